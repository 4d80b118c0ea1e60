import type { OpampModel, Supplies } from './types.js';

/** Defaults where a plan gives no op-amp: a general-purpose part (common practice, no source). */
export const defaultOpamp: OpampModel = {
  gbw: 1e6,
  slew: 0.5e6,
  headroom: 1.5,
  maxSupply: 15,
  aol: 2e5,
};

/** The output swing limits of an op-amp on these supplies, volts. */
export function swing(opamp: OpampModel, supplies: Supplies): { high: number; low: number } {
  return { high: supplies.pos - opamp.headroom, low: supplies.neg + opamp.headroom };
}
