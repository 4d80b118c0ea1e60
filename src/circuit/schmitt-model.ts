/**
 * Closed-form timing of the comparator + integrator relaxation oscillator with a
 * slewing comparator. Pure arithmetic: the tolerance engine calls it thousands
 * of times, so it allocates one small result object and nothing else.
 *
 * Circuit (DESIGN §3): the comparator's + input joins R1 from the triangle and
 * R2 from the square node, − input at ground; it drives the square node direct,
 * or through Rz with back-to-back zeners holding the node at ±Vc; the square
 * drives an inverting integrator R·C (R = Rt + RV·setting).
 *
 * Model, derived here and checked against ngspice (test/circuit/schmitt-integrator-spice.test.ts):
 * 1. Square node s = clamp(k·c + m·tri, −Vc, +Vc), c the comparator output,
 *    k = Gz/(Gz + 1/R + 1/(R1+R2)) the Rz divider into the loads and
 *    m = (1/(R1+R2))/(Gz + …) the triangle's pull through R2 (k = 1, m = 0
 *    without Rz). The node's levels sH, sL follow (m·tri is left out of the
 *    levels, it only moves the instant the node leaves the clamp); the
 *    comparator swings Hs…Ls (rail minus headroom).
 * 2. The + input crosses 0 when the triangle reaches −sH·R1/R2 (falling) or
 *    −sL·R1/R2 (rising): the switching thresholds.
 * 3. After a threshold the comparator first has to build up overdrive: a
 *    single-pole op-amp whose input pair saturates (tanh law) slews at full rate
 *    only beyond an overdrive of Vov = SR/(2π·GBW). While the square node is
 *    held by the clamp nothing feeds back, the + input drifts at α (set by the
 *    triangle), and the comparator output drops by SR·t1·ln cosh(t/t1), t1 = Vov/α.
 *    Without a clamp the square follows at once and positive feedback
 *    (time constant τ = 1/(2π·GBW·k·R1/(R1+R2))) takes over: delay ≈ τ·(ln(1+Vov/(α·τ)) − 1).
 * 4. The square then ramps at k·SR between its levels. For the integrator a
 *    linear ramp is the same as an instant switch at its midpoint (same area),
 *    so each edge acts as an ideal switch D after its threshold.
 * 5. With these effective switches the triangle is the ideal one; the half
 *    periods follow from the triangle travelling between the thresholds plus
 *    the extra travel during D at the other slope. Its peaks come where the
 *    square crosses 0 (threshold plus the overshoot area / RC).
 * 6. The integrator's finite GBW (ωt = 2π·GBW) keeps its − input δ = s/(ωt·RC)
 *    off ground: the ramp is slower (RC + 1/ωt) and the triangle output steps
 *    by the change of δ at every edge, which the capacitor must make up.
 * Without a pot, a clamp or an Rz, and with SR, GBW → ∞, this is the textbook
 * f = R2/(4·R1·R·C) and duty = |sL|/(sH + |sL|).
 */
export interface SchmittCircuit {
  readonly r1: number;
  readonly r2: number;
  /** Integrator input resistance Rt + RV·setting, Ω. */
  readonly r: number;
  readonly c: number;
  /** Series resistor to the clamped node, Ω; 0 when absent. */
  readonly rz: number;
  /** Clamp level of the high side (vz + vf2), V; Infinity without a clamp. */
  readonly vc: number;
  /** Clamp level of the low side (vz2 + vf), V, as a magnitude; `vc` when absent. */
  readonly vcLow?: number;
  /** Op-amp output limits (comparator and integrator), V. */
  readonly high: number;
  readonly low: number;
  /** Slew rate, V/s. */
  readonly slew: number;
  /** Gain-bandwidth product, Hz. */
  readonly gbw: number;
}

export interface SchmittTiming {
  /** False when the triangle can never reach a threshold (the loop latches). */
  readonly oscillates: boolean;
  readonly period: number;
  /** Time above the square's mid level (IEEE 181 50 % reference) over the period. */
  readonly duty: number;
  /** Square node levels, V. */
  readonly squareHigh: number;
  readonly squareLow: number;
  /** Triangle extremes, V (before any clipping at the integrator's swing). */
  readonly triangleMax: number;
  readonly triangleMin: number;
  /** Effective high half (from the rising to the falling mid-level crossing), s. */
  readonly highTime: number;
  /** Duration of one square edge ramp between its levels, s. */
  readonly edge: number;
  /** Longest comparator swing time (full output range at SR), s. */
  readonly swingTime: number;
  /** Longest overdrive build-up time t1 = Vov/α, s. */
  readonly overdriveTime: number;
  /** Comparator swing × k over Vc: the clamp conducts only when above 1. */
  readonly clampReach: number;
}

