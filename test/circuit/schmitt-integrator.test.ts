import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { schmittIntegratorKind as kind, type SchmittSettings } from '../../src/circuit/schmitt-integrator.js';
import type { EvalInput, EvalOutput, OpampModel } from '../../src/circuit/types.js';
import { harmonic, thd, vmax, vmin, vpp } from '../../src/circuit/waveform.js';
import { StageParseError } from '../../src/circuit/errors.js';

// Invented example values; no published board.
const file = 'bench-osc.plan.json';

function parse(json: Record<string, unknown>) {
  return kind.parse({ json: { id: 'osc', kind: 'schmitt-integrator', ...json }, path: 'stages[0]' }, file);
}

function run(json: Record<string, unknown>, opamp: OpampModel = defaultOpamp, pos = 12, neg = -12): EvalOutput {
  const parsed = parse(json);
  const parts = Object.fromEntries(Object.entries(parsed.parts).map(([role, p]) => [role, p.nominal]));
  const input: EvalInput<SchmittSettings> = { parts, settings: parsed.settings, opamp, supplies: { pos, neg }, rails: {} };
  return kind.evaluate(input);
}

function planError(json: Record<string, unknown>): StageParseError {
  try {
    parse(json);
  } catch (e) {
    if (e instanceof StageParseError) return e;
    throw e;
  }
  throw new Error('expected a StageParseError');
}

/** An op-amp so fast that slew, GBW and overdrive drop out. */
const ideal: OpampModel = { gbw: 1e15, slew: 1e15, headroom: 1.5, maxSupply: 15, aol: 1e9 };
/** Infinite-bandwidth op-amp that still slews at 0.5 V/µs. */
const slewOnly: OpampModel = { gbw: 1e15, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 1e9 };

const good = { parts: { R1: '10k 1%', R2: '22k 1%', Rt: '5k6 1%', Ct: '100n 5%' } };
const clamped = { parts: { R1: '10k 1%', R2: '22k 1%', Rt: '8k2 1%', Ct: '47n 5%', Rz: '1k 5%' }, clamp: { vz: '3.9 V 5%', vf: '0.7 V' } };

describe('ideal limit', () => {
  test('a very fast op-amp gives f = R2/(4·R1·R·C), peak = Vs·R1/R2, square = ±Vs', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e3, max: 50e3, noNaN: true }),
        fc.double({ min: 1.2, max: 5, noNaN: true }),
        fc.double({ min: 1e3, max: 1e6, noNaN: true }),
        fc.double({ min: 1e-9, max: 1e-6, noNaN: true }),
        (r1, ratio, r, c) => {
          const parts = { R1: `${r1} ohm`, R2: `${r1 * ratio} ohm`, Rt: `${r} ohm`, Ct: `${c} F` };
          const out = run({ parts }, ideal);
          // Sedra & Smith, bistable-plus-integrator generator (from memory): f = R2/(4·R1·R·C); 0.5 %.
          expect(Math.abs((out.values['freq'] ?? 0) / (ratio / (4 * r * c)) - 1)).toBeLessThan(0.005);
          // Same source: triangle peak = square level × R1/R2; square at the swing 12 V − 1.5 V.
          expect(Math.abs((out.values['triangle.vpp'] ?? 0) / ((2 * 10.5) / ratio) - 1)).toBeLessThan(0.005);
          expect(out.values['square.vpp']).toBeCloseTo(21, 9);
          expect(out.values['duty']).toBeCloseTo(0.5, 9);
        },
      ),
      { numRuns: 40 },
    );
  });

  test('with a pot the ideal frequency uses Rt + RV·setting, and the ends use 0 and all of RV', () => {
    const out = run({ parts: { R1: '10k', R2: '22k', Rt: '3k3', RV: '10k', Ct: '22n' }, pot: { RV: 0.25 } }, ideal);
    const f = (r: number) => 22e3 / (4 * 10e3 * r * 22e-9); // Sedra & Smith (from memory)
    expect(Math.abs((out.values['freq'] ?? 0) / f(3300 + 2500) - 1)).toBeLessThan(0.005);
    expect(Math.abs((out.values['freq.min'] ?? 0) / f(13300) - 1)).toBeLessThan(0.005);
    expect(Math.abs((out.values['freq.max'] ?? 0) / f(3300) - 1)).toBeLessThan(0.005);
  });

  test('unequal rails: instant switching gives duty = |L|/(H+|L|)', () => {
    // Ideal comparator: the triangle crosses the same span at slopes H/RC and |L|/RC (derived; ngspice agrees in the spice test).
    const out = run(good, ideal, 15, -9);
    expect(out.values['duty']).toBeCloseTo(7.5 / 21, 4);
    expect(out.values['square.high']).toBeCloseTo(13.5, 9);
    expect(out.values['square.low']).toBeCloseTo(-7.5, 9);
  });
});

