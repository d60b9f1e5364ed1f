/**
 * Piecewise-quadratic functions of a segment level mu, the state of functional
 * pruning ({@link fpop}).
 */

const INF = 1 / 0;
const { sqrt } = Math;

/**
 * A continuous function of mu on [lo, hi] made of pieces
 *
 *   q_k(mu) = a_k (mu - m_k)^2 + c_k   on [left_k, left_{k+1})   (the last piece ends at hi),
 *
 * each tagged with a label (the start of the last segment whose cost it carries).
 * Kept in vertex form (a, m, c) rather than as a mu^2 + b mu + c: adding a point's
 * loss then never squares a value far from the piece, so a single value 1e155
 * noise scales away leaves the other pieces exact. Struct of arrays, double
 * buffered: every operation reads one buffer and writes the other. Unchecked.
 */
export class PiecewiseQuadratic {
  left: Float64Array;
  a: Float64Array;
  m: Float64Array;
  c: Float64Array;
  label: Int32Array;
  size = 0;
  readonly lo: number;
  readonly hi: number;
  private bLeft: Float64Array;
  private bA: Float64Array;
  private bM: Float64Array;
  private bC: Float64Array;
  private bLabel: Int32Array;
  private bSize = 0;

  /** One constant piece c on [lo, hi] with the given label. */
  constructor(lo: number, hi: number, c: number, label: number, capacity = 64) {
    this.lo = lo; this.hi = hi;
    this.left = new Float64Array(capacity); this.a = new Float64Array(capacity); this.m = new Float64Array(capacity);
    this.c = new Float64Array(capacity); this.label = new Int32Array(capacity);
    this.bLeft = new Float64Array(capacity); this.bA = new Float64Array(capacity); this.bM = new Float64Array(capacity);
    this.bC = new Float64Array(capacity); this.bLabel = new Int32Array(capacity);
    this.left[0] = lo; this.a[0] = 0; this.m[0] = 0; this.c[0] = c; this.label[0] = label; this.size = 1;
  }

  /** Resets to one constant piece c with the given label (reuse without allocation). */
  reset(c: number, label: number): void {
    this.left[0] = this.lo; this.a[0] = 0; this.m[0] = 0; this.c[0] = c; this.label[0] = label; this.size = 1;
  }

  /** A copy (for pending candidates). */
  clone(): PiecewiseQuadratic {
    const q = new PiecewiseQuadratic(this.lo, this.hi, 0, 0, Math.max(8, this.size * 2));
    q.left.set(this.left.subarray(0, this.size)); q.a.set(this.a.subarray(0, this.size)); q.m.set(this.m.subarray(0, this.size));
    q.c.set(this.c.subarray(0, this.size)); q.label.set(this.label.subarray(0, this.size)); q.size = this.size;
    return q;
  }

  /** Right end of piece k. */
  right(k: number): number { return k + 1 < this.size ? this.left[k + 1] : this.hi; }

  /** Value at mu (tests and checks). */
  valueAt(mu: number): number {
    let k = 0;
    while (k + 1 < this.size && this.left[k + 1] <= mu) k++;
    const d = mu - this.m[k];
    return this.a[k] === 0 ? this.c[k] : this.a[k] * d * d + this.c[k];
  }

  private reserveBuffer(n: number): void {
    if (this.bLeft.length >= n) return;
    const cap = Math.max(n, this.bLeft.length * 2);
    this.bLeft = new Float64Array(cap); this.bA = new Float64Array(cap); this.bM = new Float64Array(cap);
    this.bC = new Float64Array(cap); this.bLabel = new Int32Array(cap);
  }

  /** Appends a piece to the write buffer, merging it into the previous one when identical. */
  private emit(l: number, a: number, m: number, c: number, label: number): void {
    const j = this.bSize;
    if (j > 0) {
      const p = j - 1;
      if (this.bLabel[p] === label && this.bA[p] === a && this.bC[p] === c && (a === 0 || this.bM[p] === m)) return;
      if (this.bLeft[p] === l) { this.bSize = p; this.emit(l, a, m, c, label); return; } // zero-width previous piece
    }
    this.bLeft[j] = l; this.bA[j] = a; this.bM[j] = m; this.bC[j] = c; this.bLabel[j] = label;
    this.bSize = j + 1;
  }

