// Build the `probebook` command: a production bundle (dist/probebook.js).
// A bundle starts much faster than tsx or unbundled imports of react and ink.
import { build } from 'esbuild';
import { createHash } from 'node:crypto';
import { chmodSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

// A build id from the sources and data tables: caches of computed targets are
// keyed by it, so a changed model never serves bands computed by an older one.
function buildId() {
  const hash = createHash('sha256');
  const walk = (dir) => {
    for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const path = join(dir, entry.name);
      if (entry.isDirectory()) walk(path);
      else {
        hash.update(path);
        hash.update(readFileSync(path));
      }
    }
  };
  walk('src');
  walk('data');
  return hash.digest('hex').slice(0, 16);
}

// Ink imports react-devtools-core only when DEV=true, but a bundle hoists an
// external import to the top and then fails to start without the package. Bundle
// a stub that throws instead: Ink catches it and explains what to install.
const noDevtools = {
  name: 'no-devtools',
  setup(b) {
    b.onResolve({ filter: /^react-devtools-core$/ }, () => ({ path: 'react-devtools-core', namespace: 'probebook-stub' }));
    b.onLoad({ filter: /.*/, namespace: 'probebook-stub' }, () => ({
      contents: "throw new Error('react-devtools-core is not bundled');",
      loader: 'js',
    }));
  },
};

// jsonc-parser's "main" is a UMD build that requires its own files at run time
// (`./impl/format`), which a bundle does not hold: take its ES module build.
const jsoncEsm = {
  name: 'jsonc-esm',
  setup(b) {
    b.onResolve({ filter: /^jsonc-parser$/ }, () => ({ path: fileURLToPath(new URL('../node_modules/jsonc-parser/lib/esm/main.js', import.meta.url)) }));
  },
};

// One build with code splitting: `dist/probebook.js` (the command) and
// `dist/targets-worker.js` (the bench screen runs a plan's Monte Carlo in a worker
// thread so the screen keeps drawing) share their chunks, and the shell commands
// (`targets`, `analyze`, `record`, …) never parse React and Ink, which live in a
// chunk of their own loaded only for the TUI. Chunks sit beside the entry files:
// the workers are found by `new URL('./targets-worker.js', import.meta.url)` (and
// `./csv-part-worker.js`: a large CSV capture is read by two threads). The entry
// `dist/samples-worker.js` draws the Monte Carlo of `targets` beside the worst-case search.
// PROBEBOOK_BUILD_DIR builds elsewhere (a test of the bundle builds its own copy, leaving dist/ alone).
const outdir = process.env.PROBEBOOK_BUILD_DIR || 'dist';
rmSync(outdir, { recursive: true, force: true });
await build({
  entryPoints: {
    probebook: 'src/cli/bin.ts',
    'targets-worker': 'src/ui/bench/targets-worker.ts',
    'samples-worker': 'src/cli/samples-worker.ts',
    'csv-part-worker': 'src/signal/csv-part-worker.ts',
  },
  outdir,
  chunkNames: 'chunk-[hash]',
  splitting: true,
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'esm',
  minify: true,
  sourcemap: 'linked',
  legalComments: 'linked',
  plugins: [noDevtools, jsoncEsm],
  // serialport loads its native binding from its own package folder, and pg's optional
  // native client is never used: both stay outside the bundle (serialport is a dependency).
  external: ['serialport', 'pg-native'],
  // Ink's layout engine (yoga, Emscripten) asks `typeof fetch` before it decodes
  // its embedded wasm; in Node 20 that touches the lazy global and loads undici
  // (tens of ms at start-up) to fetch a data: URL. probebook never uses fetch.
  define: {
    'process.env.NODE_ENV': '"production"',
    fetch: 'undefined',
    __PROBEBOOK_BUILD__: JSON.stringify(buildId()),
    __PROBEBOOK_VERSION__: JSON.stringify(JSON.parse(readFileSync('package.json', 'utf8')).version),
  },
  banner: {
    js: "#!/usr/bin/env node\nimport { createRequire as __probebookRequire } from 'node:module';\nconst require = __probebookRequire(import.meta.url);",
  },
  logLevel: 'warning',
});
chmodSync(join(outdir, 'probebook.js'), 0o755);
