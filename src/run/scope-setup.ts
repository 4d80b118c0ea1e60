/** Suggested scope settings for a check. */
export interface ScopeSetup {
  /** Seconds per division. */
  readonly timePerDiv: number;
  /** Volts per division. */
  readonly voltsPerDiv: number;
}

/** The smallest value of the 1-2-5 sequence (1, 2, 5, 10, 20, …) at or above `x` (> 0). */
export function upTo125(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) return Number.NaN;
  const decade = 10 ** Math.floor(Math.log10(x));
  for (const m of [1, 2, 5, 10]) {
    // A hair of slack so that 2e-3 is not pushed to 5e-3 by floating residue.
    if (m * decade >= x * (1 - 1e-9)) return Number((m * decade).toPrecision(12));
  }
  return Number((10 * decade).toPrecision(12));
}

/** Screen size of a typical bench scope: 10 horizontal, 8 vertical divisions (common practice, no source). */
export const scopeDivisions = { horizontal: 10, vertical: 8 } as const;

/**
 * Time/div showing at least two whole periods across the screen, and volts/div
 * keeping the peak-to-peak within six of the eight divisions so both peaks
 * stay visible with the trace centred (common practice, no source). Null when
 * there is no frequency or amplitude to set up on.
 */
export function scopeSetup(frequency: number, vpp: number): ScopeSetup | null {
  if (!(frequency > 0) || !(vpp > 0) || !Number.isFinite(frequency) || !Number.isFinite(vpp)) return null;
  return {
    timePerDiv: upTo125(2 / frequency / scopeDivisions.horizontal),
    voltsPerDiv: upTo125(vpp / 6),
  };
}
