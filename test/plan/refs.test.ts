import { describe, expect, test } from 'vitest';
import { partWithRef, refsOfPlanText } from '../../src/plan/refs.js';

describe('reference designators of a plan', () => {
  const text = JSON.stringify({ stages: [{ id: 'osc', refs: { Ct: 'C7', clamp: 'D3/D4' } }, { id: 'gain', refs: { Rf: 'R14', Rg: ' ' } }, { id: 'x' }] });
  test('by part, read from the plan text', () => {
    expect([...refsOfPlanText(text)]).toEqual([
      ['osc.Ct', 'C7'],
      ['osc.clamp', 'D3/D4'],
      ['gain.Rf', 'R14'],
    ]);
    expect(refsOfPlanText('{not json').size).toBe(0);
    expect(refsOfPlanText(null).size).toBe(0);
  });
  test("a part with its designator; a part inside a group takes the group's; none leaves the part alone", () => {
    const refs = refsOfPlanText(text);
    expect(partWithRef('osc.Ct', refs)).toBe('osc.Ct (C7)');
    expect(partWithRef('osc.clamp.vz', refs)).toBe('osc.clamp.vz (D3/D4)');
    expect(partWithRef('osc.Rt', refs)).toBe('osc.Rt');
    expect(partWithRef('rails.+12V', refs)).toBe('rails.+12V');
  });
});
