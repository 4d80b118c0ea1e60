import type { Phase, Target } from '../../src/analysis/types.js';
import type { RunPlanShape, RunReading, RunRework } from '../../src/run/types.js';
import type { Unit } from '../../src/units/unit.js';

// Hand-made targets for reducer tests: invented values, a split ±12 V board with
// an oscillator feeding a shaper feeding a gain stage.
function target(check: string, stage: string, phase: Phase, unit: Unit, nominal: number, min: number, max: number): Target {
  return {
    check,
    stage,
    quantity: check.split('.').slice(-1)[0] ?? '',
    unit,
    nominal,
    worst: { min, max },
    stat: { min, max },
    testPoint: null,
    contributors: [],
    instrument: 'meter',
    how: 'meter',
    phase,
  };
}

export const targets: readonly Target[] = [
  target('rails.+12V.to-ground', 'rails', 'unpowered', 'Ω', Infinity, 100, Infinity),
  target('rails.-12V.to-ground', 'rails', 'unpowered', 'Ω', Infinity, 100, Infinity),
  target('rails.idle-current', 'rails', 'first-power', 'A', 0.02, 0, 0.045),
  target('rails.+12V.dc', 'rails', 'rails', 'V', 12, 11.64, 12.36),
  target('rails.-12V.dc', 'rails', 'rails', 'V', -12, -12.36, -11.64),
  target('osc.freq', 'osc', 'stage', 'Hz', 2500, 2300, 2700),
  target('osc.square.vpp', 'osc', 'stage', 'V', 9.2, 8.8, 9.6),
  target('shaper.out.vpp', 'shaper', 'stage', 'V', 3.1, 2.9, 3.3),
  target('gain.out.vpp', 'gain', 'stage', 'V', 6.2, 5.8, 6.6),
];

export const planShape: RunPlanShape = {
  stages: [{ id: 'osc' }, { id: 'shaper', input: { stage: 'osc', output: 'triangle' } }, { id: 'gain', input: { stage: 'shaper', output: 'out' } }],
};

let counter = 0;
/** A saved reading of `check` with a value and verdict, stamped one second after the last. */
export function reading(check: string, value: number, verdict: RunReading['verdict'] = 'pass'): RunReading {
  counter += 1;
  const unit = targets.find((t) => t.check === check)?.unit ?? 'V';
  return { id: `r-${counter}`, check, value, unit, verdict, at: new Date(Date.UTC(2026, 0, 1, 0, 0, counter)).toISOString() };
}

export function rework(part: string): RunRework {
  counter += 1;
  return { id: `w-${counter}`, part, from: '22n', to: '2n2', note: 'wrong value fitted', at: new Date(Date.UTC(2026, 0, 1, 0, 0, counter)).toISOString() };
}

/** Readings that pass every check of the fixture, in safe order. */
export function passingReadings(): RunReading[] {
  return [
    reading('rails.+12V.to-ground', 12_000),
    reading('rails.-12V.to-ground', 11_500),
    reading('rails.idle-current', 0.021),
    reading('rails.+12V.dc', 12.02),
    reading('rails.-12V.dc', -11.97),
    reading('osc.freq', 2510),
    reading('osc.square.vpp', 9.18),
    reading('shaper.out.vpp', 3.08),
    reading('gain.out.vpp', 6.25),
  ];
}
