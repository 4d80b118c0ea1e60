import { formatValue } from '../units/format.js';
import { dcLoad, railOf } from './rail-load.js';
import { nested, ohmRange, onlyKeys, partAt, reader, textAt } from './stage-parse.js';
import type { CheckSpec, EvalInput, EvalOutput, PartFaults, PartValue, StageKind, StageWarning, Waveform } from './types.js';
import { dc, defaultSamples } from './waveform.js';

export interface TimerAstableSettings {
  /** Rail id the timer runs from (`+12V`). */
  readonly from: string;
}

/** Supply range of the bipolar timer IC, V (its data sheets give 4.5–16 V; from memory). */
const supplyRange: readonly [number, number] = [4.5, 16];
/** A shorted part reads a few tenths of an ohm (common practice, no source), Ω. */
const shortOhms = 0.1;
/** An open timing capacitor leaves the pin's stray capacitance, about 10 pF (common practice, no source), F. */
const strayFarads = 10e-12;

interface Timing {
  /** Output high (capacitor charging) and low (discharging) times, s; Infinity when it stops. */
  readonly th: number;
  readonly tl: number;
  /** Charging target and its time constant; discharge time constant, s. */
  readonly vinf: number;
  readonly tauC: number;
  readonly tauD: number;
}

/**
 * Bipolar timer IC in astable mode: the capacitor charges through Ra + Rb from
 * the rail and discharges through Rb into the discharge pin, between 1/3 and
 * 2/3 of the rail. Unloaded this is th = ln 2·(Ra + Rb)·C and tl = ln 2·Rb·C,
 * so f = 1/(ln 2·(Ra + 2Rb)·C) and duty = (Ra + Rb)/(Ra + 2Rb) (the timer's
 * data sheets). A load on the capacitor node (a probe, the next stage) is kept:
 * charging then heads for the divided target, th = τc·ln((V∞ − V/3)/(V∞ − 2V/3)),
 * and stops when V∞ no longer reaches 2/3 of the rail.
 */
function timing(input: EvalInput<TimerAstableSettings>, rail: number): Timing {
  const p = input.parts;
  const fault = input.fault;
  const value = (role: string) => {
    if (fault?.role === role) {
      if (fault.mode === 'open') return role === 'C' ? strayFarads : Number.POSITIVE_INFINITY;
      if (fault.mode === 'short') return role === 'C' ? Number.POSITIVE_INFINITY : shortOhms;
    }
    return p[role] ?? Number.NaN;
  };
  const ra = value('Ra');
  const rb = value('Rb');
  const c = value('C');
  const gl = dcLoad(input, 'cap');
  const gc = 1 / (ra + rb);
  const vinf = gc + gl > 0 ? (rail * gc) / (gc + gl) : 0;
  const tauC = c / (gc + gl);
  const tauD = c / (1 / rb + gl);
  // A shorted capacitor never leaves 0 V (the trigger holds the output high); nor does one that cannot charge.
  if (!(vinf > (2 * rail) / 3) || !Number.isFinite(tauC)) return { th: Number.POSITIVE_INFINITY, tl: 0, vinf, tauC, tauD };
  const th = tauC * Math.log((vinf - rail / 3) / (vinf - (2 * rail) / 3));
  return { th, tl: tauD * Math.LN2, vinf, tauC, tauD };
}

