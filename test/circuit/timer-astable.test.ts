import { describe, expect, test } from 'vitest';
import { timerAstableKind } from '../../src/circuit/timer-astable.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { StageParseError } from '../../src/circuit/errors.js';
import type { Complex, StageFault } from '../../src/circuit/types.js';
import { vmax, vmin } from '../../src/circuit/waveform.js';
import { runSpice } from '../helpers/ngspice.js';

function stage(json: Record<string, unknown>) {
  return timerAstableKind.parse({ json, path: 'stages[5]' }, 'x.plan.json');
}

function run(ra: number, rb: number, c: number, rail: number, extra: { fault?: StageFault; load?: (o: string, f: number) => Complex | undefined } = {}) {
  const s = stage({ from: 'VCC', parts: { Ra: `${ra}`, Rb: `${rb}`, C: `${c}` } });
  const parts = Object.fromEntries(Object.entries(s.parts).map(([k, v]) => [k, v.nominal]));
  return timerAstableKind.evaluate({ parts, settings: s.settings, opamp: defaultOpamp, supplies: { pos: 15, neg: -15 }, rails: { VCC: rail }, ...extra });
}

/**
 * The timer in ngspice from behavioural parts, independent of the closed form:
 * two comparators (1 mV wide tanh) against 1/3 and 2/3 of the rail, an SR latch
 * of two cross-coupled NOR gates (0…1 logic: high while the sum of their inputs
 * is below 0.5, switching over 20 mV, each behind a 1 ns RC), a discharge switch of 1 Ω to ground while the latch is reset, and
 * the output at rail − vdrop while it is set (both switched sharply at half logic level). Ra, Rb, C and any capacitor load are real
 * elements; the capacitor starts at 0 V.
 */
function spiceTimer(o: { ra: number; rb: number; c: number; rail: number; rcap?: number }) {
  const guess = 1 / (Math.LN2 * (o.ra + 2 * o.rb) * o.c);
  const T = 1 / guess;
  const deck = [
    `Vcc vcc 0 DC ${o.rail}`,
    `Ra vcc dis ${o.ra}`,
    `Rb dis cap ${o.rb}`,
    `C1 cap 0 ${o.c} IC=0`,
    o.rcap ? `Rcap cap 0 ${o.rcap}` : '',
    `Bs s 0 V = 0.5*(1+tanh((V(vcc)/3 - V(cap))/1m))`,
    `Br r 0 V = 0.5*(1+tanh((V(cap) - 2*V(vcc)/3)/1m))`,
    `Bq nq 0 V = 0.5*(1 - tanh((V(r) + V(qb) - 0.5)/0.02))`,
    `Rq nq q 1k`,
    `Cq q 0 1p`,
    `Bqb nqb 0 V = 0.5*(1 - tanh((V(s) + V(q) - 0.5)/0.02))`,
    `Rqb nqb qb 1k`,
    `Cqb qb 0 1p`,
    `Bdis dis 0 I = V(dis) * 0.5*(1+tanh((V(qb) - 0.5)/0.01))`,
    `Bout out 0 V = 0.5*(1+tanh((V(q) - 0.5)/0.01)) * (V(vcc) - 1.7)`,
  ].join('\n');
  const t = runSpice(deck, `tran ${T / 5000} ${8 * T} 0 ${T / 5000} uic`, ['v(out)', 'v(cap)']);
  const time = t['time'] as Float64Array;
  const out = t['v(out)'] as Float64Array;
  const cap = t['v(cap)'] as Float64Array;
  const mid = (o.rail - 1.7) / 2;
  const rises: number[] = [];
  const falls: number[] = [];
  for (let i = 1; i < out.length; i++) {
    const a = (out[i - 1] as number) - mid;
    const b = (out[i] as number) - mid;
    if (a < 0 !== b < 0) ((b > 0 ? rises : falls) as number[]).push((time[i - 1] as number) + ((time[i] as number) - (time[i - 1] as number)) * (a / (a - b)));
  }
  // Skip the first cycle (the capacitor starts from 0 V, not from 1/3 of the rail).
  const r = rises.slice(1);
  const period = ((r[r.length - 1] as number) - (r[0] as number)) / (r.length - 1);
  const fall = falls.find((x) => x > (r[0] as number)) as number;
  const from = r[0] as number;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < cap.length; i++) {
    if ((time[i] as number) < from) continue;
    lo = Math.min(lo, cap[i] as number);
    hi = Math.max(hi, cap[i] as number);
  }
  return { freq: 1 / period, duty: (fall - from) / period, capVpp: hi - lo, outHigh: Math.max(...out) };
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('timer-astable against ngspice (behavioural comparators and latch)', () => {
  test.each([
    ['1k, 10k, 100 nF at 12 V (about 690 Hz, duty 52 %)', 1e3, 10e3, 100e-9, 12],
    ['10k, 10k, 10 nF at 9 V (about 4.8 kHz, duty 67 %)', 10e3, 10e3, 10e-9, 9],
    ['47k, 2k2, 1 µF at 5 V (about 28 Hz, duty 96 %)', 47e3, 2.2e3, 1e-6, 5],
  ] as const)('%s', (_name, ra, rb, c, rail) => {
    const s = spiceTimer({ ra, rb, c, rail });
    const r = run(ra, rb, c, rail);
    // ngspice transient, periods 2–8: frequency within 1 %, duty within 0.005, capacitor swing and output level within 2 %.
    expect(rel(r.values['freq'] as number, s.freq)).toBeLessThan(0.01);
    expect(Math.abs((r.values['duty'] as number) - s.duty)).toBeLessThan(0.005);
    expect(rel(r.values['cap.vpp'] as number, s.capVpp)).toBeLessThan(0.02);
    expect(rel(r.values['out.vpp'] as number, s.outHigh)).toBeLessThan(0.02);
    // The drawn capacitor waveform runs between 1/3 and 2/3 of the rail.
    expect(vmin(r.outputs['cap'] as never)).toBeGreaterThan(rail / 3 - 0.02 * rail);
    expect(vmax(r.outputs['cap'] as never)).toBeLessThan((2 * rail) / 3 + 1e-9);
  });

  test('a 47k load on the capacitor (a 1× probe or the next stage) slows it as ngspice says', () => {
    const s = spiceTimer({ ra: 10e3, rb: 10e3, c: 10e-9, rail: 9, rcap: 47e3 });
    const r = run(10e3, 10e3, 10e-9, 9, { load: (o) => (o === 'cap' ? { re: 47e3, im: 0 } : undefined) });
    // ngspice within 1 % (2577 Hz); the unloaded closed form says 4809 Hz, 87 % high.
    expect(rel(r.values['freq'] as number, s.freq)).toBeLessThan(0.01);
    expect(Math.abs((r.values['duty'] as number) - s.duty)).toBeLessThan(0.005);
  });
});

