/**
 * A scope record as a two-column CSV (`time_s,volts`, RFC 4180), the form the
 * log keeps a capture in: the history screen and `analyze` read it back like
 * a file exported from a scope.
 */
export function captureCsv(samples: Float64Array, sampleRate: number): Uint8Array {
  const dt = 1 / sampleRate;
  const lines = new Array<string>(samples.length + 1);
  lines[0] = 'time_s,volts';
  for (let i = 0; i < samples.length; i++) lines[i + 1] = `${(i * dt).toPrecision(9)},${(samples[i] as number).toPrecision(9)}`;
  return new TextEncoder().encode(`${lines.join('\n')}\n`);
}
