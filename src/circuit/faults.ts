import type { EvalInput, PartFaults, StageFault } from './types.js';

/**
 * Fault modes every kind shares, and how a two-terminal part's open or short
 * becomes a part value (DESIGN §5a). A resistor that is open is a very large
 * resistance and one that is shorted (a solder bridge) a very small one, so the
 * kind's own equations carry the fault through; capacitors, diodes and zeners
 * need physics of their own and are handled by their kinds.
 */

/** An open resistor (a cracked part, a dry joint): 1 TΩ, far above any board's impedances. */
export const openOhms = 1e12;
/** A shorted resistor (a solder bridge): 1 mΩ. */
export const shortOhms = 1e-3;
/** An open or missing capacitor still has the stray capacitance of its pads and tracks: about 2 pF (common practice, no source). */
export const strayFarads = 2e-12;

/** `open` and `short` for each resistor role (every one is also a `value` fault). */
export function resistorFaults(roles: readonly string[], words: Readonly<Record<string, string>>): PartFaults[] {
  return roles.map((role) => ({ role, modes: ['open', 'short'] as const, description: words[role] ?? `resistor ${role}` }));
}

/**
 * The part values with the fault applied to a resistor or capacitor role, or
 * the same object when the fault is not one of these (the kind handles it) or
 * there is none. Only called with a fault set, so the hot path stays allocation-free.
 */
export function faultedParts(input: EvalInput<unknown>, resistors: readonly string[], capacitors: readonly string[] = []): Readonly<Record<string, number>> {
  const f = input.fault;
  if (!f) return input.parts;
  const value = plainFaultValue(f, resistors, capacitors);
  if (value === undefined) return input.parts;
  return { ...input.parts, [f.role]: value };
}

function plainFaultValue(f: StageFault, resistors: readonly string[], capacitors: readonly string[]): number | undefined {
  if (resistors.includes(f.role)) {
    if (f.mode === 'open' || f.mode === 'missing') return openOhms;
    if (f.mode === 'short') return shortOhms;
  }
  if (capacitors.includes(f.role) && (f.mode === 'open' || f.mode === 'missing')) return strayFarads;
  return undefined;
}

/** Whether `fault` is `mode` on `role`. */
export function isFault(fault: StageFault | undefined, role: string, mode: StageFault['mode']): boolean {
  return fault !== undefined && fault.role === role && fault.mode === mode;
}
