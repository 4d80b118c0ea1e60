import {
  evaluateSallenKey,
  parseSallenKey,
  sallenKeyChecks,
  sallenKeyFaults,
  sallenKeyHints,
  sallenKeyInputImpedance,
  type SallenKeySettings,
} from './sallen-key.js';
import type { StageKind } from './types.js';

const checks = sallenKeyChecks('highpass');

export const sallenKeyHighpassKind: StageKind<SallenKeySettings> = {
  kind: 'sallen-key-highpass',
  summary:
    'second-order Sallen–Key high-pass: f0 1/(2π√(R1R2C1C2)), Q and passband gain K = 1 + Rf/Rg (a follower without them), shifted by the op-amp gain-bandwidth; swing and slew limits',
  roles: [
    { role: 'C1', unit: 'F', description: 'capacitor from the input to node A' },
    { role: 'C2', unit: 'F', description: 'capacitor from node A to the + input' },
    { role: 'R1', unit: 'Ω', description: 'resistor from node A to the output (the feedback one)' },
    { role: 'R2', unit: 'Ω', description: 'resistor from the + input to ground (sets the DC level)' },
    { role: 'Rf', unit: 'Ω', description: 'gain resistor, output to − input', optional: true },
    { role: 'Rg', unit: 'Ω', description: 'gain resistor, − input to ground', optional: true },
  ],
  outputs: ['out'],
  needsInput: true,
  parse: (raw, file) => parseSallenKey('highpass', raw, file),
  checks: () => checks,
  evaluate: (input) => evaluateSallenKey('highpass', input),
  traits: { usesOpamp: true },
  inputImpedance: (x, f) => sallenKeyInputImpedance('highpass', x, f),
  faults: sallenKeyFaults,
  faultHints: sallenKeyHints('highpass'),
};
