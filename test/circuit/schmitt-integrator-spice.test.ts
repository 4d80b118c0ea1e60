import { describe, expect, test } from 'vitest';
import { schmittIntegratorKind as kind, type SchmittSettings } from '../../src/circuit/schmitt-integrator.js';
import type { EvalInput, EvalOutput, OpampModel } from '../../src/circuit/types.js';
import { runSpice } from '../helpers/ngspice.js';
import { opampSubcktFor } from '../helpers/spice-opamp.js';

/*
 * The oscillator against ngspice (Debian package, an independent simulator).
 * Every deck is generated from the same part values as the plan entry:
 * - both op-amps are the behavioural model of test/helpers/spice-opamp.ts:
 *   DC gain 2e5, one pole (GBW 1 MHz), slew limit 0.5 V/µs through a tanh input
 *   stage, output held at rail − 1.5 V by sharp diodes;
 * - zeners are ngspice diodes with BV = vz at IBV = 5 mA, N = 1 and IS chosen so
 *   the forward drop is vf at 5 mA (the plan's vz and vf read as the drops at
 *   the working current, as a datasheet gives Vz at a test current), two of them
 *   back-to-back from the square node to ground; one case uses an ideal clamp
 *   instead (sharp diodes into sources at ±(vz + vf)) to separate the model's
 *   timing from the zeners' soft knee, which starts the switching a little early
 *   and makes the model read up to about 0.5 % slow;
 * - the simulation window and step come from the closed form f = R2/(4·R1·R·Ct)
 *   (Sedra and Smith, square/triangle generator), the rails and the slew rate,
 *   never from the model under test: 6 periods of the ideal one plus two full
 *   swings, of which the first 1.5 are start-up;
 * - the measurement takes the period and the duty from interpolated crossings
 *   of the square's mid level (IEEE 181 50 % reference level) and the
 *   amplitudes from the extremes after the start-up.
 * Invented values throughout; this is no published board.
 */

const opamp: OpampModel = { gbw: 1e6, slew: 0.5e6, headroom: 1.5, maxSupply: 18, aol: 2e5 };

interface Case {
  readonly name: string;
  readonly parts: Readonly<Record<string, string>>;
  readonly clamp?: { readonly vz: string; readonly vf: string; readonly vz2?: string; readonly vf2?: string };
  readonly pot?: number;
  readonly pos?: number;
  readonly neg?: number;
  /** Model the clamp as sharp diodes in series with sources at ±(vz + vf) instead of soft zeners. */
  readonly sharpClamp?: boolean;
  /** The second zener (sets the low level) when it differs from the first: volts. */
  readonly zener2?: { readonly vz: number; readonly vf: number };
  /** The op-amps of this case. @default opamp (1 MHz, 0.5 V/µs) */
  readonly opamp?: OpampModel;
  /** Agreement asked of the frequency. @default limit */
  readonly freqLimit?: number;
  /** Agreement asked of the triangle's shape, as a fraction of its peak-to-peak. @default limit */
  readonly shapeLimit?: number;
}

function evaluateCase(c: Case): { out: EvalOutput; input: EvalInput<SchmittSettings> } {
  const json: Record<string, unknown> = { id: 'osc', kind: 'schmitt-integrator', parts: c.parts };
  if (c.clamp) json['clamp'] = c.clamp;
  if (c.pot !== undefined) json['pot'] = { RV: c.pot };
  const parsed = kind.parse({ json, path: 'stages[0]' }, 'spice.plan.json');
  const parts: Record<string, number> = Object.fromEntries(Object.entries(parsed.parts).map(([role, p]) => [role, p.nominal]));
  if (c.zener2) {
    parts['clamp.vz2'] = c.zener2.vz;
    parts['clamp.vf2'] = c.zener2.vf;
  }
  const input: EvalInput<SchmittSettings> = {
    parts,
    settings: parsed.settings,
    opamp: c.opamp ?? opamp,
    supplies: { pos: c.pos ?? 12, neg: c.neg ?? -12 },
    rails: {},
  };
  return { out: kind.evaluate(input), input };
}

