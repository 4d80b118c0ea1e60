import { describe, expect, test } from 'vitest';
import { explainReading, hintsFor } from '../../src/analysis/explain.js';
import { solveForValue } from '../../src/analysis/solve.js';
import { loadPlanText } from '../../src/plan/load.js';
import { fakeKinds, fakePlan } from '../plan/fake-kinds.js';

const plan = loadPlanText(JSON.stringify(fakePlan()), 'fake.plan.json', fakeKinds);
// Fake oscillator closed form: f = 1 / ((R + 2.2 kΩ)·C).
const fNominal = 1 / (12_200 * 100e-9);

describe('explainReading', () => {
  test('a frequency a tenth of nominal is a ×10 timing capacitor (closed form f ∝ 1/C)', () => {
    const list = explainReading(plan, 'osc.freq', fNominal / 10);
    expect(list[0]?.part).toBe('osc.C');
    expect(list[0]?.likely).toBe('x10-slip');
    // Closed form above: f ∝ 1/C, so a tenth of f needs 10 × 100 nF = 1 µF (hand arithmetic).
    expect(list[0]?.ratio).toBeCloseTo(10, 6);
    expect(list[0]?.wouldBe).toBeCloseTo(1e-6, 12);
    // R would need 10·12.2k − 2.2k = 119.8k: near the E12/E24 value 120k, not a decade slip.
    const r = list.find((e) => e.part === 'osc.R');
    expect(r?.wouldBe).toBeCloseTo(119_800, 3);
    expect(r?.likely).toBe('standard-value');
    expect(list.every((e, i) => i === 0 || (list[i - 1]?.score ?? 0) >= e.score)).toBe(true);
  });

  test('a gain stage reading that a 27k feedback resistor gives is its E12 neighbour (IEC 60063 E12: 22, 27)', () => {
    const list = explainReading(plan, 'amp.out.vpp', 2 * (1 + 27_000 / 10_000));
    expect(list[0]).toMatchObject({ part: 'amp.Rf', likely: 'neighbour-value' });
    // Gain 1 + Rf/Rg of the fake stage solved for Rf (hand arithmetic): the reading was made with 27k.
    expect(list[0]?.wouldBe).toBeCloseTo(27_000, 3);
  });

  test('upstream parts explain a downstream reading; unrelated stages do not', () => {
    const parts = explainReading(plan, 'amp.out.vpp', 5).map((e) => e.part);
    expect(parts).not.toContain('ref.Rtop');
    expect(parts.some((p) => p.startsWith('amp.'))).toBe(true);
  });

  test('a divider tap at 12·10k/110k: top ×10 and bottom ×0.1 both decade slips (closed form)', () => {
    const list = explainReading(plan, 'ref.out.dc', (12 * 10) / 110);
    expect(
      list
        .slice(0, 2)
        .map((e) => e.part)
        .sort(),
    ).toEqual(['ref.Rbottom', 'ref.Rtop']);
    expect(list.slice(0, 2).every((e) => e.likely === 'x10-slip')).toBe(true);
  });

  test('a small drift is labelled drift, and unknown or unpowered checks give nothing', () => {
    const list = explainReading(plan, 'osc.freq', fNominal * 0.965);
    // C at 103.6 nF (inside its 5 %) or R at 10.44 kΩ (no standard value within 2 %): both drift.
    expect(list.slice(0, 2).map((e) => e.likely)).toEqual(['drift', 'drift']);
    expect(explainReading(plan, 'nope', 1)).toEqual([]);
    expect(explainReading(plan, 'rails.+12V.to-ground', 3)).toEqual([]);
  });

  test('hints come from the stage kind, and rails have their own', () => {
    expect(hintsFor(plan, 'osc.freq')).toEqual(['timing capacitor value']);
    expect(hintsFor(plan, 'rails.idle-current').join(' ')).toContain('reversed');
    expect(hintsFor(plan, 'zzz.freq')).toEqual([]);
  });
});

describe('solveForValue', () => {
  test('finds the root of r² = 4 nearest r = 1 (closed form r = 2)', () => {
    // Bisection stops at 1e-9 in ln r, so r is good to about 2e-9.
    expect(solveForValue((r) => r * r, 4, 1 / 30, 30)).toBeCloseTo(2, 7);
  });
  test('picks the nearer of two roots and gives up when none exists', () => {
    // (ln r)² = 1 at r = e and r = 1/e, equally near in log distance; either is right.
    const r = solveForValue((x) => Math.log(x) ** 2, 1, 1 / 30, 30) ?? 0;
    expect(Math.abs(Math.log(r))).toBeCloseTo(1, 7);
    expect(solveForValue(() => 1, 2, 0.1, 10)).toBeUndefined();
  });
});

describe('explainReading on the real oscillator (demo exciter)', () => {
  test('a frequency reading that a 100 nF timing capacitor gives names osc.Ct as a ×10 slip', async () => {
    const { loadPlanFile } = await import('../../src/plan/load.js');
    const { buildChain } = await import('../../src/plan/chain.js');
    const exciter = await loadPlanFile('demo/exciter.plan.json');
    const chain = buildChain(exciter);
    const x = Float64Array.from(chain.nominal);
    x[chain.variables.findIndex((v) => v.name === 'osc.Ct')] = 100e-9;
    const reading = chain.detail(x).values['osc.freq'] ?? Number.NaN;
    // Ideal f = R2/(4·R1·(Rt + 0.4·RV)·Ct) = 250 Hz with 100 nF (DESIGN §3); the slew time takes a little off.
    expect(reading).toBeGreaterThan(240);
    expect(reading).toBeLessThan(250);
    const list = explainReading(exciter, 'osc.freq', reading);
    expect(list[0]).toMatchObject({ part: 'osc.Ct', likely: 'x10-slip' });
    // The reading was made with Ct = 100 nF: the part value that explains it exactly.
    expect(list[0]?.wouldBe).toBeCloseTo(100e-9, 12);
    // Downstream stages never explain an upstream reading.
    expect(list.some((e) => e.part.startsWith('filt.') || e.part.startsWith('drive.'))).toBe(false);
  });
});
