import { beforeAll, describe, expect, test } from 'vitest';
import type { Target, TargetSet } from '../../src/analysis/types.js';
import type { Plan } from '../../src/plan/types.js';
import { scopeSetup } from '../../src/run/scope-setup.js';
import type { Measurements } from '../../src/signal/types.js';
import { expectedTrace, nominalOutputs } from '../../src/analysis/expected-trace.js';
import { outputOf } from '../../src/plan/check-output.js';
import { captureReadings } from '../../src/run/capture-readings.js';
import { captureWarnings } from '../../src/signal/capture-warnings.js';
import { idealShape as shapeOf } from '../../src/signal/ideal-shape.js';
import { bandGauge, formatBand } from '../../src/ui/bring-up/format-band.js';
import { bringUpLayout } from '../../src/ui/bring-up/layout.js';
import { loadFixture } from './bring-up-harness.js';

let fixture: { plan: Plan; targets: TargetSet };
const target = (check: string): Target => {
  const t = fixture.targets.targets.find((x) => x.check === check);
  if (!t) throw new Error(check);
  return t;
};
beforeAll(async () => {
  fixture = await loadFixture();
});

describe('shape of the expected waveform', () => {
  // Crest factor (peak / RMS) of a square, sine and triangle: 1, √2, √3 (RMS = peak, peak/√2, peak/√3, any signals handbook).
  const n = 1000;
  const wave = (f: (phase: number) => number) => Float64Array.from({ length: n }, (_, i) => f(i / n));
  test('classifies ideal shapes by crest factor', () => {
    expect(shapeOf(wave((p) => (p < 0.5 ? 5 : -5)))).toBe('square');
    expect(shapeOf(wave((p) => 3 * Math.sin(2 * Math.PI * p)))).toBe('sine');
    expect(shapeOf(wave((p) => (p < 0.5 ? -1 + 4 * p : 3 - 4 * p)))).toBe('triangle');
    // A sine clipped at 70 % of its peak has a crest factor near 1.2: no class.
    expect(shapeOf(wave((p) => Math.max(-0.7, Math.min(0.7, Math.sin(2 * Math.PI * p)))))).toBeUndefined();
    // A flat trace has no AC RMS, so no crest factor: no class.
    expect(shapeOf(wave(() => 2.5))).toBeUndefined();
  });
});

describe('expected trace', () => {
  test('follows the check to its output and draws two periods at the target frequency and amplitude', () => {
    const outputs = nominalOutputs(fixture.plan);
    expect(outputOf(fixture.plan, target('osc.triangle.vpp'))).toBe('osc.triangle');
    expect(outputOf(fixture.plan, target('shape.out.thd'))).toBe('shape.out');
    expect(outputOf(fixture.plan, target('rails.+9V.dc'))).toBeNull();
    const tr = expectedTrace(fixture.plan, fixture.targets.targets, target('osc.triangle.vpp'), outputs);
    expect(tr).not.toBeNull();
    if (!tr) return;
    // The same chain at nominal gives the targets' nominal values: frequency and Vpp agree to 1e-9.
    expect(tr.frequency / target('osc.freq').nominal).toBeCloseTo(1, 9);
    expect(tr.vpp / target('osc.triangle.vpp').nominal).toBeCloseTo(1, 9);
    expect(tr.samples.length).toBe(2 * (outputs['osc.triangle']?.samples.length ?? 0));
    const band = tr.band;
    if (!band || typeof band.max === 'number' || typeof band.min === 'number') throw new Error('expected a per-sample band');
    // The band's outer edges span the largest allowed Vpp.
    expect((Math.max(...band.max) - Math.min(...band.min)) / target('osc.triangle.vpp').worst.max).toBeCloseTo(1, 9);
    expect(Math.max(...band.max)).toBeGreaterThanOrEqual(Math.max(...tr.samples));
    expect(expectedTrace(fixture.plan, fixture.targets.targets, target('rails.+9V.dc'), outputs)).toBeNull();
  });

  test('scope settings for the fixture square: two periods in 10 div, Vpp in 6 of 8 div (1-2-5 steps)', () => {
    const tr = expectedTrace(fixture.plan, fixture.targets.targets, target('osc.square.vpp'), nominalOutputs(fixture.plan));
    if (!tr) throw new Error('no trace');
    const setup = scopeSetup(tr.frequency, tr.vpp);
    // By hand: f ≈ 1.13 kHz → 2 periods = 1.77 ms → 177 µs/div → 200 µs; 15.6 V / 6 = 2.6 V → 5 V/div.
    expect(setup).toEqual({ timePerDiv: 2e-4, voltsPerDiv: 5 });
  });
});

describe('capture figures to readings', () => {
  const m = (over: Partial<Measurements>): Measurements => ({ frequency: 1130, vpp: 15.5, duty: 0.5, thd: 0.45, mean: 0, ...over }) as Measurements;
  const capture = (over: Partial<Measurements> = {}) => ({ name: 'tp1.csv', figures: m(over) });
  test('takes every check probed at the same output that the capture measures', () => {
    const got = captureReadings(fixture.plan, fixture.targets.targets, target('osc.freq'), capture(), () => true);
    expect(got.map((r) => r.check).sort()).toEqual(['osc.duty', 'osc.freq', 'osc.square.vpp']);
    expect(got.find((r) => r.check === 'osc.square.vpp')).toMatchObject({ value: 15.5, unit: 'V', verdict: 'pass' });
    expect(got.find((r) => r.check === 'osc.freq')?.raw).toMatch(/from tp1\.csv/);
  });
  test('names a wrong shape, clipping and a crossover notch', () => {
    expect(captureWarnings({ shape: 'square', clipped: false, notch: false }, 'sine')).toEqual(['the capture looks like a square where a sine is expected']);
    expect(captureWarnings({ shape: 'sine', clipped: true, notch: true }, 'sine')).toHaveLength(2);
    expect(captureWarnings({ shape: 'other', clipped: false, notch: false }, undefined)).toEqual([]);
  });
  test('skips figures that do not apply and checks that are locked', () => {
    const got = captureReadings(fixture.plan, fixture.targets.targets, target('osc.freq'), capture({ duty: null }), (c) => c !== 'osc.square.vpp');
    expect(got.map((r) => r.check)).toEqual(['osc.freq']);
  });
});

describe('layout and small formats', () => {
  test('the trace is dropped rather than squashed on a small terminal', () => {
    expect(bringUpLayout(80, 24, 5, 7).traceRows).toBe(7);
    expect(bringUpLayout(80, 20, 5, 7).traceRows).toBe(0);
    expect(bringUpLayout(120, 40, 5, 7).traceRows).toBe(14);
    const small = bringUpLayout(50, 16, 5, 7);
    expect(small.listWidth).toBe(0);
    expect(small.verdictRows + 5 + 3).toBeLessThanOrEqual(small.bodyRows);
  });
  test('bands open on one side and the gauge', () => {
    expect(formatBand({ min: 100, max: Infinity }, 'Ω')).toBe('≥ 100 Ω');
    expect(formatBand({ min: 0, max: 0.03 }, 'A')).toBe('0 A … 30 mA');
    expect(bandGauge(0.5)).toBe('[·····●····]');
    expect(bandGauge(1.2)).toBe('[··········]▸');
    expect(bandGauge(-Infinity)).toBe('◂[··········]');
  });
});
