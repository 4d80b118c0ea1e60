import { formatValue } from '../units/format.js';
import { thermalVoltage } from './diode.js';
import { type CeParts, collectorImpedance, operatingPoint, response, responseInto, smallSignal, vceSat, withFault } from './common-emitter-model.js';
import { applyResponse, type Response } from './harmonic-response.js';
import { dcLoad, railOf } from './rail-load.js';
import { nested, ohmRange, onlyKeys, partAt, reader, textAt } from './stage-parse.js';
import type { CheckSpec, Complex, EvalInput, EvalOutput, ImpedanceInput, PartFaults, PartValue, StageKind, StageWarning } from './types.js';
import { extremes } from './waveform.js';

export interface CommonEmitterSettings {
  /** Rail id R1 and Rc hang from (`+12V`). */
  readonly from: string;
  /** Whether an emitter bypass capacitor `Ce` is fitted. */
  readonly hasCe: boolean;
}

const noLoad: Complex = { re: 0, im: 0 };

/** The load on the collector at f as an admittance, S. */
function loadAdmittance(input: EvalInput<CommonEmitterSettings>, f: number): Complex {
  const z = input.load?.('out', f);
  if (!z) return { re: 0, im: 0 };
  const d = z.re * z.re + z.im * z.im;
  if (!Number.isFinite(d) || d === 0) return d === 0 ? { re: 1e12, im: 0 } : { re: 0, im: 0 };
  return { re: z.re / d, im: -z.im / d };
}

function partsOf(x: { readonly parts: Readonly<Record<string, number>>; readonly settings: CommonEmitterSettings }, rail: number, gLoad: number): CeParts {
  const p = x.parts;
  return {
    rail,
    r1: p['R1'] ?? Number.NaN,
    r2: p['R2'] ?? Number.NaN,
    rc: p['Rc'] ?? Number.NaN,
    re: p['Re'] ?? Number.NaN,
    ce: x.settings.hasCe ? (p['Ce'] ?? 0) : 0,
    hfe: p['hfe'] ?? Number.NaN,
    vbe: p['vbe'] ?? Number.NaN,
    vaf: p['vaf'] ?? Number.NaN,
    gLoad,
  };
}

function evaluate(input: EvalInput<CommonEmitterSettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error('common-emitter: no input waveform; the plan must name an "input"');
  const rail = railOf('common-emitter', input, input.settings.from);
  const p = withFault(partsOf(input, rail, dcLoad(input, 'out')), input.fault);
  const q = operatingPoint(p, input.fault);
  const s = smallSignal(p, q);
  const f = source.frequency > 0 ? source.frequency : 1e3;
  const g = new Float64Array(4);
  const gainAt = (fk: number, into: Float64Array) => {
    const yl = input.load ? loadAdmittance(input, fk) : noLoad;
    responseInto(p, s, fk, yl.re, yl.im, into);
  };
  gainAt(f, g);
  // Signed gain at the signal frequency (−|H|: an inverting stage; 0 when not active).
  const gain = -Math.hypot(g[0] as number, g[1] as number);
  const n = source.samples.length;
  const out = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  const emitter = input.buffer ? input.buffer(1, n) : new Float64Array(n);
  // The input is AC-coupled at the base: its DC level does not reach the stage (H(0) = 0).
  const collector: Response = (fk, slot) => {
    if (fk === 0) {
      slot.re = 0;
      slot.im = 0;
      return;
    }
    gainAt(fk, g);
    slot.re = g[0] as number;
    slot.im = g[1] as number;
  };
  const emitterResponse: Response = (fk, slot) => {
    if (fk === 0) {
      slot.re = 0;
      slot.im = 0;
      return;
    }
    gainAt(fk, g);
    slot.re = g[2] as number;
    slot.im = g[3] as number;
  };
  applyResponse(source.samples, source.frequency, collector, out);
  applyResponse(source.samples, source.frequency, emitterResponse, emitter);
  // Large signal: the collector cannot fall below the emitter plus Vce(sat), nor rise past the point where Ic reaches 0.
  const yAc = 1 / p.rc + loadAdmittance(input, f).re + s.go;
  const top = q.vc + q.ic / yAc;
  let isSaturating = false;
  let isCutting = false;
  for (let i = 0; i < n; i++) {
    const ve = q.ve + (emitter[i] as number);
    let vc = q.vc + (out[i] as number);
    if (q.region === 'active' && vc < ve + vceSat) {
      vc = ve + vceSat;
      isSaturating = true;
    }
    if (q.region === 'active' && vc > top) {
      vc = top;
      isCutting = true;
    }
    out[i] = q.region === 'active' ? vc : q.vc;
  }
  const { hi, lo } = extremes(out);
  const values = { 'vb.dc': q.vb, 've.dc': q.ve, 'vc.dc': q.vc, ic: q.ic, gain, 'out.vpp': hi - lo };
  const outputs = { out: { frequency: source.frequency, samples: out } };
  if (input.isTrial) return { outputs, values, warnings: [] };
  const warnings: StageWarning[] = [];
  if (q.region === 'saturated')
    warnings.push({
      message: `the transistor is saturated at its operating point (collector ${formatValue(q.vc, 'V')}, emitter ${formatValue(q.ve, 'V')}): no gain; bias it lower or make Rc smaller`,
    });
  if (q.region === 'cut-off')
    warnings.push({ message: `the transistor is cut off: the base divider gives ${formatValue(q.vb, 'V')}, below the base-emitter drop; no gain` });
  if (isSaturating)
    warnings.push({
      message: `at the signal peak the collector would fall below the emitter plus ${formatValue(vceSat, 'V')}: the transistor saturates and the output's low peaks flatten`,
    });
  if (isCutting)
    warnings.push({
      message: `at the signal peak the collector current would reach zero: the transistor cuts off and the output's high peaks flatten at ${formatValue(top, 'V')}`,
    });
  const pq = q.ic * Math.max(0, q.vc - q.ve);
  if (pq > 0.3) warnings.push({ message: `the transistor dissipates ${formatValue(pq, 'W')}: a small-signal package runs hot at this; mind your fingers` });
  return { outputs, values, warnings };
}

