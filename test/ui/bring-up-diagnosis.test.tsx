import { describe, expect, test } from 'vitest';
import type { Target } from '../../src/analysis/types.js';
import { bringUpSuite, powerUp } from './bring-up-harness.js';
import { keys } from './keys.js';

const suite = bringUpSuite();
const target = (check: string): Target => {
  const t = suite.fixture.targets.targets.find((x) => x.check === check);
  if (!t) throw new Error(`no ${check}`);
  return t;
};

describe('bring-up screen: diagnosis after a fail', () => {
  test('the likely faults are listed, the next check is the one that separates them, and Enter takes it', async () => {
    const { open } = await suite.setup();
    const s = await open({ width: 110, height: 40 });
    await powerUp(s);
    // 30 % fast: a wrong timing part or a wrong hysteresis resistor; the frequency alone cannot tell which.
    await s.read(`${target('osc.freq').nominal * 1.3}`);
    const shown = await s.until('✗ FAIL');
    expect(shown).toMatch(/1\. \d+ % osc\.\S+/);
    expect(shown).toMatch(/2\. \d+ % osc\.\S+/);
    // The line is cut at the panel's width: its start names the check and why.
    const next = /next: (\S+) — \1( at TP\d)? tells the likely faults apart best/.exec(shown);
    expect(next, shown).not.toBeNull();
    await s.press(keys.enter);
    await s.until(`${next?.[1]} ›`);
  });
});
