import { expect, test, vi } from 'vitest';
import { bringUpSuite, powerUp } from './bring-up-harness.js';
import { keys } from './keys.js';

// Counts the trace drawings: a keystroke in the reading line must not draw the chart again.
const drawn = vi.hoisted(() => ({ count: 0 }));
vi.mock('../../src/ui/charts/trace.js', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/ui/charts/trace.js')>();
  return {
    ...real,
    traceChart: (...args: Parameters<typeof real.traceChart>) => {
      drawn.count++;
      return real.traceChart(...args);
    },
  };
});

const suite = bringUpSuite();

test('typing a reading does not draw the expected trace again; moving to another check does', async () => {
  const { open } = await suite.setup();
  const s = await open();
  await powerUp(s);
  const atCheck = drawn.count;
  expect(atCheck).toBeGreaterThan(0);
  await s.type('2.49k');
  await s.until('osc.freq › 2.49k');
  expect(drawn.count).toBe(atCheck);
  // Enter saves it, Enter again takes the suggested next check, which has its own trace.
  await s.press(keys.enter);
  await s.until('osc.freq ›   type a reading, or Enter for the next check');
  await s.press(keys.enter);
  await s.until(() => !s.frame().includes('osc.freq ›'));
  expect(drawn.count).toBeGreaterThan(atCheck);
});
