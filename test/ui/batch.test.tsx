import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { beforeAll, describe, expect, test } from 'vitest';
import { BatchScreen } from '../../src/ui/batch/batch.js';
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

function screen() {
  const opened: string[] = [];
  let exits = 0;
  const r = render(<BatchScreen log={t.log} width={80} height={23} onExit={() => void exits++} onOpenBoard={(s) => void opened.push(s)} />);
  return { ...driveScreen(r), opened, exits: () => exits };
}

describe('batch screen', () => {
  test('the table puts the weakest check first and fits 80 columns', async () => {
    const s = screen();
    await s.waitFor('[Histogram]');
    const f = s.frame();
    expect(f).toContain('6 boards · first-pass 66.7 % · final 83.3 %');
    const rows = f.split('\n').filter((l) => /^[ ›](osc|rails)\./.test(l));
    expect(rows[0]).toMatch(/^›osc\.freq\s+6\s+5\s+0\s+1\s+83\.3 %\s+0\.59\s+0\.48\s+not capable/);
    expect(f).toMatch(/osc\.duty .*not enough data/);
    // The histogram marks the band and nominal with characters, not colour.
    expect(f).toContain('6 boards in 5 bins   [ ] band');
    for (const line of f.split('\n')) expect([...line].length).toBeLessThanOrEqual(80);
    expect(f.split('\n').length).toBeLessThanOrEqual(23);
    s.unmount();
  });

  test('batch → an outlier → its history (onOpenBoard with the serial)', async () => {
    const s = screen();
    await s.waitFor('[Histogram]');
    await s.press(keys.enter);
    await s.waitFor('[Outliers (1)]');
    expect(s.frame()).toMatch(/›PB-0006\s+3\.902 kHz\s+outside band/);
    await s.press(keys.enter);
    expect(s.opened).toEqual(['PB-0006']);
    await s.press(keys.escape);
    await s.waitFor('[Histogram]');
    expect(s.exits()).toBe(0);
    await s.press(keys.escape);
    expect(s.exits()).toBe(1);
    s.unmount();
  });

  test('Tab shows the trend; j moves to the next check', async () => {
    const s = screen();
    await s.waitFor('[Histogram]');
    await s.press(keys.tab);
    await s.waitFor('[Trend]');
    expect(s.frame()).toContain('oldest → newest, 6 points; flat lines: band edges');
    await s.press('j');
    await s.waitFor('rails.+9V.dc: mean 9.01 V');
    s.unmount();
  });

  test('f filters by date range; a bad date is refused in the form; ? shows help', async () => {
    const s = screen();
    await s.waitFor('[Histogram]');
    await s.press('f');
    await s.waitFor('Filter the batch');
    await s.press(keys.tab);
    await s.press(keys.tab);
    for (const ch of 'soon') await s.press(ch);
    await s.press(keys.enter);
    await s.waitFor('✗ from: write a date');
    for (let i = 0; i < 4; i++) await s.press(keys.backspace);
    for (const ch of '2001-01-01') await s.press(ch);
    await s.press(keys.tab);
    for (const ch of '2001-01-02') await s.press(ch);
    await s.press(keys.enter);
    await s.waitFor('No readings match');
    expect(s.frame()).toContain('from 2001-01-01T00:00:00.000Z');
    await s.press('?');
    await s.waitFor('Help — batch screen');
    expect(s.frame()).toContain('filter by plan, plan revision (hash) and date range');
    s.unmount();
  });

  test('keys in one chunk: "jj" moves twice, "f" with text behind it opens the form holding the text', async () => {
    const s = screen();
    await s.waitFor('[Histogram]');
    const selected = () =>
      s
        .frame()
        .split('\n')
        .find((l) => l.startsWith('›')) ?? '';
    const rows = s
      .frame()
      .split('\n')
      .filter((l) => /^[ ›](osc|rails)\./.test(l));
    const third = rows[2]?.slice(1, 20).trim() ?? '';
    expect(third).toMatch(/^(osc|rails)\./);
    expect(selected()).not.toContain(third);
    await s.press('jj');
    expect(selected()).toContain(third);
    await s.press('fnone\r');
    await s.waitFor('No readings match plan none');
    s.unmount();
  });
});
