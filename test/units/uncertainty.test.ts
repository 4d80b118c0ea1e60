import { expect, test } from 'vitest';
import { parseUncertainty, uncertaintyOf } from '../../src/units/uncertainty.js';

test('meter-style uncertainty: % of reading + absolute', () => {
  const spec = parseUncertainty('0.5% + 2 mV', 'V');
  expect(spec).toEqual({ relative: 0.005, absolute: 0.002 });
  // 0.5 % of 12 V = 60 mV, plus 2 mV (arithmetic, no source needed)
  if (typeof spec !== 'string') expect(uncertaintyOf(-12, spec)).toBeCloseTo(0.062, 12);
});

test('bad specs give a message', () => {
  expect(typeof parseUncertainty('0.5% + 2 mA', 'V')).toBe('string');
  expect(typeof parseUncertainty('', 'V')).toBe('string');
});
