import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeAll, describe, expect, test } from 'vitest';
import { fillDemoLog } from '../review/demo-boards.js';
import { makeLog, type TestLog } from '../review/real-log.js';

// Colour must be possible for this test to mean anything: force it on before Ink loads.
process.env.FORCE_COLOR = '1';

let t: TestLog;
beforeAll(async () => {
  process.env.PROBEBOOK_CACHE = mkdtempSync(join(tmpdir(), 'probebook-cache-'));
  t = await makeLog();
  await fillDemoLog(t);
});
afterEach(() => {
  delete process.env.NO_COLOR;
});

async function frameOf(): Promise<string> {
  const { render } = await import('ink-testing-library');
  const { BatchScreen } = await import('../../src/ui/batch/batch.js');
  const r = render(<BatchScreen log={t.log} width={80} height={23} onExit={() => {}} onOpenBoard={() => {}} />);
  const until = Date.now() + 8000;
  while (!(r.lastFrame() ?? '').includes('Histogram') && Date.now() < until) await new Promise((res) => setTimeout(res, 20));
  const frame = r.lastFrame() ?? '';
  r.unmount();
  return frame;
}

// SGR foreground colour codes 30–37, 90–97 (ECMA-48); bold and inverse are not colour.
const colour = /\u001B\[(3[0-7]|9[0-7])m/;

describe('NO_COLOR (no-color.org)', () => {
  test('the batch screen uses colour normally, none with NO_COLOR, and keeps its words', async () => {
    expect(await frameOf()).toMatch(colour);
    process.env.NO_COLOR = '1';
    const plain = await frameOf();
    expect(plain).not.toMatch(colour);
    expect(plain).toContain('not capable');
    expect(plain).toContain('capable');
  });
});