/** The deck for the nominal parts, with the integrator resistor Rt + RV·setting. */
function deck(input: EvalInput<SchmittSettings>, pot: number, sharpClamp = false): string {
  const p = input.parts;
  const lines = [
    opampSubcktFor('oa', input.opamp, input.supplies),
    'xcmp np 0 cmp oa',
    `r1 tri np ${p['R1']}`,
    `r2 sq np ${p['R2']}`,
    p['Rz'] !== undefined ? `rz cmp sq ${p['Rz']}` : 'vlink cmp sq DC 0',
    `rt sq ni ${(p['Rt'] ?? 0) + (p['RV'] ?? 0) * pot}`,
    // A small start charge on Ct sets the loop going.
    `ct ni tri ${p['Ct']} IC=0.5`,
    'xint 0 ni tri oa',
  ];
  const vz = p['clamp.vz'];
  const vf = p['clamp.vf'];
  const vz2 = p['clamp.vz2'] ?? vz;
  const vf2 = p['clamp.vf2'] ?? vf;
  if (vz !== undefined && vf !== undefined && vz2 !== undefined && vf2 !== undefined && sharpClamp) {
    // An ideal clamp: diodes with N = 0.01 (a few mV drop) into sources at +(vz + vf2) and −(vz2 + vf).
    lines.push('dcp sq cp dsharp', `vcp cp 0 DC ${vz + vf2}`, 'dcn cn sq dsharp', `vcn cn 0 DC ${-(vz2 + vf)}`, '.model dsharp D (IS=1e-15 N=0.01)');
  } else if (vz !== undefined && vf !== undefined && vz2 !== undefined && vf2 !== undefined) {
    // kT/q = 25.85 mV at 27 °C. dz2 is the zener in breakdown at the high level
    // (the plan's vz, vf); dz1 its partner (vz2, vf2): high = vz + vf2, low = −(vz2 + vf).
    const isOf = (drop: number): string => (5e-3 / Math.exp(drop / 0.025852)).toExponential(6);
    lines.push('dz1 sq zm dzb', 'dz2 0 zm dza', `.model dza D (IS=${isOf(vf)} N=1 BV=${vz} IBV=5m)`, `.model dzb D (IS=${isOf(vf2)} N=1 BV=${vz2} IBV=5m)`);
  }
  return lines.join('\n');
}

interface Measured {
  readonly f: number;
  readonly duty: number;
  readonly squareVpp: number;
  readonly triangleVpp: number;
  /** Triangle over one period from a rising mid-level crossing of the square, at n phases. */
  readonly triangleAt: (phase: number) => number;
}

function crossings(t: Float64Array, v: Float64Array, level: number, rising: boolean, from: number): number[] {
  const out: number[] = [];
  for (let i = 1; i < t.length; i++) {
    const t0 = t[i - 1] ?? 0;
    if (t0 < from) continue;
    const a = (v[i - 1] ?? 0) - level;
    const b = (v[i] ?? 0) - level;
    if (rising ? a < 0 && b >= 0 : a > 0 && b <= 0) out.push(t0 + ((t[i] ?? 0) - t0) * (a / (a - b)));
  }
  return out;
}

/**
 * The expected period and the time of one full output swing, from the part
 * values and the rails alone: the ideal f = R2/(4·R1·(Rt + RV·pot)·Ct) (Sedra and
 * Smith, the bistable-plus-integrator generator), each half lengthened by at
 * most one swing of the comparator, (V+ − V− − 2·headroom)/SR.
 */
function window(input: EvalInput<SchmittSettings>, pot: number): { period: number; edge: number } {
  const p = input.parts;
  const f = (p['R2'] ?? 0) / (4 * (p['R1'] ?? 0) * ((p['Rt'] ?? 0) + (p['RV'] ?? 0) * pot) * (p['Ct'] ?? 0));
  const edge = (input.supplies.pos - input.supplies.neg - 2 * input.opamp.headroom) / input.opamp.slew;
  return { period: 1 / f + 2 * edge, edge };
}

function simulate(input: EvalInput<SchmittSettings>, pot: number, sharpClamp = false): Measured {
  const { period: expectedPeriod, edge } = window(input, pot);
  // The real period lies between the ideal one and this bound: 6 bounds leave 4 or more periods to measure.
  const periods = 6;
  // Steps short against the edges: with long steps the regenerative switching jitters.
  const step = Math.min(expectedPeriod / 5000, edge / 25);
  const tab = runSpice(
    deck(input, pot, sharpClamp),
    `tran ${step.toExponential(4)} ${(periods * expectedPeriod).toExponential(4)} 0 ${step.toExponential(4)} uic`,
    ['v(sq)', 'v(tri)'],
  );
  const t = tab['time'] ?? new Float64Array();
  const sq = tab['v(sq)'] ?? new Float64Array();
  const tri = tab['v(tri)'] ?? new Float64Array();
  const from = 1.5 * expectedPeriod;
  let sqHi = -Infinity;
  let sqLo = Infinity;
  let triHi = -Infinity;
  let triLo = Infinity;
  for (let i = 0; i < t.length; i++) {
    if ((t[i] ?? 0) < from) continue;
    sqHi = Math.max(sqHi, sq[i] ?? 0);
    sqLo = Math.min(sqLo, sq[i] ?? 0);
    triHi = Math.max(triHi, tri[i] ?? 0);
    triLo = Math.min(triLo, tri[i] ?? 0);
  }
  const mid = (sqHi + sqLo) / 2;
  const up = crossings(t, sq, mid, true, from);
  const down = crossings(t, sq, mid, false, from);
  expect(up.length).toBeGreaterThanOrEqual(3);
  const first = up[0] ?? 0;
  const period = ((up[up.length - 1] ?? 0) - first) / (up.length - 1);
  const fall = down.find((x) => x > first) ?? Number.NaN;
  const triangleAt = (phase: number): number => {
    const at = first + phase * period;
    let i = 1;
    while (i < t.length - 1 && (t[i] ?? 0) < at) i++;
    const t0 = t[i - 1] ?? 0;
    const t1 = t[i] ?? 0;
    const w = t1 > t0 ? (at - t0) / (t1 - t0) : 0;
    return (tri[i - 1] ?? 0) * (1 - w) + (tri[i] ?? 0) * w;
  };
  return { f: 1 / period, duty: (fall - first) / period, squareVpp: sqHi - sqLo, triangleVpp: triHi - triLo, triangleAt };
}

