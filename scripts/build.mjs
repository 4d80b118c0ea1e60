// Build the `probebook` command: one production bundle (dist/probebook.js).
// A bundle starts much faster than tsx or unbundled imports of react and ink.
import { build } from 'esbuild';
import { chmodSync } from 'node:fs';

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

await build({
  entryPoints: ['src/cli/bin.ts'],
  outfile: 'dist/probebook.js',
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'esm',
  minify: true,
  sourcemap: 'linked',
  legalComments: 'linked',
  plugins: [noDevtools],
  // Ink's layout engine (yoga, Emscripten) asks `typeof fetch` before it decodes
  // its embedded wasm; in Node 20 that touches the lazy global and loads undici
  // (tens of ms at start-up) to fetch a data: URL. probebook never uses fetch.
  define: { 'process.env.NODE_ENV': '"production"', fetch: 'undefined' },
  banner: {
    js: "#!/usr/bin/env node\nimport { createRequire as __probebookRequire } from 'node:module';\nconst require = __probebookRequire(import.meta.url);",
  },
  logLevel: 'warning',
});
chmodSync('dist/probebook.js', 0o755);

// The bench screen computes a plan's targets (the Monte Carlo) in a worker thread
// so the screen keeps drawing: a second, small bundle beside the first.
await build({
  entryPoints: ['src/ui/bench/targets-worker.ts'],
  outfile: 'dist/targets-worker.js',
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'esm',
  minify: true,
  legalComments: 'none',
  define: { 'process.env.NODE_ENV': '"production"' },
  banner: { js: "import { createRequire as __probebookRequire } from 'node:module';\nconst require = __probebookRequire(import.meta.url);" },
  logLevel: 'warning',
});
