import { spawnSync } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { stageKinds } from '../../src/circuit/registry.js';
import { tmuxSession } from '../helpers/tmux-session.js';

// `probebook plan new` in a real terminal: tmux runs the command from the sources
// (tsx: the bundle may be rebuilt by another test meanwhile) in an 80×24 window,
// keys go in with send-keys, the screen comes back from capture-pane. A two-stage
// plan (an invented generator into an RC low-pass) is written from nothing, saved,
// and `probebook targets` on the saved file must print the nominal figures the
// editor showed.

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const term = tmuxSession('probebook-editor', 30_000);
const { capture, keys, typeText, screen } = term;
const tsx = join(repo, 'node_modules', '.bin', 'tsx');
let dir = '';

/** Move down until the selected line (the pointer ›) shows `label`. */
async function select(label: RegExp) {
  for (let i = 0; i < 60; i++) {
    const line = capture()
      .split('\n')
      .find((l) => l.startsWith('›'));
    if (line && label.test(line)) return;
    keys('Down');
    await new Promise((r) => setTimeout(r, 120));
  }
  throw new Error(`no row ${String(label)}; the terminal shows:\n${capture()}`);
}
/** Type over the selected field: open it, clear it, type, keep it. */
async function typeOver(name: string, text: string) {
  keys('Enter');
  // The field, with the parser's reading (or a hint) on the line under it.
  await screen(new RegExp(`^${name}:.*\n(✓|✗|Enter keeps)`, 'm'));
  for (let i = 0; i < 14; i++) keys('BSpace');
  await screen(new RegExp(`^${name}: *\n`, 'm'));
  await typeText(text);
  await screen(new RegExp(`^${name}: ${text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}`, 'm'));
  keys('Enter');
}
async function addStage(kind: string) {
  keys('a');
  await screen('Add a stage');
  const at = Object.keys(stageKinds).indexOf(kind);
  for (let i = 0; i < at; i++) keys('Down');
  await screen(new RegExp(`› ${kind}`));
  keys('Enter');
  await screen(`added a ${kind} stage`);
}

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'probebook-editor-e2e-'));
});

afterAll(async () => {
  term.kill();
  await rm(dir, { recursive: true, force: true });
});

describe('probebook plan new in a real terminal', () => {
  test('a two-stage plan from nothing, saved, gives the same nominal figures with probebook targets', async () => {
    const env = `CI=false NO_COLOR=1 PROBEBOOK_CACHE='${join(dir, 'cache')}'`;
    const command = `cd '${dir}' && ${env} '${tsx}' --tsconfig '${join(repo, 'tsconfig.json')}' '${join(repo, 'src/cli/bin.ts')}' plan new board.plan.json; echo "probebook exited $?"; sleep 60`;
    term.start(`cd '${repo}' && ${command}`);
    let frame = await screen('probebook · plan editor · board.plan.json', 60_000);
    expect(frame).toMatch(/plan id\s+board/);
    await screen('a plan needs at least one stage');

    await addStage('signal-in');
    await select(/peak\s+1 V 2%/);
    await typeOver('peak', '2 V 1%');
    await screen(/peak\s+2 V 1%/);

    await addStage('rc-lowpass');
    await select(/^›.\s*R\s+10k 1%/);
    // A slip first: the parser's own words on the line under the field, nothing stored.
    keys('Enter');
    await screen(/^R: 10k 1%/m);
    keys('BSpace', 'BSpace', 'BSpace', 'BSpace', 'BSpace', 'BSpace');
    await typeText('3k3 q');
    frame = await screen(/✗ "3k3 q": .*not a unit or prefix/);
    keys('Escape');
    // Esc drops what was typed: the field closes and the row keeps its value.
    await screen(/^(?![\s\S]*3k3 q)[\s\S]*^›.\s*R\s+10k 1%/m);
    await typeOver('R', '3k3 1%');
    await select(/^›.\s*C\s+10n 5%/);
    await typeOver('C', '4n7 5%');
    await select(/TP out/);
    await typeOver('TP out', 'TP2');

    // A bigger window for a moment: the targets move beside the form; then back.
    term.resize(130, 30);
    // Side by side: a form row and the targets' title share a line; the statistical band has its column.
    await screen(/^ .*\S\s{2,}Targets of rc[\s\S]*check\s+nominal\s+worst-case band\s+statistical band/m);
    term.resize(80, 24);
    frame = await screen(/Targets of rc \(2\) · statistical band done/);
    const shown = new Map<string, string>();
    for (const m of frame.matchAll(/^(rc\.\S+)\s+(\S+ \S+)\s{2,}/gm)) shown.set(m[1] as string, m[2] as string);
    expect([...shown.keys()].sort()).toEqual(['rc.fc', 'rc.out.vpp']);

    keys('s');
    await screen('saved board.plan.json');
    keys('Escape');
    await screen('probebook exited 0');

    const text = await readFile(join(dir, 'board.plan.json'), 'utf8');
    const saved = JSON.parse(text) as {
      stages: { id: string; kind: string; input?: string; parts?: Record<string, string>; peak?: string; testPoints?: Record<string, string> }[];
    };
    expect(saved.stages.map((s) => [s.id, s.kind, s.input])).toEqual([
      ['signal', 'signal-in', undefined],
      ['rc', 'rc-lowpass', 'signal.out'],
    ]);
    expect(saved.stages[0]?.peak).toBe('2 V 1%');
    expect(saved.stages[1]?.parts).toEqual({ R: '3k3 1%', C: '4n7 5%' });
    expect(saved.stages[1]?.testPoints).toEqual({ out: 'TP2' });

    const targets = spawnSync(
      tsx,
      ['--tsconfig', join(repo, 'tsconfig.json'), join(repo, 'src/cli/bin.ts'), 'targets', 'board.plan.json', '--cache', join(dir, 'cache')],
      { cwd: dir, encoding: 'utf8' },
    );
    expect(targets.status).toBe(0);
    for (const [check, nominal] of shown) expect(targets.stdout).toMatch(new RegExp(`^${check.replace('.', '\\.')}\\s+(TP2\\s+)?${nominal}\\s`, 'm'));
    // First-order low-pass, fc = 1/(2πRC) (any circuits handbook): 3k3 and 4n7 give 10.26 kHz.
    expect(shown.get('rc.fc')).toBe('10.26 kHz');
  }, 240_000);
});
