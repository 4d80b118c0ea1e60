import { swing } from './opamp.js';
import { type SchmittCircuit, type SchmittTiming, schmittTiming } from './schmitt-model.js';
import { parseSchmitt, type SchmittSettings } from './schmitt-parse.js';
import { schmittWarnings } from './schmitt-warnings.js';
import { schmittWaves } from './schmitt-wave.js';
import { faultedParts, isFault, resistorFaults } from './faults.js';
import type { CheckSpec, EvalInput, EvalOutput, PartFaults, StageKind, StageWarning } from './types.js';
import { defaultSamples } from './waveform.js';

export type { SchmittSettings } from './schmitt-parse.js';

/**
 * Square/triangle relaxation oscillator: a comparator with positive feedback
 * (R1 from the triangle, R2 from the square) driving an inverting integrator
 * (Rt + RV·setting, Ct), optionally with back-to-back zeners behind Rz on the
 * square node. Timing with the comparator's slew rate: `schmitt-model.ts`.
 *
 * When the loop cannot oscillate (the switching point lies beyond the
 * integrator's swing, e.g. R1 ≥ R2 unclamped) the frequency, duty and triangle
 * values are NaN — there is no target to test against — and the outputs are DC
 * at the latched levels (frequency 0); a warning says why.
 */

const resistorRoles = ['R1', 'R2', 'Rt', 'RV', 'Rz'];

/**
 * The clamp levels (high side, low side as a magnitude) of the back-to-back pair,
 * with a fault on it. D1 breaks down at the high level and D2 conducts forward;
 * the other way round at the low level. One zener fitted backwards turns the
 * pair into two diodes in series pointing the same way: both forward on one
 * side (vf + vf2) and both in breakdown on the other (vz + vz2, usually beyond
 * the swing, so that side is not clamped at all). Open (or not fitted): no
 * clamp. Shorted (a bridge across the pair): the square node sits at ground.
 */
function clampLevels(input: EvalInput<SchmittSettings>, vz: number, vf: number, vz2: number, vf2: number): { vc: number; vcLow: number } {
  const f = input.fault;
  if (f && f.role === 'clamp') {
    if (f.mode === 'open' || f.mode === 'missing') return { vc: Number.POSITIVE_INFINITY, vcLow: Number.POSITIVE_INFINITY };
    if (f.mode === 'short') return { vc: 0, vcLow: 0 };
    if (f.mode === 'reversed') return (f.variant ?? 0) === 0 ? { vc: vf + vf2, vcLow: vz + vz2 } : { vc: vz + vz2, vcLow: vf + vf2 };
  }
  return { vc: vz + vf2, vcLow: vz2 + vf };
}

function circuit(input: EvalInput<SchmittSettings>, pot: number): SchmittCircuit {
  const { opamp } = input;
  const parts = faultedParts(input, resistorRoles, ['Ct']);
  const { high, low } = swing(opamp, input.supplies);
  const vz = parts['clamp.vz'];
  const vf = parts['clamp.vf'];
  const vz2 = parts['clamp.vz2'] ?? vz;
  const vf2 = parts['clamp.vf2'] ?? vf;
  const clamped = input.settings.hasClamp && vz !== undefined && vf !== undefined && vz2 !== undefined && vf2 !== undefined;
  const levels = clamped ? clampLevels(input, vz, vf, vz2, vf2) : undefined;
  return {
    r1: parts['R1'] ?? Number.NaN,
    r2: parts['R2'] ?? Number.NaN,
    r: (parts['Rt'] ?? Number.NaN) + (parts['RV'] ?? 0) * pot,
    c: parts['Ct'] ?? Number.NaN,
    rz: parts['Rz'] ?? 0,
    // D1 in breakdown and D2 forward at the high level; the other way round at the low.
    vc: levels ? levels.vc : Number.POSITIVE_INFINITY,
    vcLow: levels ? levels.vcLow : Number.POSITIVE_INFINITY,
    high,
    low,
    slew: opamp.slew,
    gbw: opamp.gbw,
  };
}

const noWarnings: readonly StageWarning[] = Object.freeze([]);

function frequencyOf(t: SchmittTiming): number {
  return t.oscillates ? 1 / t.period : Number.NaN;
}

