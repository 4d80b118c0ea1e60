import type { OpampModel, Supplies } from '../../src/circuit/types.js';
import { runSpice } from './ngspice.js';
import { opampSubcktFor } from './spice-opamp.js';

/**
 * A Wien-bridge oscillator in ngspice (transient from a 10 mV kick on the
 * + input), with the behavioural op-amp and, when Rf2 is given, two
 * antiparallel diodes across it (SPICE diode model IS, N, RS). Returns the
 * settled peak-to-peak (last `keep` periods) and the frequency from rising
 * zero crossings over the same stretch (linear interpolation between points),
 * and the THD (harmonics 2 to 50 over the fundamental, DESIGN §4) of the last
 * ten whole periods, resampled at 4096 points between crossings and
 * transformed by a direct DFT written here (nothing from src/).
 */
export function spiceWien(
  parts: Record<string, number>,
  op: OpampModel,
  supplies: Supplies,
  diode = { is: 2.52e-9, n: 1.752, rs: 0.568 },
  periods = 150,
  keep = 20,
): { vpp: number; freq: number; thd: number } {
  const f0 = 1 / (2 * Math.PI * Math.sqrt((parts['R1'] as number) * (parts['R2'] as number) * (parts['C1'] as number) * (parts['C2'] as number)));
  const T = 1 / f0;
  const hasRf2 = parts['Rf2'] !== undefined;
  const netlist = [
    opampSubcktFor('opa', op, supplies),
    `R1 out s ${parts['R1']}`,
    `C1 s p ${parts['C1']}`,
    `R2 p 0 ${parts['R2']}`,
    `C2 p 0 ${parts['C2']}`,
    `Rg n 0 ${parts['Rg']}`,
    hasRf2
      ? `Rf1 out m ${parts['Rf1']}\nRf2 m n ${parts['Rf2']}\nD1 m n dlim\nD2 n m dlim\n.model dlim D(IS=${diode.is} N=${diode.n} RS=${diode.rs})`
      : `Rf1 out n ${parts['Rf1']}`,
    'X1 p n out opa',
    '.ic v(p)=0.01',
    '.options reltol=1e-6 abstol=1e-12 vntol=1e-9',
  ].join('\n');
  const t = runSpice(netlist, `tran ${T / 400} ${periods * T} ${(periods - keep) * T} ${T / 400} uic`, ['v(out)']);
  const time = t['time'] as Float64Array;
  const v = t['v(out)'] as Float64Array;
  let hi = -Infinity;
  let lo = Infinity;
  for (const x of v) {
    hi = Math.max(hi, x);
    lo = Math.min(lo, x);
  }
  const mid = (hi + lo) / 2;
  const crossings: number[] = [];
  for (let i = 1; i < v.length; i++) {
    const a = (v[i - 1] as number) - mid;
    const b = (v[i] as number) - mid;
    if (a < 0 && b >= 0) crossings.push((time[i - 1] as number) + ((time[i] as number) - (time[i - 1] as number)) * (a / (a - b)));
  }
  const first = crossings[0] as number;
  const last = crossings[crossings.length - 1] as number;
  const t0 = crossings[crossings.length - 11] as number;
  const n = 4096;
  const s = new Float64Array(n);
  let j = 0;
  for (let i = 0; i < n; i++) {
    const x = t0 + ((last - t0) * i) / n;
    while ((time[j + 1] as number) < x) j++;
    const w = (x - (time[j] as number)) / ((time[j + 1] as number) - (time[j] as number));
    s[i] = (v[j] as number) * (1 - w) + (v[j + 1] as number) * w;
  }
  let fundamental = 0;
  let sum = 0;
  for (let k = 1; k <= 50; k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * 10 * k * i) / n;
      re += (s[i] as number) * Math.cos(a);
      im += (s[i] as number) * Math.sin(a);
    }
    if (k === 1) fundamental = Math.hypot(re, im);
    else sum += re * re + im * im;
  }
  return { vpp: hi - lo, freq: (crossings.length - 1) / (last - first), thd: Math.sqrt(sum) / fundamental };
}
