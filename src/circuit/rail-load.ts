import type { Complex, EvalInput } from './types.js';

/**
 * Small helpers for the kinds fed from a rail (`from`) and loaded at their
 * outputs: the rail's sampled value with a message that names the rail, and
 * the load an output sees as a DC conductance.
 */

/** The sampled voltage of the rail a stage names in `from`; an unknown id is named with the known ones. */
export function railOf(kind: string, input: EvalInput<unknown>, from: string): number {
  const rail = input.rails[from];
  // `parse` cannot see the plan's rails (the plan loader checks the id); a chain built by hand may still miss it.
  if (rail === undefined) {
    const known = Object.keys(input.rails)
      .map((id) => JSON.stringify(id))
      .join(', ');
    throw new Error(`${kind}: "from" names rail ${JSON.stringify(from)}, which the plan does not have (rails: ${known || 'none'})`);
  }
  return rail;
}

/** Conductance Re(1/Z) of a complex impedance, S; 0 for an open circuit (undefined or infinite). */
export function conductanceOf(z: Complex | undefined): number {
  if (!z) return 0;
  const mag2 = z.re * z.re + z.im * z.im;
  if (!Number.isFinite(mag2)) return 0;
  // A zero impedance is a dead short: an enormous (finite) conductance keeps the node equations solvable.
  if (mag2 === 0) return 1e12;
  return z.re / mag2;
}

/** The DC conductance that downstream stages (and any external load) put on one output, S. */
export function dcLoad(input: EvalInput<unknown>, output: string): number {
  return input.load ? conductanceOf(input.load(output, 0)) : 0;
}

/** A resistance as a complex impedance (ohms). */
export function ohms(r: number): Complex {
  return { re: r, im: 0 };
}

/** Two resistances in parallel (either may be Infinity for an open). */
export function parallel(a: number, b: number): number {
  if (!Number.isFinite(a)) return b;
  if (!Number.isFinite(b)) return a;
  return (a * b) / (a + b);
}