const zener = { vz: '3.9 V', vf: '0.7 V' };
const base = { R1: '10k', R2: '22k' };

/** 2 % agreement, the task's limit for the model against the simulation. */
const limit = 0.02;

const cases: readonly Case[] = [
  { name: 'unclamped, 54 Hz', parts: { ...base, Rt: '100k', Ct: '100n' } },
  { name: 'unclamped, 920 Hz (slew 8 % of a half)', parts: { ...base, Rt: '5k6', Ct: '100n' } },
  { name: 'unclamped, 3.7 kHz (slew 31 % of a half)', parts: { ...base, Rt: '1k', Ct: '100n' } },
  { name: 'unclamped, 5.8 kHz (slew 49 % of a half)', parts: { ...base, Rt: '1k', Ct: '47n' } },
  { name: 'clamped, 54 Hz', parts: { ...base, Rt: '100k', Ct: '100n', Rz: '1k' }, clamp: zener },
  { name: 'clamped, 1.2 kHz', parts: { ...base, Rt: '8k2', Ct: '47n', Rz: '1k' }, clamp: zener },
  { name: 'clamped, 4.5 kHz (slew 38 % of a half)', parts: { ...base, Rt: '3k3', Ct: '22n', Rz: '1k' }, clamp: zener },
  { name: 'ideal clamp (diodes into sources), 4.5 kHz', parts: { ...base, Rt: '3k3', Ct: '22n', Rz: '1k' }, clamp: zener, sharpClamp: true },
  { name: 'asymmetric rails +15/−9 V, unclamped, 840 Hz', parts: { ...base, Rt: '5k6', Ct: '100n' }, pos: 15, neg: -9 },
  // A mismatched zener pair (3.6 V against 4.3 V) moves the duty off 50 %.
  {
    name: 'mismatched zeners 3.6 V / 4.3 V, clamped, 1.2 kHz',
    parts: { ...base, Rt: '8k2', Ct: '47n', Rz: '1k' },
    clamp: { vz: '3.6 V', vf: '0.7 V' },
    zener2: { vz: 4.3, vf: 0.7 },
  },
  // The same pair written in the plan (`clamp.vz2`), and one with a second forward drop too.
  {
    name: 'zener pair from the plan, vz2 4.3 V, clamped, 1.2 kHz',
    parts: { ...base, Rt: '8k2', Ct: '47n', Rz: '1k' },
    clamp: { vz: '3.6 V', vf: '0.7 V', vz2: '4.3 V' },
  },
  {
    name: 'zener pair from the plan, vz2 5.1 V, vf2 0.75 V, clamped, 1.2 kHz',
    parts: { ...base, Rt: '8k2', Ct: '47n', Rz: '1k' },
    clamp: { vz: '3.3 V', vf: '0.7 V', vz2: '5.1 V', vf2: '0.75 V' },
  },
  { name: 'asymmetric rails +15/−9 V, clamped, 1.2 kHz', parts: { ...base, Rt: '8k2', Ct: '47n', Rz: '1k' }, clamp: zener, pos: 15, neg: -9 },
  // A low-GBW op-amp (100 kHz, 1 V/µs) with a short integrator time constant (RC = 48 µs):
  // the integrator's finite-GBW term 1/(2π·GBW·RC) is 3.3 % of RC, so the wrong sign of that
  // correction moves f by about 6.6 % (measured: +6.6 % against ngspice, the right sign −0.2 %);
  // held to 1 % here, inside the 2 % of the other cases. The triangle's corners carry the slow
  // integrator's recovery, which the waveform follows to 2.3 % of Vpp here (ngspice): 3 % for the shape.
  {
    name: 'low-GBW op-amps (100 kHz, 1 V/µs), 11 kHz ideal',
    parts: { ...base, Rt: '22k', Ct: '2n2' },
    opamp: { ...opamp, gbw: 1e5, slew: 1e6 },
    freqLimit: 0.01,
    shapeLimit: 0.03,
  },
];

