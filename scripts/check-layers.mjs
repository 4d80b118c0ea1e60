#!/usr/bin/env node
// The layer check of DESIGN §2: every import in src/ goes only to a layer the
// table lets it import ("(types)" allows `import type` / `export type` only),
// and the pure core imports no terminal, store or chart package (STYLE.md 1).
// Usage: node scripts/check-layers.mjs [ROOT]   (ROOT defaults to the repository;
// the script reads ROOT/src). Prints one line per offending import and exits 1.
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * DESIGN §2, "may import": layer → { layer: 'all' | 'types' }. A layer may also
 * import what the layers it lists may import (plan imports units, so log may
 * too), as `closure` works out; types through types stay types.
 */
const all = 'all';
const types = 'types';
const table = {
  units: {},
  circuit: { units: all },
  plan: { units: all, circuit: all },
  analysis: { units: all, circuit: all, plan: all },
  signal: { units: all },
  run: { analysis: all, plan: all },
  review: { units: all, analysis: types },
  log: { plan: all, analysis: types },
  bench: { units: all, signal: all },
  ui: { units: all, circuit: all, plan: all, analysis: all, signal: all, run: all, review: all, log: all, bench: all },
  cli: { units: all, circuit: all, plan: all, analysis: all, signal: all, run: all, review: all, log: all, bench: all, ui: all },
};

/** The table with each layer's transitive imports added. */
function closure(direct) {
  const out = {};
  for (const layer of Object.keys(direct)) {
    const reach = { ...direct[layer] };
    let grew = true;
    while (grew) {
      grew = false;
      for (const [via, rule] of Object.entries(reach)) {
        for (const [to, next] of Object.entries(direct[via] ?? {})) {
          const combined = rule === all && next === all ? all : types;
          if (to !== layer && reach[to] !== all && reach[to] !== combined) {
            reach[to] = combined;
            grew = true;
          }
        }
      }
    }
    out[layer] = reach;
  }
  return out;
}

export const layers = closure(table);

/** Packages the pure core never imports (STYLE.md 1: the terminal, the disk store and the charts stay at the edges). */
const edgePackages = ['react', 'ink', 'lowdb', 'asciichart', 'ink-testing-library'];
const pureCore = new Set(['units', 'circuit', 'plan', 'analysis', 'signal', 'run', 'review']);

const sourceFile = /\.(ts|tsx|mts|js|mjs)$/;

function* walk(dir) {
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) yield* walk(path);
    else if (sourceFile.test(entry.name) && !entry.name.endsWith('.d.ts')) yield path;
  }
}

/** Comments out, strings kept: an import inside a comment is no import. */
function withoutComments(text) {
  return text.replace(/\/\*[\s\S]*?\*\//g, (m) => m.replace(/[^\n]/g, ' ')).replace(/(^|[^:'"`\\])\/\/.*$/gm, '$1');
}

/**
 * Every module specifier of a source file with its line and whether only types
 * come through it: static imports and re-exports (`import type`, `export type`,
 * and `import { type A, type B }` count as types), dynamic `import('…')`.
 */
export function importsOf(text) {
  const code = withoutComments(text);
  const found = [];
  const lineAt = (index) => code.slice(0, index).split('\n').length;
  const statement = /(^|[;\n}])\s*(import|export)\s+(type\s+)?([^'";]*?)\s*from\s*['"]([^'"]+)['"]/g;
  for (const m of code.matchAll(statement)) {
    const clause = m[4] ?? '';
    const names = /^\{([^}]*)\}$/.exec(clause.trim());
    const allTypes =
      names !== null &&
      names[1]
        .split(',')
        .map((s) => s.trim())
        .filter(Boolean)
        .every((s) => s.startsWith('type '));
    found.push({ spec: m[5], line: lineAt(m.index + m[0].search(/import|export/)), isType: Boolean(m[3]) || allTypes });
  }
  for (const m of code.matchAll(/(^|[;\n])\s*import\s*['"]([^'"]+)['"]/g))
    found.push({ spec: m[2], line: lineAt(m.index + m[0].search(/import/)), isType: false });
  for (const m of code.matchAll(/\bimport\s*\(\s*['"]([^'"]+)['"]\s*\)/g)) found.push({ spec: m[1], line: lineAt(m.index), isType: false });
  return found;
}

/** The layer of a path under src/ (its first folder), or null for files at the top of src/. */
function layerOf(srcDir, path) {
  const rel = relative(srcDir, path);
  if (rel.startsWith('..')) return null;
  const parts = rel.split(sep);
  return parts.length > 1 ? parts[0] : null;
}

/** Offending imports under ROOT/src, one readable line each. */
export function checkLayers(root) {
  const srcDir = join(root, 'src');
  const problems = [];
  for (const file of walk(srcDir)) {
    const from = layerOf(srcDir, file);
    const where = relative(root, file);
    if (from === null) continue;
    const allowed = layers[from];
    if (!allowed) {
      problems.push(`${where}: folder src/${from} is not a layer of DESIGN §2; add it to the table in scripts/check-layers.mjs`);
      continue;
    }
    for (const { spec, line, isType } of importsOf(readFileSync(file, 'utf8'))) {
      if (spec.startsWith('.')) {
        const to = layerOf(srcDir, resolve(dirname(file), spec));
        if (to === null || to === from) continue;
        const rule = allowed[to];
        if (rule === all || (rule === types && isType)) continue;
        const why = rule === types ? `src/${from} may import only types from src/${to}` : `src/${from} may not import src/${to}`;
        problems.push(`${where}:${line}: imports ${spec} — ${why} (DESIGN §2)`);
      } else if (pureCore.has(from)) {
        const name = spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0];
        if (edgePackages.includes(name)) problems.push(`${where}:${line}: imports ${spec} — the pure core (src/${from}) imports no ${name} (STYLE.md 1)`);
      }
    }
  }
  return problems;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const root = resolve(process.argv[2] ?? join(dirname(fileURLToPath(import.meta.url)), '..'));
  const problems = checkLayers(root);
  for (const p of problems) console.error(p);
  if (problems.length > 0) {
    console.error(`layer check: ${problems.length} import${problems.length === 1 ? '' : 's'} against the layer table`);
    process.exitCode = 1;
  } else {
    console.log('layer check: every import follows the layer table (DESIGN §2)');
  }
}
