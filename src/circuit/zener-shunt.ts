import { formatValue } from '../units/format.js';
import { thermalVoltage } from './diode.js';
import { dcLoad, ohms, parallel, railOf } from './rail-load.js';
import { nested, ohmRange, onlyKeys, partAt, reader, textAt } from './stage-parse.js';
import type { CheckSpec, Complex, EvalInput, EvalOutput, ImpedanceInput, PartFaults, PartValue, StageKind, StageWarning } from './types.js';
import { dc } from './waveform.js';

export interface ZenerShuntSettings {
  /** Rail id `Rs` hangs from (`+12V`); a negative rail mirrors the stage (zener anode at the output). */
  readonly from: string;
  /** Whether the plan names an `Rload` on the board. */
  readonly hasLoad: boolean;
}

/**
 * A zener fitted the wrong way round conducts forward as a generic silicon
 * junction, IS = 1e-14 A, N = 1 (about 0.7 V at a few mA), with a bulk
 * resistance of 0.5 Ω: its breakdown rz plays no part forward (common
 * practice, no source).
 */
const forwardIs = 1e-14;
const forwardBulk = 0.5;
/** A shorted part reads a few tenths of an ohm on the board (common practice, no source), Ω. */
const shortOhms = 0.1;
/** A small glass zener is rated about 0.5 W; warn a little below (common practice, no source), W. */
const zenerPowerWarn = 0.4;
/** A common quarter-watt resistor (common practice, no source), W. */
const resistorPowerWarn = 0.25;

interface Solution {
  /** Output magnitude, V. */
  readonly v: number;
  /** Zener current, A (0 when it does not conduct). */
  readonly iz: number;
  /** Rail magnitude, V. */
  readonly rail: number;
  /** Series resistance as fitted (a short taken as a few tenths of an ohm), Ω. */
  readonly rs: number;
  readonly isConducting: boolean;
}

/**
 * The output node on the magnitude of the rail: the rail through Rs, loads to
 * ground (Rload and whatever the downstream stages draw at DC), and the zener
 * as a knee vz with a slope rz (DESIGN §3: vz is the knee extrapolated to
 * zero current, Vout = vz + rz·Iz while it conducts).
 */
function solve(input: EvalInput<ZenerShuntSettings>): Solution {
  const p = input.parts;
  const fault = input.fault;
  const rail = Math.abs(railOf('zener-shunt', input, input.settings.from));
  let rs = p['Rs'] ?? Number.NaN;
  if (fault?.role === 'Rs') rs = fault.mode === 'open' ? Number.POSITIVE_INFINITY : shortOhms;
  let gLoad = dcLoad(input, 'out');
  if (input.settings.hasLoad) {
    const rl = p['Rload'] ?? Number.NaN;
    if (fault?.role === 'Rload' && fault.mode === 'short') gLoad += 1 / shortOhms;
    else if (!(fault?.role === 'Rload' && fault.mode === 'open')) gLoad += 1 / rl;
  }
  const gs = Number.isFinite(rs) ? 1 / rs : 0;
  if (fault?.role === 'Z' && fault.mode === 'short') return { v: 0, iz: rail * gs, rail, rs, isConducting: true };
  // Thevenin equivalent of the rail, Rs and the loads, seen by the zener.
  const gth = gs + gLoad;
  const vth = gth > 0 ? (rail * gs) / gth : 0;
  const hasZener = !(fault?.role === 'Z' && fault.mode === 'open');
  const rz = p['rz'] ?? Number.NaN;
  if (fault?.role === 'Z' && fault.mode === 'reversed') return forward(vth, gth, forwardBulk, rail, rs);
  const knee = p['vz'] ?? Number.NaN;
  if (!hasZener || !(vth > knee)) return { v: vth, iz: 0, rail, rs, isConducting: false };
  // Node equation with the zener as knee + rz: (Vth − V)·Gth = (V − vz)/rz.
  const v = (vth * gth + knee / rz) / (gth + 1 / rz);
  return { v, iz: (v - knee) / rz, rail, rs, isConducting: true };
}

