import { mkdtempSync, rmSync, writeFileSync, mkdirSync, copyFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { afterAll, describe, expect, test, vi } from 'vitest';
import { type CaptureAttachResult, CaptureAttach } from '../../src/ui/capture/capture-attach.js';
import { completePath } from '../../src/ui/capture/path-complete.js';
import { progressBar } from '../../src/ui/capture/view.js';
import { keys } from './keys.js';
import { type Rendered, waitForFrame, writeAndWait } from './wait-frame.js';

const demo = join(import.meta.dirname, '..', '..', 'demo', 'captures');
const dir = mkdtempSync(join(tmpdir(), 'probebook-attach-'));
mkdirSync(join(dir, 'scope'));
copyFileSync(join(demo, 'driver-notch.tsv'), join(dir, 'scope', 'driver-notch.tsv'));
copyFileSync(join(demo, 'osc-square-triangle.csv'), join(dir, 'scope', 'osc-square.csv'));
writeFileSync(join(dir, 'scope', 'osc-short.csv'), 'Time (s),V\n0,1\n1e-6,2\n');
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Wait until the frame contains `text` (the read runs in the background). */
const frameWith = (ui: Rendered, text: string): Promise<string> => waitForFrame(ui, text);

describe('path completion', () => {
  test('one match completes, a folder gets its slash, several complete to the common prefix', () => {
    expect(completePath('sc', dir).text).toBe('scope/');
    const several = completePath('scope/osc-', dir);
    expect(several.text).toBe('scope/osc-s');
    expect(several.candidates).toEqual(['osc-short.csv', 'osc-square.csv']);
    expect(completePath('scope/osc-sq', dir).text).toBe('scope/osc-square.csv');
    expect(completePath('nothing', dir).matches).toBe(0);
  });

  test('progress bar', () => {
    expect(progressBar(0.456, 10)).toBe('[#####.....]  45 %');
    expect(progressBar(2, 4)).toBe('[####] 100 %');
  });
});

describe('CaptureAttach', () => {
  test('Tab completes, Enter reads and shows the figures, Enter again hands them back', async () => {
    const onDone = vi.fn<(r: CaptureAttachResult) => void>();
    const onCancel = vi.fn();
    const ui = render(<CaptureAttach onDone={onDone} onCancel={onCancel} expect="sine" cwd={dir} width={70} />);
    const { stdin, unmount } = ui;
    await waitForFrame(ui, 'Attach a capture');
    expect(ui.lastFrame()).toContain('Attach a capture (CSV or WAV), expecting a sine');
    await writeAndWait(ui, 'scope/dr');
    stdin.write(keys.tab);
    await frameWith(ui, 'file: scope/driver-notch.tsv');
    stdin.write(keys.enter);
    const frame = await frameWith(ui, 'Enter attach these figures');
    expect(frame).toContain('shape         sine, crossover notch');
    expect(frame).toContain('⚠ expected a sine; the capture has a crossover notch');
    expect(frame).toContain('─ captured');
    await writeAndWait(ui, keys.enter);
    expect(onDone).toHaveBeenCalledTimes(1);
    const result = onDone.mock.calls[0]?.[0];
    expect(result?.path).toBe(join(dir, 'scope', 'driver-notch.tsv'));
    expect(result?.measurements.notch).toBe(true);
    // The demo file's own settings (invented, demo/make-captures.ts): 5 µs steps, 4000 rows.
    expect(result?.sampleRate).toBeCloseTo(200e3, 3);
    expect(result?.samples.length).toBe(4000);
    // The file's own bytes, for the log's copy by hash: the same bytes as on disk.
    expect(result?.bytes.length).toBe(66404);
    expect(Buffer.compare(Buffer.from(result?.bytes ?? []), readFileSync(join(dir, 'scope', 'driver-notch.tsv')))).toBe(0);
    expect(onCancel).not.toHaveBeenCalled();
    unmount();
  });

  test('several matches are listed; a bad file shows its reason and keeps the path for editing', async () => {
    const ui = render(<CaptureAttach onDone={() => {}} onCancel={() => {}} cwd={dir} />);
    const { stdin, unmount } = ui;
    await waitForFrame(ui, 'Attach a capture');
    await writeAndWait(ui, 'scope/osc-');
    stdin.write(keys.tab);
    const listed = await frameWith(ui, 'osc-short.csv  osc-square.csv');
    expect(listed).toContain('file: scope/osc-s');
    await writeAndWait(ui, 'h');
    stdin.write(keys.tab);
    await frameWith(ui, 'file: scope/osc-short.csv');
    stdin.write(keys.enter);
    const refused = await frameWith(ui, 'only 2 samples');
    expect(refused).toContain('file: scope/osc-short.csv');
    unmount();
  });

  test('Esc on the figures goes back to the path; Esc on the path cancels', async () => {
    const onCancel = vi.fn();
    const onDone = vi.fn();
    const ui = render(<CaptureAttach onDone={onDone} onCancel={onCancel} cwd={dir} />);
    const { stdin, unmount } = ui;
    await waitForFrame(ui, 'Attach a capture');
    await writeAndWait(ui, 'scope/osc-square.csv --channel 2');
    stdin.write(keys.enter);
    const figures = await frameWith(ui, 'channel TRIANGLE');
    expect(figures).toContain('shape         triangle');
    expect(figures).toContain('also in the file: 1 SQUARE (add --channel N to the path)');
    stdin.write(keys.escape);
    await frameWith(ui, 'Tab complete');
    await writeAndWait(ui, keys.escape);
    expect(onCancel).toHaveBeenCalledTimes(1);
    expect(onDone).not.toHaveBeenCalled();
    unmount();
  });

  test('a missing file and a bad setting are messages, not crashes', async () => {
    const ui = render(<CaptureAttach onDone={() => {}} onCancel={() => {}} cwd={dir} />);
    const { stdin, unmount } = ui;
    await waitForFrame(ui, 'Attach a capture');
    await writeAndWait(ui, 'nope.csv');
    stdin.write(keys.enter);
    await frameWith(ui, 'no such file');
    for (let i = 0; i < 8; i++) {
      // One key at a time, as a terminal sends them.
      await writeAndWait(ui, keys.backspace);
    }
    await writeAndWait(ui, 'x.wav --scale -3');
    stdin.write(keys.enter);
    await frameWith(ui, '--scale -3: give a positive voltage');
    unmount();
  });

  test('keys are ignored while inactive', async () => {
    const onCancel = vi.fn();
    const ui = render(<CaptureAttach onDone={() => {}} onCancel={onCancel} cwd={dir} isActive={false} />);
    const { stdin, unmount } = ui;
    await waitForFrame(ui, 'Attach a capture');
    stdin.write('abc');
    await writeAndWait(ui, keys.escape);
    expect(ui.lastFrame()).not.toContain('abc');
    expect(onCancel).not.toHaveBeenCalled();
    unmount();
  });
});
