import type { OpampModel, PartValue, StageKind } from '../circuit/types.js';
import type { Unit } from '../units/unit.js';
import type { UncertaintySpec } from '../units/uncertainty.js';
import type { OpampSpreads, TemperatureRange } from './active-spread.js';

/** Where a check sits in a safe bring-up (DESIGN §5): unpowered, first power, rails, then the stages. */
export type Phase = 'unpowered' | 'first-power' | 'rails' | 'stage';

/** A supply rail of the board. */
export interface Rail {
  /** As the plan names it (`+12V`). */
  readonly id: string;
  /** Volts, signed. */
  readonly nominal: number;
  /** Fraction. */
  readonly tol: number;
  readonly text: string;
  /** Where the rail is probed (`"TP1"`), when the plan names it. */
  readonly testPoint?: string;
}

/** `"<stage>.<output>"` resolved. */
export interface InputRef {
  readonly stage: string;
  readonly output: string;
}

/** A stage of a loaded plan, with its kind module resolved and its values parsed. */
export interface PlanStage {
  readonly id: string;
  readonly kind: string;
  readonly module: StageKind<unknown>;
  readonly input?: InputRef;
  /** Toleranced values by role, as the kind's `parse` returned them. */
  readonly parts: Readonly<Record<string, PartValue>>;
  readonly settings: unknown;
  /** Test point by output name (`{ square: "TP2" }`), or by check key. */
  readonly testPoints: Readonly<Record<string, string>>;
  /** Reference designators by part role or part group (`{ Ct: "C7", clamp: "D3/D4" }`), as printed on the board. */
  readonly refs?: Readonly<Record<string, string>>;
  /** The op-amp this stage uses (plan default, or the stage's own `opamp`). */
  readonly opamp: OpampModel;
  /**
   * Spreads of the stage's op-amp keys (`gbw`, `slew`, `headroom`, `vos`, `ib`).
   * Absent: none (an exact op-amp, as in plans built before spreads).
   */
  readonly opampSpread?: OpampSpreads;
  /** The stage names its own `opamp`: a different part, sampled apart from the plan's (`<stage>.opamp.gbw`). */
  readonly hasOwnOpamp?: boolean;
  /** JSON path in the plan file (`stages[2]`), for messages. */
  readonly path: string;
}

/** A loaded, validated plan: everything in SI base units, stages in chain order. */
export interface Plan {
  readonly plan: string;
  readonly title: string;
  /** The plan's free-text note (e.g. "invented values"), when it has one. */
  readonly note?: string;
  /** The file it came from (as given), for messages. */
  readonly file: string;
  /** sha256 (hex) of the exact plan text, the key of its snapshot in the log. */
  readonly hash: string;
  /** The exact plan text. */
  readonly text: string;
  readonly rails: readonly Rail[];
  /** Idle current limit for first power, A. */
  readonly idleCurrentMax?: number;
  /** Below this rail-to-ground resistance (unpowered) a rail counts as shorted, Ω. */
  readonly railShortMin: number;
  readonly opamp: OpampModel;
  /** Spreads of the plan's op-amp keys (chain variables `opamp.gbw`, …); absent: none. */
  readonly opampSpread?: OpampSpreads;
  /** The board's ambient range, kelvin (chain variable `temperature`); absent: every model at its own nominal. */
  readonly temperature?: TemperatureRange;
  /** Instrument uncertainty by unit. */
  readonly uncertainty: Readonly<Partial<Record<Unit, UncertaintySpec>>>;
  /** Per-check uncertainty overrides by check id. */
  readonly checkUncertainty: Readonly<Record<string, UncertaintySpec>>;
  /** Stages in an order where every input comes before its user. */
  readonly stages: readonly PlanStage[];
  /** The bench writes decimal commas: a typed `"1,500"` is 1.5 (else refused as ambiguous). @default false */
  readonly decimalComma?: boolean;
}