describe('slew rate in the closed form (hand derivation, confirmed by ngspice in the spice test)', () => {
  test('unclamped: T = 4·R1·R·C/R2 + 4·Vs/SR and peak = Vs·R1/R2 + Vs²/(2·SR·R·C)', () => {
    const out = run({ parts: { R1: '10k', R2: '22k', Rt: '1k', Ct: '100n' } }, slewOnly);
    const rc = 1e3 * 100e-9;
    const period = (4 * 10e3 * rc) / 22e3 + (4 * 10.5) / 0.5e6;
    // Hand derivation above (the describe's title): the closed form with slew, 0.1 %; confirmed by ngspice in the spice test.
    expect(Math.abs((out.values['freq'] ?? 0) * period - 1)).toBeLessThan(1e-3);
    const peak = (10.5 * 10) / 22 + 10.5 ** 2 / (2 * 0.5e6 * rc);
    expect(Math.abs((out.values['triangle.vpp'] ?? 0) / (2 * peak) - 1)).toBeLessThan(1e-3);
  });

  test('clamped: T = 4·R1·R·C/R2 + 4·Vsat/SR for Rz from 10 Ω to 1k (0.1 %), and the peak with the time held at the clamp', () => {
    const vc = 3.9 + 0.7;
    const rc = 8.2e3 * 47e-9;
    for (const rz of ['10 ohm', '1k']) {
      const out = run({ ...clamped, parts: { ...clamped.parts, Rz: rz } }, slewOnly);
      const period = (4 * 10e3 * rc) / 22e3 + (4 * 10.5) / 0.5e6;
      expect(Math.abs((out.values['freq'] ?? 0) * period - 1)).toBeLessThan(1e-3);
      // Back-to-back zeners clamp the square to ±(vz + vf) (common practice, no source).
      expect(out.values['square.vpp']).toBeCloseTo(2 * vc, 9);
    }
    const nearlyDirect = run({ ...clamped, parts: { ...clamped.parts, Rz: '1 ohm' } }, slewOnly);
    const peak = (vc * 10) / 22 + (vc * (10.5 - vc)) / (0.5e6 * rc) + vc ** 2 / (2 * 0.5e6 * rc);
    // The hand-derived peak just above, 0.2 %.
    expect(Math.abs((nearlyDirect.values['triangle.vpp'] ?? 0) / (2 * peak) - 1)).toBeLessThan(2e-3);
  });

  test('at 0.5 V/µs a 1 kHz design runs several % below the ideal frequency', () => {
    const slow = run(good).values['freq'] ?? 0;
    const fast = run(good, ideal).values['freq'] ?? 0;
    // DESIGN §3: at 0.5 V/µs a 1 kHz design runs about 10 % slow (each half period also lasts the comparator's swing, Sedra and Smith on slew rate).
    expect(slow / fast).toBeLessThan(0.95);
    expect(slow / fast).toBeGreaterThan(0.85);
  });
});

