import { describe, expect, test } from 'vitest';
import { buildChain } from '../../src/plan/chain.js';
import { loadPlanText } from '../../src/plan/load.js';
import { runSpice } from '../helpers/ngspice.js';
import { node, planDeck } from '../helpers/plan-deck.js';

/*
 * A slew-limited inverting amplifier against ngspice (Debian package): the
 * deck's op-amp is the behavioural model of test/helpers/spice-opamp.ts (tanh
 * input stage, one pole at GBW 1 MHz, 0.5 V/µs, ±13.5 V swing), the deck
 * generated from the same invented plan (test/helpers/plan-deck.ts). The output
 * stops slewing before the ideal peak: a hard slew clamp read 5–9 % high here.
 * Peak-to-peak over the last three of twelve periods; within 1 %.
 */
const cases = [
  { f: 20_000, peak: 1, rf: '100k', shape: 'sine' },
  { f: 50_000, peak: 0.5, rf: '100k', shape: 'sine' },
  { f: 10_000, peak: 1, rf: '100k', shape: 'sine' },
  { f: 20_000, peak: 2, rf: '47k', shape: 'triangle' },
  // Not slew-limited: the single pole alone, as before.
  { f: 30_000, peak: 0.3, rf: '33k', shape: 'sine' },
] as const;

describe('slew-limited amplitude against ngspice', () => {
  for (const c of cases) {
    test(`${c.shape} ${c.peak} V at ${c.f / 1000} kHz, gain −${c.rf}/10k`, () => {
      const rails = [
        { id: '+15V', nominal: '15 V' },
        { id: '-15V', nominal: '-15 V' },
      ];
      const p = loadPlanText(
        JSON.stringify({
          plan: 'slew-test',
          title: 'invented slew test',
          rails,
          opamp: { gbw: '1 MHz', slew: '0.5 V/us', headroom: '1.5 V' },
          stages: [
            { id: 'in', kind: 'signal-in', shape: c.shape, peak: `${c.peak} V`, frequency: `${c.f} Hz` },
            { id: 'amp', kind: 'inverting-amp', input: 'in.out', parts: { Rin: '10k', Rf: c.rf } },
          ],
        }),
        'slew-test.plan.json',
      );
      const chain = buildChain(p);
      const model = chain.detail(chain.nominal).values['amp.out.vpp'] as number;
      const period = 1 / c.f;
      const deck = planDeck(p).replace(/SIN\(([^ ]+) ([^ ]+) ([^ )]+)\)/, (all, off: string, pk: string) =>
        c.shape === 'triangle' ? `PWL(0 ${off} ${period / 4} ${pk} ${(3 * period) / 4} -${pk} ${period} ${off}) r=0` : all,
      );
      const t = runSpice(deck, `tran ${period / 4000} ${12 * period} 0 ${period / 4000}`, [`v(${node('amp', 'out')})`]);
      const time = t['time'] as Float64Array;
      const v = t[`v(${node('amp', 'out')})`] as Float64Array;
      let hi = -Infinity;
      let lo = Infinity;
      for (let i = 0; i < time.length; i++) {
        if ((time[i] as number) < 9 * period) continue;
        hi = Math.max(hi, v[i] as number);
        lo = Math.min(lo, v[i] as number);
      }
      expect(Math.abs(model / (hi - lo) - 1)).toBeLessThan(0.01);
    });
  }
});
