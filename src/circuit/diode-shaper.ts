import { type DiodeModel, defaultDiode, defaultDiodeName, diodeModels, diodeString, nominalTemperature, saturationAt, thermalVoltage } from './diode.js';
import { type ShaperBranch, type ShaperNet, solveNode, solveTransfer } from './shaper-solver.js';
import { fastThd } from './spectrum.js';
import { choiceAt, countAt, list, nested, ohmRange, onlyKeys, partAt, reader, type StageReader } from './stage-parse.js';
import { StageParseError } from './errors.js';
import { faultedParts, resistorFaults } from './faults.js';
import type { CheckSpec, Complex, EvalInput, EvalOutput, ImpedanceInput, PartFaults, PartValue, StageKind, StageWarning } from './types.js';
import { mirrorOrder } from './mirror.js';
import { extremes } from './waveform.js';

/** One breakpoint branch as the plan wrote it; its R and bias are toleranced parts under `roles`. */
export interface ShaperBranchSetting {
  readonly diodes: number;
  readonly polarity: '+' | '-';
  /** Part roles of this branch's resistor and bias voltage (`branches[0].R`, `branches[0].bias`). */
  readonly rRole: string;
  readonly biasRole: string;
}

export interface DiodeShaperSettings {
  readonly branches: readonly ShaperBranchSetting[];
  readonly hasLoad: boolean;
  readonly diode: DiodeModel;
  /** Model name, or `custom` when the plan gave `{is, n, rs}`. */
  readonly diodeName: string;
}

/** A diode of this class is rated a few hundred mA; warn well below (common practice, no source). */
const diodeCurrentWarn = 0.1;

/**
 * Spreads of the diode's IS and N when the plan gives none: IS ±50 % and N ±2 %
 * together move a small-signal diode's forward drop by about ±30 mV at a given
 * current, the part-to-part spread of one type (from memory of data-sheet
 * forward-voltage ranges; common practice, no source). Every diode of a stage
 * shares one sample (one reel).
 */
export const defaultIsTol = 0.5;
export const defaultNTol = 0.02;

function diodeParts(model: DiodeModel, is?: PartValue, n?: PartValue): Record<string, PartValue> {
  const part = (given: PartValue | undefined, nominal: number, tol: number, unit: PartValue['unit'], what: string): PartValue =>
    given && given.tol > 0 ? given : { nominal, tol, unit, text: `${given?.text ?? nominal} ${tol * 100}% (default ${what} spread)` };
  return { 'diode.is': part(is, model.is, defaultIsTol, 'A', 'IS'), 'diode.n': part(n, model.n, defaultNTol, '1', 'N') };
}

function parseDiode(r: StageReader): { model: DiodeModel; name: string; parts: Record<string, PartValue> } {
  const raw = r.json['diode'];
  if (raw === undefined) return { model: defaultDiode, name: defaultDiodeName, parts: diodeParts(defaultDiode) };
  if (typeof raw === 'string') {
    const model = diodeModels[raw];
    if (!model) {
      throw new StageParseError(
        r.file,
        `${r.path}.diode`,
        `no diode model ${JSON.stringify(raw)}; write ${Object.keys(diodeModels)
          .map((m) => JSON.stringify(m))
          .join(' or ')}, or { "is": "2.52n", "n": 1.752, "rs": "0.568" }`,
      );
    }
    return { model, name: raw, parts: diodeParts(model) };
  }
  const d = nested(r, 'diode');
  onlyKeys(d, ['is', 'n', 'rs']);
  const is = partAt(d, 'is', 'A', true, { positive: true, example: '"2.52n"' });
  const n = partAt(d, 'n', '1', true, { positive: true, example: '1.752' });
  const rs = partAt(d, 'rs', 'Ω', false, { nonNegative: true, example: '"0.568"' });
  const model = { is: is.nominal, n: n.nominal, rs: rs?.nominal ?? 0 };
  return { model, name: 'custom', parts: diodeParts(model, is, n) };
}

