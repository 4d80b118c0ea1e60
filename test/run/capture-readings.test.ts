import { describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import type { Target } from '../../src/analysis/types.js';
import { loadPlanText } from '../../src/plan/load.js';
import { planChecks } from '../../src/plan/checks.js';
import { captureReadings, type CaptureFigureValues } from '../../src/run/capture-readings.js';

// An invented test board: a generator input at a connector, a divider off a rail,
// and two hand-written checks. Values are illustrative, not from any product.
const plan = loadPlanText(
  JSON.stringify({
    plan: 'capture-fixture',
    title: 'Capture readings test board (invented)',
    rails: [{ id: '+5V', nominal: '5 V', tol: '2%' }],
    uncertainty: { V: '0.5% + 2 mV', Hz: '0.01%' },
    stages: [
      { id: 'gen', kind: 'signal-in', shape: 'sine', peak: '1 V 2%', frequency: '1 kHz 1%', offset: '0.5 V 2%' },
      { id: 'ref', kind: 'divider', from: '+5V', parts: { Rtop: '10k 1%', Rbottom: '10k 1%' } },
      {
        id: 'hand',
        kind: 'manual',
        checks: [
          { id: 'tp.vpp', quantity: 'peak-to-peak', unit: 'V', nominal: '2 V', tol: '5%' },
          { id: 'tp.level', quantity: 'level', unit: 'V', nominal: '2 V', tol: '5%' },
        ],
      },
    ],
  }),
  'capture-fixture.plan.json',
);
const targets = computeTargets(plan, { trials: 200, seed: 1 }).targets;
const target = (check: string): Target => {
  const t = targets.find((x) => x.check === check);
  if (!t) throw new Error(`no ${check}`);
  return t;
};
// Figures as the capture analysis names them; invented values near the board's nominals.
const figures: CaptureFigureValues = { frequency: 1000.05, vpp: 2.001, duty: 0.5, thd: 0.001, mean: 0.5 };

describe('capture readings follow each check’s declared capture figure', () => {
  test('every declared figure has the unit of what it measures (Hz, V, fractions)', () => {
    const unitOf = { frequency: 'Hz', vpp: 'V', mean: 'V', duty: '1', thd: '1' } as const;
    const declared = planChecks(plan).filter((c) => c.captureFigure);
    expect(declared.map((c) => c.check).sort()).toEqual(['gen.freq', 'gen.out.dc', 'gen.out.vpp', 'hand.tp.vpp', 'ref.out.dc']);
    for (const c of declared) expect(c.unit).toBe(unitOf[c.captureFigure ?? 'vpp']);
    // Carried onto the targets as well.
    expect(target('gen.out.dc').captureFigure).toBe('mean');
    expect(target('hand.tp.level').captureFigure).toBeUndefined();
  });

  test('a capture at the generator gives its frequency, peak-to-peak and mean, judged against their bands', () => {
    const got = captureReadings(plan, targets, target('gen.out.vpp'), { name: 'gen.csv', figures }, () => true);
    expect(got.map((r) => [r.check, r.value, r.verdict])).toEqual([
      ['gen.out.vpp', 2.001, 'pass'],
      ['gen.freq', 1000.05, 'pass'],
      ['gen.out.dc', 0.5, 'pass'],
    ]);
    expect(got[2]?.raw).toBe('mean 500 mV from gen.csv');
  });

  test('a figure not measured, a locked check and an undeclared check give nothing', () => {
    expect(
      captureReadings(plan, targets, target('gen.freq'), { name: 'g.csv', figures: { ...figures, frequency: null } }, () => true).map((r) => r.check),
    ).toEqual(['gen.out.vpp', 'gen.out.dc']);
    expect(captureReadings(plan, targets, target('gen.freq'), { name: 'g.csv', figures }, (c) => c === 'gen.freq').map((r) => r.check)).toEqual(['gen.freq']);
    // A hand-written check with no figure of its own is never filled from a capture; one that declares vpp is.
    expect(captureReadings(plan, targets, target('hand.tp.level'), { name: 'h.csv', figures }, () => true)).toEqual([]);
    expect(captureReadings(plan, targets, target('hand.tp.vpp'), { name: 'h.csv', figures }, () => true).map((r) => r.check)).toEqual(['hand.tp.vpp']);
  });
});