describe('waveforms', () => {
  test('one period of 256 samples, phase 0 at the start of the square high half, peaks as the values', () => {
    const out = run(good);
    const square = out.outputs['square'];
    const triangle = out.outputs['triangle'];
    expect(square?.samples.length).toBe(256);
    expect(triangle?.samples.length).toBe(256);
    if (!square || !triangle) return;
    // The waveform must agree with the stage's own values (a consistency check); 10.5 V = 12 V rail − 1.5 V headroom (DESIGN §3 swing).
    expect(square.frequency).toBeCloseTo(out.values['freq'] ?? 0, 9);
    expect(square.samples[0]).toBeCloseTo(0, 6);
    expect(square.samples[8]).toBeCloseTo(10.5, 6);
    expect(square.samples[136]).toBeCloseTo(-10.5, 6);
    // The waveform handed downstream must carry the stage's own peak-to-peak values (consistency, no outside figure).
    expect(vpp(square)).toBeCloseTo(out.values['square.vpp'] ?? 0, 9);
    expect(vpp(triangle)).toBeCloseTo(out.values['triangle.vpp'] ?? 0, 9);
    // The integrator inverts: the triangle falls through the high half.
    expect(triangle.samples[32] ?? 0).toBeGreaterThan(triangle.samples[96] ?? 0);
    expect(triangle.samples[160] ?? 0).toBeLessThan(triangle.samples[224] ?? 0);
  });

  test('fast op-amp: harmonics follow the Fourier series of the ideal square and triangle', () => {
    const out = run(good, ideal);
    const square = out.outputs['square'];
    const triangle = out.outputs['triangle'];
    if (!square || !triangle) throw new Error('no outputs');
    // Fourier series (any signals handbook): square fundamental 4/π·A; triangle odd harmonics 1/k², so
    // THD over harmonics 2…50 = √(Σ odd k 3…49 of 1/k⁴); 0.5 % and 1 %.
    expect(Math.abs(harmonic(square, 1) / ((4 / Math.PI) * 10.5) - 1)).toBeLessThan(0.005);
    let sum = 0;
    for (let k = 3; k <= 49; k += 2) sum += k ** -4;
    expect(Math.abs(thd(triangle) / Math.sqrt(sum) - 1)).toBeLessThan(0.01);
  });

  test('unequal rails: the share of samples above the mid level is the duty', () => {
    const out = run(good, defaultOpamp, 15, -9);
    const square = out.outputs['square'];
    if (!square) throw new Error('no square');
    const mid = (vmax(square) + vmin(square)) / 2;
    const above = Array.from(square.samples).filter((v) => v > mid).length / 256;
    // Duty from the two square levels (DESIGN §3); the sampled share can be off by one and a half samples of 256.
    expect(Math.abs(above - (out.values['duty'] ?? 0))).toBeLessThanOrEqual(1.5 / 256);
    expect(out.values['duty'] ?? 0).toBeLessThan(0.4);
  });

  test('for any sound design: freq.min ≤ freq ≤ freq.max, waveforms match the values, a faster op-amp runs faster', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.2, max: 0.8, noNaN: true }),
        fc.double({ min: 2e3, max: 100e3, noNaN: true }),
        fc.double({ min: 10e-9, max: 1e-6, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.boolean(),
        (ratio, rt, ct, pot, isClamped) => {
          const json = {
            parts: { R1: `${22e3 * ratio} ohm`, R2: '22k', Rt: `${rt} ohm`, RV: '10k', Ct: `${ct} F`, ...(isClamped ? { Rz: '1k' } : {}) },
            pot: { RV: pot },
            ...(isClamped ? { clamp: { vz: '3.9 V', vf: '0.7 V' } } : {}),
          };
          const out = run(json);
          const f = out.values['freq'] ?? Number.NaN;
          // DESIGN §3: f at both ends of the pot bracket f; waveforms agree with the values; a faster op-amp loses less time to slewing (Sedra and Smith).
          expect(out.values['freq.min'] ?? Number.NaN).toBeLessThanOrEqual(f * (1 + 1e-12));
          expect(out.values['freq.max'] ?? Number.NaN).toBeGreaterThanOrEqual(f * (1 - 1e-12));
          expect(vpp(out.outputs['triangle'] ?? { frequency: 0, samples: new Float64Array() })).toBeCloseTo(out.values['triangle.vpp'] ?? 0, 6);
          expect(vpp(out.outputs['square'] ?? { frequency: 0, samples: new Float64Array() })).toBeCloseTo(out.values['square.vpp'] ?? 0, 6);
          const faster = run(json, { ...defaultOpamp, slew: 5e6, gbw: 10e6 }).values['freq'] ?? 0;
          // A faster op-amp loses less of each half period to slewing (Sedra and Smith, slew rate).
          expect(faster).toBeGreaterThan(f);
        },
      ),
      { numRuns: 60 },
    );
  });

  test('a triangle past the integrator swing is clipped at it', () => {
    const out = run({ parts: { R1: '10k', R2: '22k', Rt: '1k', Ct: '10n' } });
    // The integrator cannot swing past rail − headroom = 12 − 1.5 V (DESIGN §3).
    expect(vmax(out.outputs['triangle'] ?? { frequency: 0, samples: new Float64Array() })).toBeCloseTo(10.5, 9);
    expect(out.values['triangle.vpp']).toBeCloseTo(21, 9);
  });
});