  private swap(): void {
    let t: Float64Array = this.left; this.left = this.bLeft; this.bLeft = t;
    t = this.a; this.a = this.bA; this.bA = t;
    t = this.m; this.m = this.bM; this.bM = t;
    t = this.c; this.c = this.bC; this.bC = t;
    const u = this.label; this.label = this.bLabel; this.bLabel = u;
    this.size = this.bSize; this.bSize = 0;
  }

  /** Adds w (mu - z)^2 everywhere (Gaussian loss). In place. */
  addSquare(z: number, w: number): void {
    const { a, m, c } = this;
    for (let k = 0; k < this.size; k++) {
      const ak = a[k];
      if (ak === 0) { a[k] = w; m[k] = z; continue; }
      const a2 = ak + w;
      const d = m[k] - z;
      c[k] += ((ak * w) / a2) * d * d;
      m[k] += (w * (z - m[k])) / a2;
      a[k] = a2;
    }
  }

  /**
   * Adds the biweight loss w min((mu - z)^2, K^2) (Fearnhead & Rigaill 2019): the square
   * on [z - K, z + K], the constant w K^2 elsewhere; pieces straddling z +- K are split.
   */
  addBiweight(z: number, w: number, K: number): void {
    const from = z - K, to = z + K, cap = w * K * K;
    this.reserveBuffer(this.size + 2);
    this.bSize = 0;
    for (let k = 0; k < this.size; k++) {
      const l = this.left[k], r = this.right(k);
      const ak = this.a[k], mk = this.m[k], ck = this.c[k], lab = this.label[k];
      if (r <= from || l >= to) { this.emit(l, ak, mk, ck + cap, lab); continue; }
      if (l < from) this.emit(l, ak, mk, ck + cap, lab);
      const inL = l > from ? l : from;
      if (ak === 0) this.emit(inL, w, z, ck, lab);
      else {
        const a2 = ak + w, d = mk - z;
        this.emit(inL, a2, mk + (w * (z - mk)) / a2, ck + ((ak * w) / a2) * d * d, lab);
      }
      if (r > to) this.emit(to, ak, mk, ck + cap, lab);
    }
    this.swap();
  }

  /** Pointwise min with the constant C labelled `label`; where equal, the current pieces stay. */
  minConstant(C: number, label: number): void {
    this.reserveBuffer(this.size * 3 + 1);
    this.bSize = 0;
    for (let k = 0; k < this.size; k++) {
      const l = this.left[k], r = this.right(k);
      const ak = this.a[k], mk = this.m[k], ck = this.c[k], lab = this.label[k];
      if (ak === 0) {
        if (ck <= C) this.emit(l, 0, 0, ck, lab); else this.emit(l, 0, 0, C, label);
        continue;
      }
      if (ck >= C) { this.emit(l, 0, 0, C, label); continue; }
      const h = sqrt((C - ck) / ak);
      const lo = mk - h, hi = mk + h;
      if (hi <= l || lo >= r) { this.emit(l, 0, 0, C, label); continue; }
      if (lo > l) this.emit(l, 0, 0, C, label);
      this.emit(lo > l ? lo : l, ak, mk, ck, lab);
      if (hi < r) this.emit(hi, 0, 0, C, label);
    }
    this.swap();
  }

  /**
   * Pointwise min with another function on the same domain; where equal, this one's
   * pieces stay. Used for candidates that become eligible after a minimum segment length.
   */
  minWith(o: PiecewiseQuadratic): void {
    this.reserveBuffer(3 * (this.size + o.size) + 4);
    this.bSize = 0;
    let i = 0, j = 0;
    let l = this.lo;
    while (l < this.hi) {
      const ri = this.right(i), rj = o.right(j);
      const r = ri < rj ? ri : rj;
      if (r > l) this.minPieces(l, r, this.a[i], this.m[i], this.c[i], this.label[i], o.a[j], o.m[j], o.c[j], o.label[j]);
      l = r;
      if (ri <= r) i++;
      if (rj <= r) j++;
      if (i >= this.size || j >= o.size) break;
    }
    this.swap();
  }