describe('timer-astable closed form', () => {
  test('the ln 2 form: f = 1/(ln 2·(Ra + 2Rb)·C), duty (Ra + Rb)/(Ra + 2Rb)', () => {
    const r = run(1e3, 10e3, 100e-9, 12);
    expect(r.values['freq']).toBeCloseTo(1 / (Math.LN2 * 21e3 * 100e-9), 6);
    expect(r.values['duty']).toBeCloseTo(11 / 21, 12);
    // The timer data sheets' rounded form f = 1.44/((Ra + 2Rb)·C) (from memory): 685.7 Hz, within 0.2 %.
    expect(rel(r.values['freq'] as number, 1.44 / (21e3 * 100e-9))).toBeLessThan(0.002);
    expect(r.values['cap.vpp']).toBeCloseTo(4, 12);
    expect(r.values['out.vpp']).toBeCloseTo(10.3, 12);
  });
});

describe('timer-astable faults and plan', () => {
  test('Ra or Rb open, or C shorted: stopped with the output high', () => {
    for (const fault of [
      { role: 'Ra', mode: 'open' },
      { role: 'Rb', mode: 'open' },
      { role: 'C', mode: 'short' },
    ] as const) {
      const r = run(1e3, 10e3, 100e-9, 12, { fault });
      expect(r.values['freq']).toBe(0);
      expect(r.outputs['out']?.samples[0]).toBeCloseTo(10.3, 12);
      expect(r.warnings.map((w) => w.message).join('\n')).toMatch(/does not run/);
    }
  });
  test('C open runs on stray capacitance (far higher), Rb shorted runs near 100 % duty, Ra shorted warns of heat', () => {
    expect(run(1e3, 10e3, 100e-9, 12, { fault: { role: 'C', mode: 'open' } }).values['freq'] as number).toBeGreaterThan(1e6);
    expect(run(1e3, 10e3, 100e-9, 12, { fault: { role: 'Rb', mode: 'short' } }).values['duty'] as number).toBeGreaterThan(0.999);
    expect(
      run(1e3, 10e3, 100e-9, 12, { fault: { role: 'Ra', mode: 'short' } })
        .warnings.map((w) => w.message)
        .join('\n'),
    ).toMatch(/runs hot/);
  });
  test('a supply outside 4.5–16 V warns', () => {
    expect(
      run(10e3, 10e3, 10e-9, 18)
        .warnings.map((w) => w.message)
        .join('\n'),
    ).toMatch(/runs from 4\.5 V to 16 V/);
  });
  test.each([
    [{ from: 'VCC', parts: { Ra: '10k', Rb: '10k' } }, /stages\[5\]\.parts\.C: missing; write a capacitance, e\.g\. "10n 5%"/],
    [{ from: 'VCC', parts: { Ra: '10k', Rb: '10k', C: '10k' } }, /stages\[5\]\.parts\.C: "10k" reads as 10 kF, not a plausible value/],
    [{ parts: { Ra: '10k', Rb: '10k', C: '10n' } }, /stages\[5\]\.from: missing/],
    [{ from: 'VCC', parts: { Ra: '10k', Rb: '10k', C: '10n' }, vdrop: '9 V' }, /stages\[5\]\.vdrop: "9 V" reads as 9 V, not a plausible value/],
  ])('plan error %j', (json, message) => {
    expect(() => stage(json)).toThrow(StageParseError);
    expect(() => stage(json)).toThrow(message);
  });
});
