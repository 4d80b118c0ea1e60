/** `[########......]  45 %` for a fraction from 0 to 1. */
export function progressBar(fraction: number, width = 30): string {
  const f = Math.max(0, Math.min(1, Number.isFinite(fraction) ? fraction : 0));
  const filled = Math.round(f * width);
  return `[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${Math.floor(f * 100)
    .toString()
    .padStart(3)} %`;
}

/** The first `periods` periods of a capture (the whole capture when the frequency is unknown or it is shorter). */
export function capturedWindow(samples: Float64Array, sampleRate: number, frequency: number | null, periods: number): Float64Array {
  if (frequency === null || !(frequency > 0)) return samples;
  const length = Math.min(samples.length, Math.max(2, Math.round((periods * sampleRate) / frequency)));
  return samples.subarray(0, length);
}

/** A hint naming the channels not shown, or null for a one-channel capture. */
export function otherChannels(analyzed: {
  readonly capture: { readonly channels: readonly { readonly name: string }[] };
  readonly channel: { readonly name: string };
}): string | null {
  const { channels } = analyzed.capture;
  if (channels.length < 2) return null;
  const others = channels.map((c, i) => ({ c, i })).filter(({ c }) => c !== analyzed.channel);
  return `also in the file: ${others.map(({ c, i }) => `${i + 1} ${c.name}`).join(', ')} (add --channel N to the path)`;
}
