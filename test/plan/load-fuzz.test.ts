import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { PlanError } from '../../src/plan/errors.js';
import { loadPlanText } from '../../src/plan/load.js';

// Fuzzing the plan loader: whatever the file holds, loading it either gives a plan
// or throws a PlanError with one line; nothing else escapes (no stack overflow,
// no TypeError), and nothing takes long. Fixed examples first: the cases an
// attack on the notebook found (issue 10), then properties around the demo plan.

const demo = readFileSync('demo/exciter.plan.json', 'utf8');
const demoJson = JSON.parse(demo) as Record<string, unknown>;

function outcome(text: string): 'plan' | 'refused' {
  try {
    loadPlanText(text, 'fuzz.plan.json');
    return 'plan';
  } catch (error) {
    if (!(error instanceof PlanError)) throw error;
    expect(error.message).not.toContain('\n');
    expect(error.message.length).toBeLessThan(2000);
    return 'refused';
  }
}

describe('fixed examples', () => {
  test.each([
    ['invalid JSON 10,000 levels deep', '['.repeat(10_000)],
    ['objects 10,000 levels deep', '{"a":'.repeat(10_000)],
    [
      'valid JSON nested deep inside a stage',
      demo.replace('"stages": [', `"stages": [{"id": "deep", "kind": "manual", "x": ${'['.repeat(5000)}${']'.repeat(5000)}}, `),
    ],
    ['a title with an escape sequence and 300 characters', JSON.stringify({ ...demoJson, title: `\u001b[2J${'t'.repeat(300)}` })],
    ['a rail id with a newline', JSON.stringify({ ...demoJson, rails: [{ id: '+12V\nforged', nominal: '12 V', tol: '3%' }] })],
    [
      '201 stages',
      JSON.stringify({
        ...demoJson,
        stages: Array.from({ length: 201 }, (_, i) => ({ id: `s${i}`, kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz' })),
      }),
    ],
    ['a part value with a space inside the number', demo.replace('"10k 1%"', '"1 0k 1%"')],
    ['a part value with an ambiguous comma', demo.replace('"10k 1%"', '"10,000 1%"')],
    ['a 130 k space value', demo.replace('"10k 1%"', `"1${' '.repeat(130_000)}0k 1%"`)],
  ])('%s is refused with one line', (_name, text) => {
    expect(outcome(text)).toBe('refused');
  });

  test('the demo plan itself loads', () => {
    expect(outcome(demo)).toBe('plan');
  });
});

describe('properties', () => {
  test('random text never escapes as anything but a PlanError', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 200 }), (text) => {
        outcome(text);
      }),
      { numRuns: 300 },
    );
  });

  test('the demo plan with one value replaced by random text', () => {
    const values = [...demo.matchAll(/"(\d[^"]*)"/g)].map((m) => m[1] ?? '');
    fc.assert(
      fc.property(fc.constantFrom(...values), fc.string({ maxLength: 30 }), (value, replacement) => {
        outcome(demo.replace(`"${value}"`, JSON.stringify(replacement)));
      }),
      { numRuns: 200 },
    );
  });

  test('the demo plan cut short anywhere', () => {
    fc.assert(
      fc.property(fc.nat({ max: demo.trimEnd().length - 1 }), (at) => {
        expect(outcome(demo.slice(0, at))).toBe('refused');
      }),
      { numRuns: 200 },
    );
  });
});

describe('long runs of spaces in the plan keys with patterns of their own', () => {
  // A rail tolerance of 50 k spaces took seconds (quadratic backtracking); now a one-line refusal.
  test.each([
    ['a rail tolerance', (s: string) => demo.replace('"tol": "2%"', `"tol": "${s}x"`)],
    ['an instrument uncertainty', (s: string) => demo.replace(/"V": "[^"]*"/, `"V": "1${s}x"`)],
  ])('%s', (_name, make) => {
    const text = make(' '.repeat(50_000));
    expect(text).not.toBe(demo);
    expect(outcome(text)).toBe('refused');
  });
});
