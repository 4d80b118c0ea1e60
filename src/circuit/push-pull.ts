import { StageParseError } from './errors.js';
import { formatValue } from '../units/format.js';
import { thermalVoltage } from './diode.js';
import { extremes } from './waveform.js';
import { choiceAt, nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import { faultedParts, isFault, resistorFaults } from './faults.js';
import { evaluateNetwork } from './push-pull-network.js';
import type { CheckSpec, EvalInput, EvalOutput, ImpedanceInput, PartFaults, PartValue, StageKind, StageWarning } from './types.js';

/**
 * A complementary emitter follower (NPN on top, PNP below, emitters joined at the
 * output), as in Horowitz and Hill, push-pull followers and crossover distortion:
 *
 * - `bias: "none"`: both bases driven by the input. The NPN conducts once the input
 *   is a Vbe above the output, the PNP once it is a Vbe below, so the output is
 *   input − Vbe, input + Vbe, or 0 in between: a dead band of 2·Vbe (crossover).
 * - `bias: "diodes"`: two diodes between the bases, fed by the bias network, hold
 *   each base a diode drop away from the input; the drops cancel and the output
 *   follows the input. They cancel only as well as the bias diode's drop `vd`
 *   matches Vbe: a diode that drops less than the transistor leaves a dead band
 *   of 2·(Vbe − vd); one that drops more makes a standing (class-AB) current
 *   instead. Without a plan value, vd is Vbe ± 8 % (a diode and a base-emitter
 *   junction at similar currents match within about ±50 mV; common practice,
 *   no source), so the dead band target is 0 … about 0.1 V, not an impossible 0.
 *
 * The output cannot go nearer a rail than a Vbe (the base can be driven at most to
 * the rail; common practice, no source). Vbe defaults to 0.65 V (a silicon junction
 * drops about 0.6–0.7 V; common practice, no source) and hfe to 100.
 */
export interface PushPullSettings {
  readonly bias: 'none' | 'diodes';
  readonly hasLoad: boolean;
  /**
   * Diode bias with its resistors `Rb1` (+rail → NPN base) and `Rb2` (PNP base →
   * −rail) given: the stage is solved as built (push-pull-network.ts), every
   * junction at its own current, and offers `iq` and `out.dc`. @default false
   */
  readonly hasNetwork?: boolean;
}

export const defaultVbe = 0.65;
/** Spread of a bias diode's drop against Vbe when the plan gives none (common practice, no source). */
const defaultMatch = 0.08;
export const defaultHfe = 100;
/** Spread of hfe when the plan gives none (see parse). */
export const defaultHfeTol = 0.5;
/** A TO-92 transistor gets too hot to touch near half a watt (common practice, no source). */
const hotWatts = 0.5;

/** Total load on the output at f: Rload in parallel with what the plan or the chain hangs there, Ω. */
export function outputLoad(
  input: { readonly parts: Readonly<Record<string, number>>; readonly settings: PushPullSettings; readonly load?: EvalInput<PushPullSettings>['load'] },
  f: number,
): number {
  let g = input.settings.hasLoad ? 1 / (input.parts['Rload'] ?? Number.NaN) : 0;
  const z = input.load?.('out', f);
  // A follower's output node is resistive at audio frequencies: its large-signal load is the real part.
  if (z !== undefined && Number.isFinite(z.re) && z.re > 0) g += 1 / z.re;
  return g > 0 ? 1 / g : Number.POSITIVE_INFINITY;
}

/**
 * The unbiased follower into a load RL, each half by the diode law: the
 * conducting emitter carries Ie = y/RL, so vin − y = Vt·ln(1 + y/(RL·IS·(1 + 1/β)))
 * (Ebers–Moll, IS from the plan's vbe taken at 1 mA collector current). With
 * k = RL·IS·(1 + 1/β) the curve is odd (y(−x) = −y(x)) and explicit when walked
 * along the junction voltage u·Vt: y = k·(e^u − 1), x = y + Vt·u, dy/dx =
 * (k + y)/(k + y + Vt). The dead band, by our definition the drive width where
 * dy/dx < 1/2: that is at y = Vt − k, i.e. x = Vt·(1 + ln(1 + Vt/k)) − k on each side.
 *
 * The samples: knots uniform in u through the dead band and the knee (up to
 * y = 8·Vt), then uniform in y up to the largest drive (whose output is solved
 * by Newton's method, see `lawSolve`); each sample finds its interval through a
 * uniform grid of cells and follows by cubic Hermite interpolation. Against a
 * bisection per sample, sines of 1–10 V into 100 Ω … 10 kΩ: within 0.35 mV
 * (test/circuit/push-pull.test.ts holds it to 1 mV). Module state and plain
 * functions, no closures: a trial allocates nothing here.
 */
const kneeKnots = 24;
const lineKnots = 24;
const knotCount = kneeKnots + lineKnots + 1;
const lawX = new Float64Array(knotCount);
const lawY = new Float64Array(knotCount);
const lawS = new Float64Array(knotCount);
/** A uniform grid over 0…top naming the knot each cell starts in: a sample's interval in a step or two. */
const cells = 64;
const cellStart = new Int32Array(cells + 1);
let lawTop = 0;
let lawYTop = 0;
let lawLast = 0;
let lawPerCell = 0;

/** k = RL·IS·(1 + 1/β), A·Ω = V, for the plan's vbe at 1 mA. */
function lawK(vbe: number, hfe: number, rl: number, vt: number): number {
  return rl * (1e-3 / Math.expm1(vbe / vt)) * (1 + 1 / hfe);
}

/**
 * y for a drive x > 0: y + Vt·ln(1 + y/k) = x, in u = ln(1 + y/k). F(u) = k·(e^u − 1)
 * + Vt·u − x is convex and rising, so Newton's method converges from anywhere,
 * monotonically once above the root. Start: the output a junction drop below
 * the drive (just below the root), or inside the dead band u = x/Vt (above it).
 */
function lawSolve(x: number, k: number, vt: number): number {
  const y0 = x - vt * Math.log1p(x / k);
  let u = y0 > 0 ? Math.log1p(y0 / k) : x / vt;
  for (let it = 0; it < 60; it++) {
    const e = k * Math.exp(u);
    const d = (e - k + vt * u - x) / (e + vt);
    u -= d;
    if (Math.abs(d) < 1e-11) break;
  }
  return k * Math.expm1(u);
}

function lawDeadband(k: number, vt: number): number {
  return 2 * Math.max(0, vt * (1 + Math.log1p(vt / k)) - k);
}

function lawKnot(i: number, u: number, y: number, k: number, vt: number): void {
  lawX[i] = y + vt * u;
  lawY[i] = y;
  lawS[i] = (k + y) / (k + y + vt);
}

/** Fill the knots for drives up to `top` (> 0). */
function lawCurve(top: number, k: number, vt: number): void {
  const yTop = lawSolve(top, k, vt);
  const yKnee = Math.min(8 * vt, yTop);
  const uKnee = Math.log1p(yKnee / k);
  let count = 0;
  for (let j = 0; j <= kneeKnots; j++) {
    const u = (uKnee * j) / kneeKnots;
    lawKnot(count++, u, k * Math.expm1(u), k, vt);
  }
  if (yTop > yKnee) {
    for (let j = 1; j <= lineKnots; j++) {
      const y = yKnee + ((yTop - yKnee) * j) / lineKnots;
      lawKnot(count++, Math.log1p(y / k), y, k, vt);
    }
  }
  // The last knot is the largest drive itself (rounding aside): the peak is solved, not interpolated.
  lawX[count - 1] = top;
  lawY[count - 1] = yTop;
  lawTop = top;
  lawYTop = yTop;
  lawLast = count - 1;
  lawPerCell = cells / top;
  let knot = 0;
  for (let c = 0; c <= cells; c++) {
    const edge = c / lawPerCell;
    while (knot < lawLast - 1 && (lawX[knot + 1] as number) <= edge) knot++;
    cellStart[c] = knot;
  }
}

/** The output for drive x from the knots `lawCurve` filled. */
function lawAt(x: number): number {
  const ax = x < 0 ? -x : x;
  if (ax >= lawTop) return x < 0 ? -lawYTop : lawYTop;
  let a = cellStart[Math.floor(ax * lawPerCell)] as number;
  while (a < lawLast - 1 && (lawX[a + 1] as number) <= ax) a++;
  const x0 = lawX[a] as number;
  const h = (lawX[a + 1] as number) - x0;
  const t = (ax - x0) / h;
  const y0 = lawY[a] as number;
  const d = (lawY[a + 1] as number) - y0;
  const m0 = h * (lawS[a] as number);
  const m1 = h * (lawS[a + 1] as number);
  // Cubic Hermite (any numerical analysis text).
  const y = y0 + t * (m0 + t * (3 * d - 2 * m0 - m1 + t * (m0 + m1 - 2 * d)));
  return x < 0 ? -y : y;
}

function evaluate(input: EvalInput<PushPullSettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error('push-pull: no input waveform; the plan must name an "input"');
  // The network solver takes a wrong load value; an open or shorted transistor or bias diode is
  // evaluated by the follower law below instead (its bias resistors then only set the fight current).
  if (input.settings.hasNetwork && !isActiveFault(input.fault))
    return evaluateNetwork(input.fault ? { ...input, parts: faultedParts(input, ['Rload']) } : input, source);
  const vbe = input.parts['vbe'] ?? defaultVbe;
  const hfe = input.parts['hfe'] ?? defaultHfe;
  // An open or shorted load resistor is a huge or tiny one (src/circuit/faults.ts).
  const load = outputLoad(input.fault ? { ...input, parts: faultedParts(input, ['Rload']) } : input, source.frequency);
  const crossover = input.settings.bias === 'none';
  // The part of Vbe the bias diode does not cancel (0 when it drops as much or more).
  const dead = crossover ? vbe : Math.max(0, vbe - (input.parts['vd'] ?? vbe));
  const f = input.fault;
  // A shorted bias diode leaves its transistor's whole Vbe uncancelled: a dead band on that half only.
  const deadUp = isFault(f, 'bias[0]', 'short') ? vbe : dead;
  const deadDown = isFault(f, 'bias[1]', 'short') ? vbe : dead;
  // A missing (or open) bias diode leaves its base on the bias resistor alone: that transistor
  // is driven hard on and fights the other one (a large standing current, both run hot). The
  // other one still follows the input on its own half, which the driven one clamps near 0 V:
  // the far half of the wave is lost (checked against ngspice in the diagnosis fault set).
  const stuckHigh = isFault(f, 'bias[0]', 'missing') || isFault(f, 'bias[0]', 'open');
  const stuckLow = isFault(f, 'bias[1]', 'missing') || isFault(f, 'bias[1]', 'open');
  // The follower that still works carries the driven one's current, about hfe times the bias
  // current: its Vbe exceeds its bias diode's drop by Vt·ln(hfe) (Shockley law, Vt = kT/q).
  const fight = stuckHigh || stuckLow ? thermalVoltage() * Math.log(hfe) : 0;
  // An open output transistor: its half of the wave is missing.
  const noUpper = isFault(f, 'Q[0]', 'open');
  const noLower = isFault(f, 'Q[1]', 'open');
  // Unbiased into a load: each junction by the diode law at the current it carries.
  const law = crossover && Number.isFinite(load);
  const vt = thermalVoltage();
  const k = law ? lawK(vbe, hfe, load, vt) : 0;
  if (law) {
    const e = extremes(source.samples);
    const top = Math.max(Math.abs(e.hi), Math.abs(e.lo));
    if (top > 0) lawCurve(top, k, vt);
    else {
      lawTop = 0;
      lawYTop = 0;
    }
  }
  const high = input.supplies.pos - vbe;
  const low = input.supplies.neg + vbe;
  const samples = source.samples;
  const n = samples.length;
  const out = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  let hi = -Infinity;
  let lo = Infinity;
  let clipped = false;
  for (let i = 0; i < n; i++) {
    const x = samples[i] as number;
    let y = law ? lawAt(x) : x > deadUp ? x - deadUp : x < -deadDown ? x + deadDown : 0;
    if ((noUpper && y > 0) || (noLower && y < 0)) y = 0;
    if (stuckHigh) y = y < 0 ? 0 : y + fight;
    else if (stuckLow) y = y > 0 ? 0 : y - fight;
    if (y > high || y < low) {
      clipped = true;
      y = Math.min(high, Math.max(low, y));
    }
    out[i] = y;
    if (y > hi) hi = y;
    if (y < lo) lo = y;
  }
  // Collector dissipation (Vce · Ie) of whichever transistor conducts, for the warning only
  // (a Monte Carlo trial reads no warnings).
  let heatTop = 0;
  let heatBottom = 0;
  if (!input.isTrial && input.settings.hasLoad) {
    const pos = input.supplies.pos;
    const neg = input.supplies.neg;
    for (let i = 0; i < n; i++) {
      const y = out[i] as number;
      if (y > 0) heatTop += (pos - y) * y;
      else heatBottom += (y - neg) * -y;
    }
    heatTop /= load;
    heatBottom /= load;
  }
  const ipeak = Math.max(Math.abs(hi), Math.abs(lo)) / load;
  const values: Record<string, number> = { 'out.vpp': hi - lo, deadband: stuckHigh || stuckLow ? Number.NaN : law ? lawDeadband(k, vt) : deadUp + deadDown };
  if (input.settings.hasLoad) {
    values['out.ipeak'] = ipeak;
    values['base.ipeak'] = ipeak / hfe;
  }
  const warnings: StageWarning[] = [];
  if (input.isTrial) return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings };
  if (crossover) {
    warnings.push({ message: `no bias: a dead band of ±${formatValue(vbe, 'V')} around zero (crossover distortion); the output loses a Vbe on each peak` });
  }
  if (clipped) {
    warnings.push({ message: `the output would pass ${formatValue(low, 'V')} … ${formatValue(high, 'V')}, a Vbe inside the rails: it clips` });
  }
  const watts = Math.max(heatTop, heatBottom) / n;
  if (input.settings.hasLoad && watts > hotWatts) {
    warnings.push({
      message: `each output transistor dissipates about ${formatValue(watts, 'W')}: too hot for a small package without a heatsink; do not touch the transistors while the signal runs`,
    });
  }
  return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings };
}