function parse(raw: Parameters<StageKind['parse']>[0], file: string): { parts: Record<string, PartValue>; settings: DiodeShaperSettings } {
  const r = reader(raw, file);
  const p = nested(r, 'parts', true);
  onlyKeys(p, ['Rs', 'Rload']);
  const parts: Record<string, PartValue> = { Rs: partAt(p, 'Rs', 'Ω', true, { positive: true, plausible: ohmRange, example: '"4k7 1%"' }) };
  const load = partAt(p, 'Rload', 'Ω', false, { positive: true, plausible: ohmRange, example: '"10k 1%"' });
  if (load) parts['Rload'] = load;
  const example = '{ "diodes": 1, "polarity": "+", "R": "2k2 1%", "bias": "0 V" }';
  const items = list(r, 'branches', true, example);
  if (items.length === 0) throw new StageParseError(file, `${raw.path}.branches`, `is empty; a shaper needs at least one branch, e.g. [${example}]`);
  const branches = items.map((b, i): ShaperBranchSetting => {
    onlyKeys(b, ['diodes', 'polarity', 'R', 'bias']);
    const rRole = `branches[${i}].R`;
    const biasRole = `branches[${i}].bias`;
    parts[rRole] = partAt(b, 'R', 'Ω', true, { positive: true, plausible: ohmRange, example: '"2k2 1%"' });
    parts[biasRole] = partAt(b, 'bias', 'V', false, { example: '"0 V"' }) ?? { nominal: 0, tol: 0, unit: 'V', text: '0 V' };
    return { diodes: countAt(b, 'diodes', 1, 1, 10), polarity: choiceAt(b, 'polarity', ['+', '-'] as const), rRole, biasRole };
  });
  const diode = parseDiode(r);
  Object.assign(parts, diode.parts);
  return { parts, settings: { branches, hasLoad: load !== undefined, diode: diode.model, diodeName: diode.name } };
}

function resistorRoles(settings: DiodeShaperSettings): string[] {
  return ['Rs', ...(settings.hasLoad ? ['Rload'] : []), ...settings.branches.map((b) => b.rRole)];
}

/** The fault on a branch's diode string, if the evaluation carries one. */
function diodeFault(input: EvalInput<DiodeShaperSettings>, i: number): 'open' | 'short' | 'reversed' | undefined {
  const f = input.fault;
  if (!f || f.role !== `branches[${i}].diodes`) return undefined;
  return f.mode === 'missing' ? 'open' : f.mode;
}

/**
 * The node as the solver sees it, for one sample of the parts. A branch diode
 * that is open (or not fitted) takes its branch away; one fitted backwards in a
 * one-diode branch makes it conduct on the other side of its bias, and in a
 * longer string (one diode against the others) blocks the branch both ways;
 * a shorted diode leaves the others, and a one-diode branch becomes its
 * resistor alone, a linear branch to the bias.
 */
export function shaperNet(input: EvalInput<DiodeShaperSettings>): ShaperNet {
  const { settings } = input;
  // The resistor roles only matter for a fault (a list per trial otherwise).
  const parts = input.fault ? faultedParts(input, resistorRoles(settings)) : input.parts;
  // One sample of the diodes (IS, N) at the board temperature (Vt = kT/q and the SPICE law for IS).
  const base = settings.diode;
  const model: DiodeModel = { is: parts['diode.is'] ?? base.is, n: parts['diode.n'] ?? base.n, rs: base.rs };
  const kelvin = input.temperature ?? nominalTemperature;
  const vt = thermalVoltage(kelvin);
  const is = saturationAt(model, kelvin);
  let gl = 0;
  let il = 0;
  const branches: ShaperBranch[] = [];
  settings.branches.forEach((b, i) => {
    const fault = diodeFault(input, i);
    const bias = parts[b.biasRole] ?? 0;
    const r = parts[b.rRole] ?? Number.NaN;
    if (fault === 'open' || (fault === 'reversed' && b.diodes > 1)) return;
    if (fault === 'short' && b.diodes === 1) {
      gl += 1 / r;
      il += bias / r;
      return;
    }
    const sign = (b.polarity === '+') === (fault !== 'reversed') ? 1 : -1;
    branches.push({ sign, bias, diodes: diodeString(model, fault === 'short' ? b.diodes - 1 : b.diodes, r, vt, is) });
  });
  const rload = settings.hasLoad ? (parts['Rload'] ?? Number.NaN) : Number.POSITIVE_INFINITY;
  // What the chain hangs on the node (the next stage's input, an external load) adds its
  // large-signal equivalent, the resistive part at the fundamental, to Rload.
  const frequency = input.input?.frequency ?? 0;
  const z = input.load?.('out', frequency > 0 ? frequency : 0);
  const gExtra = z !== undefined && Number.isFinite(z.re) && z.re > 0 ? z.re / (z.re * z.re + z.im * z.im) : 0;
  const gs = 1 / (parts['Rs'] ?? Number.NaN);
  return il === 0 ? { gs, gl: gl + 1 / rload + gExtra, branches } : { gs, gl: gl + 1 / rload + gExtra, il, branches };
}

