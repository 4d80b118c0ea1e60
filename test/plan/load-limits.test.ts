import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { PlanError } from '../../src/plan/errors.js';
import { buildChain } from '../../src/plan/chain.js';
import { loadPlanFile, loadPlanText, maxPlanDepth, maxStageList, maxStages, nestingDepth } from '../../src/plan/load.js';
import { cli } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

// Issue 10, items 10, 12 and 14: no plan file hangs, overflows the stack or grows
// without bound; each is refused with the usual one line (exit 2).
const t = tempDir('plan-limits');
afterAll(() => t.remove());

/** An invented chain: a generator into `n - 1` RC low-passes in series. */
function chainPlan(n: number, extra: Record<string, unknown> = {}): string {
  const stages: unknown[] = [{ id: 'src', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz' }];
  for (let i = 0; i < n - 1; i++)
    stages.push({ id: `f${i}`, kind: 'rc-lowpass', input: i === 0 ? 'src.out' : `f${i - 1}.out`, parts: { R: '1k 1%', C: '10n 5%' } });
  return JSON.stringify({ plan: 'gen', title: 'Generated chain (invented)', rails: [{ id: '+12V', nominal: '12 V', tol: '3%' }], stages, ...extra });
}

function planError(run: () => unknown): PlanError {
  try {
    run();
  } catch (error) {
    if (error instanceof PlanError) return error;
    throw error;
  }
  throw new Error('no PlanError');
}

describe('nesting (item 10)', () => {
  test('invalid JSON nested 10,000 levels deep: a plan error, not a stack overflow', () => {
    const e = planError(() => loadPlanText('['.repeat(10_000), 'deep.plan.json'));
    expect(e.message).toContain(`nested more than ${maxPlanDepth} levels deep`);
  });

  test('valid JSON nested that deep is refused the same way', () => {
    const e = planError(() =>
      loadPlanText(
        `{"plan":"x","title":"t","rails":[],"stages":[{"id":"a","kind":"manual","x":${'['.repeat(10_000)}${']'.repeat(10_000)}}]}`,
        'deep.plan.json',
      ),
    );
    expect(e.message).toContain('levels deep');
  });

  test('the command exits 2 with one line', async () => {
    const file = join(t.dir, 'deep.plan.json');
    writeFileSync(file, '{"a":'.repeat(10_000));
    const r = await cli(['targets', file]);
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });

  test('brackets inside strings do not count', () => {
    expect(nestingDepth('{"a": "[[[[[[", "b": [1, {"c": "\\"{{{"}]}', 10)).toBe(3);
  });
});

describe('files that are not plans (item 12)', () => {
  test('a FIFO is refused at once, not read forever', async () => {
    const fifo = join(t.dir, 'pipe.plan.json');
    execFileSync('mkfifo', [fifo]);
    await expect(loadPlanFile(fifo)).rejects.toThrow(/is not a regular file/);
    const r = await cli(['targets', fifo]);
    expect(r.status).toBe(2);
  });

  test('a character device is refused', async () => {
    await expect(loadPlanFile('/dev/zero')).rejects.toThrow(/is not a regular file/);
  });

  test('a file over 1 MB is refused before it is read', async () => {
    const file = join(t.dir, 'big.plan.json');
    writeFileSync(file, `{"plan":"x","title":"t","note":"${'x'.repeat(1_100_000)}"}`);
    await expect(loadPlanFile(file)).rejects.toThrow(/at most 1 MB/);
  });
});

describe('size limits (item 14)', () => {
  test(`${maxStages} stages load and build a chain; ${maxStages + 1} are refused naming "stages"`, () => {
    const plan = loadPlanText(chainPlan(maxStages), 'gen.plan.json');
    expect(plan.stages).toHaveLength(maxStages);
    const chain = buildChain(plan);
    // Every stage finds its own parts (the lookup is by name through a map).
    expect(chain.variables.filter((v) => v.stage === 'f198')).toHaveLength(2);
    expect(chain.stageIndex('f198')).toBe(maxStages - 1);
    const e = planError(() => loadPlanText(chainPlan(maxStages + 1), 'gen.plan.json'));
    expect(e.message).toMatch(/stages: 201 stages; a plan holds at most 200/);
  });

  test(`a shaper with ${maxStageList + 1} branches is refused naming the branches`, () => {
    const branches = Array.from({ length: maxStageList + 1 }, (_, i) => ({ diodes: 1, polarity: i % 2 ? '-' : '+', R: '2k2 1%', bias: '0 V' }));
    const text = JSON.stringify({
      plan: 'gen',
      title: 'Generated shaper (invented)',
      rails: [{ id: '+12V', nominal: '12 V', tol: '3%' }],
      stages: [
        { id: 'src', kind: 'signal-in', shape: 'triangle', peak: '5 V', frequency: '1 kHz' },
        { id: 'sh', kind: 'diode-shaper', input: 'src.out', parts: { Rs: '4k7 1%' }, branches },
      ],
    });
    const e = planError(() => loadPlanText(text, 'shaper.plan.json'));
    expect(e.message).toMatch(/stages\[1\]\.branches: 65 entries; a stage holds at most 64/);
  });

  test('a long chain given in reverse order still loads (no recursion per stage)', () => {
    const plan = JSON.parse(chainPlan(maxStages)) as { stages: unknown[] };
    plan.stages.reverse();
    const loaded = loadPlanText(JSON.stringify(plan), 'reversed.plan.json');
    expect(loaded.stages[0]?.id).toBe('src');
    expect(loaded.stages.at(-1)?.id).toBe(`f${maxStages - 2}`);
  });

  test('the demo plans are far inside the limits', () => {
    for (const file of ['demo/exciter.plan.json', 'demo/line-driver.plan.json']) {
      const text = readFileSync(file, 'utf8');
      expect(text.length).toBeLessThan(20_000);
      expect(nestingDepth(text, 100)).toBeLessThan(8);
    }
  });
});
