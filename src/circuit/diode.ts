import models from '../../data/diode-models.json' with { type: 'json' };

/** DC parameters of a junction diode, as SPICE names them. */
export interface DiodeModel {
  /** Saturation current IS, A. */
  readonly is: number;
  /** Emission coefficient N, dimensionless. */
  readonly n: number;
  /** Ohmic series resistance RS, Ω. */
  readonly rs: number;
}

/** Boltzmann constant, J/K, and elementary charge, C (exact in the SI since 2019, BIPM SI Brochure 9th ed.). */
const boltzmann = 1.380649e-23;
const charge = 1.602176634e-19;

/** The SPICE nominal temperature, 27 °C, in kelvin. */
export const nominalTemperature = 300.15;

/** Thermal voltage kT/q, V (≈ 25.865 mV at 27 °C, 300.15 K). */
export function thermalVoltage(kelvin = nominalTemperature): number {
  return (boltzmann * kelvin) / charge;
}

/** SPICE diode defaults for the temperature law: saturation-current exponent XTI and band gap EG, eV (silicon). */
export const diodeXti = 3;
export const diodeEg = 1.11;

/**
 * The saturation current at `kelvin` of a model given at the SPICE nominal
 * temperature (27 °C), by the SPICE diode temperature law (Berkeley SPICE 2G/3
 * diode model, also in the ngspice manual's diode section, with XTI = 3 and
 * EG = 1.11 eV, the silicon defaults):
 *   IS(T) = IS · (T/Tnom)^(XTI/N) · exp((T/Tnom − 1) · EG / (N · Vt(T))).
 * The tests check the forward drop it gives against ngspice at 15 and 40 °C.
 */
export function saturationAt(model: DiodeModel, kelvin: number): number {
  if (kelvin === nominalTemperature) return model.is;
  const ratio = kelvin / nominalTemperature;
  return model.is * ratio ** (diodeXti / model.n) * Math.exp(((ratio - 1) * diodeEg) / (model.n * thermalVoltage(kelvin)));
}

/** The default small-signal diode (see data/diode-models.json for where its values come from). */
export const defaultDiodeName: string = models.default;
export const diodeModels: Readonly<Record<string, DiodeModel>> = models.models;
export const defaultDiode: DiodeModel = diodeModels[defaultDiodeName] ?? { is: 2.52e-9, n: 1.752, rs: 0.568 };

/**
 * `count` equal diodes in series with a resistor act as one diode with emission
 * coefficient count·N and series resistance R + count·RS: every diode carries the
 * same current, so each drops N·Vt·ln(1 + I/IS) + I·RS (Shockley law with series
 * resistance). The shaper solves every branch in this form.
 */
export interface DiodeString {
  readonly is: number;
  /** count · N · Vt, V. */
  readonly nvt: number;
  /** R + count · RS, Ω. */
  readonly r: number;
}

export function diodeString(model: DiodeModel, count: number, resistance: number, vt = thermalVoltage(), is = model.is): DiodeString {
  return { is, nvt: count * model.n * vt, r: resistance + count * model.rs };
}

/** Current through the string at a total junction voltage x (Shockley law), A. */
export function stringCurrent(s: DiodeString, x: number): number {
  return s.is * Math.expm1(x / s.nvt);
}

/**
 * Total voltage across the string at a forward current i, V: the closed form the
 * tests use to check the solver (V = count·(N·Vt·ln(1 + I/IS) + I·RS) + I·R).
 */
export function stringVoltage(s: DiodeString, i: number): number {
  return s.nvt * Math.log1p(i / s.is) + i * s.r;
}

/**
 * Highest junction voltage the string can hold with `u` volts across it: where the
 * resistor alone would drop all of `u`. Keeps Newton's iterates from overflowing exp.
 */
export function junctionCeiling(s: DiodeString, u: number): number {
  if (u <= 0) return u + s.r * s.is;
  return Math.min(u, s.nvt * Math.log1p(u / (s.r * s.is)));
}
