import type { DiodeModel } from './diode.js';

/**
 * The diode-biased complementary follower as it is built (Horowitz and Hill,
 * push-pull followers and their biasing): Rb1 from the positive rail to the NPN
 * base (node a), bias diode D1 from a down to the driven midpoint (vin), D2 from
 * the midpoint down to the PNP base (node b), Rb2 from b to the negative rail;
 * emitters joined at the output y, loaded by GL to ground.
 *
 * Every junction follows the Shockley law at its own current: the diodes with
 * their series resistance RS, the transistors as Ebers–Moll (Ic = IS·(e^(Vbe/Vt) − 1),
 * Ib = Ic/β, Ie = Ic + Ib; the base–collector junction stays reversed since the
 * base never rises above its rail). Kirchhoff at a, b and y:
 *
 *   F1 = (V+ − a)/Rb1 − I(D1) − Ib(NPN) = 0
 *   F2 = I(D2) + Ib(PNP) − (b − V−)/Rb2 = 0
 *   F3 = Ie(NPN) − Ie(PNP) − GL·y = 0
 *
 * solved by Newton's method on (a, b, y) and both diode junctions, the
 * Jacobian eliminated by hand (it is an arrow: a and b couple only through y).
 * The NPN and PNP carry their own IS and β: they are not assumed to match.
 */
export interface FollowerNetwork {
  readonly vpos: number;
  readonly vneg: number;
  readonly rb1: number;
  readonly rb2: number;
  /** Load conductance from the output to ground, S. */
  readonly gl: number;
  readonly diode: DiodeModel;
  /** Saturation currents of the NPN and the PNP, A. */
  readonly isn: number;
  readonly isp: number;
  readonly betaN: number;
  readonly betaP: number;
  /** Thermal voltage, V. */
  readonly vt: number;
}

/** The network's state at one drive level; reused between solves (warm start). */
export interface FollowerState {
  a: number;
  b: number;
  y: number;
  /** Diode junction voltages (without the RS drop), V. */
  j1: number;
  j2: number;
  /** dy/dvin at the solution. */
  slope: number;
  /** Collector currents of the NPN and the PNP, A. */
  icn: number;
  icp: number;
  /** Current the driver pushes into the midpoint, A. */
  iin: number;
  converged: boolean;
}

export function freshState(vin: number): FollowerState {
  return { a: vin + 0.6, b: vin - 0.6, y: vin, j1: 0.6, j2: 0.6, slope: 1, icn: 0, icp: 0, iin: 0, converged: false };
}

/**
 * A close start at vin = 0: each bias diode carries what its resistor feeds
 * (the base currents neglected), the output sits at 0 V. Newton then needs a
 * few steps instead of a damped walk from a guess.
 */
export function restState(net: FollowerNetwork): FollowerState {
  const nvt = net.diode.n * net.vt;
  const drop = (i: number): number => nvt * Math.log1p(Math.max(i, 0) / net.diode.is) + net.diode.rs * Math.max(i, 0);
  let j1 = drop((net.vpos - 0.6) / net.rb1);
  let j2 = drop((-0.6 - net.vneg) / net.rb2);
  j1 = drop((net.vpos - j1) / net.rb1);
  j2 = drop((-j2 - net.vneg) / net.rb2);
  const i1 = (net.vpos - j1) / net.rb1;
  const i2 = (-j2 - net.vneg) / net.rb2;
  return { a: j1, b: -j2, y: 0, j1: j1 - net.diode.rs * i1, j2: j2 - net.diode.rs * i2, slope: 1, icn: 0, icp: 0, iin: 0, converged: false };
}

/** Collector current saturation current from a base–emitter drop at 1 mA (Ebers–Moll, N = 1), A. */
export function isFromVbe(vbeAt1mA: number, vt: number): number {
  return 1e-3 / Math.expm1(vbeAt1mA / vt);
}

/** Largest forward step of any junction per Newton step, in thermal voltages (keeps exp tame). */
const maxJunctionStep = 4;
/** Newton stops when no voltage moved by more than this, V: the convergence is quadratic, so the error left is of the order of (10 µV)² per thermal voltage, a few nV. */
const tolerance = 1e-5;

/**
 * On a Monte Carlo trial (EvalInput.isTrial) a step under 0.3 mV ends the solve: the
 * convergence is quadratic, so about (0.3 mV)² / (2·Vt), 2 µV, is left, and a knot
 * takes one Newton step (four exponentials) fewer than at `tolerance`.
 */
export const trialTolerance = 3e-4;

