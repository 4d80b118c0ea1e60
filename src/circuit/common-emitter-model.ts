import { thermalVoltage } from './diode.js';
import type { Complex, StageFault } from './types.js';

/**
 * The NPN common-emitter stage's operating point and small-signal response,
 * pure arithmetic (the tolerance engine calls it per trial).
 *
 * DC (Sedra and Smith, the classical four-resistor bias): the base sees the
 * Thevenin source Vth = Vrail·R2/(R1 + R2), Rth = R1 ∥ R2;
 * Ib = (Vth − Vbe)/(Rth + (β + 1)·Re), Ic = β·Ib, Vc = Vrail − Ic·Rc.
 * Two refinements close the gap to a Gummel–Poon transistor (ngspice):
 * - the Early effect as SPICE writes it, Ic = hfe·Ib·(1 + Vcb/VA), so the
 *   effective β rises with the collector voltage (ro = (VA + Vcb)/Ic);
 * - `vbe` is the drop at 1 mA and slides with the collector current,
 *   Vbe = vbe + Vt·ln(Ic/1 mA) (Shockley law, 60 mV a decade at 27 °C).
 * When the collector would fall below the emitter plus Vce(sat) the
 * transistor saturates and the two loop equations are solved with Vce fixed;
 * with Vth below Vbe it is cut off.
 *
 * AC (hybrid-π: gm = Ic/Vt, rπ = β/gm, ro): nodal analysis of the emitter
 * and collector nodes with the base driven, the emitter to ground through
 * Re ∥ Ce, the collector to AC ground through Rc and the load.
 */
export interface CeParts {
  readonly rail: number;
  readonly r1: number;
  readonly r2: number;
  readonly rc: number;
  readonly re: number;
  /** Bypass capacitor, F; 0 without one. */
  readonly ce: number;
  readonly hfe: number;
  readonly vbe: number;
  readonly vaf: number;
  /** DC conductance loading the collector, S. */
  readonly gLoad: number;
}

export type CeRegion = 'active' | 'saturated' | 'cut-off';

export interface CePoint {
  readonly vb: number;
  readonly ve: number;
  readonly vc: number;
  readonly ic: number;
  readonly ib: number;
  readonly region: CeRegion;
}

/** Collector–emitter voltage of a saturated small-signal NPN, V (common practice, no source). */
export const vceSat = 0.2;
/** Reference current at which `vbe` is read, A. */
const vbeAt = 1e-3;
/** A shorted part, Ω; an open one, Ω (common practice, no source). */
const shortOhms = 0.1;
const openOhms = 1e12;
/** Inverse β of a transistor fitted with emitter and collector swapped (common practice, no source). */
const reversedHfe = 5;

/** Part values with a non-value fault applied (open → 1 TΩ or no capacitor, short → 0.1 Ω or Re shorted). */
export function withFault(p: CeParts, fault: StageFault | undefined): CeParts {
  if (!fault) return p;
  const value = (v: number) => (fault.mode === 'open' ? openOhms : fault.mode === 'short' ? shortOhms : v);
  switch (fault.role) {
    case 'R1':
      return { ...p, r1: value(p.r1) };
    case 'R2':
      return { ...p, r2: value(p.r2) };
    case 'Rc':
      return { ...p, rc: value(p.rc) };
    case 'Re':
      return { ...p, re: value(p.re) };
    case 'Ce':
      // An open bypass leaves Re alone; a shorted one shorts Re at DC as well.
      return fault.mode === 'open' ? { ...p, ce: 0 } : fault.mode === 'short' ? { ...p, re: shortOhms, ce: 0 } : p;
    case 'Q':
      return fault.mode === 'reversed' ? { ...p, hfe: reversedHfe } : p;
    default:
      return p;
  }
}

