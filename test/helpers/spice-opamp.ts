import type { OpampModel, Supplies } from '../../src/circuit/types.js';

/**
 * A behavioural op-amp for ngspice decks in the tests, independent of the
 * equations in `src/circuit`:
 *
 *   inputs ── transconductance I = Imax·tanh(gm·vd/Imax) ── node x: C ∥ R ── buffer ── out
 *
 * - finite DC gain: gm·R = aol;
 * - a single pole at GBW/aol: C = gm/(2π·GBW), so the unity-gain frequency is GBW;
 * - a slew limit: the stage current saturates at Imax = SR·C, as a differential
 *   input pair does (tanh is the long-tailed pair's law), so full slew needs an
 *   overdrive of about SR/(2π·GBW);
 * - output limits: node x is held between vlow and vhigh by two sharp diodes
 *   (N = 0.01, their drop at the full stage current taken off the limits, so
 *   the output saturates within about a millivolt of vhigh and vlow), so the stage
 *   recovers from saturation without wind-up, and the output follows x through
 *   an ideal buffer.
 *
 * Pins: `.subckt NAME inp inn out`. The supplies are not pins: the limits are
 * absolute voltages (rail minus headroom), as the stage models assume.
 */
export interface SpiceOpampOptions {
  /** Gain-bandwidth product, Hz. */
  readonly gbw: number;
  /** Slew rate, V/s. */
  readonly slew: number;
  /** DC open-loop gain, V/V. */
  readonly aol: number;
  /** Highest output voltage, V. */
  readonly vhigh: number;
  /** Lowest output voltage, V. */
  readonly vlow: number;
}

/** Internal node capacitance; only sets the current scale (Imax = SR·C), F. */
const cInternal = 1e-9;

function num(x: number): string {
  return x.toPrecision(10);
}

export function opampSubckt(name: string, o: SpiceOpampOptions): string {
  if (!(o.gbw > 0 && o.slew > 0 && o.aol > 1 && o.vhigh > o.vlow)) {
    throw new Error(`opampSubckt ${name}: need gbw, slew > 0, aol > 1 and vhigh > vlow`);
  }
  const gm = 2 * Math.PI * o.gbw * cInternal;
  const imax = o.slew * cInternal;
  const r = o.aol / gm;
  const model = `dlim_${name}`;
  // The clamp diode's drop at the full stage current (kT/q = 25.85 mV at 27 °C),
  // taken off the limit sources so the output saturates at vhigh and vlow.
  const drop = 0.01 * 0.025852 * Math.log(imax / 1e-15);
  return [
    `.subckt ${name} inp inn out`,
    `rin inp inn 1e12`,
    // B source current flows from its first node through the source to the second: into x.
    `bgm 0 x I = ${num(imax)} * tanh(${num(gm / imax)} * (V(inp) - V(inn)))`,
    `cx x 0 ${num(cInternal)}`,
    `rx x 0 ${num(r)}`,
    `dhi x hi ${model}`,
    `vhi hi 0 DC ${num(o.vhigh - drop)}`,
    `dlo lo x ${model}`,
    `vlo lo 0 DC ${num(o.vlow + drop)}`,
    `eout out 0 x 0 1`,
    `.model ${model} D (IS=1e-15 N=0.01)`,
    `.ends ${name}`,
  ].join('\n');
}

/**
 * `opampSubckt` for a plan's op-amp on these supplies: its output limits are the
 * rails less the headroom (worked here, not through src/circuit/opamp.ts).
 */
export function opampSubcktFor(name: string, op: OpampModel, supplies: Supplies): string {
  return opampSubckt(name, { gbw: op.gbw, slew: op.slew, aol: op.aol, vhigh: supplies.pos - op.headroom, vlow: supplies.neg + op.headroom });
}
