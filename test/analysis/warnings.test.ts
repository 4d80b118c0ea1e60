import { describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import { loadPlanText } from '../../src/plan/load.js';

/** An oscillator into a non-inverting gain stage (invented values). */
function plan(overrides: { rails?: unknown; opamp?: unknown; osc?: Record<string, unknown>; gain?: Record<string, unknown> } = {}) {
  return loadPlanText(
    JSON.stringify({
      plan: 'warn',
      title: 'warnings (invented values)',
      rails: overrides.rails ?? [
        { id: '+12V', nominal: '12 V', tol: '2%' },
        { id: '-12V', nominal: '-12 V', tol: '2%' },
      ],
      idleCurrent: { max: '30 mA' },
      opamp: overrides.opamp ?? { gbw: '6 MHz', slew: '8 V/us', headroom: '1.5 V', maxSupply: '18 V' },
      stages: [
        { id: 'osc', kind: 'schmitt-integrator', parts: { R1: '12k 1%', R2: '22k 1%', Rt: '22k 1%', Ct: '8n2 5%' }, ...overrides.osc },
        { id: 'gain', kind: 'noninverting-amp', input: 'osc.triangle', parts: { Rg: '10k 1%', Rf: '4k7 1%' }, ...overrides.gain },
      ],
    }),
    'warn.plan.json',
  );
}

describe('design warnings', () => {
  test('a clean design has none', () => {
    expect(computeTargets(plan(), { trials: 200 }).warnings).toEqual([]);
  });

  test('rails above the op-amp supply ceiling (±15 V, common practice, no source), for each op-amp stage', () => {
    const rails = [
      { id: '+16V', nominal: '16 V', tol: '2%' },
      { id: '-16V', nominal: '-16 V', tol: '2%' },
    ];
    const set = computeTargets(plan({ rails, opamp: { maxSupply: '15 V' } }), { trials: 200 });
    const ceiling = set.warnings.filter((w) => w.message.includes('supply ceiling'));
    expect(ceiling.map((w) => w.stage).sort()).toEqual(['gain', 'gain', 'osc', 'osc']);
    expect(ceiling[0]?.message).toContain("rail +16V (16 V) is above the op-amp's supply ceiling of ±15 V");
  });

  test('a rail whose tolerance reaches past the ceiling', () => {
    const rails = [
      { id: '+15V', nominal: '15 V', tol: '3%' },
      { id: '-15V', nominal: '-15 V', tol: '3%' },
    ];
    const set = computeTargets(plan({ rails, opamp: { maxSupply: '15 V' } }), { trials: 200 });
    expect(set.warnings.some((w) => w.message.includes('can reach 15.45 V at the top of its tolerance'))).toBe(true);
  });

  test('a rail without a tolerance', () => {
    const rails = [
      { id: '+12V', nominal: '12 V' },
      { id: '-12V', nominal: '-12 V', tol: '2%' },
    ];
    const set = computeTargets(plan({ rails }), { trials: 200 });
    expect(set.warnings.filter((w) => w.stage === 'rails').map((w) => w.message)).toEqual([expect.stringContaining('rail +12V has no tolerance')]);
  });

  test('an output that clips only at a corner: gain parts high with the rails low', async () => {
    // Demo exciter with Rf 37.4k: nominal peak 2.121 V · 4.74 = 10.05 V fits the 12 V − 1.5 V swing; with
    // 1 % parts high and the rails 2 % low the swing is 11.76 − 1.5 = 10.26 V and the peak wants about 10.7 V.
    const { readFileSync } = await import('node:fs');
    const json = JSON.parse(readFileSync('demo/exciter.plan.json', 'utf8')) as { stages: { parts: Record<string, string> }[] };
    const gain = json.stages[2];
    if (gain) gain.parts.Rf = '37.4k 1%';
    const set = computeTargets(loadPlanText(JSON.stringify(json), 'clip.plan.json'), { trials: 200 });
    const clip = set.warnings.filter((w) => w.stage === 'gain');
    expect(clip).toHaveLength(1);
    // With the diodes' default spread (IS ±50 %, N ±2 %) the shaper's peak rises too at that corner: the sensitivity
    // corner alone now clips (−10.87 … 10.87 V wanted against ±10.74 V), before the rails are moved.
    expect(clip[0]?.message).toMatch(/^at the tolerance corner that raises gain\.out\.vpp most( with the rails low)?: .*clips/);
  });

  test('a stage that cannot oscillate (R1 ≥ R2) warns through its own stage id', () => {
    const set = computeTargets(plan({ osc: { parts: { R1: '33k 1%', R2: '22k 1%', Rt: '22k 1%', Ct: '8n2 5%' } } }), { trials: 200 });
    expect(set.warnings.some((w) => w.stage === 'osc')).toBe(true);
  });

  test('a signal above the full-power bandwidth SR/(2π·Vpeak) is said once (Sedra and Smith)', () => {
    // 8 V/µs at about 10 V peak: full-power bandwidth ≈ 127 kHz; a 10 kΩ·820 pF oscillator runs far above the slow op-amp's 20 kHz.
    const set = computeTargets(
      plan({
        opamp: { gbw: '6 MHz', slew: '8 V/us', headroom: '1.5 V', maxSupply: '18 V' },
        osc: { parts: { R1: '12k 1%', R2: '22k 1%', Rt: '2k2 1%', Ct: '1n 5%' } },
        gain: { parts: { Rg: '10k 1%', Rf: '22k 1%' }, opamp: { slew: '0.5 V/us' } },
      }),
      { trials: 200 },
    );
    const slew = set.warnings.filter((w) => w.stage === 'gain' && /slew|full-power/.test(w.message));
    expect(slew).toHaveLength(1);
  });
});
