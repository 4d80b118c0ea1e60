import { describe, expect, test } from 'vitest';
import { signalInKind } from '../../src/circuit/signal-in.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { thd } from '../../src/circuit/waveform.js';
import { StageParseError } from '../../src/circuit/errors.js';

function run(json: Record<string, unknown>) {
  const p = signalInKind.parse({ json, path: 'stages[0]' }, 'x.plan.json');
  const parts = Object.fromEntries(Object.entries(p.parts).map(([k, v]) => [k, v.nominal]));
  return { parsed: p, result: signalInKind.evaluate({ parts, settings: p.settings, opamp: defaultOpamp, supplies: { pos: 12, neg: -12 }, rails: {} }) };
}

describe('signal-in', () => {
  test.each([
    // Fourier series (any signals handbook): sine 0, triangle √(π⁴/96 − 1), square √(π²/8 − 1), harmonics 2–50.
    ['sine', 0, 1e-9],
    ['triangle', Math.sqrt(Math.PI ** 4 / 96 - 1), 1e-3],
    // The square's series converges slowly: its harmonics 2–50 alone (odd, 1/k) give √(Σ 1/k², k = 3, 5 … 49) ≈ 47.3 %
    // rather than the whole series' 48.3 %; 256 samples fold the harmonics above 128 back, hence 0.5 pp.
    ['square', Math.sqrt(Array.from({ length: 24 }, (_, i) => 1 / (2 * i + 3) ** 2).reduce((a, b) => a + b, 0)), 0.005],
  ] as const)("%s: vpp, frequency and the shape's THD", (shape, ideal, tol) => {
    const { result } = run({ shape, peak: '1.5 V 2%', frequency: '2 kHz' });
    expect(result.values['out.vpp']).toBeCloseTo(3, 12);
    expect(result.values['freq']).toBe(2000);
    const out = result.outputs['out'];
    expect(out?.frequency).toBe(2000);
    expect(Math.abs(thd(out as NonNullable<typeof out>) - ideal)).toBeLessThan(tol);
  });

  test('offset adds a DC check and shifts the waveform', () => {
    const { parsed, result } = run({ shape: 'sine', peak: '1 V', frequency: '1 kHz', offset: '0.5 V 5%' });
    expect(signalInKind.checks(parsed.settings).map((c) => c.key)).toEqual(['out.vpp', 'freq', 'out.dc']);
    const s = result.outputs['out']?.samples as Float64Array;
    // The invented generator setting: peak 1 V plus 0.5 V offset.
    expect(Math.max(...s)).toBeCloseTo(1.5, 9);
    expect(parsed.parts['offset']).toMatchObject({ nominal: 0.5, tol: 0.05 });
  });

  test.each([
    [{ peak: '1 V', frequency: '1 kHz' }, /stages\[0\]\.shape: missing; write "sine" or "triangle" or "square"/],
    [{ shape: 'saw', peak: '1 V', frequency: '1 kHz' }, /stages\[0\]\.shape: "saw" is not one of/],
    [{ shape: 'sine', frequency: '1 kHz' }, /stages\[0\]\.peak: missing; write a voltage/],
    [{ shape: 'sine', peak: '1 V', frequency: '1 kV' }, /stages\[0\]\.frequency: .*voltage.*frequency/],
    [{ shape: 'sine', peak: '1 V', frequency: '1 kHz', parts: { R: '1k' } }, /stages\[0\]\.parts\.R: is not a key here/],
  ])('plan error %j', (json, message) => {
    const parse = () => signalInKind.parse({ json, path: 'stages[0]' }, 'x.plan.json');
    expect(parse).toThrow(StageParseError);
    expect(parse).toThrow(message);
  });
});
