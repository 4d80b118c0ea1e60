import { describe, expect, test } from 'vitest';
import { invertingAmpKind } from '../../src/circuit/inverting-amp.js';
import type { OpampModel, Waveform } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { StageParseError } from '../../src/circuit/errors.js';
import { corner, runSpice } from '../helpers/ngspice.js';
import { opampSubcktFor } from '../helpers/spice-opamp.js';

// Invented op-amp and supplies for the tests (not a particular part).
const opamp: OpampModel = { gbw: 1e6, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
const supplies = { pos: 12, neg: -12 };

function run(parts: Record<string, number>, input: Waveform, op: OpampModel = opamp) {
  return invertingAmpKind.evaluate({ parts, settings: {}, opamp: op, supplies, rails: {}, input });
}

function deck(op: OpampModel, rin: number, rf: number, source: string): string {
  return `${opampSubcktFor('opa', op, supplies)}\n${source}\nRin in inn ${rin}\nRf inn out ${rf}\nX1 0 inn out opa`;
}

const sine = (peak: number, f: number): Waveform => fromPhase(f, (p) => peak * Math.sin(2 * Math.PI * p));

describe('inverting-amp against ngspice AC (behavioural single-pole op-amp)', () => {
  test.each([
    { rin: 10e3, rf: 33e3, op: opamp },
    { rin: 2.2e3, rf: 100e3, op: { ...opamp, gbw: 3e6, aol: 1e5 } },
  ])('Rin $rin, Rf $rf: gain and −3 dB bandwidth', ({ rin, rf, op }) => {
    const t = runSpice(deck(op, rin, rf, 'Vin in 0 DC 0 AC 1'), 'ac dec 200 1 100meg', ['vm(out)', 'vp(out)']);
    const mag = t['vm(out)'] as Float64Array;
    const phase = t['vp(out)'] as Float64Array;
    const r = run({ Rin: rin, Rf: rf }, sine(0.1, 100), op);
    // ngspice AC at 1 Hz: |gain| within 0.1 %, and the output inverted (phase ±π).
    expect(Math.abs(Math.abs(r.values['gain'] as number) - (mag[0] as number)) / (mag[0] as number)).toBeLessThan(1e-3);
    expect(Math.abs(Math.abs(phase[0] as number) - Math.PI)).toBeLessThan(0.01);
    expect(r.values['gain']).toBeLessThan(0);
    // ngspice AC −3 dB point (200 points/decade, log-interpolated): within 1 %.
    const bw = corner(t['frequency'] as Float64Array, mag);
    expect(Math.abs((r.values['bw'] as number) - bw) / bw).toBeLessThan(0.01);
    // Sedra and Smith: GBW / (1 + Rf/Rin) within 0.1 % when aol ≫ noise gain.
    const ideal = op.gbw / (1 + rf / rin);
    expect(Math.abs((r.values['bw'] as number) - ideal) / ideal).toBeLessThan(1e-3);
  });

  test('output vpp against an ngspice transient: a triangle that clips, and one that is attenuated by the bandwidth', () => {
    const f = 1000;
    const peak = 4;
    const source = `Vin in 0 PWL(0 0 ${0.25 / f} ${peak} ${0.75 / f} ${-peak} ${1 / f} 0) r=0`;
    for (const { rf, freq } of [
      { rf: 33e3, freq: f },
      { rf: 10e3, freq: f },
    ]) {
      const t = runSpice(deck(opamp, 10e3, rf, source), `tran ${1 / (freq * 2000)} ${5 / freq} ${4 / freq} ${1 / (freq * 2000)}`, ['v(out)']);
      const v = t['v(out)'] as Float64Array;
      const spiceVpp = Math.max(...v) - Math.min(...v);
      const tri = fromPhase(freq, (p) => peak * (p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4));
      const r = run({ Rin: 10e3, Rf: rf }, tri);
      // ngspice transient (last of five periods): within 2 %.
      expect(Math.abs((r.values['out.vpp'] as number) - spiceVpp) / spiceVpp).toBeLessThan(0.02);
      if (rf === 33e3) expect(r.warnings.map((w) => w.message).join()).toMatch(/clips/);
    }
  });

  test('a sine above the full-power bandwidth slews: SR/(2π·Vpeak) in the warning, vpp against ngspice', () => {
    // 8 V peak at 0.5 V/µs: full-power bandwidth 0.5e6 / (2π·8) = 9.947 kHz (op-amp datasheet definition).
    const fast = run({ Rin: 10e3, Rf: 20e3 }, sine(4, 20e3));
    const m = /full-power bandwidth at ([\d.]+) V peak is ([\d.]+) kHz/.exec(fast.warnings.map((w) => w.message).join());
    expect(m).not.toBeNull();
    const vpeak = Number(m?.[1]);
    // Full-power bandwidth SR/(2π·Vpeak) (Sedra and Smith), 0.5 V/µs at 8 V peak ≈ 9.95 kHz: 1 % and 0.1 %.
    expect(Math.abs(vpeak - 8) / 8).toBeLessThan(0.01);
    expect(Math.abs(Number(m?.[2]) * 1e3 - 0.5e6 / (2 * Math.PI * vpeak)) / 9947).toBeLessThan(1e-3);
    const slow = run({ Rin: 10e3, Rf: 20e3 }, sine(4, 2e3));
    expect(slow.warnings).toEqual([]);
    const f = 20e3;
    const t = runSpice(deck(opamp, 10e3, 20e3, `Vin in 0 SIN(0 4 ${f})`), `tran ${1 / (f * 2000)} ${8 / f} ${6 / f} ${1 / (f * 2000)}`, ['v(out)']);
    const v = t['v(out)'] as Float64Array;
    const spiceVpp = Math.max(...v) - Math.min(...v);
    // A slewing output is a triangle of SR/(2f) peak-to-peak per half period; ngspice's tanh stage within 5 %.
    expect(Math.abs((fast.values['out.vpp'] as number) - spiceVpp) / spiceVpp).toBeLessThan(0.05);
    expect(fast.values['out.vpp']).toBeLessThan(15);
  });
});

describe('inverting-amp plan', () => {
  const parse = (json: Record<string, unknown>) => invertingAmpKind.parse({ json, path: 'stages[2]' }, 'x.plan.json');
  test('reads Rin and Rf with tolerances', () => {
    expect(parse({ parts: { Rin: '10k 1%', Rf: '33k 1%' } }).parts['Rf']).toMatchObject({ nominal: 33e3, tol: 0.01, unit: 'Ω' });
  });
  test.each([
    [{ parts: { Rin: '10k' } }, /stages\[2\]\.parts\.Rf: missing; write a resistance, e.g. "33k 1%"/],
    [{ parts: { Rin: '10k', Rf: '33x' } }, /stages\[2\]\.parts\.Rf: .*write e\.g\. "33k 1%"/],
    [{ parts: { Rin: '0', Rf: '33k' } }, /stages\[2\]\.parts\.Rin: "0" must be above zero/],
    [{ parts: { Rin: '10k', Rf: '33k', Rg: '1k' } }, /stages\[2\]\.parts\.Rg: is not a key here/],
    [{}, /stages\[2\]\.parts: missing/],
  ])('%j', (json, message) => {
    expect(() => parse(json)).toThrow(StageParseError);
    expect(() => parse(json)).toThrow(message);
  });
  test('fault hints name the swapped resistors', () => {
    expect(invertingAmpKind.faultHints['gain']?.join(' ')).toMatch(/swapped.*1\/gain/);
  });
});
