// Build the `probebook` command: one production bundle (dist/probebook.js).
// A bundle starts much faster than tsx or unbundled imports of react and ink.
import { build } from 'esbuild';
import { chmodSync } from 'node:fs';

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
  // Ink loads the React devtools only when DEV is set; never bundled.
  external: ['react-devtools-core'],
  define: { 'process.env.NODE_ENV': '"production"' },
  banner: {
    js: "#!/usr/bin/env node\nimport { createRequire as __probebookRequire } from 'node:module';\nconst require = __probebookRequire(import.meta.url);",
  },
  logLevel: 'warning',
});
chmodSync('dist/probebook.js', 0o755);
