// The conventions a new user meets first (issue 9 item 11): --version, -h and
// --help on every command, a top-level usage that lists every command, the
// licence file, what the package ships, and no unused dependency.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { commands, usage } from '../../src/cli/main.js';
import { cli, cliProcess } from '../log/fixtures/run-cli.js';

const root = join(import.meta.dirname, '../..');
const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as Record<string, unknown> & {
  version: string;
  files: string[];
  dependencies: Record<string, string>;
  devDependencies: Record<string, string>;
  allowScripts?: Record<string, boolean>;
};

describe('probebook conventions', () => {
  test('--version prints the package version and exits 0 (as a shell sees it)', () => {
    const r = cliProcess(['--version']);
    expect(r.status).toBe(0);
    expect(r.stdout).toBe(`probebook ${pkg.version}\n`);
  });

  test.each(['-h', '--help'])('%s on every command exits 0 with its usage on stdout and nothing on stderr', async (flag) => {
    for (const argv of [[flag], ...Object.keys(commands).map((c) => [c, flag]), ['report', '--batch', flag]]) {
      const r = await cli(argv);
      expect(r.stderr, argv.join(' ')).toBe('');
      expect(r.status, argv.join(' ')).toBe(0);
      expect(r.stdout, argv.join(' ')).toMatch(/^usage:/);
    }
  });

  test('the TUI answers -h without a terminal', () => {
    const r = cliProcess(['--log', '/tmp/probebook-no-such-log', '-h']);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^usage: probebook \[--log DIR\]/);
  });

  test.each([
    ['targets', 'demo/exciter.plan.json', '--cache='],
    ['history', 'X-1', '--cache', ''],
    ['batch', '--cache='],
    ['report', 'X-1', '--cache='],
  ])('an empty --cache is refused with one line (%s)', async (...argv) => {
    const r = await cli(argv);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('probebook: --cache needs a folder; leave it out to use $PROBEBOOK_CACHE or ~/.cache/probebook\n');
  });

  test('the top-level usage names every command, report --batch included (DESIGN §7)', () => {
    for (const name of Object.keys(commands)) expect(usage).toContain(`probebook ${name} `);
    expect(usage).toContain('probebook report --batch --format md|csv');
    expect(usage).toContain('probebook --version');
  });

  test('LICENSE holds the MIT licence package.json declares', () => {
    const text = readFileSync(join(root, 'LICENSE'), 'utf8');
    expect(pkg.license).toBe('MIT');
    expect(text).toMatch(/^MIT License\n\nCopyright \(c\) \d{4} probebook contributors\n/);
    expect(text).toContain('THE SOFTWARE IS PROVIDED "AS IS", WITHOUT WARRANTY OF ANY KIND');
  });

  test('the package ships the bundle and the demo plans and captures, not sources that need dev tools nor the bundled data', () => {
    expect(pkg.files).toEqual(['dist', 'demo/*.plan.json', 'demo/captures']);
    expect(pkg.files.some((f) => f === 'data' || f === 'demo' || f.endsWith('.ts'))).toBe(false);
  });

  test('no unused dependency: proper-lockfile is gone; esbuild may run its install script', () => {
    expect(pkg.dependencies['proper-lockfile']).toBeUndefined();
    expect(pkg.devDependencies['@types/proper-lockfile']).toBeUndefined();
    expect(readFileSync(join(root, 'package-lock.json'), 'utf8')).not.toContain('proper-lockfile');
    // npm 11's allowScripts field (docs.npmjs.com, npm-install-scripts): every package with an
    // install script in the lockfile is reviewed there, so installs print no warning.
    const lock = JSON.parse(readFileSync(join(root, 'package-lock.json'), 'utf8')) as { packages: Record<string, { hasInstallScript?: boolean }> };
    const scripted = Object.entries(lock.packages)
      .filter(([, p]) => p.hasInstallScript)
      .map(([path]) => path.replace(/^.*node_modules\//, ''));
    expect(scripted).toContain('esbuild');
    for (const name of scripted) expect(pkg.allowScripts?.[name], name).toBe(true);
  });
});