/**
 * What the driver sees, as a large-signal equivalent: each base takes its
 * emitter's current over (hfe + 1), i.e. the load times (hfe + 1) (emitter
 * follower, Horowitz and Hill), and with the diode bias network the bias
 * resistors too, since a swing of v moves v/Rb1 + v/Rb2 between the diodes and
 * the driver (Kirchhoff at the two bases): Rb1 ‖ Rb2 ‖ (hfe + 1)·RL. Inside the
 * dead band of an unbiased stage nothing flows; the equivalent is that of the
 * conducting half. Open without a load.
 */
function inputImpedance(x: ImpedanceInput<PushPullSettings>, f: number): { re: number; im: number } {
  const rl = outputLoad(x, f);
  const hn = x.parts['hfe'] ?? defaultHfe;
  const hp = x.parts['hfe.pnp'] ?? hn;
  let g = Number.isFinite(rl) ? 1 / ((0.5 * (hn + hp) + 1) * rl) : 0;
  if (x.settings.hasNetwork) g += 1 / (x.parts['Rb1'] ?? Number.NaN) + 1 / (x.parts['Rb2'] ?? Number.NaN);
  return { re: g > 0 ? 1 / g : Number.POSITIVE_INFINITY, im: 0 };
}

/** A fault on an output transistor or a bias diode (the follower law models those, not the network solver). */
function isActiveFault(f: EvalInput<PushPullSettings>['fault']): boolean {
  return f !== undefined && /^(Q|bias)\[[01]\]$/.test(f.role);
}

