import type { OpampModel } from './types.js';

/**
 * A small linear network (a filter section, a Wien bridge) solved by nodal
 * analysis at one frequency: node 0 is ground, node 1 the input (driven with
 * 1 V, so every node voltage is a transfer function from the input), nodes 2…
 * unknown. Each element is a conductance in parallel with a capacitance between
 * two nodes; an open part has both zero, a shorted one a large conductance.
 *
 * An op-amp is the one-pole model A(s) = aol / (1 + s·aol/(2π·GBW)) (Sedra and
 * Smith, single-pole op-amp frequency response), an ideal voltage source at its
 * output: the output node's current equation is replaced by
 * V(out)/A − V(+) + V(−) = 0, written with 1/A = 1/aol + s/(2π·GBW) so that a
 * very large aol stays well conditioned.
 *
 * Everything is preallocated: a filter kind solves its net a hundred times per
 * evaluation, and the tolerance engine evaluates it ten thousand times.
 */
export interface NetElement {
  readonly a: number;
  readonly b: number;
  /** Conductance, S. */
  g: number;
  /** Capacitance, F. */
  c: number;
}

export interface NetOpamp {
  readonly out: number;
  readonly plus: number;
  readonly minus: number;
}

/** A shorted part: a solder bridge of about a milliohm (common practice, no source). */
export const shortConductance = 1e3;

export class LinearNet {
  /** Node voltages of the last solve, real and imaginary parts, indexed by node. */
  readonly re: Float64Array;
  readonly im: Float64Array;
  private readonly m: number;
  private readonly ar: Float64Array;
  private readonly ai: Float64Array;
  private readonly br: Float64Array;
  private readonly bi: Float64Array;

  constructor(
    readonly nodes: number,
    readonly elements: NetElement[],
    readonly opamp?: NetOpamp,
  ) {
    this.m = nodes - 2;
    this.re = new Float64Array(nodes);
    this.im = new Float64Array(nodes);
    this.ar = new Float64Array(this.m * this.m);
    this.ai = new Float64Array(this.m * this.m);
    this.br = new Float64Array(this.m);
    this.bi = new Float64Array(this.m);
  }

  /** Solve at `f` Hz with the input at 1 V; the op-amp (if any) is `op`. Fills `re`/`im`. */
  solve(f: number, op?: OpampModel): void {
    this.assemble(0, 2 * Math.PI * f, op);
    this.eliminate();
    this.re[0] = 0;
    this.im[0] = 0;
    this.re[1] = 1;
    this.im[1] = 0;
    for (let i = 0; i < this.m; i++) {
      this.re[i + 2] = this.br[i] as number;
      this.im[i + 2] = this.bi[i] as number;
    }
  }

  /**
   * The determinant of the nodal matrix at a complex frequency s = σ + jω (rad/s), into
   * `out`: its zeros are the net's natural frequencies with the input held at 0 V.
   */
  determinant(sigma: number, omega: number, op: OpampModel | undefined, out: { re: number; im: number }): void {
    this.assemble(sigma, omega, op);
    out.re = 1;
    out.im = 0;
    this.eliminate(out);
  }

  private assemble(sigma: number, w: number, op?: OpampModel): void {
    const { m, ar, ai, br, bi } = this;
    ar.fill(0);
    ai.fill(0);
    br.fill(0);
    bi.fill(0);
    const outRow = this.opamp && op ? this.opamp.out - 2 : -1;
    for (const e of this.elements) {
      const yr = e.g + sigma * e.c;
      const yi = w * e.c;
      if (yr === 0 && yi === 0) continue;
      const ia = e.a - 2;
      const ib = e.b - 2;
      // Current leaving node a through the element: y·(Va − Vb).
      if (ia >= 0 && ia !== outRow) {
        add(ar, ia * m + ia, yr);
        add(ai, ia * m + ia, yi);
        if (ib >= 0) {
          add(ar, ia * m + ib, -yr);
          add(ai, ia * m + ib, -yi);
        } else if (e.b === 1) {
          add(br, ia, yr);
          add(bi, ia, yi);
        }
      }
      if (ib >= 0 && ib !== outRow) {
        add(ar, ib * m + ib, yr);
        add(ai, ib * m + ib, yi);
        if (ia >= 0) {
          add(ar, ib * m + ia, -yr);
          add(ai, ib * m + ia, -yi);
        } else if (e.a === 1) {
          add(br, ib, yr);
          add(bi, ib, yi);
        }
      }
    }
    if (outRow >= 0 && this.opamp && op) {
      const { plus, minus } = this.opamp;
      add(ar, outRow * m + outRow, 1 / op.aol + sigma / (2 * Math.PI * op.gbw));
      add(ai, outRow * m + outRow, w / (2 * Math.PI * op.gbw));
      this.place(outRow, plus, -1);
      this.place(outRow, minus, 1);
    }
  }

