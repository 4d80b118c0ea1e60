/**
 * SI prefixes (BIPM, The International System of Units, 9th ed., 2019, Table 7),
 * the subset used on a bench, plus the ASCII stand-ins people type: `u` for µ,
 * `meg` for mega (as SPICE does, since `m` is milli), `K` for kilo.
 */
export const prefixes: Readonly<Record<string, number>> = {
  f: 1e-15,
  p: 1e-12,
  n: 1e-9,
  u: 1e-6,
  µ: 1e-6,
  μ: 1e-6,
  m: 1e-3,
  k: 1e3,
  K: 1e3,
  M: 1e6,
  meg: 1e6,
  MEG: 1e6,
  Meg: 1e6,
  G: 1e9,
  T: 1e12,
};

/** Prefixes used when formatting, by power of 1000 (engineering notation). */
export const formatPrefixes: ReadonlyArray<readonly [number, string]> = [
  [-15, 'f'],
  [-12, 'p'],
  [-9, 'n'],
  [-6, 'µ'],
  [-3, 'm'],
  [0, ''],
  [3, 'k'],
  [6, 'M'],
  [9, 'G'],
  [12, 'T'],
];
