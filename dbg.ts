import { stageKinds } from './src/circuit/registry.js';
import { defaultDiode } from './src/circuit/diode.js';
import { fromPhase } from './src/circuit/waveform.js';
const op = { gbw: 1e6, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
const sup = { pos: 12, neg: -12 };
const sine = fromPhase(1000, (p) => 3 * Math.sin(2 * Math.PI * p));
const cases: [string, Record<string, number>, unknown][] = [
  ['wien-bridge', { R1: 15e3, C1: 10e-9, R2: 15e3, C2: 10e-9, Rg: 10e3, Rf1: 15e3, Rf2: 10e3 }, { hasLimiter: true, diode: defaultDiode, diodeName: 'x' }],
  ['rc-highpass', { C: 1e-6, R: 47e3 }, {}],
  ['sallen-key-lowpass', { R1: 10e3, R2: 10e3, C1: 22e-9, C2: 10e-9 }, { hasGain: false }],
  ['sallen-key-highpass', { C1: 100e-9, C2: 100e-9, R1: 5.6e3, R2: 11e3, Rf: 1e3, Rg: 10e3 }, { hasGain: true }],
  ['mfb-bandpass', { R1: 30e3, R2: 4.7e3, R3: 62e3, C1: 10e-9, C2: 10e-9 }, {}],
  ['rc-lowpass', { R: 10e3, C: 10e-9 }, {}],
  ['noninverting-amp', { Rg: 10e3, Rf: 10e3 }, {}],
];
for (const [k, parts, settings] of cases) {
  const kind = stageKinds[k]!;
  const arr = new Float64Array(256);
  const input = { parts, settings, opamp: op, supplies: sup, rails: {}, input: sine, isTrial: true, buffer: () => arr };
  for (let i = 0; i < 200; i++) kind.evaluate(input);
  const t0 = performance.now();
  const N = 2000;
  for (let i = 0; i < N; i++) kind.evaluate(input);
  console.log(k.padEnd(20), ((performance.now() - t0) / N * 1000).toFixed(1), 'µs/eval');
}
