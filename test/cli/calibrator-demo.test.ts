import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { main } from '../../src/cli/main.js';

/** Run in-process with captured output, from the repository root. */
async function run(args: readonly string[]): Promise<{ status: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const status = await main(args, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t), env: {}, cwd: process.cwd() });
  return { status, stdout, stderr };
}

interface JsonTarget {
  check: string;
  stage: string;
  nominal: number | null;
  worst: { min: number | null; max: number | null };
  stat: { min: number | null; max: number | null };
}

const file = 'demo/calibrator.plan.json';
const secondSet = [
  'rc-highpass',
  'sallen-key-lowpass',
  'sallen-key-highpass',
  'mfb-bandpass',
  'regulator',
  'zener-shunt',
  'wien-bridge',
  'comparator',
  'common-emitter',
  'timer-astable',
];

describe('the calibrator demo plan (invented board)', () => {
  const raw = JSON.parse(readFileSync(file, 'utf8')) as { note: string; stages: { id: string; kind: string; parts?: Record<string, string> }[] };

  test('says it is invented and is built from the second set of stage kinds', () => {
    expect(raw.note).toMatch(/[Ii]nvented/);
    const kinds = new Set(raw.stages.map((s) => s.kind).filter((k) => secondSet.includes(k)));
    // The issue asks for at least six of the ten.
    expect(kinds.size).toBeGreaterThanOrEqual(6);
  });

  test('targets --json: every stage check has a nominal inside its bands, and no design warnings', async () => {
    const r = await run(['targets', file, '--json', '--trials', '1000']);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const json = JSON.parse(r.stdout) as { plan: string; targets: JsonTarget[]; warnings: { stage: string; message: string }[] };
    expect(json.plan).toBe('calibrator-demo');
    expect(json.warnings).toEqual([]);
    for (const t of json.targets.filter((x) => x.stage !== 'rails')) {
      expect(Number.isFinite(t.nominal), t.check).toBe(true);
      expect(t.nominal as number).toBeGreaterThanOrEqual(t.worst.min as number);
      expect(t.nominal as number).toBeLessThanOrEqual(t.worst.max as number);
      expect(t.stat.min as number).toBeGreaterThanOrEqual(t.worst.min as number);
      expect(t.stat.max as number).toBeLessThanOrEqual(t.worst.max as number);
    }
    // The tone: f = 1/(ln 2·(Ra + 2Rb)·C) with the plan's 4k7, 33k, 22n (the timer's data sheets' form) = 927.5 Hz.
    const tone = json.targets.find((t) => t.check === 'tone.freq');
    expect(tone?.nominal as number).toBeCloseTo(1 / (Math.LN2 * (4.7e3 + 2 * 33e3) * 22e-9), 6);
    // The comparator flags the sine tone: it switches at the oscillator's frequency, 50 % duty on a symmetric sine.
    const osc = json.targets.find((t) => t.check === 'osc.freq');
    const flag = json.targets.find((t) => t.check === 'present.freq');
    expect(flag?.nominal).toBe(osc?.nominal);
    expect(json.targets.find((t) => t.check === 'present.duty')?.nominal as number).toBeCloseTo(0.5, 3);
  });
});
