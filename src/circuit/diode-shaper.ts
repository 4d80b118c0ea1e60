import type { StageKind } from './types.js';

// PLACEHOLDER until the stage kind is written: it refuses to evaluate.
export const diodeShaperKind: StageKind<unknown> = {
  kind: 'diode-shaper',
  summary: 'not built yet',
  roles: [],
  outputs: ['out'],
  needsInput: false,
  parse() {
    throw new Error('stage kind diode-shaper is not built yet');
  },
  checks: () => [],
  evaluate() {
    throw new Error('stage kind diode-shaper is not built yet');
  },
  faultHints: {},
};