function evaluate(input: EvalInput<SchmittSettings>): EvalOutput {
  const s = input.settings;
  const p = circuit(input, s.pot);
  if (isFault(input.fault, 'Ct', 'short')) return shortedCt(p, input.fault?.variant ?? 0);
  const t = schmittTiming(p);
  // A trial's warnings are never read (EvalInput.isTrial).
  const warnings = input.isTrial ? noWarnings : schmittWarnings(p, t, { hasClamp: s.hasClamp, hasRz: p.rz > 0 });
  const values: Record<string, number> = {
    freq: frequencyOf(t),
    'square.vpp': t.oscillates ? t.squareHigh - t.squareLow : 0,
    'square.high': t.squareHigh,
    // Latched, the square is DC at its high level: both levels read the same.
    'square.low': t.oscillates ? t.squareLow : t.squareHigh,
    duty: t.oscillates ? t.duty : Number.NaN,
  };
  if (s.hasPot) {
    // RV fully in gives the lowest frequency, RV shorted the highest.
    values['freq.min'] = frequencyOf(schmittTiming(circuit(input, 1)));
    values['freq.max'] = frequencyOf(schmittTiming(circuit(input, 0)));
  }
  if (!t.oscillates) {
    // Latched: the square sits high and the integrator runs into its low limit.
    values['triangle.vpp'] = Number.NaN;
    values['triangle.peak'] = Number.NaN;
    return {
      outputs: {
        square: { frequency: 0, samples: new Float64Array(defaultSamples).fill(t.squareHigh) },
        triangle: { frequency: 0, samples: new Float64Array(defaultSamples).fill(p.low) },
      },
      values,
      warnings,
    };
  }
  const top = Math.min(t.triangleMax, p.high);
  const bottom = Math.max(t.triangleMin, p.low);
  values['triangle.vpp'] = top - bottom;
  values['triangle.peak'] = top;
  const { square, triangle } = schmittWaves(t, p.high, p.low, undefined, input.buffer);
  return { outputs: { square, triangle }, values, warnings };
}

/**
 * Ct shorted: the integrator's output is tied to its − input, a virtual ground,
 * so the triangle is a flat 0 V; the comparator's + input then sees only the
 * square through R1/(R1 + R2), positive feedback, and latches: the square sits
 * at one level, high (variant 0) or low (variant 1), whichever it held when the
 * loop stopped.
 */
function shortedCt(p: SchmittCircuit, variant: number): EvalOutput {
  const t = schmittTiming(p);
  const level = variant === 1 ? t.squareLow : t.squareHigh;
  return {
    outputs: {
      square: { frequency: 0, samples: new Float64Array(defaultSamples).fill(level) },
      triangle: { frequency: 0, samples: new Float64Array(defaultSamples) },
    },
    values: {
      freq: Number.NaN,
      'square.vpp': 0,
      'square.high': level,
      'square.low': level,
      duty: Number.NaN,
      'triangle.vpp': 0,
      'triangle.peak': 0,
      'freq.min': Number.NaN,
      'freq.max': Number.NaN,
    },
    warnings: [],
  };
}

function faults(settings: SchmittSettings): readonly PartFaults[] {
  const words: Record<string, string> = {
    R1: 'hysteresis resistor',
    R2: 'feedback resistor',
    Rt: 'timing resistor',
    RV: 'frequency pot',
    Rz: 'zener feed resistor',
  };
  const roles = resistorRoles.filter((r) => (r !== 'RV' || settings.hasPot) && (r !== 'Rz' || settings.hasClamp));
  const list: PartFaults[] = [
    ...resistorFaults(roles, words),
    { role: 'Ct', modes: ['open', 'short'], description: 'timing capacitor', variants: { short: ['square latched high', 'square latched low'] } },
  ];
  if (settings.hasClamp) {
    list.push({
      role: 'clamp',
      modes: ['reversed', 'open', 'short'],
      description: 'zener pair',
      variants: { reversed: ['high-side zener backwards', 'low-side zener backwards'] },
    });
  }
  return list;
}

const baseChecks: readonly CheckSpec[] = [
  {
    key: 'freq',
    captureFigure: 'frequency',
    quantity: 'frequency',
    unit: 'Hz',
    output: 'square',
    instrument: 'counter',
    how: 'counter on the square test point, DC coupled; period mode below about 1 kHz',
  },
  {
    key: 'square.vpp',
    captureFigure: 'vpp',
    quantity: 'square peak-to-peak',
    unit: 'V',
    output: 'square',
    instrument: 'scope',
    how: 'scope on the square test point, DC coupled, 10× probe, measure Vpp',
  },
  {
    key: 'square.high',
    quantity: 'square high level',
    unit: 'V',
    output: 'square',
    instrument: 'scope',
    how: 'scope on the square test point, DC coupled, measure the top level',
  },
  {
    key: 'square.low',
    quantity: 'square low level',
    unit: 'V',
    output: 'square',
    instrument: 'scope',
    how: 'scope on the square test point, DC coupled, measure the base level',
  },
  {
    key: 'duty',
    captureFigure: 'duty',
    quantity: 'duty cycle (high time / period)',
    unit: '1',
    output: 'square',
    instrument: 'scope',
    how: 'scope on the square test point, DC coupled, measure positive duty at the 50 % level',
  },
  {
    key: 'triangle.vpp',
    captureFigure: 'vpp',
    quantity: 'triangle peak-to-peak',
    unit: 'V',
    output: 'triangle',
    instrument: 'scope',
    how: 'scope on the triangle test point, DC coupled, 10× probe, measure Vpp',
  },
];

