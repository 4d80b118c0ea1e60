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
  /**
   * A figure from the device's data sheet (a regulator's reference, a zener's
   * dynamic resistance, a timer's output drop), not a part fitted by its value:
   * it spreads within its tolerance in the bands, but the diagnosis never names
   * it as a wrong value (a 22 % low reference is a broken or wrong device, which
   * the stage's fitted parts and fault modes and its hints speak for). @default false
   */
  readonly isRating?: boolean;
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
  /**
   * Input offset voltage, V, signed: one sample of the part's offset (0 at the
   * nominal). It moves every DC level at the output by vos × noise gain. @default 0
   */
  readonly vos?: number;
  /** Input bias current, A (into each input); it adds ib × Rf at an amplifier's output. @default 0 */
  readonly ib?: number;
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
  /**
   * The total load on each of the stage's outputs: every downstream stage's
   * input impedance in parallel with any external load the plan names, at
   * frequency `f` (Hz). Undefined for an output nothing loads (an open
   * circuit). A kind whose output has a source impedance (a passive network, a
   * shaper node, a follower) applies it; an op-amp output may ignore it until
   * it would current-limit. Absent: nothing loads any output (as before loading).
   */
  readonly load?: ((output: string, f: number) => Complex | undefined) | undefined;
  /**
   * A single non-value fault to evaluate physically (an open diode removes its
   * branch, a reversed zener clamps at its forward drop, a shorted timing
   * capacitor stops the oscillator). Value faults are plain part values and
   * need no flag. Absent on a healthy board.
   */
  readonly fault?: StageFault | undefined;
  /**
   * Board temperature for this evaluation, kelvin (sampled when the plan gives a
   * `temperature` range). Junction laws (a diode's Vt = kT/q and its Is) follow it.
   * Absent: each model at its own nominal temperature (27 °C for the diode models).
   */
  readonly temperature?: number | undefined;
}

/** A complex number, used for impedances in ohms (re + j·im). */
export interface Complex {
  readonly re: number;
  readonly im: number;
}

/**
 * How a part can be wrong on a freshly built board (DESIGN §5a):
 * `value` a wrong value fitted (solved for), `open`, `short`, `reversed`
 * (polarised parts only), `missing` (not fitted, where that differs from open).
 */
export type FaultMode = 'value' | 'open' | 'short' | 'reversed' | 'missing';

/** One non-value fault applied to a stage for one evaluation. */
export interface StageFault {
  /** The part role or part group (`Ct`, `clamp`, `branches[1].diodes`). */
  readonly role: string;
  readonly mode: Exclude<FaultMode, 'value'>;
  /**
   * Which way the mode happens when a part group can fail it in more than one
   * way (`PartFaults.variants`: the upper or the lower zener of a pair fitted
   * backwards). @default 0
   */
  readonly variant?: number;
}

/** The fault modes one part (or part group) of a stage can have. */
export interface PartFaults {
  /** The part role or group, as in `StageFault.role`. */
  readonly role: string;
  /** Modes other than `value` (every toleranced part has `value`). */
  readonly modes: readonly Exclude<FaultMode, 'value'>[];
  /** The part in bench words ("zener pair", "upper bias diode"). */
  readonly description: string;
  /**
   * Modes that can happen in more than one way, each way in bench words, in
   * `StageFault.variant` order (`{ reversed: ['upper zener backwards', 'lower zener backwards'] }`).
   */
  readonly variants?: Readonly<Partial<Record<Exclude<FaultMode, 'value'>, readonly string[]>>>;
}

/** One sample of a stage's parts and its settings: what its impedances follow from. */
export interface ImpedanceInput<Settings> {
  readonly parts: Readonly<Record<string, number>>;
  readonly settings: Settings;
  readonly opamp: OpampModel;
  /**
   * The load on the stage's own outputs, as `EvalInput.load`: a passive stage's
   * input impedance depends on what hangs on its output (an RC low-pass input is
   * R + (1/(jωC) ‖ load)). Absent: nothing loads them.
   */
  readonly load?: ((output: string, f: number) => Complex | undefined) | undefined;
  /**
   * Every rail of the board by id, volts, when the caller knows them: a stage
   * tied to a rail (a transistor's bias, a zener in or out of regulation) sets
   * its impedances from its operating point. Absent: the kind falls back to
   * a form from its parts alone.
   */
  readonly rails?: Readonly<Record<string, number>>;
}

/**
 * Traits of a stage kind that code outside `src/circuit` reads, instead of
 * matching kind names (STYLE 21). All default to false / absent.
 */
export interface StageTraits {
  /** Built around the plan's op-amp: supply ceiling, full-power bandwidth, DC level at its outputs. */
  readonly usesOpamp?: boolean;
  /** A linear amplifier whose signal must stay inside the op-amp's full-power and small-signal bandwidth. */
  readonly isAmplifier?: boolean;
  /** The settings key naming a rail the stage is fed from (`"from"`); the plan loader checks the id. */
  readonly railSetting?: string;
  /** Targets written by hand, with no model: no part of the stage can explain a deviation. */
  readonly isHandWritten?: boolean;
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
  /**
   * Which figure of a scope capture answers this check, if any (the capture
   * analysis's `frequency`, `vpp`, `duty`, `thd`, `mean`). Absent: the capture
   * does not give it.
   */
  readonly captureFigure?: 'frequency' | 'vpp' | 'duty' | 'thd' | 'mean';
  /**
   * A design figure nobody probes at a test point (a base drive current): still
   * in `targets`, marked so, never asked for on the bring-up screen. @default false
   */
  readonly isDesignFigure?: boolean;
  /**
   * The lowest value the quantity can physically take (0 for a dead band's
   * width or a THD). When the band reaches down to it, the verdict guards only
   * the band's open (upper) side: a reading at the floor passes.
   */
  readonly floor?: number;
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
   * Read the kind-specific part of the plan entry. Throws `StageParseError` (from
   * `src/circuit/errors.ts`) with the JSON path for anything wrong.
   */
  parse(raw: RawStage, file: string): ParsedStage<Settings>;
  /** The checks this stage offers, given its settings (some depend on a pot or a clamp). */
  checks(settings: Settings): readonly CheckSpec[];
  /** One sample of the stage: the only function the tolerance engine calls. */
  evaluate(input: EvalInput<Settings>): EvalOutput;
  /** Fault hints by check key: what usually causes a deviation, for the technician. */
  readonly faultHints: Readonly<Record<string, readonly string[]>>;
  /** Traits read by the rest of the code (op-amp based, tied to a rail, hand-written). */
  readonly traits?: StageTraits;
  /**
   * Impedance the stage's input presents at frequency `f` (Hz), for one sample
   * of its parts. Absent: an open circuit (no load on the upstream output).
   * Non-linear inputs give their large-signal equivalent.
   */
  inputImpedance?(x: ImpedanceInput<Settings>, f: number): Complex;
  /**
   * Source (Thevenin) impedance of an output at `f` (Hz). Absent: zero (an
   * ideal source, such as an op-amp output inside its limits).
   */
  outputImpedance?(x: ImpedanceInput<Settings>, output: string, f: number): Complex;
  /**
   * Non-value fault modes of the stage's parts (every toleranced part can also
   * be the wrong value). `evaluate` honours `EvalInput.fault` for each of them.
   */
  faults?(settings: Settings): readonly PartFaults[];
}