/**
 * Fault modes (DESIGN §5a): an output transistor open, a bias diode not fitted
 * or shorted, the load open or shorted. With a bias network (`Rb1`, `Rb2`) the
 * transistor and diode faults are evaluated by the follower law, not by the
 * network solver (a first-order model of the faulted stage).
 */
function faults(settings: PushPullSettings): readonly PartFaults[] {
  const list: PartFaults[] = [
    { role: 'Q[0]', modes: ['open'], description: 'upper (NPN) output transistor' },
    { role: 'Q[1]', modes: ['open'], description: 'lower (PNP) output transistor' },
  ];
  if (settings.hasLoad) list.push(...resistorFaults(['Rload'], { Rload: 'load resistor' }));
  if (settings.bias === 'diodes') {
    list.push(
      { role: 'bias[0]', modes: ['missing', 'short'], description: 'upper bias diode' },
      { role: 'bias[1]', modes: ['missing', 'short'], description: 'lower bias diode' },
    );
  }
  return list;
}

function checks(settings: PushPullSettings): readonly CheckSpec[] {
  const list: CheckSpec[] = [
    {
      key: 'out.vpp',
      captureFigure: 'vpp',
      quantity: 'peak-to-peak',
      unit: 'V',
      output: 'out',
      instrument: 'scope',
      how: 'scope DC-coupled at the output across the load, read peak-to-peak',
    },
    {
      key: 'deadband',
      quantity: 'crossover dead band (total width)',
      unit: 'V',
      output: 'out',
      instrument: 'scope',
      how: 'scope in X-Y mode, input on X and output on Y: read the width of the flat step around zero',
      floor: 0,
    },
  ];
  if (settings.hasNetwork) {
    list.push(
      {
        key: 'iq',
        quantity: 'quiescent collector current per transistor',
        unit: 'A',
        instrument: 'meter',
        how: "no signal (drive at 0 V): ammeter in series with one collector, or the rail current less the bias resistor's; caution, the transistors may run hot",
      },
      {
        key: 'out.dc',
        quantity: 'output offset, no signal',
        unit: 'V',
        output: 'out',
        instrument: 'meter',
        how: 'no signal (drive at 0 V): DC voltmeter from the output to ground',
      },
    );
  }
  // Nobody probes these at a test point: design figures, in targets but not on the bring-up list.
  if (settings.hasLoad) {
    list.push(
      {
        key: 'out.ipeak',
        quantity: 'peak load current',
        unit: 'A',
        output: 'out',
        instrument: 'scope',
        how: 'scope across the load resistor: peak voltage over its value',
        isDesignFigure: true,
      },
      {
        key: 'base.ipeak',
        quantity: 'peak base drive current',
        unit: 'A',
        instrument: 'scope',
        how: "scope across a series base resistor if fitted, or from the driver's output; peak voltage over the resistor",
        isDesignFigure: true,
      },
    );
  }
  return list;
}