export function operatingPoint(p: CeParts, fault?: StageFault): CePoint {
  const vt = thermalVoltage();
  const vth = (p.rail * p.r2) / (p.r1 + p.r2);
  const rth = (p.r1 * p.r2) / (p.r1 + p.r2);
  const gc = 1 / p.rc;
  if (fault?.role === 'Q' && fault.mode === 'short') {
    // Collector and emitter joined: Rc and Re divide the rail.
    const v = (p.rail * gc) / (gc + p.gLoad + 1 / p.re);
    return { vb: vth, ve: v, vc: v, ic: v / p.re, ib: 0, region: 'saturated' };
  }
  const cutOff = (): CePoint => ({ vb: vth, ve: 0, vc: (p.rail * gc) / (gc + p.gLoad), ic: 0, ib: 0, region: 'cut-off' });
  if (fault?.role === 'Q' && fault.mode === 'open') return cutOff();
  let vbe = p.vbe;
  let k = 1;
  let ib = 0;
  let ic = 0;
  let vc = p.rail;
  let vb = vth;
  for (let it = 0; it < 8; it++) {
    const beta = p.hfe * k;
    ib = (vth - vbe) / (rth + (1 + beta) * p.re);
    if (!(ib > 0)) return cutOff();
    ic = beta * ib;
    vc = (p.rail * gc - ic) / (gc + p.gLoad);
    vb = vth - ib * rth;
    k = 1 + Math.max(0, vc - vb) / p.vaf;
    vbe = p.vbe + vt * Math.log(ic / vbeAt);
  }
  const ve = (ib + ic) * p.re;
  if (vc - ve >= vceSat) return { vb, ve, vc, ic, ib, region: 'active' };
  // Saturated: Ib(Rth + Re) + Ic·Re = Vth − Vbe and Rc·Ic + (1 + Rc·GL)·(Ib + Ic)·Re = Vrail − Vce(sat)·(1 + Rc·GL),
  // with Vbe at the saturated emitter current and Vce(sat) from the forced β (see saturationVce), a few rounds.
  const m = 1 + p.rc * p.gLoad;
  let vce = vceSat;
  let sib = 0;
  let sic = 0;
  for (let it = 0; it < 4; it++) {
    const a11 = rth + p.re;
    const a12 = p.re;
    const a21 = m * p.re;
    const a22 = p.rc + m * p.re;
    const b1 = vth - vbe;
    const b2 = p.rail - vce * m;
    const det = a11 * a22 - a12 * a21;
    sib = (b1 * a22 - a12 * b2) / det;
    sic = (a11 * b2 - a21 * b1) / det;
    if (!(sic >= 0 && sib > 0)) break;
    // In saturation the base-emitter junction carries the whole emitter current (the collector may carry none: Rc open).
    vbe = p.vbe + vt * Math.log((sib + sic) / vbeAt);
    vce = saturationVce(sic / sib, p.hfe);
  }
  const sve = (sib + sic) * p.re;
  return { vb: vth - sib * rth, ve: sve, vc: sve + vce, ic: sic, ib: sib, region: 'saturated' };
}

/**
 * Collector–emitter voltage of a saturated transistor driven at a forced β
 * (Ic/Ib below hfe): Vce(sat) = Vt·ln((1/αR + βforced/βR)/(1 − βforced/βF))
 * (Ebers–Moll; Sedra and Smith, the BJT in saturation), with βR = 1 (αR = 1/2,
 * SPICE's default BR; from memory). No ohmic collector resistance: a real
 * small-signal part reads a few tens of mV more at tens of mA.
 */
export function saturationVce(forced: number, hfe: number): number {
  const vt = thermalVoltage();
  const x = Math.min(forced / hfe, 0.999);
  return vt * Math.log((2 + forced) / (1 - x));
}

/** Small-signal parameters at an operating point. */
export interface CeSmall {
  readonly gm: number;
  readonly gpi: number;
  readonly go: number;
}

export function smallSignal(p: CeParts, q: CePoint): CeSmall {
  const vt = thermalVoltage();
  if (q.region !== 'active' || !(q.ic > 0)) return { gm: 0, gpi: 0, go: 0 };
  return { gm: q.ic / vt, gpi: q.ib / vt, go: q.ic / (p.vaf + Math.max(0, q.vc - q.vb)) };
}