/** The node with the zener reversed: a forward junction (Shockley law) plus its bulk resistance, solved by bisection. */
function forward(vth: number, gth: number, rz: number, rail: number, rs: number): Solution {
  const vt = thermalVoltage();
  // KCL at the node, f(vj) = (Vth − vj − I·rz)·Gth − I with I = IS·(e^(vj/Vt) − 1): falls as vj rises.
  const f = (vj: number) => {
    const i = forwardIs * Math.expm1(vj / vt);
    return (vth - vj - i * rz) * gth - i;
  };
  let lo = 0;
  let hi = Math.max(0, vth);
  for (let k = 0; k < 80; k++) {
    const mid = (lo + hi) / 2;
    if (f(mid) > 0) lo = mid;
    else hi = mid;
  }
  const i = forwardIs * Math.expm1(lo / vt);
  // The zener carries its current forward: what the meter works out from the drops is that current.
  return { v: lo + i * rz, iz: i, rail, rs, isConducting: true };
}

function evaluate(input: EvalInput<ZenerShuntSettings>): EvalOutput {
  const s = solve(input);
  const sign = Math.sign(input.rails[input.settings.from] ?? 1) || 1;
  const vout = sign * s.v;
  const pz = s.v * s.iz;
  const values = { 'out.dc': vout, iz: s.iz, pz };
  if (input.isTrial) return { outputs: { out: dc(vout) }, values, warnings: [] };
  const warnings: StageWarning[] = [];
  const izmin = input.parts['izmin'] ?? 0;
  if (input.fault === undefined && s.iz < izmin) {
    warnings.push({
      message: s.isConducting
        ? `the zener carries only ${formatValue(s.iz, 'A')}, below its ${formatValue(izmin, 'A')} minimum: it is at its soft knee and the output sags with load (make Rs smaller or the load lighter)`
        : `the zener does not conduct: Rs and the load leave only ${formatValue(vout, 'V')} at the output, below the ${formatValue(input.parts['vz'] ?? Number.NaN, 'V')} knee; the stage has dropped out of regulation`,
    });
  }
  if (pz > zenerPowerWarn) {
    warnings.push({
      message: `the zener dissipates ${formatValue(pz, 'W')}: a small glass zener is rated about 0.5 W; it runs hot, so let it cool before touching it`,
    });
  }
  const prs = Number.isFinite(s.rs) ? (s.rail - s.v) ** 2 / s.rs : 0;
  if (prs > resistorPowerWarn) {
    warnings.push({ message: `Rs dissipates ${formatValue(prs, 'W')}: more than a quarter-watt resistor takes; fit a larger one and mind the hot part` });
  }
  return { outputs: { out: dc(vout) }, values, warnings };
}

/** Source resistance of the zener node: rz ∥ Rs ∥ Rload in regulation, Rs ∥ Rload out of it (regulating assumed when no rail is known). */
function sourceResistance(x: ImpedanceInput<ZenerShuntSettings>): number {
  const rs = x.parts['Rs'] ?? Number.NaN;
  const rl = x.settings.hasLoad ? (x.parts['Rload'] ?? Number.POSITIVE_INFINITY) : Number.POSITIVE_INFINITY;
  const rz = x.parts['rz'] ?? Number.NaN;
  const rail = x.rails?.[x.settings.from];
  const base = parallel(rs, rl);
  // Out of regulation the zener is open and only Rs ∥ Rload remains; in regulation rz shunts them.
  if (rail !== undefined && Math.abs(rail) * (base / rs) <= (x.parts['vz'] ?? 0)) return base;
  return parallel(base, rz);
}