describe('warnings', () => {
  const messages = (out: EvalOutput) => out.warnings.map((w) => w.message).join('\n');

  test('a sound 1 kHz design raises none', () => {
    expect(run(good).warnings).toEqual([]);
    expect(run(clamped).warnings).toEqual([]);
  });

  test('R1 ≥ R2 unclamped: no oscillation, NaN targets, DC outputs', () => {
    const out = run({ parts: { R1: '22k', R2: '22k', Rt: '5k6', Ct: '100n' } });
    expect(messages(out)).toMatch(/no oscillation.*R1 smaller than R2/s);
    expect(out.values['freq']).toBeNaN();
    expect(out.values['duty']).toBeNaN();
    expect(out.values['triangle.vpp']).toBeNaN();
    expect(out.outputs['square']?.frequency).toBe(0);
  });

  test('R1 > R2 still oscillates when a low clamp keeps the switching point inside the swing', () => {
    const out = run({ ...clamped, parts: { ...clamped.parts, R1: '15k', R2: '10k' } });
    expect(messages(out)).not.toMatch(/no oscillation/);
    expect(Number.isFinite(out.values['freq'])).toBe(true);
  });

  test('clamp above the comparator swing never conducts', () => {
    const out = run({ ...clamped, clamp: { vz: '12 V', vf: '0.7 V' } });
    expect(messages(out)).toMatch(/clamp never conducts/);
    // A clamp that never conducts leaves the full swing 2·(12 − 1.5) V = 21 V less the slew-rounded corners (DESIGN §3).
    expect(out.values['square.vpp'] ?? 0).toBeLessThan(21);
    expect(out.values['square.vpp'] ?? 0).toBeGreaterThan(18);
  });

  test('a clamp reached on one side only (rails +15/−6 V, clamp 5.4 V)', () => {
    const out = run({ ...clamped, clamp: { vz: '4.7 V', vf: '0.7 V' } }, defaultOpamp, 15, -6);
    expect(messages(out)).toMatch(/does not conduct on the negative side/);
    // vz + vf = 4.7 + 0.7 V (back-to-back zeners, common practice, no source); the low side stops at the −6 V rail's swing.
    expect(out.values['square.high']).toBeCloseTo(5.4, 9);
    expect(out.values['square.low'] ?? 0).toBeGreaterThan(-4.5);
  });

  test('clamp without Rz', () => {
    const out = run({ ...clamped, parts: { R1: '10k', R2: '22k', Rt: '8k2', Ct: '47n' } });
    expect(messages(out)).toMatch(/no series resistor Rz/);
    // ±(vz + vf) = ±4.6 V (back-to-back zeners, common practice, no source).
    expect(out.values['square.vpp']).toBeCloseTo(9.2, 9);
  });

  test('slew share: a note from a quarter of the half period, "unreliable" beyond 60 %', () => {
    expect(messages(run({ parts: { R1: '10k', R2: '22k', Rt: '1k', Ct: '100n' } }))).toMatch(/depends on the op-amp's slew rate/);
    expect(messages(run({ parts: { R1: '10k', R2: '22k', Rt: '1k', Ct: '10n' } }))).toMatch(/model is unreliable/);
  });

  test('above a tenth of the GBW, and an integrator asked to ramp faster than it slews', () => {
    const quick: OpampModel = { ...defaultOpamp, slew: 100e6 };
    expect(messages(run({ parts: { R1: '10k', R2: '22k', Rt: '1k', Ct: '1n' } }, quick))).toMatch(/tenth of the op-amp's gain-bandwidth/);
    expect(messages(run({ parts: { R1: '10k', R2: '22k', Rt: '1k', Ct: '10n' } }))).toMatch(/faster than the integrator can slew/);
  });

  test('a tiny triangle against the overdrive the comparator needs', () => {
    expect(messages(run({ parts: { R1: '220', R2: '47k', Rt: '100k', Ct: '100n' } }))).toMatch(/switches slowly/);
  });
});

describe('checks and hints', () => {
  test('contract check keys, with the pot ends only when there is a pot', () => {
    const plain = kind.checks(parse(good).settings).map((c) => c.key);
    expect(plain).toEqual(expect.arrayContaining(['freq', 'square.vpp', 'triangle.vpp', 'duty']));
    expect(plain).not.toContain('freq.min');
    const potted = kind.checks(parse({ parts: { ...good.parts, RV: '10k 20%' } }).settings);
    expect(potted.map((c) => c.key)).toEqual(expect.arrayContaining(['freq.min', 'freq.max']));
    for (const c of potted) {
      expect(c.how.length).toBeGreaterThan(10);
      expect(c.instrument).toBe(c.key.startsWith('freq') ? 'counter' : 'scope');
    }
  });

  test('every check has a value and fault hints', () => {
    const json = { ...clamped, parts: { ...clamped.parts, RV: '10k 20%' } };
    const out = run(json);
    for (const c of kind.checks(parse(json).settings)) {
      expect(Number.isFinite(out.values[c.key])).toBe(true);
      expect(kind.faultHints[c.key]?.length ?? 0).toBeGreaterThan(0);
    }
    expect(kind.faultHints['square.vpp']?.join(' ')).toMatch(/backwards/);
  });
});

describe('parse', () => {
  test('values, tolerances, the pot default and the clamp as toleranced parts', () => {
    const p = parse({ parts: { ...clamped.parts, RV: '10k 20%' }, clamp: { vz: '3.9 V 5%', vf: '0.7 V' } });
    expect(p.parts['Rt']).toMatchObject({ nominal: 8200, tol: 0.01, unit: 'Ω' });
    expect(p.parts['clamp.vz']).toMatchObject({ nominal: 3.9, tol: 0.05, unit: 'V' });
    expect(p.parts['clamp.vf']).toMatchObject({ nominal: 0.7, tol: 0 });
    expect(p.settings).toEqual({ hasPot: true, pot: 0.5, hasClamp: true });
    // Without vz2/vf2 the partner zener is the same type, with its own spread.
    expect(p.parts['clamp.vz2']).toMatchObject({ nominal: 3.9, tol: 0.05 });
    expect(p.parts['clamp.vf2']).toMatchObject({ nominal: 0.7, tol: 0 });
  });

  test('an asymmetric zener pair: vz2 (and vf2) for the second zener', () => {
    const p = parse({ ...clamped, clamp: { vz: '3.9 V 5%', vf: '0.7 V', vz2: '4.7 V 2%', vf2: '0.75 V' } });
    expect(p.parts['clamp.vz2']).toMatchObject({ nominal: 4.7, tol: 0.02, unit: 'V' });
    expect(p.parts['clamp.vf2']).toMatchObject({ nominal: 0.75, tol: 0 });
  });

  const cases: readonly [string, Record<string, unknown>, string, RegExp][] = [
    ['not a resistance', { parts: { ...good.parts, Rt: '3k3 x' } }, 'stages[0].parts.Rt', /"3k3 x" is not a resistance; write e\.g\. "3k3 1%"/],
    ['a capacitance for a resistor', { parts: { ...good.parts, R1: '22 nF' } }, 'stages[0].parts.R1', /is not a resistance; write e\.g\./],
    ['missing part', { parts: { R1: '10k', R2: '22k', Rt: '3k3' } }, 'stages[0].parts.Ct', /missing; .*"Ct": "22n 5%"/],
    ['no parts', {}, 'stages[0].parts', /R1, R2, Rt and Ct/],
    ['negative', { parts: { ...good.parts, R1: '-10k' } }, 'stages[0].parts.R1', /must be above zero; write e\.g\./],
    ['zero', { parts: { ...good.parts, Ct: '0' } }, 'stages[0].parts.Ct', /must be above zero/],
    ['a bare number', { parts: { ...good.parts, Rt: 3300 } }, 'stages[0].parts.Rt', /write it as text, e\.g\. "3k3 1%"/],
    ['unknown part', { parts: { ...good.parts, R3: '1k' } }, 'stages[0].parts.R3', /its parts are R1, R2, Rt, Ct, RV, Rz/],
    ['pot out of range', { parts: { ...good.parts, RV: '10k' }, pot: { RV: 1.5 } }, 'stages[0].pot.RV', /from 0 .* to 1 .*e\.g\. 0\.5/],
    ['pot without RV', { parts: good.parts, pot: { RV: 0.3 } }, 'stages[0].pot.RV', /parts has no RV/],
    ['clamp missing vf', { ...clamped, clamp: { vz: '3.9 V' } }, 'stages[0].clamp.vf', /missing; .*"vf": "0.7 V"/],
    ['clamp not a voltage', { ...clamped, clamp: { vz: '3.9 mA', vf: '0.7 V' } }, 'stages[0].clamp.vz', /"3.9 mA" is not a voltage; write e\.g\. "3.9 V 5%"/],
    [
      'second zener not a voltage',
      { ...clamped, clamp: { vz: '3.9 V', vf: '0.7 V', vz2: '4.3 mA' } },
      'stages[0].clamp.vz2',
      /"4.3 mA" is not a voltage; write e\.g\. "4.3 V 5%"/,
    ],
    ['unknown clamp key', { ...clamped, clamp: { vz: '3.9 V', vf: '0.7 V', vz3: '5 V' } }, 'stages[0].clamp.vz3', /is not a clamp value; .*vz2/],
  ];
  for (const [name, json, path, message] of cases) {
    test(`${name}: names ${path} and gives an example`, () => {
      const e = planError(json);
      expect(e.path).toBe(path);
      expect(e.message).toContain(file);
      expect(e.detail).toMatch(message);
    });
  }
});
