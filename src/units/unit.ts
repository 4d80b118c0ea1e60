/**
 * The units probebook computes in. Values are always stored in SI base units
 * with the unit beside them; prefixes and symbols exist only at the edges.
 * `1` is a dimensionless fraction (THD, duty, pot setting), `V/V` a gain.
 */
export type Unit = 'V' | 'A' | 'Hz' | 's' | 'Ω' | 'F' | 'H' | 'W' | 'V/s' | 'V/V' | '1' | 'K';

/** The word a technician would use for a quantity of this unit. */
export const unitNoun: Readonly<Record<Unit, string>> = {
  V: 'a voltage',
  A: 'a current',
  Hz: 'a frequency',
  s: 'a time',
  Ω: 'a resistance',
  F: 'a capacitance',
  H: 'an inductance',
  W: 'a power',
  'V/s': 'a slew rate',
  'V/V': 'a gain',
  '1': 'a plain number',
  K: 'a temperature',
};

/** An example a technician could type for each unit, used in error messages. */
export const unitExample: Readonly<Record<Unit, string>> = {
  V: '"12 V"',
  A: '"45 mA"',
  Hz: '"1 kHz"',
  s: '"10 us"',
  Ω: '"4k7 1%"',
  F: '"22n 5%"',
  H: '"10 mH"',
  W: '"0.5 W"',
  'V/s': '"0.5 V/us"',
  'V/V': '"-3.3"',
  '1': '"0.5"',
  K: '"25 °C"',
};

/**
 * Unit symbols accepted after a number, mapped to our units. Lower-cased keys;
 * `'R'` is not here: in RKM it is the decimal marker of a resistance.
 */
export const unitAliases: Readonly<Record<string, Unit>> = {
  v: 'V',
  volt: 'V',
  volts: 'V',
  a: 'A',
  amp: 'A',
  amps: 'A',
  hz: 'Hz',
  s: 's',
  sec: 's',
  ω: 'Ω',
  Ω: 'Ω',
  ohm: 'Ω',
  ohms: 'Ω',
  f: 'F',
  h: 'H',
  w: 'W',
  'v/s': 'V/s',
  'v/v': 'V/V',
};

/** Key of a unit in a plan's `uncertainty` map (ASCII, as people type it). */
export function uncertaintyKey(unit: Unit): string {
  return unit === 'Ω' ? 'ohm' : unit;
}