function impedanceParts(x: ImpedanceInput<CommonEmitterSettings>) {
  const rail = x.rails?.[x.settings.from];
  if (rail === undefined) return undefined;
  const p = partsOf(x, rail, 0);
  const q = operatingPoint(p);
  return { p, q, s: smallSignal(p, q) };
}

function inputImpedance(x: ImpedanceInput<CommonEmitterSettings>, f: number): Complex {
  const r1 = x.parts['R1'] ?? Number.NaN;
  const r2 = x.parts['R2'] ?? Number.NaN;
  const bias = (r1 * r2) / (r1 + r2);
  const op = impedanceParts(x);
  // Without the rails the bias current is unknown: Zb = rπ + (hfe + 1)·(Re ∥ Ce) with rπ taken at a
  // typical small-signal bias of 1 mA (hfe·Vt/1 mA; an estimate, common practice, no source).
  const hfe = x.parts['hfe'] ?? Number.NaN;
  const re = x.parts['Re'] ?? Number.NaN;
  const wc = x.settings.hasCe ? 2 * Math.PI * f * (x.parts['Ce'] ?? 0) * re : 0;
  // Re ∥ 1/(jωCe) = Re/(1 + jωReCe).
  const ze = { re: re / (1 + wc * wc), im: (-re * wc) / (1 + wc * wc) };
  let zb: Complex = { re: (hfe * thermalVoltage()) / 1e-3 + (hfe + 1) * ze.re, im: (hfe + 1) * ze.im };
  if (op && op.q.region === 'active') {
    const r = response(op.p, op.s, f, { re: 0, im: 0 });
    const d = r.ib.re * r.ib.re + r.ib.im * r.ib.im;
    zb = { re: r.ib.re / d, im: -r.ib.im / d };
  }
  // R1 ∥ R2 ∥ Zb.
  const yb = 1 / (zb.re * zb.re + zb.im * zb.im);
  const y = { re: 1 / bias + zb.re * yb, im: -zb.im * yb };
  const d = y.re * y.re + y.im * y.im;
  return { re: y.re / d, im: -y.im / d };
}

function outputImpedance(x: ImpedanceInput<CommonEmitterSettings>, _output: string, f: number): Complex {
  const op = impedanceParts(x);
  // Without the rails (or out of the active region): Rc alone.
  if (!op || op.q.region !== 'active') return { re: x.parts['Rc'] ?? Number.NaN, im: 0 };
  return collectorImpedance(op.p, op.s, f);
}

const checks: readonly CheckSpec[] = [
  {
    key: 'vb.dc',
    quantity: 'base voltage',
    unit: 'V',
    instrument: 'meter',
    how: 'DC voltmeter from the base to ground, no signal (a 10 MΩ meter barely loads the divider)',
  },
  { key: 've.dc', quantity: 'emitter voltage', unit: 'V', instrument: 'meter', how: 'DC voltmeter from the emitter to ground, no signal' },
  {
    key: 'vc.dc',
    quantity: 'collector voltage',
    unit: 'V',
    output: 'out',
    instrument: 'meter',
    how: 'DC voltmeter from the collector to ground, no signal',
    captureFigure: 'mean',
  },
  {
    key: 'ic',
    quantity: 'collector current',
    unit: 'A',
    instrument: 'meter',
    how: 'voltage across Rc divided by Rc (do not break the collector lead to insert a meter)',
  },
  {
    key: 'gain',
    quantity: 'voltage gain, collector over base (signed)',
    unit: 'V/V',
    output: 'out',
    instrument: 'scope',
    how: 'two channels: base and collector peak-to-peak with a small signal; the ratio, negative (inverted)',
  },
  {
    key: 'out.vpp',
    quantity: 'collector peak-to-peak',
    unit: 'V',
    output: 'out',
    instrument: 'scope',
    how: 'scope at the collector, AC coupled, with the chain signal applied; look for flattened peaks',
    captureFigure: 'vpp',
  },
];

