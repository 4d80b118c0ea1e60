import { spiceWien } from './test/helpers/wien-spice.js';
import { wienBridgeKind } from './src/circuit/wien-bridge.js';
import { defaultDiode } from './src/circuit/diode.js';
const op = { gbw: 1e6, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
const sup = { pos: 12, neg: -12 };
const cases: [Record<string, number>, typeof op][] = [
  [{ R1: 10e3, C1: 4.7e-9, R2: 4.7e3, C2: 10e-9, Rg: 4.7e3, Rf1: 15e3, Rf2: 10e3 }, op],
  [{ R1: 8.2e3, C1: 1e-9, R2: 8.2e3, C2: 1e-9, Rg: 10e3, Rf1: 18e3, Rf2: 6.8e3 }, { ...op, slew: 5e6 }],
  [{ R1: 8.2e3, C1: 1e-9, R2: 8.2e3, C2: 1e-9, Rg: 10e3, Rf1: 18e3, Rf2: 6.8e3 }, { ...op, slew: 5e6, gbw: 10e6 }],
  [{ R1: 15e3, C1: 10e-9, R2: 15e3, C2: 10e-9, Rg: 10e3, Rf1: 19e3 }, op],
];
for (const [p, o] of cases) {
  const s = spiceWien(p, o, sup);
  const r = wienBridgeKind.evaluate({ parts: p, settings: { hasLimiter: p.Rf2 !== undefined, diode: defaultDiode, diodeName: 'x' }, opamp: o, supplies: sup, rails: {} });
  const f0 = 1 / (2 * Math.PI * Math.sqrt(p.R1 * p.R2 * p.C1 * p.C2));
  console.log(JSON.stringify(s), JSON.stringify(r.values), 'ideal', f0.toFixed(1), r.warnings.map(w=>w.message.slice(0,60)));
}
