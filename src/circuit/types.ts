import type { Unit } from '../units/unit.js';

/**
 * One period of a periodic signal, sampled uniformly from t = 0 to t = T·(N−1)/N,
 * in volts. A DC level is a waveform with frequency 0 and constant samples.
 * Signals flow down the chain as waveforms so that every stage (shaper, follower,
 * clipping amplifier) can act on the real shape, not on a label.
 */
export interface Waveform {
  /** Fundamental frequency, Hz (0 for DC). */
  readonly frequency: number;
  /** One period, volts. */
  readonly samples: Float64Array;
}

/** A part role of a stage kind: `R1`, `Ct`, `clamp.vz`, `branches[0].R`. */
export interface PartRole {
  readonly role: string;
  readonly unit: Unit;
  /** What the part does, in a technician's words ("timing capacitor"). */
  readonly description: string;
  readonly optional?: boolean;
}

/** A value with its tolerance, as fitted on the board. */
export interface PartValue {
  /** SI base units. */
  readonly nominal: number;
  /** Symmetric tolerance as a fraction (0.05 for 5 %); 0 when exact or unknown. */
  readonly tol: number;
  readonly unit: Unit;
  /** The text as the plan wrote it (`"22n 5%"`), for messages. */
  readonly text: string;
}

/** The op-amp model a stage uses (from the plan's `opamp`, with defaults). */
export interface OpampModel {
  /** Gain-bandwidth product, Hz. */
  readonly gbw: number;
  /** Slew rate, V/s. */
  readonly slew: number;
  /** How far the output stays from each rail, V. */
  readonly headroom: number;
  /** Highest total supply per rail (|V+| and |V−|), V. */
  readonly maxSupply: number;
  /** DC open-loop gain, V/V. */
  readonly aol: number;
}

/** Supplies an op-amp stage runs from, volts (positive and negative rail, sampled). */
export interface Supplies {
  readonly pos: number;
  readonly neg: number;
}

/**
 * What a stage kind is given for one evaluation: one sample of its toleranced
 * values (parts and any toleranced settings, by role), its parsed settings, the
 * op-amp and supplies, and its input waveform if it has an input.
 */
export interface EvalInput<Settings> {
  readonly parts: Readonly<Record<string, number>>;
  readonly settings: Settings;
  readonly opamp: OpampModel;
  readonly supplies: Supplies;
  /** Every rail of the board by id, volts (sampled), for stages tied to a rail (a divider). */
  readonly rails: Readonly<Record<string, number>>;
  readonly input?: Waveform;
  /**
   * A sampled evaluation (Monte Carlo trial, worst-case corner, sensitivity
   * step): the caller reads only `values` and `outputs`. A kind may then skip
   * its warnings and solve to bench accuracy (tens of µV) instead of to the
   * last microvolt. Absent or false for the nominal evaluation and for anything
   * shown to the user. @default false
   */
  readonly isTrial?: boolean;
  /**
   * On a trial, the stage's own output arrays to refill instead of allocating:
   * `buffer(slot, length)` returns the same Float64Array of that length for the
   * same slot on every trial of this stage (contents left from the last one), so
   * an output written there lives only until the stage's next trial. Absent
   * whenever the outputs are kept.
   */
  readonly buffer?: ((slot: number, length: number) => Float64Array) | undefined;
}

/** A design warning raised while evaluating a stage. */
export interface StageWarning {
  readonly message: string;
}

/** Outputs of one evaluation: waveforms by output name and target values by check key. */
export interface EvalOutput {
  /** Waveforms by output name (`square`, `triangle`, `out`). */
  readonly outputs: Readonly<Record<string, Waveform>>;
  /** Target values by check key relative to the stage (`freq`, `out.vpp`, `gain`). */
  readonly values: Readonly<Record<string, number>>;
  /** Design warnings (only needed from the nominal evaluation). */
  readonly warnings: readonly StageWarning[];
}

/** A check a stage kind offers, keyed relative to the stage (`freq`, `out.thd`). */
export interface CheckSpec {
  readonly key: string;
  /** Quantity in words for the screen ("frequency", "peak-to-peak"). */
  readonly quantity: string;
  readonly unit: Unit;
  /** Output name whose test point the check is probed at, if any. */
  readonly output?: string;
  /** How it is measured. */
  readonly instrument: 'meter' | 'scope' | 'counter';
  /** How to set up the measurement, one short line. */
  readonly how: string;
}

/** A raw stage object from a plan, and where it sits, for error messages. */
export interface RawStage {
  readonly json: Readonly<Record<string, unknown>>;
  /** JSON path of the stage, e.g. `stages[1]`. */
  readonly path: string;
}

/** A stage kind's reading of its own plan entry. */
export interface ParsedStage<Settings> {
  /** Toleranced values by role (parts, and toleranced settings such as `clamp.vz`). */
  readonly parts: Readonly<Record<string, PartValue>>;
  readonly settings: Settings;
}

/**
 * A stage kind: one module per kind, registered in `src/circuit/registry.ts`.
 * The tolerance engine only calls `evaluate`; it never knows which kind it samples.
 */
export interface StageKind<Settings = unknown> {
  readonly kind: string;
  /** One line for help screens. */
  readonly summary: string;
  /** Part roles (fixed roles; kinds with repeated parts list the pattern). */
  readonly roles: readonly PartRole[];
  /** Output names, the first being the default. */
  readonly outputs: readonly string[];
  /** Whether the stage takes an `input`. */
  readonly needsInput: boolean;
  /**
   * Read the kind-specific part of the plan entry. Throws `PlanError` (from
   * `src/plan/errors.ts`) with the JSON path for anything wrong.
   */
  parse(raw: RawStage, file: string): ParsedStage<Settings>;
  /** The checks this stage offers, given its settings (some depend on a pot or a clamp). */
  checks(settings: Settings): readonly CheckSpec[];
  /** One sample of the stage: the only function the tolerance engine calls. */
  evaluate(input: EvalInput<Settings>): EvalOutput;
  /** Fault hints by check key: what usually causes a deviation, for the technician. */
  readonly faultHints: Readonly<Record<string, readonly string[]>>;
}