/** Solve the network at drive `vin`, starting from (and writing to) `s`; done when no voltage moved by more than `tol`. */
export function solveFollower(net: FollowerNetwork, vin: number, s: FollowerState, tol = tolerance): FollowerState {
  const { vpos, vneg, rb1, rb2, gl, diode, isn, isp, betaN, betaP, vt } = net;
  const nvt = diode.n * vt;
  const rs = diode.rs;
  const dis = diode.is;
  // Reciprocals once per solve: a Newton step then divides only where it must.
  const inN = 1 / nvt;
  const inV = 1 / vt;
  const gb1 = 1 / rb1;
  const gb2 = 1 / rb2;
  const hn = 1 / betaN;
  const hp = 1 / betaP;
  const en1 = 1 + hn;
  const ep1 = 1 + hp;
  let { a, b, y, j1, j2 } = s;
  let converged = false;
  let g1c1 = 0,
    g2c2 = 0,
    j11 = 1,
    j22 = 1,
    j31 = 0,
    j32 = 0,
    jyy = 1;
  let icn = 0,
    icp = 0,
    i1 = 0,
    i2 = 0;
  // The last step and the conductances it was taken with: the currents are moved along it at the end.
  let gn = 0,
    gp = 0,
    g1 = 0,
    g2 = 0,
    da = 0,
    db = 0,
    dy = 0,
    dj1 = 0,
    dj2 = 0;
  for (let it = 0; it < 100; it++) {
    const e1 = Math.exp(j1 * inN);
    const e2 = Math.exp(j2 * inN);
    i1 = dis * (e1 - 1);
    i2 = dis * (e2 - 1);
    g1 = dis * e1 * inN;
    g2 = dis * e2 * inN;
    const c1 = 1 / (1 + rs * g1);
    const c2 = 1 / (1 + rs * g2);
    const en = Math.exp((a - y) * inV);
    const ep = Math.exp((y - b) * inV);
    icn = isn * (en - 1);
    icp = isp * (ep - 1);
    gn = isn * en * inV;
    gp = isp * ep * inV;
    const r1 = j1 + rs * i1 - (a - vin);
    const r2 = j2 + rs * i2 - (vin - b);
    const f1 = (vpos - a) * gb1 - i1 - icn * hn;
    const f2 = i2 + icp * hp - (b - vneg) * gb2;
    const f3 = icn * en1 - icp * ep1 - gl * y;
    g1c1 = g1 * c1;
    g2c2 = g2 * c2;
    const f1p = f1 + g1c1 * r1;
    const f2p = f2 - g2c2 * r2;
    j11 = -gb1 - gn * hn - g1c1;
    const j13 = gn * hn;
    j22 = -g2c2 - gp * hp - gb2;
    const j23 = gp * hp;
    j31 = gn * en1;
    j32 = gp * ep1;
    const j33 = -j31 - j32 - gl;
    const q1 = 1 / j11;
    const q2 = 1 / j22;
    jyy = j33 - j31 * j13 * q1 - j32 * j23 * q2;
    dy = -(f3 - j31 * f1p * q1 - j32 * f2p * q2) / jyy;
    da = -(f1p + j13 * dy) * q1;
    db = -(f2p + j23 * dy) * q2;
    dj1 = c1 * (da - r1);
    dj2 = c2 * (-db - r2);
    // Damping: no junction may move forward by more than a few thermal voltages at once.
    const limit = maxJunctionStep * vt;
    const dl = diode.n * limit;
    let worst = 0;
    if (j1 + dj1 > 0.3 && dj1 > dl) worst = dj1 / dl;
    if (j2 + dj2 > 0.3 && dj2 > dl) worst = Math.max(worst, dj2 / dl);
    if (a - y + da - dy > 0.3 && da - dy > limit) worst = Math.max(worst, (da - dy) / limit);
    if (y - b + dy - db > 0.3 && dy - db > limit) worst = Math.max(worst, (dy - db) / limit);
    if (worst > 1) {
      const k = 1 / worst;
      dy *= k;
      da *= k;
      db *= k;
      dj1 *= k;
      dj2 *= k;
    }
    a += da;
    b += db;
    y += dy;
    j1 += dj1;
    j2 += dj2;
    const step = Math.max(Math.abs(da), Math.abs(db), Math.abs(dy), Math.abs(dj1), Math.abs(dj2));
    if (worst <= 1 && step < tol) {
      converged = true;
      break;
    }
  }
  // The currents were evaluated before the last step: carried along it to first order (the
  // step is under `tol`, so what is left is of the order of (step/Vt)², 1e-4 of the current at 0.3 mV).
  icn += gn * (da - dy);
  icp += gp * (dy - db);
  i1 += g1 * dj1;
  i2 += g2 * dj2;
  s.a = a;
  s.b = b;
  s.y = y;
  s.j1 = j1;
  s.j2 = j2;
  s.icn = icn;
  s.icp = icp;
  s.iin = i2 - i1;
  // dy/dvin from the implicit function (the same eliminated Jacobian, driven by vin).
  s.slope = ((j31 * g1c1) / j11 + (j32 * g2c2) / j22) / jyy;
  s.converged = converged && Number.isFinite(y);
  return s;
}

/** Where the small-signal gain falls below this, the output counts as in the dead band. */
export const deadbandGain = 0.5;

/**
 * The dead band: the total width of drive around zero where the follower's
 * small-signal gain dy/dvin is below one half (our definition; for an unbiased
 * follower it is the 2·Vbe step, for a well-biased one 0). Found by bisection on
 * each side of zero, when the gain at zero is below one half at all.
 */
export function deadband(net: FollowerNetwork, atZero: FollowerState): number {
  if (!(atZero.slope < deadbandGain)) return 0;
  const edge = (sign: 1 | -1): number => {
    let inside = 0;
    let outside = sign * 0.05;
    const s = { ...atZero };
    // Walk out until the gain recovers (at most 2 V: beyond that the stage is not biased at all).
    while (Math.abs(outside) < 2 && solveFollower(net, outside, s).slope < deadbandGain) {
      inside = outside;
      outside *= 2;
    }
    for (let i = 0; i < 30; i++) {
      const mid = 0.5 * (inside + outside);
      const t = solveFollower(net, mid, { ...atZero });
      if (t.slope < deadbandGain) inside = mid;
      else outside = mid;
    }
    return Math.abs(0.5 * (inside + outside));
  };
  return edge(1) + edge(-1);
}