/** One period of the output and the capacitor, refilled in the trial's own buffers when given. */
function waves(t: Timing, rail: number, high: number, buffer: ((slot: number, length: number) => Float64Array) | undefined): { out: Waveform; cap: Waveform } {
  const period = t.th + t.tl;
  const frequency = 1 / period;
  const n = defaultSamples;
  const out = buffer ? buffer(0, n) : new Float64Array(n);
  const cap = buffer ? buffer(1, n) : new Float64Array(n);
  const dt = period / n;
  // The exponentials advance by a constant factor per sample (one exp per segment, not per sample).
  const stepC = Math.exp(-dt / t.tauC);
  let charge = 1;
  let discharge = 0;
  let isHigh = true;
  let stepD = 1;
  for (let i = 0; i < n; i++) {
    const time = i * dt;
    if (time < t.th) {
      out[i] = high;
      cap[i] = t.vinf - (t.vinf - rail / 3) * charge;
      charge *= stepC;
    } else {
      if (isHigh) {
        isHigh = false;
        discharge = Math.exp(-(time - t.th) / t.tauD);
        stepD = Math.exp(-dt / t.tauD);
      }
      out[i] = 0;
      cap[i] = ((2 * rail) / 3) * discharge;
      discharge *= stepD;
    }
  }
  return { out: { frequency, samples: out }, cap: { frequency, samples: cap } };
}

function evaluate(input: EvalInput<TimerAstableSettings>): EvalOutput {
  const rail = railOf('timer-astable', input, input.settings.from);
  const vdrop = input.parts['vdrop'] ?? Number.NaN;
  const high = Math.max(0, rail - vdrop);
  const t = rail > 0 ? timing(input, rail) : undefined;
  const warnings: StageWarning[] = [];
  if (!t || !Number.isFinite(t.th)) {
    // Stopped: the capacitor sits below 1/3 of the rail and the output stays high (0 V with no supply at all).
    const level = rail > 0 ? high : 0;
    if (!input.isTrial) {
      warnings.push({
        message:
          rail > 0
            ? `the timer does not run: the capacitor cannot charge to 2/3 of the rail (${formatValue((2 * rail) / 3, 'V')}), so the output stays high`
            : `the timer needs a positive supply; rail ${JSON.stringify(input.settings.from)} is ${formatValue(rail, 'V')}`,
      });
    }
    return { outputs: { out: dc(level), cap: dc(0) }, values: { freq: 0, duty: 1, 'out.vpp': 0, 'cap.vpp': 0 }, warnings };
  }
  const period = t.th + t.tl;
  const values = { freq: 1 / period, duty: t.th / period, 'out.vpp': high, 'cap.vpp': rail / 3 };
  const { out, cap } = waves(t, rail, high, input.buffer);
  if (!input.isTrial) {
    if (rail < supplyRange[0] || rail > supplyRange[1]) {
      warnings.push({
        message: `the bipolar timer runs from ${formatValue(supplyRange[0], 'V')} to ${formatValue(supplyRange[1], 'V')}; rail ${JSON.stringify(input.settings.from)} is ${formatValue(rail, 'V')}`,
      });
    }
    const ra = input.parts['Ra'] ?? Number.NaN;
    if (rail / ra > 0.1 || input.fault?.role === 'Ra') {
      warnings.push({
        message: `while the output is low the discharge pin sinks ${formatValue(rail / Math.max(ra, shortOhms), 'A')} through Ra: keep Ra at 1 kΩ or more or the timer runs hot`,
      });
    }
  }
  return { outputs: { out, cap }, values, warnings };
}

const checks: readonly CheckSpec[] = [
  {
    key: 'freq',
    quantity: 'output frequency',
    unit: 'Hz',
    output: 'out',
    instrument: 'counter',
    how: 'counter or scope frequency readout at the timer output',
    captureFigure: 'frequency',
  },
  {
    key: 'duty',
    quantity: 'output duty (fraction high)',
    unit: '1',
    output: 'out',
    instrument: 'scope',
    how: 'scope positive-duty readout at the timer output',
    captureFigure: 'duty',
  },
  {
    key: 'out.vpp',
    quantity: 'output peak-to-peak',
    unit: 'V',
    output: 'out',
    instrument: 'scope',
    how: 'scope at the timer output, DC coupled, read peak-to-peak',
    captureFigure: 'vpp',
  },
  {
    key: 'cap.vpp',
    quantity: 'capacitor swing (1/3 to 2/3 of the rail)',
    unit: 'V',
    output: 'cap',
    instrument: 'scope',
    how: '10× probe on the timing capacitor (a 1× probe or a meter there slows the timer), read peak-to-peak',
    captureFigure: 'vpp',
  },
];

