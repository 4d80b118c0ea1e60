// Filter and oscillator kinds: CPU µs per trial evaluation (isTrial, as the
// tolerance engine calls them once per Monte Carlo trial) of each new kind on
// an invented section, beside rc-lowpass and noninverting-amp (one single-pole
// pass each) as the yardstick, with the ratio. The filters solve their node
// equations tens of times per trial (phase point, −3 dB points, each harmonic
// of the input); the Wien bridge runs a describing-function solve and a
// harmonic balance. Goal: every filter within 100× the yardstick, the Wien
// bridge within 300× (10,000 trials of a five-stage plan in a few seconds).
// Times are CPU time of this process (process.cpuUsage), not wall time.
// Figures and ratios from one run; nothing here fails a build.
import { stageKinds } from '../src/circuit/registry.js';
import { defaultDiode } from '../src/circuit/diode.js';
import { fromPhase } from '../src/circuit/waveform.js';
import type { EvalInput } from '../src/circuit/types.js';
import { cpuPerCall } from './timing.js';

const opamp = { gbw: 1e6, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
const supplies = { pos: 12, neg: -12 };
const sine = fromPhase(1000, (p) => 3 * Math.sin(2 * Math.PI * p));
const triangle = fromPhase(1000, (p) => 3 * (p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4));

// Invented part values.
const cases: [string, Record<string, number>, unknown][] = [
  ['rc-lowpass', { R: 10e3, C: 10e-9 }, {}],
  ['noninverting-amp', { Rg: 10e3, Rf: 10e3 }, {}],
  ['rc-highpass', { C: 1e-6, R: 47e3 }, {}],
  ['sallen-key-lowpass', { R1: 10e3, R2: 10e3, C1: 22e-9, C2: 10e-9 }, { hasGain: false }],
  ['sallen-key-highpass', { C1: 100e-9, C2: 100e-9, R1: 5.6e3, R2: 11e3, Rf: 1e3, Rg: 10e3 }, { hasGain: true }],
  ['mfb-bandpass', { R1: 30e3, R2: 4.7e3, R3: 62e3, C1: 10e-9, C2: 10e-9 }, {}],
  ['wien-bridge', { R1: 15e3, C1: 10e-9, R2: 15e3, C2: 10e-9, Rg: 10e3, Rf1: 15e3, Rf2: 10e3 }, { hasLimiter: true, diode: defaultDiode, diodeName: '1N4148' }],
];

let sink = 0;
const buffer = new Float64Array(256);
const rows: [string, string, number][] = [];
for (const [kind, parts, settings] of cases) {
  const module = stageKinds[kind];
  if (!module) throw new Error(`no kind ${kind}`);
  for (const [label, wave] of [
    ['sine', sine],
    ['triangle', triangle],
  ] as const) {
    const input: EvalInput<unknown> = { parts, settings, opamp, supplies, rails: {}, input: wave, isTrial: true, buffer: () => buffer };
    const n = kind === 'wien-bridge' ? 500 : 3000;
    rows.push([
      kind,
      label,
      cpuPerCall(n, () => {
        sink += module.evaluate(input).values['out.vpp'] ?? 0;
      }),
    ]);
    if (kind === 'wien-bridge') break; // no input: one row
  }
}
const yardstick = rows.find((r) => r[0] === 'rc-lowpass' && r[1] === 'sine')?.[2] ?? 1;
console.log('kind                  input      µs/trial   × rc-lowpass');
for (const [kind, label, us] of rows) {
  console.log(
    `${kind.padEnd(22)}${(kind === 'wien-bridge' ? '—' : label).padEnd(11)}${us.toFixed(1).padStart(8)}   ${(us / yardstick).toFixed(1).padStart(8)}×`,
  );
}
if (sink === 42) console.log('');