export const pushPullKind: StageKind<PushPullSettings> = {
  kind: 'push-pull',
  summary: 'complementary emitter-follower output: dead band 2·Vbe without bias, ≈ unity with diode bias; load and base currents',
  traits: { usesOpamp: false, isAmplifier: false, isHandWritten: false },
  roles: [
    { role: 'Rload', unit: 'Ω', description: 'load from the output to ground', optional: true },
    { role: 'vbe', unit: 'V', description: 'base-emitter drop of the output transistors', optional: true },
    { role: 'hfe', unit: 'V/V', description: 'current gain of the output transistors', optional: true },
    { role: 'vd', unit: 'V', description: 'drop of each bias diode (diode bias without Rb1/Rb2 only; default Vbe ± 8 %)', optional: true },
    { role: 'Rb1', unit: 'Ω', description: 'bias resistor from the positive rail to the NPN base (diode bias)', optional: true },
    { role: 'Rb2', unit: 'Ω', description: 'bias resistor from the PNP base to the negative rail (diode bias)', optional: true },
    { role: 'vbe.pnp', unit: 'V', description: "base-emitter drop of the PNP at 1 mA (with Rb1/Rb2; default: the plan's vbe)", optional: true },
    { role: 'hfe.pnp', unit: 'V/V', description: "current gain of the PNP (with Rb1/Rb2; default: the plan's hfe)", optional: true },
  ],
  outputs: ['out'],
  needsInput: true,
  parse(raw, file) {
    const r = reader(raw, file);
    const p = nested(r, 'parts');
    onlyKeys(p, ['Rload', 'Rb1', 'Rb2']);
    const parts: Record<string, PartValue> = {};
    const load = partAt(p, 'Rload', 'Ω', false, { positive: true, plausible: ohmRange, example: '"1k 5%"' });
    if (load) parts['Rload'] = load;
    const vbe = partAt(r, 'vbe', 'V', false, { positive: true, example: '"0.65 V 10%"' });
    if (vbe) parts['vbe'] = vbe;
    const hfe = partAt(r, 'hfe', 'V/V', false, { positive: true, example: '100' });
    // hfe written without a tolerance spreads ±50 %: data sheets give a small-signal
    // transistor's hfe as a min … max range of about 2:1 to 3:1 (from memory; common practice).
    if (hfe) parts['hfe'] = hfe.tol > 0 ? hfe : { ...hfe, tol: defaultHfeTol, text: `${hfe.text} ${defaultHfeTol * 100}% (default hfe spread)` };
    const bias = choiceAt(r, 'bias', ['none', 'diodes'] as const);
    const vd = partAt(r, 'vd', 'V', false, { positive: true, example: '"0.65 V 8%"' });
    if (vd && bias !== 'diodes')
      throw new StageParseError(file, `${raw.path}.vd`, 'a bias diode drop only applies with "bias": "diodes"; remove it or set the bias');
    const rb1 = partAt(p, 'Rb1', 'Ω', false, { positive: true, plausible: ohmRange, example: '"4k7 5%"' });
    const rb2 = partAt(p, 'Rb2', 'Ω', false, { positive: true, plausible: ohmRange, example: '"4k7 5%"' });
    const hasNetwork = rb1 !== undefined || rb2 !== undefined;
    if (hasNetwork) {
      if (bias !== 'diodes')
        throw new StageParseError(
          file,
          `${raw.path}.parts.${rb1 ? 'Rb1' : 'Rb2'}`,
          'bias resistors only apply with "bias": "diodes"; set the bias or remove them',
        );
      if (!rb1 || !rb2)
        throw new StageParseError(
          file,
          `${raw.path}.parts.${rb1 ? 'Rb2' : 'Rb1'}`,
          'missing; the diode bias network needs both Rb1 (+rail to the NPN base) and Rb2 (PNP base to −rail), e.g. "4k7 5%"',
        );
      if (vd) throw new StageParseError(file, `${raw.path}.vd`, 'with Rb1 and Rb2 the bias diodes follow the diode law at their real current; remove "vd"');
      parts['Rb1'] = rb1;
      parts['Rb2'] = rb2;
      // The PNP is its own part: by default the plan's vbe and hfe, varied independently of the NPN's.
      const pnp = nested(r, 'pnp');
      onlyKeys(pnp, ['vbe', 'hfe']);
      const vbeP = partAt(pnp, 'vbe', 'V', false, { positive: true, example: '"0.7 V 10%"' });
      const hfeP = partAt(pnp, 'hfe', 'V/V', false, { positive: true, example: '150' });
      const v = vbe ?? { nominal: defaultVbe, tol: 0, unit: 'V' as const, text: `${defaultVbe} V (default)` };
      // hfe keeps its default spread here too (a written hfe without a tolerance got it above).
      const h = parts['hfe'] ?? { nominal: defaultHfe, tol: defaultHfeTol, unit: 'V/V' as const, text: `${defaultHfe} ${defaultHfeTol * 100}% (default)` };
      parts['vbe'] = v;
      parts['hfe'] = h;
      parts['vbe.pnp'] = vbeP ?? v;
      parts['hfe.pnp'] = hfeP ? (hfeP.tol > 0 ? hfeP : { ...hfeP, tol: defaultHfeTol, text: `${hfeP.text} ${defaultHfeTol * 100}% (default hfe spread)` }) : h;
    } else if (raw.json['pnp'] !== undefined) {
      throw new StageParseError(file, `${raw.path}.pnp`, 'separate PNP values apply to the diode bias network only; add Rb1 and Rb2 or remove "pnp"');
    } else if (bias === 'diodes') {
      const v = vbe?.nominal ?? defaultVbe;
      parts['vd'] = vd ?? { nominal: v, tol: defaultMatch, unit: 'V', text: `${v} V ${defaultMatch * 100}% (default: matched to Vbe)` };
    }
    return { parts, settings: { bias, hasLoad: load !== undefined, hasNetwork } };
  },
  checks,
  evaluate,
  faults,
  inputImpedance,
  // Seen from the load: the base source over (hfe + 1) plus the emitter's Vt/Ie at about 1 mA
  // (emitter follower output resistance, Horowitz and Hill); an estimate, the stage solves its own load.
  outputImpedance: (x) => {
    const rb = x.settings.hasNetwork ? 1 / (1 / (x.parts['Rb1'] ?? Number.NaN) + 1 / (x.parts['Rb2'] ?? Number.NaN)) : 0;
    return { re: rb / ((x.parts['hfe'] ?? defaultHfe) + 1) + 26, im: 0 };
  },
  faultHints: {
    'out.vpp': [
      'the drive level is off: check the upstream stage first',
      'one transistor open or not fitted: only one half of the wave appears',
      'a bias diode shorted: crossover appears although the plan has diode bias',
      'caution: output transistors get hot under signal; let them cool before touching or reworking',
    ],
    deadband: [
      'a bias diode open or its bias resistor wrong: the step at zero returns',
      'the bias diodes fitted backwards',
      'caution: a bias set too high makes the transistors run hot (thermal runaway); power off if they heat with no signal',
    ],
    'out.ipeak': ['the load is not the value the plan assumes', 'the output is clipping: check the rails'],
    'base.ipeak': ["a lower-gain transistor fitted (hfe below the plan's)", 'the driver cannot supply the base current: its output sags at the peaks'],
    iq: [
      'a bias diode shorted or the wrong type: the standing current collapses (crossover returns) or climbs',
      'Rb1 or Rb2 the wrong value: the diodes carry another current and drop more or less',
      'transistors of another type, or not sharing heat with the diodes: the current drifts as they warm',
      'caution: a standing current that rises as the parts warm is thermal runaway; power off and let them cool',
    ],
    'out.dc': [
      'Rb1 and Rb2 unequal (a wrong value fitted): the midpoint pulls one way',
      'one transistor or bias diode open: the output sits a Vbe toward one rail',
      'the driver stage has an offset: check its DC level first',
    ],
  },
};