const faults = (): readonly PartFaults[] => [
  { role: 'Ra', modes: ['open', 'short'], description: 'resistor from the rail to the discharge pin' },
  { role: 'Rb', modes: ['open', 'short'], description: 'resistor from the discharge pin to the capacitor' },
  { role: 'C', modes: ['open', 'short'], description: 'timing capacitor' },
];

export const timerAstableKind: StageKind<TimerAstableSettings> = {
  kind: 'timer-astable',
  summary: 'bipolar timer IC in astable mode: f = 1/(ln 2·(Ra + 2Rb)·C), duty (Ra + Rb)/(Ra + 2Rb), capacitor between 1/3 and 2/3 of the rail',
  roles: [
    { role: 'Ra', unit: 'Ω', description: 'resistor from the rail to the discharge pin' },
    { role: 'Rb', unit: 'Ω', description: 'resistor from the discharge pin to the capacitor' },
    { role: 'C', unit: 'F', description: 'timing capacitor' },
    { role: 'vdrop', unit: 'V', description: 'how far the output high stays below the rail', optional: true, isRating: true },
  ],
  outputs: ['out', 'cap'],
  needsInput: false,
  traits: { railSetting: 'from' },
  parse(raw, file) {
    const r = reader(raw, file);
    const from = textAt(r, 'from', true, '"+12V" (the rail id the timer runs from)');
    const p = nested(r, 'parts', true);
    onlyKeys(p, ['Ra', 'Rb', 'C']);
    const parts: Record<string, PartValue> = {
      Ra: partAt(p, 'Ra', 'Ω', true, { positive: true, plausible: ohmRange, example: '"10k 1%"' }),
      Rb: partAt(p, 'Rb', 'Ω', true, { positive: true, plausible: ohmRange, example: '"47k 1%"' }),
      // Above 1 F is a missing prefix or an RKM slip, not a timing capacitor.
      C: partAt(p, 'C', 'F', true, { positive: true, plausible: [1e-12, 1], example: '"10n 5%"' }),
      vdrop: partAt(r, 'vdrop', 'V', false, { nonNegative: true, plausible: [0, 5], example: '"1.7 V"' }) ?? {
        nominal: 1.7,
        tol: 0,
        unit: 'V',
        text: '1.7 V (default)',
      },
    };
    return { parts, settings: { from } };
  },
  checks: () => checks,
  evaluate,
  // The capacitor node seen from outside: Rb to the discharge pin or Ra + Rb to the rail, shunted by C.
  outputImpedance: (x, output, f) => {
    if (output !== 'cap') return { re: 0, im: 0 };
    const r = (x.parts['Ra'] ?? Number.NaN) + (x.parts['Rb'] ?? Number.NaN);
    const wrc = 2 * Math.PI * f * r * (x.parts['C'] ?? Number.NaN);
    // R ∥ 1/(jωC) = R/(1 + jωRC).
    return { re: r / (1 + wrc * wrc), im: (-r * wrc) / (1 + wrc * wrc) };
  },
  faults,
  faultHints: {
    freq: [
      'a decade off: C from the wrong reel (10n for 100n), or a ×10 slip on Rb',
      'zero, output stuck high: Ra or Rb open, or C shorted',
      'far too high (hundreds of kHz): C open or not fitted',
      'a little low: a meter or 1× probe on the capacitor pin loads it',
    ],
    duty: ['near 100 %: Rb shorted', 'near 50 %: Ra much smaller than designed, or Ra and Rb swapped'],
    'out.vpp': ['the rail low, or the output loaded beyond its drive (a relay without a diode, an LED without a resistor)'],
    'cap.vpp': ['not a third of the rail: the control pin loaded or bypassed with a leaky capacitor'],
  },
};
