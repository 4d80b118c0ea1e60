import { describe, expect, test } from 'vitest';
import type { Target } from '../../src/analysis/types.js';
import { boardJson, bringUpSuite, powerUp, renderBringUp, type ScreenOptions } from './bring-up-harness.js';
import { keys } from './keys.js';

const suite = bringUpSuite();
const target = (check: string): Target => {
  const t = suite.fixture.targets.targets.find((x) => x.check === check);
  if (!t) throw new Error(`no ${check}`);
  return t;
};

async function setup(options: ScreenOptions = {}) {
  const { tmp, open } = await suite.setup(options);
  const screen = await open();
  return { ...screen, dir: tmp.dir, log: tmp.log };
}

describe('bring-up screen', () => {
  test('starts with the cautions, then an unpowered check; a reading is saved to the board file', async () => {
    const s = await setup();
    const first = await s.until('Cautions before first power');
    expect(first).toContain('current limit');
    expect(first).toMatch(/local electrical codes/);
    expect(await s.board()).toBeNull();
    await s.press(keys.enter);
    const panel = await s.until('rails.+9V.to-ground ›');
    expect(panel).toContain('resistance to ground');
    expect(panel).toContain('≥ 100 Ω');
    await s.read('OL');
    const saved = await s.until('saved ✓');
    expect(saved).toContain('✓ PASS');
    expect(saved).toContain('within the limit ≥ 100 Ω');
    const board = await s.board();
    expect(board?.runs).toHaveLength(1);
    expect(board?.readings).toMatchObject([{ check: 'rails.+9V.to-ground', value: Infinity, raw: 'OL', verdict: 'pass', operator: 'tester' }]);
  });

  test('pass, marginal and fail readings, with deviation and position in the band', async () => {
    const s = await setup();
    await powerUp(s);
    const f = target('osc.freq');
    // Nominal: deviation 0 % → pass.
    await s.read(f.nominal.toPrecision(12));
    expect(await s.until('✓ PASS')).toMatch(/deviation ±0 % · \d+ % into the band/);
    // Exactly on the band's top edge: reading ± U straddles it → marginal (ILAC-G8 simple acceptance).
    await s.read(`${f.worst.max}`);
    const marginal = await s.until('≈ MARGINAL');
    expect(marginal).toMatch(/100 % into the band/);
    // Twice the nominal: wholly outside → fail, and the deviation is +100 %.
    await s.read(`${2 * f.nominal}`);
    const fail = await s.until('✗ FAIL');
    expect(fail).toMatch(/deviation \+100 % · above the band/);
    const verdicts = (await s.board())?.readings.filter((r) => r.check === 'osc.freq').map((r) => r.verdict);
    expect(verdicts).toEqual(['pass', 'marginal', 'fail']);
  });

  test('a bad value shows the parser message and saves nothing', async () => {
    const s = await setup();
    await powerUp(s);
    const before = await boardJson(s.dir, s.serial);
    await s.type('12 V');
    await s.press(keys.enter);
    expect(await s.until('not recorded')).toMatch(/expected a frequency/);
    expect(await boardJson(s.dir, s.serial)).toBe(before);
    // The typed text stays for editing; Esc clears it.
    expect(s.frame()).toContain('osc.freq › 12 V');
    await s.press(keys.escape);
    await s.until('osc.freq › ');
    expect(s.exits).toHaveLength(0);
  });

  test('a held Backspace arriving as one chunk erases as many characters as it holds', async () => {
    // A terminal sends DEL (0x7F) per Backspace; over tmux or ssh several arrive in one write.
    const s = await setup();
    await s.until('Cautions before first power');
    await s.press(keys.enter);
    await s.until('rails.+9V.to-ground ›');
    await s.type('22k5');
    await s.until('rails.+9V.to-ground › 22k5');
    await s.press(keys.backspace.repeat(3));
    await s.until('rails.+9V.to-ground › 2');
    expect(s.frame()).not.toContain('22k');
  });

  test('a frequency a decade low is explained by a ×10 timing capacitor, osc.Ct', async () => {
    const s = await setup();
    await powerUp(s);
    // With Ct ten times its fitted 22 nF the frequency falls tenfold: f = R2 / (4·R1·Rt·Ct) for the comparator-and-integrator
    // relaxation oscillator (Sedra & Smith, Microelectronic Circuits; formula from memory). The slew time per half period
    // shrinks against the longer ramp, so the part that explains it solves to about 10× (220 nF ± the slew share).
    await s.read(`${target('osc.freq').nominal / 10}`);
    const shown = await s.until('✗ FAIL');
    // The diagnosis of the run names it first; Rt ten times too large gives the same frequency, so it is named beside it.
    expect(shown).toMatch(/1\. \d+ % osc\.Ct 220 nF \(decade slip\): osc\.freq would read 11\d\.\d Hz \(or osc\.Rt\)/);
  });

  test('rework then re-measure: the reworked stage comes up again first', async () => {
    const s = await setup();
    await powerUp(s);
    await s.read(`${target('osc.freq').nominal / 10}`);
    await s.until('✗ FAIL');
    await s.press('r');
    // The form starts from the most likely part and its fitted value.
    await s.until('Rework note');
    expect(s.frame()).toMatch(/› part\s*osc\.Ct/);
    expect(s.frame()).toMatch(/from\s*22n 5%/);
    await s.press(keys.enter, keys.enter);
    await s.type('22n');
    await s.press(keys.enter);
    await s.type('220n fitted by mistake');
    await s.press(keys.enter);
    await s.until(() => !s.frame().includes('Rework note'));
    const board = await s.board();
    // The note starts with what the diagnosis found; the technician's words follow.
    expect(board?.rework).toMatchObject([
      {
        part: 'osc.Ct',
        from: '22n 5%',
        to: '22n',
        note: expect.stringMatching(/^diagnosis 220 nF found \(\d+ %\); 220n fitted by mistake$/),
        run: board?.runs[0]?.id,
      },
    ]);
    // The oscillator's reading no longer counts (↻) and the next suggestion is to measure it again.
    expect(s.frame()).toMatch(/↻ freq/);
    expect(s.frame()).toContain('osc.freq ›');
    await s.read(`${target('osc.freq').nominal}`);
    expect(await s.until('✓ PASS')).toContain('osc.freq =');
  });

  test('resume after unmount continues where the run stopped', async () => {
    const s = await setup();
    await powerUp(s);
    await s.read(`${target('osc.freq').nominal}`);
    const run = (await s.board())?.runs[0]?.id ?? '';
    s.unmount();
    const again = await renderBringUp(suite.fixture, s.log, { resumeRun: run });
    suite.onCleanup(async () => again.unmount());
    await again.until('resumed run');
    await again.press(keys.enter);
    // Every earlier reading keeps its mark and the next check follows osc.freq.
    const shown = await again.until('osc.square.vpp ›');
    expect(shown).toMatch(/✓ freq/);
    expect(shown).toMatch(/✓ \+9V\.dc/);
    await again.read(`${target('osc.square.vpp').nominal}`);
    const board = await again.board();
    expect(board?.runs).toHaveLength(1);
    expect(board?.readings.filter((r) => r.run === run)).toHaveLength(7);
  });

  test('an idle current above the limit stops the run until power-off is acknowledged', async () => {
    const s = await setup();
    await s.until('Cautions before first power');
    await s.press(keys.enter);
    await s.read('OL');
    await s.press(keys.enter);
    await s.read('OL');
    await s.press(keys.enter);
    await s.until('rails.idle-current ›');
    await s.read('120m');
    const stop = await s.until('POWER OFF');
    expect(stop).toContain('120 mA is above the limit');
    expect(stop).toContain('Switch the supply off now');
    // Nothing but the acknowledgement is taken.
    await s.press('r', keys.escape, 'e');
    expect(s.frame()).toContain('POWER OFF');
    expect(s.exits).toHaveLength(0);
    await s.press(keys.enter);
    const after = await s.until('rails.+9V.to-ground ›');
    expect(after).toMatch(/↻ \+9V\.to-ground/);
    expect((await s.board())?.readings.at(-1)).toMatchObject({ check: 'rails.idle-current', verdict: 'fail' });
  });

  test('fits 80×24 without wrapping, and reports a half-typed value as dirty', async () => {
    const s = await setup({ width: 80, height: 24 });
    await powerUp(s);
    await s.type('1.1');
    await s.until('osc.freq › 1.1');
    const lines = s.frame().split('\n');
    expect(lines.length).toBeLessThanOrEqual(24);
    for (const line of lines) expect([...line].length).toBeLessThanOrEqual(80);
    expect(s.dirty.at(-1)).toBe(true);
    await s.press(keys.escape);
    await s.until(() => s.dirty.at(-1) === false);
  });

  test('? shows help, Esc on an empty input goes back', async () => {
    const s = await setup();
    await s.until('Cautions before first power');
    await s.press(keys.enter);
    await s.until('rails.+9V.to-ground ›');
    await s.press('?');
    expect(await s.until('Help — bring-up screen')).toContain('Enter (empty)');
    await s.press('?');
    await s.until('rails.+9V.to-ground ›');
    await s.press(keys.escape);
    expect(s.exits).toHaveLength(1);
  });
});