const potChecks: readonly CheckSpec[] = [
  {
    key: 'freq.min',
    quantity: 'lowest frequency (RV all in)',
    unit: 'Hz',
    output: 'square',
    instrument: 'counter',
    how: 'turn RV to the slow end, read the counter on the square test point, then set RV back',
  },
  {
    key: 'freq.max',
    quantity: 'highest frequency (RV shorted)',
    unit: 'Hz',
    output: 'square',
    instrument: 'counter',
    how: 'turn RV to the fast end, read the counter on the square test point, then set RV back',
  },
];

const faultHints: Readonly<Record<string, readonly string[]>> = {
  freq: [
    'Ct a decade off (a 220n fitted for 22n reads ten times slow; 2n2 ten times fast)',
    'Rt a neighbouring value or a ×10 slip (3k3 for 33k)',
    'RV wiper not at the setting, or RV open (frequency stuck at one end)',
    'R1 and R2 swapped (unclamped it stops; clamped, frequency down and triangle up by (R2/R1)²)',
    'slower op-amp fitted than planned (lower slew rate lengthens every edge)',
  ],
  'freq.min': ['RV open or its track broken at one end', 'RV of a different value fitted (10k for 100k)', 'Ct or Rt wrong: check freq first'],
  'freq.max': ['RV wiper not reaching the end (Rt alone sets the top)', 'Rt wrong: check freq first', 'slew rate limiting the top end: check the square edges'],
  'square.vpp': [
    'one zener fitted backwards (one side of the square at about two forward drops, the other unclamped: a lopsided square and a wrong frequency)',
    'one zener open or missing (one side at the op-amp swing)',
    'zener of another voltage fitted (check the marking)',
    'rail low or missing: check rails first (unclamped square follows the rails)',
  ],
  'square.high': ['positive rail low', 'upper zener of the wrong voltage or backwards', 'Rz too large for the load (clamp not reached)'],
  'square.low': ['negative rail low', 'lower zener of the wrong voltage or backwards', 'Rz too large for the load (clamp not reached)'],
  duty: [
    'unequal rails (unclamped square): check both rail readings',
    'one zener of another voltage',
    'offset at the integrator or comparator input (leaky Ct, a resistor from a node to a rail)',
  ],
  'triangle.vpp': [
    'R1 or R2 wrong: triangle peak = square level × R1/R2',
    'square level wrong: check square.vpp first',
    'triangle clipping at the integrator swing: lower R1/R2',
    'integrator slew-limited (ramps straight, slower than Rt·Ct): check the op-amp fitted',
  ],
};

export const schmittIntegratorKind: StageKind<SchmittSettings> = {
  kind: 'schmitt-integrator',
  summary: 'square/triangle relaxation oscillator: comparator with hysteresis into an integrator',
  traits: { usesOpamp: true, isAmplifier: false, isHandWritten: false },
  roles: [
    { role: 'R1', unit: 'Ω', description: 'hysteresis resistor from the triangle to the comparator input' },
    { role: 'R2', unit: 'Ω', description: 'feedback resistor from the square to the comparator input' },
    { role: 'Rt', unit: 'Ω', description: 'integrator input (timing) resistor' },
    { role: 'Ct', unit: 'F', description: 'integrator (timing) capacitor' },
    { role: 'RV', unit: 'Ω', description: 'frequency pot in series with Rt', optional: true },
    { role: 'Rz', unit: 'Ω', description: 'series resistor from the comparator to the clamped square node', optional: true },
    { role: 'clamp.vz', unit: 'V', description: 'zener voltage of the square clamp', optional: true },
    { role: 'clamp.vf', unit: 'V', description: 'forward drop of the square clamp zener', optional: true },
    { role: 'clamp.vz2', unit: 'V', description: 'zener voltage of the second clamp zener (sets the low level)', optional: true },
    { role: 'clamp.vf2', unit: 'V', description: 'forward drop of the second clamp zener (adds to the high level)', optional: true },
  ],
  outputs: ['square', 'triangle'],
  needsInput: false,
  parse: parseSchmitt,
  checks: (settings) => (settings.hasPot ? [...baseChecks.slice(0, 1), ...potChecks, ...baseChecks.slice(1)] : baseChecks),
  evaluate,
  faultHints,
  faults,
};
