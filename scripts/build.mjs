// Build the `probebook` command: a production bundle (dist/probebook.js).
// A bundle starts much faster than tsx or unbundled imports of react and ink.
import { build } from 'esbuild';
import { chmodSync, rmSync } from 'node:fs';

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

// One build with code splitting: `dist/probebook.js` (the command) and
// `dist/targets-worker.js` (the bench screen runs a plan's Monte Carlo in a worker
// thread so the screen keeps drawing) share their chunks, and the shell commands
// (`targets`, `analyze`, `record`, …) never parse React and Ink, which live in a
// chunk of their own loaded only for the TUI. Chunks sit beside the entry files:
// the worker is found by `new URL('./targets-worker.js', import.meta.url)`.
rmSync('dist', { recursive: true, force: true });
await build({
  entryPoints: { probebook: 'src/cli/bin.ts', 'targets-worker': 'src/ui/bench/targets-worker.ts' },
  outdir: 'dist',
  chunkNames: 'chunk-[hash]',
  splitting: true,
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
