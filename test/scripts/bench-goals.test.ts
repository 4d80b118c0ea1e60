import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { goalTable, parseFigures, readGoalRows } from '../../scripts/bench-goals.mjs';

// The summary table of `npm run bench` (issue 15's goals). The rows and their
// "today" and goal columns are the table, typed into bench/goals.json.

const repo = join(import.meta.dirname, '..', '..');
const rows = readGoalRows(join(repo, 'bench', 'goals.json'));
const roots: string[] = [];
afterAll(() => {
  for (const r of roots) rmSync(r, { recursive: true, force: true });
});

/** The table's line for a goal id, by its work text. */
const lineOf = (lines: string[], id: string) => lines.find((l) => l.startsWith(rows.find((r) => r.id === id)?.work ?? '\0')) ?? '';

describe('the goal rows', () => {
  test("every row of issue 15's table is there once, with a limit matching its goal text", () => {
    expect(rows.map((r) => r.id)).toEqual([
      'record',
      'targets-process',
      'monte-carlo',
      'worst-case',
      'tui-first-frame-empty',
      'tui-first-frame-10k',
      'keystroke-p95',
      'batch',
      'analyze-1m',
      'analyze-5m',
      'analyze-rss',
    ]);
    for (const r of rows) expect(r.goal.replace(/,/g, '')).toContain(String(r.limit));
  });
});

describe('goalTable', () => {
  test('met, not met, not measured, no figure and not run, each said in words', () => {
    const figures = parseFigures(
      [
        JSON.stringify({ id: 'monte-carlo', figure: 180 }),
        JSON.stringify({ id: 'monte-carlo', figure: 64.2 }),
        JSON.stringify({ id: 'worst-case', figure: 100.4 }),
        '{"id":"analyze-1m","fig', // a bench killed mid-line
        JSON.stringify({ id: 'analyze-5m', figure: null, note: 'numpy is not installed' }),
        JSON.stringify({ id: 'record', figure: 2.5, note: '300 ms' }),
      ].join('\n'),
    );
    const lines = goalTable(
      rows,
      figures,
      new Map<string, number | null>([
        ['tolerance', 0],
        ['analyze', 0],
        ['record', 0],
        ['ui', 1],
      ]),
    );
    expect(lines[0]).toContain('2 of 11 met (3 measured)');
    // The last figure of an id wins.
    expect(lineOf(lines, 'monte-carlo')).toMatch(/513–630 ms\s+64 ms\s+≤ 100 ms\s+tolerance\s+met$/);
    // At the limit is met, a hair above is not.
    expect(lineOf(lines, 'worst-case')).toMatch(/100 ms\s+≤ 100 ms\s+tolerance\s+not met$/);
    expect(lineOf(lines, 'record')).toMatch(/≈ 16×\s+2\.50×\s+≤ 3×\s+record\s+met {2}300 ms$/);
    expect(lineOf(lines, 'targets-process')).toMatch(/—\s+≤ 4×\s+tolerance\s+no figure$/);
    expect(lineOf(lines, 'analyze-1m')).toMatch(/analyze\s+no figure$/);
    expect(lineOf(lines, 'analyze-5m')).toMatch(/analyze\s+not measured {2}numpy is not installed$/);
    expect(lineOf(lines, 'keystroke-p95')).toMatch(/ui\s+no figure \(bench exited 1\)$/);
    expect(lineOf(lines, 'batch')).toMatch(/—\s+≤ 1000 ms\s+review\s+not run$/);
  });

  test('an exact limit is met', () => {
    const lines = goalTable(rows, parseFigures(JSON.stringify({ id: 'keystroke-p95', figure: 16 })), new Map([['ui', 0]]));
    expect(lineOf(lines, 'keystroke-p95')).toMatch(/16 ms\s+≤ 16 ms\s+ui\s+met$/);
  });
});

describe('npm run bench', () => {
  test('a goal bench reports through bench/goals.ts and the run ends with the table', () => {
    // A throwaway tree with the real script, goals module and rows, and one stand-in goal bench.
    const root = mkdtempSync(join(tmpdir(), 'probebook-bench-goals-'));
    roots.push(root);
    mkdirSync(join(root, 'bench'));
    for (const f of ['goals.json', 'goals.ts']) copyFileSync(join(repo, 'bench', f), join(root, 'bench', f));
    symlinkSync(join(repo, 'node_modules'), join(root, 'node_modules'));
    writeFileSync(
      join(root, 'bench', 'tolerance.bench.ts'),
      "import { reportGoal } from './goals.js';\nconsole.log('own figures');\nreportGoal('monte-carlo', 42);\nreportGoal('worst-case', 250, 'slow');\n",
    );
    writeFileSync(join(root, 'bench', 'other.bench.ts'), "import { reportGoal } from './goals.js';\nreportGoal('no-such-goal', 1);\n");
    const r = spawnSync(process.execPath, [join(repo, 'scripts', 'bench.mjs')], { cwd: root, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toContain('own figures');
    // A goal id the rows do not have is the bench's error, not a silent row.
    expect(r.stderr).toContain('bench/goals.json has no goal "no-such-goal"');
    expect(r.stdout).toContain('(other.bench.ts exited 1)');
    const table = r.stdout.slice(r.stdout.indexOf('== summary =='));
    const lines = table.split('\n');
    expect(lines[1]).toContain('1 of 11 met (2 measured)');
    expect(lineOf(lines, 'monte-carlo')).toMatch(/42 ms\s+≤ 100 ms\s+tolerance\s+met$/);
    expect(lineOf(lines, 'worst-case')).toMatch(/250 ms\s+≤ 100 ms\s+tolerance\s+not met {2}slow$/);
    expect(lineOf(lines, 'targets-process')).toMatch(/tolerance\s+no figure$/);
    expect(lineOf(lines, 'record')).toMatch(/≤ 3×\s+record\s+not run$/);
  }, 60_000);

  test('a name that matches no bench is refused with the list', () => {
    const r = spawnSync(process.execPath, [join(repo, 'scripts', 'bench.mjs'), 'no-such-bench'], { cwd: repo, encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/no bench matches no-such-bench; the benches are .*tolerance/);
  });
});
