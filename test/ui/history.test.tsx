import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { beforeAll, describe, expect, test } from 'vitest';
import { HistoryScreen } from '../../src/ui/history/history.js';
import { formatValue } from '../../src/units/format.js';
import { fillDemoLog } from '../review/demo-boards.js';
import { makeLog, type TestLog } from '../review/real-log.js';
import { keys } from './keys.js';
import { driveScreen } from './screen-driver.js';

let t: TestLog;
beforeAll(async () => {
  // The screens cache targets in the user's cache folder; give this test its own.
  process.env.PROBEBOOK_CACHE = mkdtempSync(join(tmpdir(), 'probebook-cache-'));
  t = await makeLog();
  await fillDemoLog(t);
});

function screen(serial: string) {
  let exits = 0;
  const r = render(<HistoryScreen log={t.log} serial={serial} width={80} height={23} onExit={() => void exits++} />);
  return { ...driveScreen(r), exits: () => exits };
}

describe('history screen', () => {
  test('shows the timeline: runs, readings with verdicts and deviations, the rework note', async () => {
    const s = screen('PB-0003');
    await s.waitFor('Timeline');
    const f = s.frame();
    expect(f).toContain('probebook · history · PB-0003');
    expect(f).toContain('2 runs · 6 readings (1 fail) · 1 rework');
    expect(f).toMatch(/✗ fail\s+osc\.freq\s+4\.29 kHz\s+\+21\.9 %/);
    expect(f).toContain('↻ rework osc.Ct 8n2 → 10n: wrong value fitted');
    expect(f).toMatch(/✓ pass\s+osc\.freq\s+3\.525 kHz/);
    for (const line of f.split('\n')) expect([...line].length).toBeLessThanOrEqual(80);
    s.unmount();
  });

  test('a reading → its target as it was when measured (plan snapshot by hash)', async () => {
    const s = screen('PB-0003');
    await s.waitFor('Timeline');
    // Timeline: run, 3 readings, rework, run, 3 readings. The failing osc.freq is row 3.
    await s.press(keys.down);
    await s.press(keys.down);
    await s.press(keys.enter);
    await s.waitFor('Target as it was when measured');
    const target = t.target('osc.freq');
    const f = s.frame();
    expect(f).toContain('check        osc.freq');
    expect(f).toContain(`revision ${t.plan.hash.slice(0, 12)}`);
    expect(f).toContain('plan         osc-demo');
    // The band printed is the one computed from the snapshot, formatted as the screen formats it.
    expect(f).toContain(`worst-case   ${fmt(target.worst.min)} … ${fmt(target.worst.max)}`);
    expect(f).toContain('✗ fail');
    await s.press(keys.escape);
    await s.waitFor('Timeline');
    expect(s.exits()).toBe(0);
    await s.press(keys.escape);
    expect(s.exits()).toBe(1);
    s.unmount();
  });

  test('Tab shows a check before and after the rework side by side', async () => {
    const s = screen('PB-0003');
    await s.waitFor('Timeline');
    await s.press(keys.tab);
    await s.waitFor('before rework');
    expect(s.frame()).toMatch(/osc\.freq\s+4\.29 kHz ✗ fail\s+3\.525 kHz ✓ pass/);
    s.unmount();
  });

  test('a capture on the timeline is re-drawn as a trace', async () => {
    // An invented 1 kHz sine, 2 V peak, 200 samples over 2 ms, as a scope's CSV.
    const rows = Array.from({ length: 200 }, (_, i) => `${(i * 1e-5).toExponential(6)},${(2 * Math.sin(2 * Math.PI * 1000 * i * 1e-5)).toFixed(5)}`);
    const bytes = new TextEncoder().encode(`time,ch1\n${rows.join('\n')}\n`);
    const { file } = await t.log.saveCapture(bytes, 'sine.csv');
    await t.log.linkCapture('PB-0005', { file, name: 'sine.csv', at: new Date().toISOString(), check: 'osc.freq', run: null });
    const s = screen('PB-0005');
    await s.waitFor('Timeline');
    await s.press('G');
    await s.waitFor('›');
    expect(s.frame()).toMatch(/›.*∿ capture sine\.csv for osc\.freq/);
    await s.press(keys.enter);
    await s.waitFor('200 samples');
    // The trace's axis spans the sine's ±2 V peaks.
    expect(s.frame()).toMatch(/2(\.0+)? V/);
    expect(s.frame()).toMatch(/-2(\.0+)? V|−2(\.0+)? V/);
    s.unmount();
  });

  test('? opens a help box listing the keys; an unknown board says so', async () => {
    const s = screen('PB-0001');
    await s.waitFor('Timeline');
    await s.press('?');
    await s.waitFor('Help — history screen');
    expect(s.frame()).toContain('Enter');
    await s.press('?');
    await s.waitFor('Timeline');
    s.unmount();
    const none = screen('PB-9999');
    await none.waitFor('No board PB-9999');
    none.unmount();
  });
});

/** Hertz as the screen formats them (units/format). */
const fmt = (v: number) => formatValue(v, 'Hz');
