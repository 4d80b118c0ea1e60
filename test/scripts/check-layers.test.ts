import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterEach, describe, expect, test } from 'vitest';

const script = join(import.meta.dirname, '../../scripts/check-layers.mjs');
const repoRoot = join(import.meta.dirname, '../..');
let roots: string[] = [];

/** A throwaway tree ROOT/src/... with the given files. */
function tree(files: Record<string, string>): string {
  const root = mkdtempSync(join(tmpdir(), 'probebook-layers-'));
  roots.push(root);
  for (const [path, text] of Object.entries(files)) {
    mkdirSync(dirname(join(root, 'src', path)), { recursive: true });
    writeFileSync(join(root, 'src', path), text);
  }
  return root;
}

function check(root: string) {
  const r = spawnSync(process.execPath, [script, root], { encoding: 'utf8' });
  return { status: r.status, lines: r.stderr.split('\n').filter((l) => l.startsWith('src/')) };
}

afterEach(() => {
  for (const root of roots) rmSync(root, { recursive: true, force: true });
  roots = [];
});

describe('scripts/check-layers.mjs (DESIGN §2 layer table)', () => {
  test('the repository itself follows the table', () => {
    const r = spawnSync(process.execPath, [script, repoRoot], { encoding: 'utf8' });
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
  });

  test('an upward import passes, a downward one fails with one line naming file, line and layers', () => {
    const root = tree({
      'units/a.ts': 'export const a = 1;\n',
      'circuit/k.ts': "import { a } from '../units/a.js';\nexport const k = a;\n",
      'plan/p.ts': "import { k } from '../circuit/k.js';\n// import { x } from '../cli/x.js'; a comment is no import\nexport const p = k;\n",
      'circuit/bad.ts': "import { a } from '../units/a.js';\nimport { p } from '../plan/p.js';\nexport const bad = a + p;\n",
    });
    const r = check(root);
    expect(r.status).toBe(1);
    expect(r.lines).toEqual(['src/circuit/bad.ts:2: imports ../plan/p.js — src/circuit may not import src/plan (DESIGN §2)']);
  });

  test('"(types)" lets types through and stops values; re-exports and dynamic imports count', () => {
    const root = tree({
      'analysis/types.ts': 'export interface Band { min: number }\nexport const zero = 0;\n',
      'review/ok.ts':
        "import type { Band } from '../analysis/types.js';\nimport { type Band as B2 } from '../analysis/types.js';\nexport type X = Band | B2;\n",
      'review/value.ts': "import { zero } from '../analysis/types.js';\nexport const v = zero;\n",
      'ui/u.ts': 'export const u = 1;\n',
      'log/reexport.ts': "export { u } from '../ui/u.js';\n",
      'plan/lazy.ts': "export const later = () => import('../ui/u.js');\n",
    });
    const r = check(root);
    expect(r.status).toBe(1);
    expect(r.lines.sort()).toEqual([
      'src/log/reexport.ts:1: imports ../ui/u.js — src/log may not import src/ui (DESIGN §2)',
      'src/plan/lazy.ts:1: imports ../ui/u.js — src/plan may not import src/ui (DESIGN §2)',
      'src/review/value.ts:1: imports ../analysis/types.js — src/review may import only types from src/analysis (DESIGN §2)',
    ]);
  });

  test('a layer reaches what the layers it lists reach (log → plan → units), and the pure core imports no ink', () => {
    const root = tree({
      'units/a.ts': 'export const a = 1;\n',
      'log/l.ts': "import { a } from '../units/a.js';\nexport const l = a;\n",
      'signal/s.ts': "import { render } from 'ink';\nexport const s = render;\n",
      'ui/v.tsx': "import { Box } from 'ink';\nexport const v = Box;\n",
    });
    const r = check(root);
    expect(r.lines).toEqual(['src/signal/s.ts:1: imports ink — the pure core (src/signal) imports no ink (STYLE.md 1)']);
    expect(r.status).toBe(1);
  });

  test('a folder that is not a layer is named', () => {
    const r = check(tree({ 'gadgets/g.ts': 'export const g = 1;\n' }));
    expect(r.status).toBe(1);
    expect(r.lines[0]).toContain('src/gadgets is not a layer');
  });
});
