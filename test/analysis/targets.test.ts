import { sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import { targetsJson } from '../../src/analysis/targets-json.js';
import { sampleChain } from '../../src/analysis/sampling.js';
import { buildChain } from '../../src/plan/chain.js';
import { loadPlanText } from '../../src/plan/load.js';
import { fakeKinds, fakePlan } from '../plan/fake-kinds.js';

/** A 10k/10k 1 % divider from a 12 V 1 % rail (invented values). */
function dividerPlan(extra: Record<string, unknown>[] = []) {
  return loadPlanText(
    JSON.stringify({
      plan: 'div',
      title: 'divider (invented values)',
      rails: [{ id: '+12V', nominal: '12 V', tol: '1%' }],
      idleCurrent: { max: '10 mA' },
      stages: [{ id: 'ref', kind: 'divider', from: '+12V', parts: { Rtop: '10k 1%', Rbottom: '10k 1%' } }, ...extra],
    }),
    'div.plan.json',
    fakeKinds,
  );
}

// GUM (JCGM 100:2008, eq. 10) for V·Rb/(Rt+Rb): relative sensitivities 1 (V), +½ (Rb), −½ (Rt);
// each input normal with tolerance = 3σ, so u = 1 %/3 each.
const uRel = Math.sqrt((0.01 / 3) ** 2 + ((0.5 * 0.01) / 3) ** 2 + ((0.5 * 0.01) / 3) ** 2);

describe('divider against closed forms', () => {
  test('worst case equals Vout = V·Rb/(Rt+Rb) at the corners (closed form)', () => {
    const set = computeTargets(dividerPlan(), { trials: 2000 });
    const t = set.targets.find((x) => x.check === 'ref.out.dc');
    expect(t).toBeDefined();
    // Corners: all three at the ends that raise or lower the tap.
    const hi = (12 * 1.01 * 10_100) / (9_900 + 10_100);
    const lo = (12 * 0.99 * 9_900) / (10_100 + 9_900);
    // Closed form V·Rb/(Rt+Rb) = 12·10k/20k = 6 V at nominal, and at the corners above (hand arithmetic).
    expect(t?.nominal).toBeCloseTo(6, 12);
    expect(t?.worst.max).toBeCloseTo(hi, 10);
    expect(t?.worst.min).toBeCloseTo(lo, 10);
  });

  test('Monte Carlo spread matches the GUM root-sum-square (simple-statistics for the SD, within 2 %)', () => {
    const chain = buildChain(dividerPlan());
    const samples = sampleChain(chain, { trials: 40_000, seed: 7, distribution: 'normal' });
    const i = chain.checks.findIndex((c) => c.check === 'ref.out.dc');
    const sd = sampleStandardDeviation(Array.from(samples.values[i] ?? []));
    // Truncating a normal at ±3σ leaves σ·√(1 − 6φ(3)/(2Φ(3) − 1)) = 0.98658σ (truncated-normal variance, any statistics handbook; from memory).
    expect(Math.abs(sd / (6 * uRel * 0.98658) - 1)).toBeLessThan(0.02);
  });

  test('statistical band ≈ the analytic RSS band ±3·u_c (within 5 %)', () => {
    const set = computeTargets(dividerPlan(), { trials: 100_000, seed: 3 });
    const t = set.targets.find((x) => x.check === 'ref.out.dc');
    const half = 3 * 6 * uRel;
    // The truncated inputs thin the tails, so the band sits a few per cent inside ±3σ.
    expect(Math.abs((6 - (t?.stat.min ?? 0)) / half - 1)).toBeLessThan(0.05);
    expect(Math.abs(((t?.stat.max ?? 0) - 6) / half - 1)).toBeLessThan(0.05);
  });

  test('uniform parts (tolerance = the half width): SD = tol/√3 per part (uniform distribution variance)', () => {
    const chain = buildChain(dividerPlan());
    const samples = sampleChain(chain, { trials: 40_000, seed: 11, distribution: 'uniform' });
    const i = chain.checks.findIndex((c) => c.check === 'ref.out.dc');
    const sd = sampleStandardDeviation(Array.from(samples.values[i] ?? []));
    // GUM (JCGM 100:2008) RSS with relative sensitivities 1, ½, ½ and a uniform part's SD = half width/√3 (uniform variance, any statistics handbook); 2 % for 40,000 trials.
    const expected = (6 * Math.sqrt(0.01 ** 2 + 2 * 0.005 ** 2)) / Math.sqrt(3);
    expect(Math.abs(sd / expected - 1)).toBeLessThan(0.02);
  });

  test('contributors follow the squared sensitivities: rail 2/3, each resistor 1/6 (GUM RSS shares)', () => {
    const set = computeTargets(dividerPlan(), { trials: 200 });
    const t = set.targets.find((x) => x.check === 'ref.out.dc');
    const shares = Object.fromEntries((t?.contributors ?? []).map((c) => [c.part, c.share]));
    // Squared sensitivities 1 : ¼ : ¼ of equal 1 % tolerances (GUM eq. 10) → shares 2/3, 1/6, 1/6 (hand arithmetic).
    expect(shares['rails.+12V']).toBeCloseTo(2 / 3, 3);
    expect(shares['ref.Rtop']).toBeCloseTo(1 / 6, 3);
    expect(shares['ref.Rbottom']).toBeCloseTo(1 / 6, 3);
  });

  test('more than 10 variables: sensitivity-guided extremes still hit the closed-form corners', () => {
    const extra = [1, 2, 3, 4, 5].map((k) => ({ id: `d${k}`, kind: 'divider', from: '+12V', parts: { Rtop: `${k}k 2%`, Rbottom: '4k7 1%' } }));
    const set = computeTargets(dividerPlan(extra), { trials: 500 });
    for (const k of [1, 2, 3, 4, 5]) {
      const t = set.targets.find((x) => x.check === `d${k}.out.dc`);
      const top = k * 1000;
      const hi = (12.12 * 4747) / (top * 0.98 + 4747);
      const lo = (11.88 * 4653) / (top * 1.02 + 4653);
      // The closed-form corners just above (rail +1 %, Rtop −2 %, Rbottom +1 % and the opposite), hand arithmetic.
      expect(t?.worst.max).toBeCloseTo(hi, 9);
      expect(t?.worst.min).toBeCloseTo(lo, 9);
    }
  });
});

describe('engine properties', () => {
  const plan = loadPlanText(JSON.stringify(fakePlan()), 'fake.plan.json', fakeKinds);

  test('same seed → identical numbers; another seed → different ones', () => {
    // A second load of the same text: a new plan object, so nothing is served from the memo.
    const again = loadPlanText(JSON.stringify(fakePlan()), 'fake.plan.json', fakeKinds);
    const a = computeTargets(plan, { trials: 3000, seed: 5 });
    const b = computeTargets(again, { trials: 3000, seed: 5 });
    expect(b).not.toBe(a);
    const c = computeTargets(plan, { trials: 3000, seed: 6 });
    expect(JSON.stringify(targetsJson(a))).toBe(JSON.stringify(targetsJson(b)));
    const freq = (s: typeof a) => s.targets.find((t) => t.check === 'osc.freq')?.stat;
    expect(freq(c)).not.toEqual(freq(a));
  });

  test('the statistical band never lies outside the worst-case band, and holds the nominal', () => {
    for (const distribution of ['normal', 'uniform'] as const) {
      const set = computeTargets(plan, { trials: 3000, seed: 2, distribution });
      for (const t of set.targets) {
        // DESIGN §4: the statistical band never lies outside the worst-case band, which holds the nominal.
        expect(t.stat.min).toBeGreaterThanOrEqual(t.worst.min);
        expect(t.stat.max).toBeLessThanOrEqual(t.worst.max);
        if (t.phase === 'stage' || t.phase === 'rails') {
          expect(t.nominal).toBeGreaterThanOrEqual(t.worst.min);
          expect(t.nominal).toBeLessThanOrEqual(t.worst.max);
        }
      }
    }
  });

  test('safe bring-up order: unpowered, first power, rails, then stages in chain order', () => {
    const set = computeTargets(plan, { trials: 200 });
    expect(set.targets.map((t) => t.check)).toEqual([
      'rails.+12V.to-ground',
      'rails.-12V.to-ground',
      'rails.idle-current',
      'rails.+12V.dc',
      'rails.-12V.dc',
      'ref.out.dc',
      'osc.freq',
      'osc.triangle.vpp',
      'amp.gain',
      'amp.out.vpp',
    ]);
    const ground = set.targets[0];
    expect(ground?.worst).toEqual({ min: 100, max: Infinity });
    expect(ground?.phase).toBe('unpowered');
    expect(set.targets[2]?.worst).toEqual({ min: 0, max: 0.04 });
    // The rail band is its own tolerance.
    expect(set.targets[3]?.worst.min).toBeCloseTo(11.88, 10);
    expect(set.targets[3]?.worst.max).toBeCloseTo(12.12, 10);
  });

  test('test points: by check key, else by the check output, else null', () => {
    const set = computeTargets(plan, { trials: 200 });
    const tp = Object.fromEntries(set.targets.map((t) => [t.check, t.testPoint]));
    expect(tp['osc.freq']).toBe('TP2');
    expect(tp['osc.triangle.vpp']).toBe('TP3');
    expect(tp['amp.gain']).toBeNull();
  });

  test('a fake gain stage: 1 + Rf/Rg on the upstream triangle, bands from both resistors (closed form)', () => {
    const set = computeTargets(plan, { trials: 500 });
    const t = set.targets.find((x) => x.check === 'amp.out.vpp');
    // Closed form of the fake stage: vpp·(1 + Rf/Rg), triangle 2 V pp, 22k/10k at nominal and at the 1 % corners (hand arithmetic).
    expect(t?.nominal).toBeCloseTo(2 * 3.2, 12);
    expect(t?.worst.max).toBeCloseTo(2 * (1 + 22_220 / 9_900), 10);
    expect(t?.worst.min).toBeCloseTo(2 * (1 + 21_780 / 10_100), 10);
  });

  test('JSON writes unbounded sides as null and keeps the contract keys', () => {
    const json = targetsJson(computeTargets(plan, { trials: 200 })) as { plan: string; targets: Record<string, unknown>[]; warnings: unknown[] };
    expect(json.plan).toBe('fake-1');
    expect(json.targets[0]).toMatchObject({ check: 'rails.+12V.to-ground', unit: 'Ω', worst: { min: 100, max: null }, testPoint: null });
    for (const t of json.targets)
      expect(Object.keys(t)).toEqual(expect.arrayContaining(['check', 'stage', 'quantity', 'unit', 'nominal', 'worst', 'stat', 'testPoint']));
  });

  test('stage warnings are collected with their stage; no idle limit is itself a warning', () => {
    const p = fakePlan();
    const stages = (p.stages as Record<string, unknown>[]).map((s) => (s.id === 'amp' ? { ...s, parts: { Rg: '1k 1%', Rf: '47k 1%' } } : s));
    const { idleCurrent: _i, ...rest }: Record<string, unknown> = { ...p, stages };
    const set = computeTargets(loadPlanText(JSON.stringify(rest), 'w.plan.json', fakeKinds), { trials: 200 });
    expect(set.warnings).toContainEqual({ stage: 'amp', message: 'gain above 20' });
    expect(set.warnings.some((w) => w.stage === 'rails' && w.message.includes('idleCurrent.max'))).toBe(true);
    expect(set.targets.find((t) => t.check === 'rails.idle-current')?.worst.max).toBe(Infinity);
  });

  test('the unpowered rail-to-ground checks and the idle current are limit checks, every other check is not', () => {
    const set = computeTargets(plan, { trials: 200 });
    expect(set.targets.filter((t) => t.isLimit).map((t) => t.check)).toEqual(['rails.+12V.to-ground', 'rails.-12V.to-ground', 'rails.idle-current']);
    // A limit check's band has one side only (≥ threshold) or runs from 0 to the limit (DESIGN §5).
    for (const t of set.targets.filter((x) => x.isLimit)) expect(t.worst.max === Infinity || t.worst.min === 0).toBe(true);
    expect(set.targets.filter((t) => !t.isLimit).length).toBeGreaterThan(3);
  });

  test('asking again with the same plan object and options returns the same result', () => {
    const a = computeTargets(plan, { trials: 300, seed: 9 });
    expect(computeTargets(plan, { trials: 300, seed: 9 })).toBe(a);
    expect(computeTargets(plan, { trials: 300, seed: 9, distribution: 'uniform' })).not.toBe(a);
  });

  test('progress is reported while sampling, ending at the trial count', () => {
    const seen: number[] = [];
    const fresh = loadPlanText(JSON.stringify(fakePlan()), 'fake.plan.json', fakeKinds);
    computeTargets(fresh, {
      trials: 40_000,
      seed: 3,
      onProgress: (done, total) => {
        expect(total).toBe(40_000);
        seen.push(done);
      },
    });
    // Progress every 1000 trials or a twentieth, whichever is more (the sampler's own rule): at least 10 calls for 40,000.
    expect(seen.length).toBeGreaterThanOrEqual(10);
    expect(seen.at(-1)).toBe(40_000);
    expect([...seen].sort((a, b) => a - b)).toEqual(seen);
  });

  test('trials where a stage stops give one warning per stage, naming the upstream cause downstream', async () => {
    // R1 > R2 (33k against 22k) with a clamp: the demo oscillator still runs at nominal but stops at some corners.
    const { readFileSync } = await import('node:fs');
    const json = JSON.parse(readFileSync('demo/exciter.plan.json', 'utf8')) as { stages: { parts: Record<string, string> }[] };
    const osc = json.stages[0];
    if (osc) osc.parts.R1 = '33k 1%';
    const set = computeTargets(loadPlanText(JSON.stringify(json), 'r1.plan.json'), { trials: 400 });
    const gaps = set.warnings.filter((w) => w.message.includes('had no value'));
    expect(gaps.map((w) => w.stage)).toEqual(['osc', 'shaper']);
    expect(gaps[0]?.message).toContain('osc.freq');
    expect(gaps[1]?.message).toContain('its input from osc stops');
    const f = set.targets.find((t) => t.check === 'osc.freq');
    expect(Number.isFinite(f?.stat.min)).toBe(true);
  });

  test('a check without a nominal value still gets the band of the trials that work', () => {
    // Unclamped oscillator with R1 just above R2: it latches at nominal but runs where R1 < R2 (invented values).
    const text = JSON.stringify({
      plan: 'edge',
      title: 'oscillator on the edge (invented values)',
      rails: [
        { id: '+12V', nominal: '12 V', tol: '2%' },
        { id: '-12V', nominal: '-12 V', tol: '2%' },
      ],
      stages: [{ id: 'osc', kind: 'schmitt-integrator', parts: { R1: '22.2k 1%', R2: '22k 1%', Rt: '10k 1%', Ct: '10n 5%' } }],
    });
    const set = computeTargets(loadPlanText(text, 'edge.plan.json'), { trials: 2000 });
    const f = set.targets.find((t) => t.check === 'osc.freq');
    expect(Number.isNaN(f?.nominal)).toBe(true);
    expect(Number.isFinite(f?.worst.min)).toBe(true);
    expect(Number.isFinite(f?.worst.max)).toBe(true);
    // DESIGN §4: the statistical band lies inside the worst-case band.
    expect(f?.stat.min).toBeGreaterThanOrEqual(f?.worst.min ?? Infinity);
    expect(set.warnings.some((w) => w.stage === 'osc' && w.message.includes('osc.freq has no nominal value'))).toBe(true);
  });

  test('a warning that only a tolerance corner raises is reported once, naming the corner', () => {
    // Fake gain 1 + Rf/Rg warns above 20: nominal 1 + 18.7k/1k = 19.7, the corner 1 + 18.887k/0.99k = 20.08.
    const p = fakePlan();
    const stages = (p.stages as Record<string, unknown>[]).map((s) => (s.id === 'amp' ? { ...s, parts: { Rg: '1k 1%', Rf: '18.7k 1%' } } : s));
    const set = computeTargets(loadPlanText(JSON.stringify({ ...p, stages }), 'c.plan.json', fakeKinds), { trials: 200 });
    const amp = set.warnings.filter((w) => w.stage === 'amp');
    expect(amp).toEqual([{ stage: 'amp', message: 'at the tolerance corner that raises amp.gain most: gain above 20' }]);
  });

  test('bad trial counts are refused', () => {
    expect(() => computeTargets(plan, { trials: 0 })).toThrow(RangeError);
  });
});