  /** Emits min(p, q) on [l, r), splitting at the crossings. */
  private minPieces(l: number, r: number, a1: number, m1: number, c1: number, lab1: number, a2: number, m2: number, c2: number, lab2: number): void {
    // quick dominance: q's minimum on [l, r] at or above p's maximum (at an end, p convex) keeps p
    const e1l = l - m1, e1r = r - m1;
    const pMax = a1 === 0 ? c1 : a1 * Math.max(e1l * e1l, e1r * e1r) + c1;
    const at = m2 < l ? l : m2 > r ? r : m2;
    const qMin = a2 === 0 ? c2 : a2 * (at - m2) * (at - m2) + c2;
    if (qMin >= pMax) { this.emit(l, a1, m1, c1, lab1); return; }
    // difference p - q in u = mu - l: A u^2 + B u + D
    const d1 = l - m1, d2 = l - m2;
    const A = a1 - a2;
    const B = 2 * (a1 * d1 - a2 * d2);
    const D = (a1 === 0 ? 0 : a1 * d1 * d1) + c1 - (a2 === 0 ? 0 : a2 * d2 * d2) - c2;
    const width = r - l;
    let cut1 = width, cut2 = width;
    if (A === 0) {
      if (B !== 0) { const u = -D / B; if (u > 0 && u < width) cut1 = u; }
    } else {
      const disc = B * B - 4 * A * D;
      if (disc > 0) {
        const s = sqrt(disc);
        const qq = -0.5 * (B + (B >= 0 ? s : -s));
        const u1 = qq / A, u2 = qq !== 0 ? D / qq : u1;
        const lo = u1 < u2 ? u1 : u2, hi = u1 < u2 ? u2 : u1;
        if (lo > 0 && lo < width) { cut1 = lo; if (hi > lo && hi < width) cut2 = hi; } else if (hi > 0 && hi < width) cut1 = hi;
      }
    }
    this.emitSmaller(l, 0, cut1, a1, m1, c1, lab1, a2, m2, c2, lab2);
    if (cut1 < width) this.emitSmaller(l, cut1, cut2, a1, m1, c1, lab1, a2, m2, c2, lab2);
    if (cut2 < width) this.emitSmaller(l, cut2, width, a1, m1, c1, lab1, a2, m2, c2, lab2);
  }

  /** Emits whichever of p, q is smaller at the middle of [l + from, l + to). */
  private emitSmaller(l: number, from: number, to: number, a1: number, m1: number, c1: number, lab1: number, a2: number, m2: number, c2: number, lab2: number): void {
    const mid = l + (from + to) / 2;
    const e1 = mid - m1, e2 = mid - m2;
    const v1 = (a1 === 0 ? 0 : a1 * e1 * e1) + c1, v2 = (a2 === 0 ? 0 : a2 * e2 * e2) + c2;
    if (v1 <= v2) this.emit(l + from, a1, m1, c1, lab1); else this.emit(l + from, a2, m2, c2, lab2);
  }

  /** The minimum over mu: value, label of its piece, and the minimising mu (the smallest on ties). */
  minimum(): { value: number; label: number; mu: number } {
    let best = INF, lab = -1, mu = this.lo;
    for (let k = 0; k < this.size; k++) {
      const l = this.left[k], r = this.right(k), ak = this.a[k], mk = this.m[k];
      let v: number, at: number;
      if (ak === 0) { v = this.c[k]; at = l; } else {
        at = mk < l ? l : mk > r ? r : mk;
        const d = at - mk;
        v = ak * d * d + this.c[k];
      }
      if (v < best) { best = v; lab = this.label[k]; mu = at; }
    }
    return { value: best, label: lab, mu };
  }
}