function cdiv(a: Complex, b: Complex): Complex {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}
function cmul(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}
function csub(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}

/** Emitter admittance Re ∥ Ce at f, S. */
function emitterAdmittance(p: CeParts, f: number): Complex {
  return { re: 1 / p.re, im: 2 * Math.PI * f * p.ce };
}

/**
 * Collector and emitter response to 1 V at the base at frequency f, with the
 * collector loaded by `yLoad` (S, complex): solves
 *   vc·(Yc + go) − ve·(gm + go) = −gm
 *   −vc·go + ve·(Ye + gπ + gm + go) = gπ + gm.
 */
export function response(p: CeParts, s: CeSmall, f: number, yLoad: Complex): { vc: Complex; ve: Complex; ib: Complex } {
  const a11: Complex = { re: 1 / p.rc + yLoad.re + s.go, im: yLoad.im };
  const a12: Complex = { re: -(s.gm + s.go), im: 0 };
  const a21: Complex = { re: -s.go, im: 0 };
  const ye = emitterAdmittance(p, f);
  const a22: Complex = { re: ye.re + s.gpi + s.gm + s.go, im: ye.im };
  const b1: Complex = { re: -s.gm, im: 0 };
  const b2: Complex = { re: s.gpi + s.gm, im: 0 };
  const det = csub(cmul(a11, a22), cmul(a12, a21));
  const vc = cdiv(csub(cmul(b1, a22), cmul(a12, b2)), det);
  const ve = cdiv(csub(cmul(a11, b2), cmul(a21, b1)), det);
  // Base current: through rπ into the emitter node.
  const ib: Complex = { re: (1 - ve.re) * s.gpi, im: -ve.im * s.gpi };
  return { vc, ve, ib };
}

/**
 * `response` without allocating, for the trial path: writes
 * [Re vc, Im vc, Re ve, Im ve] for 1 V at the base into `into` (Cramer's rule
 * on the same two node equations, in real arithmetic).
 */
export function responseInto(p: CeParts, s: CeSmall, f: number, ylRe: number, ylIm: number, into: Float64Array): void {
  const a11r = 1 / p.rc + ylRe + s.go;
  const a11i = ylIm;
  const a12 = -(s.gm + s.go);
  const a21 = -s.go;
  const a22r = 1 / p.re + s.gpi + s.gm + s.go;
  const a22i = 2 * Math.PI * f * p.ce;
  const b1 = -s.gm;
  const b2 = s.gpi + s.gm;
  // det = a11·a22 − a12·a21 (a12, a21 real).
  const dr = a11r * a22r - a11i * a22i - a12 * a21;
  const di = a11r * a22i + a11i * a22r;
  const d2 = dr * dr + di * di;
  // vc = (b1·a22 − a12·b2)/det, ve = (a11·b2 − a21·b1)/det.
  const nr = b1 * a22r - a12 * b2;
  const ni = b1 * a22i;
  into[0] = (nr * dr + ni * di) / d2;
  into[1] = (ni * dr - nr * di) / d2;
  const er = a11r * b2 - a21 * b1;
  const ei = a11i * b2;
  into[2] = (er * dr + ei * di) / d2;
  into[3] = (ei * dr - er * di) / d2;
}

/** Impedance looking into the collector with the base held (test current in, node equations), ohms; Rc in parallel. */
export function collectorImpedance(p: CeParts, s: CeSmall, f: number): Complex {
  const a11: Complex = { re: 1 / p.rc + s.go, im: 0 };
  const a12: Complex = { re: -(s.gm + s.go), im: 0 };
  const a21: Complex = { re: -s.go, im: 0 };
  const ye = emitterAdmittance(p, f);
  const a22: Complex = { re: ye.re + s.gpi + s.gm + s.go, im: ye.im };
  const det = csub(cmul(a11, a22), cmul(a12, a21));
  // Unit current into the collector: vc = a22/det.
  return cdiv(a22, det);
}