const checks: readonly CheckSpec[] = [
  {
    key: 'out.dc',
    quantity: 'zener voltage',
    unit: 'V',
    output: 'out',
    instrument: 'meter',
    how: 'DC voltmeter from the zener cathode to ground, the load connected',
    captureFigure: 'mean',
  },
  {
    key: 'iz',
    quantity: 'zener current',
    unit: 'A',
    instrument: 'meter',
    how: 'the drop across Rs over Rs, less what the load takes (output voltage over Rload); never break the circuit to insert an ammeter with the power on',
  },
  {
    key: 'pz',
    quantity: 'zener dissipation',
    unit: 'W',
    instrument: 'meter',
    how: 'design figure: zener voltage × zener current; not probed',
    isDesignFigure: true,
  },
];

function faults(settings: ZenerShuntSettings): readonly PartFaults[] {
  const list: PartFaults[] = [
    { role: 'Z', modes: ['open', 'short', 'reversed'], description: 'zener diode' },
    { role: 'Rs', modes: ['open', 'short'], description: 'series resistor from the rail' },
  ];
  if (settings.hasLoad) list.push({ role: 'Rload', modes: ['open', 'short'], description: 'load resistor on the zener' });
  return list;
}

export const zenerShuntKind: StageKind<ZenerShuntSettings> = {
  kind: 'zener-shunt',
  summary: 'zener shunt reference from a rail: Rs to the output, zener to ground, Vout = vz + rz·Iz, dropout below izmin',
  roles: [
    { role: 'Rs', unit: 'Ω', description: 'series resistor from the rail to the zener' },
    { role: 'Rload', unit: 'Ω', description: 'load on the zener node', optional: true },
    { role: 'vz', unit: 'V', description: 'zener knee voltage (extrapolated to zero current)' },
    { role: 'rz', unit: 'Ω', description: 'zener dynamic resistance', optional: true, isRating: true },
    { role: 'izmin', unit: 'A', description: 'least zener current it regulates at', optional: true, isRating: true },
  ],
  outputs: ['out'],
  needsInput: false,
  traits: { railSetting: 'from' },
  parse(raw, file) {
    const r = reader(raw, file);
    const from = textAt(r, 'from', true, '"+12V" (the rail id Rs hangs from)');
    const p = nested(r, 'parts', true);
    onlyKeys(p, ['Rs', 'Rload']);
    const parts: Record<string, PartValue> = {
      Rs: partAt(p, 'Rs', 'Ω', true, { positive: true, plausible: ohmRange, example: '"1k 5%"' }),
      vz: partAt(r, 'vz', 'V', true, { positive: true, plausible: [1.8, 200], example: '"5.1 V 5%"' }),
      rz: partAt(r, 'rz', 'Ω', false, { positive: true, plausible: [0.01, 1e4], example: '"5 ohm"' }) ?? {
        nominal: 5,
        tol: 0,
        unit: 'Ω',
        text: '5 ohm (default)',
      },
      izmin: partAt(r, 'izmin', 'A', false, { nonNegative: true, plausible: [0, 1], example: '"1 mA"' }) ?? {
        nominal: 1e-3,
        tol: 0,
        unit: 'A',
        text: '1 mA (default)',
      },
    };
    const rload = partAt(p, 'Rload', 'Ω', false, { positive: true, plausible: ohmRange, example: '"4k7 5%"' });
    if (rload) parts['Rload'] = rload;
    return { parts, settings: { from, hasLoad: rload !== undefined } };
  },
  checks: () => checks,
  evaluate,
  outputImpedance: (x): Complex => ohms(sourceResistance(x)),
  faults,
  faultHints: {
    pz: ['a zener darker than its neighbours or smelling hot: too much current for its rating'],
    'out.dc': [
      'about 0.7 V: the zener fitted the wrong way round (band at the ground end)',
      'near the rail: the zener open or not fitted, or the wrong (higher-voltage) zener',
      'near 0 V: the zener shorted, or Rs open',
      'a little low and sagging with load: Rs too large for the load, the zener below its knee current',
    ],
    iz: [
      'no drop across Rs: Rs open or the zener open',
      'far more current than designed: zener shorted or the wrong voltage; the zener and Rs run hot (a zener darker than its neighbours or smelling hot)',
      'less than designed: a heavier load downstream, or Rs a decade high',
    ],
  },
};