function faults(settings: DiodeShaperSettings): readonly PartFaults[] {
  const words: Record<string, string> = { Rs: 'series resistor', Rload: 'load resistor' };
  settings.branches.forEach((b, i) => {
    words[b.rRole] = `branch ${i + 1} resistor`;
  });
  return [
    ...resistorFaults(resistorRoles(settings), words),
    ...settings.branches.map(
      (b, i): PartFaults => ({
        role: `branches[${i}].diodes`,
        modes: ['open', 'short', 'reversed'],
        description: `branch ${i + 1} diode${b.diodes > 1 ? 's' : ''} (${b.polarity})`,
      }),
    ),
  ];
}

function evaluate(input: EvalInput<DiodeShaperSettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error('diode-shaper: no input waveform; the plan must name an "input"');
  const net = shaperNet(input);
  const vin = source.samples;
  // Every sample is written below, so a trial's reused array needs no clearing.
  const out = input.buffer ? input.buffer(0, vin.length) : new Float64Array(vin.length);
  // A memoryless node: a waveform that mirrors about its peak (a triangle) is solved
  // on one slope only and copied to the other, exactly. A trial needs bench accuracy
  // and no warnings: the transfer curve at knots, interpolated (see solveTransfer).
  const peaks = input.isTrial ? undefined : new Float64Array(net.branches.length);
  if (peaks) {
    const m = mirrorOrder(vin);
    solveNode(net, vin, m.order, out, peaks);
    m.fill(out);
  } else solveTransfer(net, vin, out);
  const { hi, lo } = extremes(out);
  const values: Record<string, number> = {
    'out.vpp': hi - lo,
    'out.thd': source.frequency > 0 ? fastThd(out) : Number.NaN,
    'out.peak': hi,
  };
  return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings: peaks ? warningsFor(net, vin, out, peaks) : noWarnings };
}

const noWarnings: readonly StageWarning[] = Object.freeze([]);

function warningsFor(net: ShaperNet, vin: Float64Array, out: Float64Array, peaks: Float64Array): StageWarning[] {
  const warnings: StageWarning[] = [];
  // The largest current Rs carries; a branch that never takes 1 % of it does not shape.
  let rsPeak = 0;
  for (let i = 0; i < vin.length; i++) rsPeak = Math.max(rsPeak, Math.abs((vin[i] as number) - (out[i] as number)) * net.gs);
  let peakCurrent = 0;
  for (const current of peaks) peakCurrent = Math.max(peakCurrent, current);
  if (!(peakCurrent > 0.01 * rsPeak)) {
    warnings.push({
      message:
        'the drive never reaches a breakpoint: no branch conducts and the output is a scaled copy of the input; check the drive level and the bias voltages',
    });
  }
  if (peakCurrent > diodeCurrentWarn) {
    warnings.push({
      message: `a branch carries ${(peakCurrent * 1e3).toPrecision(3)} mA at the peak; small-signal diodes are rated a few hundred mA at most (check the datasheet), raise the branch resistor`,
    });
  }
  return warnings;
}

/**
 * The driver sees Rs into the node. Its large-signal equivalent here: Rs plus the
 * node loaded as at the peaks, one polarity's branches conducting (their R in
 * parallel) with Rload and whatever the chain hangs on the node. Rough, and
 * meant for a driver with a source impedance of its own; an op-amp output (the
 * usual driver) ignores it.
 */