function relErr(model: number, spice: number): number {
  return model / spice - 1;
}

describe('schmitt-integrator against ngspice (0.5 V/µs, 1 MHz op-amps)', () => {
  for (const c of cases) {
    test(c.name, () => {
      const { out, input } = evaluateCase(c);
      const v = out.values;
      const freq = v['freq'] ?? Number.NaN;
      const sim = simulate(input, input.settings.pot, c.sharpClamp);
      // ngspice transient, measured as described at the top; 2 % each (the frequency tighter where a case says).
      expect(Math.abs(relErr(freq, sim.f))).toBeLessThan(c.freqLimit ?? limit);
      expect(Math.abs(relErr(v['duty'] ?? Number.NaN, sim.duty))).toBeLessThan(limit);
      // A mismatched pair must show in the duty (levels 4.3 V and 5.0 V: duty ≈ 5.0/9.3 = 0.54 by the ramp-time ratio).
      if (c.zener2 || c.clamp?.vz2) expect(Math.abs((v['duty'] ?? 0.5) - 0.5)).toBeGreaterThan(0.02);
      expect(Math.abs(relErr(v['square.vpp'] ?? Number.NaN, sim.squareVpp))).toBeLessThan(limit);
      expect(Math.abs(relErr(v['triangle.vpp'] ?? Number.NaN, sim.triangleVpp))).toBeLessThan(limit);
      // The triangle handed downstream has the simulated shape, overshoot and slewed corners included:
      // within 2 % of its peak-to-peak at 32 phases (ngspice, same run).
      const tri = out.outputs['triangle']?.samples ?? new Float64Array();
      let worst = 0;
      for (let i = 0; i < tri.length; i += 8) worst = Math.max(worst, Math.abs((tri[i] ?? 0) - sim.triangleAt(i / tri.length)));
      expect(worst / sim.triangleVpp).toBeLessThan(c.shapeLimit ?? limit);
      console.log(
        `${c.name}: tool ${freq.toFixed(2)} Hz, ngspice ${sim.f.toFixed(2)} Hz, ${(relErr(freq, sim.f) * 100).toFixed(2)} %; duty ${(v['duty'] ?? 0).toFixed(4)} / ${sim.duty.toFixed(4)}; triangle ${(v['triangle.vpp'] ?? 0).toFixed(3)} / ${sim.triangleVpp.toFixed(3)} V; shape within ${((worst / sim.triangleVpp) * 100).toFixed(2)} % of Vpp`,
      );
    });
  }

  test('both ends of the pot (RV 10k at 0.5, clamped): freq.min and freq.max', () => {
    const c: Case = { name: 'pot', parts: { ...base, Rt: '3k3', RV: '10k', Ct: '22n', Rz: '1k' }, clamp: zener, pot: 0.5 };
    const { out, input } = evaluateCase(c);
    const fMin = out.values['freq.min'] ?? Number.NaN;
    const fMax = out.values['freq.max'] ?? Number.NaN;
    const slow = simulate(input, 1);
    const fast = simulate(input, 0);
    // ngspice with Rt + RV (all in) and Rt alone; 2 % each.
    expect(Math.abs(relErr(fMin, slow.f))).toBeLessThan(limit);
    expect(Math.abs(relErr(fMax, fast.f))).toBeLessThan(limit);
    console.log(
      `pot ends: freq.min tool ${fMin.toFixed(2)} / ngspice ${slow.f.toFixed(2)} Hz, freq.max tool ${fMax.toFixed(2)} / ngspice ${fast.f.toFixed(2)} Hz`,
    );
  });

  test('far into the slew-limited region the tool warns instead of modelling, and ngspice shows why', () => {
    const c: Case = { name: 'deep', parts: { ...base, Rt: '1k', Ct: '10n' } };
    const { out, input } = evaluateCase(c);
    const messages = out.warnings.map((w) => w.message).join('\n');
    expect(messages).toMatch(/model is unreliable/);
    expect(messages).toMatch(/clips/);
    const freq = out.values['freq'] ?? Number.NaN;
    const sim = simulate(input, 0);
    // The closed form is more than 2 % off here (ngspice), which is what the warnings say.
    expect(Math.abs(relErr(freq, sim.f))).toBeGreaterThan(limit);
  });
});