  /** Add a real coefficient for `node` in row `row` (the input moves to the right side). */
  private place(row: number, node: number, k: number): void {
    if (node === 0) return;
    if (node === 1) {
      this.br[row] = (this.br[row] as number) - k;
      return;
    }
    const i = row * this.m + (node - 2);
    this.ar[i] = (this.ar[i] as number) + k;
  }

  /**
   * Gaussian elimination with partial pivoting, in place; the solution is left in br/bi.
   * With `det`, the product of the pivots (signed by the row swaps) is multiplied into it.
   */
  private eliminate(det?: { re: number; im: number }): void {
    const { m, ar, ai, br, bi } = this;
    for (let col = 0; col < m; col++) {
      let pivot = col;
      let best = -1;
      for (let r = col; r < m; r++) {
        const mag = Math.hypot(ar[r * m + col] as number, ai[r * m + col] as number);
        if (mag > best) {
          best = mag;
          pivot = r;
        }
      }
      if (pivot !== col) {
        for (let c = 0; c < m; c++) {
          swap(ar, pivot * m + c, col * m + c);
          swap(ai, pivot * m + c, col * m + c);
        }
        swap(br, pivot, col);
        swap(bi, pivot, col);
        if (det) {
          det.re = -det.re;
          det.im = -det.im;
        }
      }
      const pr = ar[col * m + col] as number;
      const pi = ai[col * m + col] as number;
      if (det) {
        const r = det.re * pr - det.im * pi;
        det.im = det.re * pi + det.im * pr;
        det.re = r;
      }
      const d = pr * pr + pi * pi;
      if (d === 0) continue;
      for (let r = col + 1; r < m; r++) {
        const xr = ar[r * m + col] as number;
        const xi = ai[r * m + col] as number;
        if (xr === 0 && xi === 0) continue;
        // factor = x / pivot
        const fr = (xr * pr + xi * pi) / d;
        const fi = (xi * pr - xr * pi) / d;
        for (let c = col; c < m; c++) {
          const yr = ar[col * m + c] as number;
          const yi = ai[col * m + c] as number;
          ar[r * m + c] = (ar[r * m + c] as number) - (fr * yr - fi * yi);
          ai[r * m + c] = (ai[r * m + c] as number) - (fr * yi + fi * yr);
        }
        const yr = br[col] as number;
        const yi = bi[col] as number;
        br[r] = (br[r] as number) - (fr * yr - fi * yi);
        bi[r] = (bi[r] as number) - (fr * yi + fi * yr);
      }
    }
    for (let r = m - 1; r >= 0; r--) {
      let sr = br[r] as number;
      let si = bi[r] as number;
      for (let c = r + 1; c < m; c++) {
        const xr = ar[r * m + c] as number;
        const xi = ai[r * m + c] as number;
        const vr = br[c] as number;
        const vi = bi[c] as number;
        sr -= xr * vr - xi * vi;
        si -= xr * vi + xi * vr;
      }
      const pr = ar[r * m + r] as number;
      const pi = ai[r * m + r] as number;
      const d = pr * pr + pi * pi;
      br[r] = d === 0 ? Number.NaN : (sr * pr + si * pi) / d;
      bi[r] = d === 0 ? Number.NaN : (si * pr - sr * pi) / d;
    }
  }
}

function add(a: Float64Array, i: number, v: number): void {
  a[i] = (a[i] as number) + v;
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i] as number;
  a[i] = a[j] as number;
  a[j] = t;
}

/** Set an element to a resistor value, or to its open / shorted fault. */
export function setResistor(e: NetElement, ohms: number, fault?: 'open' | 'short' | 'missing'): void {
  e.c = 0;
  e.g = fault === 'open' || fault === 'missing' ? 0 : fault === 'short' ? shortConductance : 1 / ohms;
}

/** Set an element to a capacitor value, or to its open / shorted fault. */
export function setCapacitor(e: NetElement, farads: number, fault?: 'open' | 'short' | 'missing'): void {
  e.g = fault === 'short' ? shortConductance : 0;
  e.c = fault === 'open' || fault === 'missing' || fault === 'short' ? 0 : farads;
}