function inputImpedance(x: ImpedanceInput<DiodeShaperSettings>, f: number): Complex {
  const { parts, settings } = x;
  let g = settings.hasLoad ? 1 / (parts['Rload'] ?? Number.NaN) : 0;
  for (const b of settings.branches) if (b.polarity === '+') g += 1 / (parts[b.rRole] ?? Number.NaN);
  const z = x.load?.('out', f);
  if (z !== undefined && Number.isFinite(z.re) && z.re > 0) g += 1 / z.re;
  return { re: (parts['Rs'] ?? Number.NaN) + (g > 0 ? 1 / g : Number.POSITIVE_INFINITY), im: 0 };
}

const shaperChecks: readonly CheckSpec[] = [
  {
    key: 'out.vpp',
    captureFigure: 'vpp',
    quantity: 'peak-to-peak',
    unit: 'V',
    output: 'out',
    instrument: 'scope',
    how: 'scope DC-coupled at the shaper output, 10× probe, read peak-to-peak',
  },
  {
    key: 'out.thd',
    captureFigure: 'thd',
    quantity: 'total harmonic distortion',
    unit: '1',
    output: 'out',
    instrument: 'scope',
    how: 'scope FFT (or save a capture and run analyze) at the shaper output, harmonics 2–50',
    floor: 0,
  },
  { key: 'out.peak', quantity: 'positive peak', unit: 'V', output: 'out', instrument: 'scope', how: 'scope DC-coupled at the shaper output, read the maximum' },
];

export const diodeShaperKind: StageKind<DiodeShaperSettings> = {
  kind: 'diode-shaper',
  summary: 'diode wave shaper: series Rs into a node loaded by diode-resistor breakpoint branches (Shockley law solved per sample)',
  traits: { usesOpamp: false, isAmplifier: false, isHandWritten: false },
  roles: [
    { role: 'Rs', unit: 'Ω', description: 'series resistor from the input to the shaper node' },
    { role: 'Rload', unit: 'Ω', description: 'load from the shaper node to ground', optional: true },
    { role: 'branches[i].R', unit: 'Ω', description: 'breakpoint branch resistor (sets the slope above the breakpoint)' },
    { role: 'branches[i].bias', unit: 'V', description: 'breakpoint branch bias voltage (sets where the branch starts to conduct)' },
    { role: 'diode.is', unit: 'A', description: "the diodes' saturation current IS (default spread ±50 %)", optional: true },
    { role: 'diode.n', unit: '1', description: "the diodes' emission coefficient N (default spread ±2 %)", optional: true },
  ],
  outputs: ['out'],
  needsInput: true,
  parse,
  checks: () => shaperChecks,
  evaluate,
  faults,
  inputImpedance,
  // Seen from downstream with the branches off: Rs ‖ Rload (small signal about 0 V).
  outputImpedance: (x) => {
    const rs = x.parts['Rs'] ?? Number.NaN;
    const rl = x.settings.hasLoad ? (x.parts['Rload'] ?? Number.NaN) : Number.POSITIVE_INFINITY;
    return { re: Number.isFinite(rl) ? (rs * rl) / (rs + rl) : rs, im: 0 };
  },
  faultHints: {
    'out.thd': [
      'a diode fitted backwards: that branch conducts on the wrong half-cycle and one side flattens early',
      "a branch resistor a decade off (470R for 4k7 or the reverse) moves that breakpoint's slope",
      'a bias voltage or bias divider off: the breakpoints sit at the wrong levels',
      'an open diode or a dry joint: one breakpoint is missing and the peaks stay pointed',
      'the drive level is off: check the triangle amplitude upstream first, a shaper is tuned for one drive',
    ],
    'out.vpp': [
      'the drive level is off: check the upstream triangle peak-to-peak first',
      'Rs the wrong value (a ×10 slip changes the amplitude a lot)',
      'a shorted diode clamps the output near its bias voltage',
      'Rload missing, wrong or a probe loading the node (use a 10× probe)',
    ],
    'out.peak': [
      'an asymmetric output: compare the positive and negative peaks; one branch set missing or reversed',
      'a bias voltage off on the positive side',
    ],
  },
};