function faults(settings: CommonEmitterSettings): readonly PartFaults[] {
  const list: PartFaults[] = [
    { role: 'R1', modes: ['open', 'short'], description: 'upper base-bias resistor' },
    { role: 'R2', modes: ['open', 'short'], description: 'lower base-bias resistor' },
    { role: 'Rc', modes: ['open', 'short'], description: 'collector resistor' },
    { role: 'Re', modes: ['open', 'short'], description: 'emitter resistor' },
    { role: 'Q', modes: ['open', 'short', 'reversed'], description: 'the transistor' },
  ];
  if (settings.hasCe) list.push({ role: 'Ce', modes: ['open', 'short'], description: 'emitter bypass capacitor' });
  return list;
}

export const commonEmitterKind: StageKind<CommonEmitterSettings> = {
  kind: 'common-emitter',
  summary: 'NPN common-emitter stage from a rail: divider bias, Ic = hfe·Ib, gain −Rc/(re + Re) (bypassed −Rc/re), saturation and cut-off warnings',
  roles: [
    { role: 'R1', unit: 'Ω', description: 'base-bias resistor from the rail to the base' },
    { role: 'R2', unit: 'Ω', description: 'base-bias resistor from the base to ground' },
    { role: 'Rc', unit: 'Ω', description: 'collector resistor from the rail' },
    { role: 'Re', unit: 'Ω', description: 'emitter resistor to ground' },
    { role: 'Ce', unit: 'F', description: 'emitter bypass capacitor across Re', optional: true },
    { role: 'hfe', unit: 'V/V', description: 'transistor current gain', optional: true },
    { role: 'vbe', unit: 'V', description: 'base-emitter drop at 1 mA', optional: true },
    { role: 'vaf', unit: 'V', description: 'Early voltage', optional: true, isRating: true },
  ],
  outputs: ['out'],
  needsInput: true,
  traits: { railSetting: 'from' },
  parse(raw, file) {
    const r = reader(raw, file);
    const from = textAt(r, 'from', true, '"+12V" (the rail id R1 and Rc hang from)');
    const p = nested(r, 'parts', true);
    onlyKeys(p, ['R1', 'R2', 'Rc', 'Re', 'Ce']);
    const ohm = (key: string, example: string) => partAt(p, key, 'Ω', true, { positive: true, plausible: ohmRange, example });
    const parts: Record<string, PartValue> = {
      R1: ohm('R1', '"47k 1%"'),
      R2: ohm('R2', '"10k 1%"'),
      Rc: ohm('Rc', '"4k7 1%"'),
      Re: ohm('Re', '"1k 1%"'),
      hfe: partAt(r, 'hfe', 'V/V', false, { positive: true, plausible: [5, 2000], example: '"150 50%"' }) ?? {
        nominal: 150,
        tol: 0.5,
        unit: 'V/V',
        text: '150 50% (default)',
      },
      vbe: partAt(r, 'vbe', 'V', false, { positive: true, plausible: [0.3, 1], example: '"0.65 V"' }) ?? {
        nominal: 0.65,
        tol: 0,
        unit: 'V',
        text: '0.65 V (default)',
      },
      vaf: partAt(r, 'vaf', 'V', false, { positive: true, plausible: [5, 1000], example: '"100 V"' }) ?? {
        nominal: 100,
        tol: 0,
        unit: 'V',
        text: '100 V (default)',
      },
    };
    const ce = partAt(p, 'Ce', 'F', false, { positive: true, plausible: [1e-12, 1], example: '"100u 20%"' });
    if (ce) parts['Ce'] = ce;
    return { parts, settings: { from, hasCe: ce !== undefined } };
  },
  checks: () => checks,
  evaluate,
  inputImpedance,
  outputImpedance,
  faults,
  faultHints: {
    'vb.dc': [
      'R1 or R2 the wrong value or swapped (the base near the rail: R2 open or R1 shorted)',
      'the base loaded by the previous stage: its coupling capacitor leaky',
    ],
    've.dc': [
      'about 0.6 V below the base is right; equal to the base: the base-emitter junction open (a damaged transistor)',
      '0 V with the base at its level: Re shorted or the emitter lead open',
    ],
    'vc.dc': [
      'at the rail: no collector current (transistor open or cut off, Re open, R1 open)',
      'near the emitter: saturated (R2 open, Rc too large, or collector and emitter shorted)',
      'a transistor fitted back to front (emitter and collector swapped) still biases, with a much lower hfe',
    ],
    ic: ['read as the drop across Rc over Rc; far off: the bias divider or Re'],
    gain: [
      'far lower than designed with the DC levels right: the bypass capacitor open, dried out or not fitted',
      'a polarised bypass capacitor fitted backwards leaks and shifts the emitter',
      'the next stage loading the collector',
    ],
    'out.vpp': ['flattened low peaks: saturation (collector biased too low for the signal)', 'flattened high peaks: cut-off (too little collector current)'],
  },
};