/** Delay beyond the pure slew for the comparator to travel `drop` volts under a ramp overdrive. */
function clampedLeave(drop: number, slew: number, t1: number): number {
  if (drop <= 0) return 0;
  const u = drop / (slew * t1);
  // t = t1·acosh(exp(u)) written so it cannot overflow: u·t1 + t1·ln(1 + √(1 − e^(−2u))).
  return drop / slew + t1 * Math.log(1 + Math.sqrt(Math.max(0, 1 - Math.exp(-2 * u))));
}

/**
 * Extra delay of an edge when the square follows the comparator at once:
 * positive feedback (time constant τ) has to build the overdrive Vov while the
 * triangle adds α. τ·ln(1 + 0.6·Vov/(α·τ)) is a fit to a numerical solution of
 * that switching equation (tanh input stage, single pole), within 0.03·τ for
 * Vov/(α·τ) from 0.2 to 500.
 */
function regenDelay(alpha: number, tau: number, vov: number): number {
  return tau * Math.log(1 + (0.6 * vov) / (alpha * tau));
}

export function schmittTiming(p: SchmittCircuit): SchmittTiming {
  const { r1, r2, r, c, slew, vc } = p;
  const vcLow = p.vcLow ?? vc;
  // A finite-GBW integrator keeps its − input (dV/dt)/ωt off ground, against the
  // square: the capacitor sees s·(1 − 1/(ωt·RC)), i.e. RC grows by 1/ωt.
  const wt = 2 * Math.PI * p.gbw;
  const rc = r * c + 1 / wt;
  const gLoad = p.rz > 0 ? 1 / p.rz + 1 / r + 1 / (r1 + r2) : Number.POSITIVE_INFINITY;
  const k = p.rz > 0 ? 1 / p.rz / gLoad : 1;
  // R2's current also depends on the triangle: s = k·c + m·tri off the clamp.
  const m = p.rz > 0 ? 1 / (r1 + r2) / gLoad : 0;
  // Without Rz the zeners hold the comparator's own output (in current limit).
  const cHigh = p.rz > 0 ? p.high : Math.min(p.high, vc);
  const cLow = p.rz > 0 ? p.low : Math.max(p.low, -vcLow);
  const sH = Math.min(vc, k * cHigh);
  const sL = Math.max(-vcLow, k * cLow);
  const ratio = r1 / r2;
  const thUp = -sL * ratio;
  const thDown = -sH * ratio;
  const clampReach = Math.min((k * p.high) / vc, (-k * p.low) / vcLow);
  const swingTime = (cHigh - cLow) / slew;
  const oscillates = sH > 0 && sL < 0 && thUp < p.high && thDown > p.low;
  const vov = slew / (2 * Math.PI * p.gbw);
  const share = r2 / (r1 + r2);
  // The + input's drift rate just after each threshold, V/s.
  const alphaDown = (share * sH) / rc;
  const alphaUp = (share * -sL) / rc;
  const t1Down = vov / alphaDown;
  const t1Up = vov / alphaUp;
  const tau = 1 / (2 * Math.PI * p.gbw * k * (r1 / (r1 + r2)));
  // Comparator travel from the threshold until the square node leaves its level
  // (the triangle taken at the threshold meanwhile).
  const dropDown = cHigh - (sH - m * thDown) / k;
  const dropUp = (sL - m * thUp) / k - cLow;
  const leaveDown = dropDown > 1e-9 ? clampedLeave(dropDown, slew, t1Down) : regenDelay(alphaDown, tau, vov);
  const leaveUp = dropUp > 1e-9 ? clampedLeave(dropUp, slew, t1Up) : regenDelay(alphaUp, tau, vov);
  const edge = (sH - sL) / (k * slew);
  const d1 = leaveDown + edge / 2;
  const d2 = leaveUp + edge / 2;
  const span = thUp - thDown;
  let highTime = (span * rc) / sH + (-sL / sH) * d2 + d1;
  let lowTime = (span * rc) / -sL + (sH / -sL) * d1 + d2;
  // That same − input offset flips with the square, so the triangle output jumps
  // by 2·δ at each edge (δ = level/(ωt·RC)) and the capacitor travels that much further.
  const jump = (sH - sL) / (wt * r * c);
  highTime += (jump * rc) / sH;
  lowTime += (jump * rc) / -sL;
  const period = highTime + lowTime;
  // The triangle peaks where the square crosses 0 V: threshold, plus the square's
  // area from the threshold to there (flat part and half a ramp) over RC, plus
  // half of the − input's jump (the offset passes 0 with the square).
  const triangleMax = thUp - sL / (wt * r * c) + (-sL * leaveUp + (sL * sL) / (2 * k * slew)) / rc;
  const triangleMin = thDown - sH / (wt * r * c) - (sH * leaveDown + (sH * sH) / (2 * k * slew)) / rc;
  return {
    oscillates,
    period,
    duty: highTime / period,
    squareHigh: sH,
    squareLow: sL,
    triangleMax,
    triangleMin,
    highTime,
    edge,
    swingTime,
    overdriveTime: Math.max(t1Down, t1Up),
    clampReach,
  };
}
