// Small stand-in stage kinds for the plan and engine tests: closed forms whose
// answers are known without the real stage modules.
import type { PartValue, StageKind } from '../../src/circuit/types.js';
import { fromPhase, dc, vpp } from '../../src/circuit/waveform.js';
import { PlanError } from '../../src/plan/errors.js';
import { parseValue } from '../../src/units/parse.js';
import type { Unit } from '../../src/units/unit.js';

function part(json: Record<string, unknown>, role: string, unit: Unit, file: string, path: string): PartValue {
  const parts = (json.parts ?? {}) as Record<string, unknown>;
  const text = parts[role];
  if (typeof text !== 'string') throw new PlanError(file, `${path}.parts.${role}`, `missing; expected ${unit === 'Ω' ? 'a resistance' : 'a value'}`);
  const p = parseValue(text, { expected: unit });
  if (!p.ok) throw new PlanError(file, `${path}.parts.${role}`, p.message);
  return { nominal: p.value, tol: p.tol ?? 0, unit, text };
}

/** Vout = Vrail · Rbottom / (Rtop + Rbottom). */
export const fakeDivider: StageKind<{ from: string }> = {
  kind: 'divider',
  summary: 'test divider',
  traits: { railSetting: 'from' },
  roles: [
    { role: 'Rtop', unit: 'Ω', description: 'top' },
    { role: 'Rbottom', unit: 'Ω', description: 'bottom' },
  ],
  outputs: ['out'],
  needsInput: false,
  parse(raw, file) {
    const json = raw.json as Record<string, unknown>;
    return {
      parts: { Rtop: part(json, 'Rtop', 'Ω', file, raw.path), Rbottom: part(json, 'Rbottom', 'Ω', file, raw.path) },
      settings: { from: String(json.from) },
    };
  },
  checks: () => [{ key: 'out.dc', quantity: 'DC level', unit: 'V', output: 'out', instrument: 'meter', how: 'DC volts' }],
  evaluate({ parts, rails, settings }) {
    const v = ((rails[settings.from] ?? 0) * (parts.Rbottom ?? 0)) / ((parts.Rtop ?? 0) + (parts.Rbottom ?? 0));
    return { outputs: { out: dc(v) }, values: { 'out.dc': v }, warnings: [] };
  },
  faultHints: { 'out.dc': ['a swapped top and bottom resistor mirrors the level about half the rail'] },
};

/** A triangle source: f = 1 / ((R + 2.2 kΩ fixed)·C), peak 1 V; the fixed resistor keeps R and C from explaining a reading equally. */
export const fakeOsc: StageKind<null> = {
  kind: 'osc',
  summary: 'test oscillator',
  roles: [
    { role: 'R', unit: 'Ω', description: 'timing resistor' },
    { role: 'C', unit: 'F', description: 'timing capacitor' },
  ],
  outputs: ['triangle', 'square'],
  needsInput: false,
  parse(raw, file) {
    const json = raw.json as Record<string, unknown>;
    return { parts: { R: part(json, 'R', 'Ω', file, raw.path), C: part(json, 'C', 'F', file, raw.path) }, settings: null };
  },
  checks: () => [
    { key: 'freq', quantity: 'frequency', unit: 'Hz', output: 'square', instrument: 'counter', how: 'counter' },
    { key: 'triangle.vpp', quantity: 'peak-to-peak', unit: 'V', output: 'triangle', instrument: 'scope', how: 'scope' },
  ],
  evaluate({ parts }) {
    const f = 1 / (((parts.R ?? 0) + 2200) * (parts.C ?? 0));
    const tri = fromPhase(f, (p) => (p < 0.5 ? -1 + 4 * p : 3 - 4 * p), 16);
    return { outputs: { triangle: tri, square: fromPhase(f, (p) => (p < 0.5 ? 1 : -1), 16) }, values: { freq: f, 'triangle.vpp': vpp(tri) }, warnings: [] };
  },
  faultHints: { freq: ['timing capacitor value'] },
};

/** Gain 1 + Rf/Rg on the input's peak-to-peak; passes the frequency on. */
export const fakeGain: StageKind<null> = {
  kind: 'gain',
  summary: 'test gain',
  roles: [
    { role: 'Rg', unit: 'Ω', description: 'ground leg' },
    { role: 'Rf', unit: 'Ω', description: 'feedback' },
  ],
  outputs: ['out'],
  needsInput: true,
  parse(raw, file) {
    const json = raw.json as Record<string, unknown>;
    return { parts: { Rg: part(json, 'Rg', 'Ω', file, raw.path), Rf: part(json, 'Rf', 'Ω', file, raw.path) }, settings: null };
  },
  checks: () => [
    { key: 'gain', quantity: 'gain', unit: 'V/V', instrument: 'scope', how: 'ratio' },
    { key: 'out.vpp', quantity: 'peak-to-peak', unit: 'V', output: 'out', instrument: 'scope', how: 'scope' },
  ],
  evaluate({ parts, input }) {
    const g = 1 + (parts.Rf ?? 0) / (parts.Rg ?? 1);
    const src = input?.samples ?? new Float64Array(1);
    const samples = new Float64Array(src.length);
    for (let i = 0; i < src.length; i++) samples[i] = (src[i] ?? 0) * g;
    const out = { frequency: input?.frequency ?? 0, samples };
    return { outputs: { out }, values: { gain: g, 'out.vpp': vpp(out) }, warnings: g > 20 ? [{ message: 'gain above 20' }] : [] };
  },
  faultHints: { 'out.vpp': ['feedback resistor value'] },
};

export const fakeKinds: Readonly<Record<string, StageKind<unknown>>> = {
  divider: fakeDivider as StageKind<unknown>,
  osc: fakeOsc as StageKind<unknown>,
  gain: fakeGain as StageKind<unknown>,
};

/** A small plan over the fake kinds (invented values). */
export function fakePlan(overrides: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    plan: 'fake-1',
    title: 'Test chain (invented values)',
    rails: [
      { id: '+12V', nominal: '12 V', tol: '1%' },
      { id: '-12V', nominal: '-12 V', tol: '1%' },
    ],
    idleCurrent: { max: '40 mA' },
    uncertainty: { V: '0.5% + 2 mV', Hz: '0.01%' },
    stages: [
      { id: 'ref', kind: 'divider', from: '+12V', parts: { Rtop: '10k 1%', Rbottom: '10k 1%' }, testPoints: { out: 'TP1' } },
      { id: 'osc', kind: 'osc', parts: { R: '10k 1%', C: '100n 5%' }, testPoints: { square: 'TP2', triangle: 'TP3' } },
      { id: 'amp', kind: 'gain', input: 'osc.triangle', parts: { Rg: '10k 1%', Rf: '22k 1%' } },
    ],
    ...overrides,
  };
}
