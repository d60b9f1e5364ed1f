/**
 * Whittaker-Henderson graduation: optimality (normal equations), exact leverages
 * against a dense inverse, polynomial reproduction, the one-sided trend against
 * prefix fits, and error messages. Reference checks against statsmodels are in
 * whittakerReference.test.ts.
 */
import { Matrix, inverse } from 'ml-matrix';
import { whittakerFit } from '../../../src/engine/smoothers/whittaker/whittakerFit';
import { whittakerGcv } from '../../../src/engine/smoothers/whittaker/whittakerGcv';
import { whittakerOneSided } from '../../../src/engine/smoothers/whittaker/whittakerOneSided';
import { hodrickPrescottLambda } from '../../../src/engine/smoothers/whittaker/hodrickPrescottLambda';
import { bandedInverseBand } from '../../../src/engine/smoothers/whittaker/bandedInverseBand';
import { bandedCholesky, bandedCholeskySolve } from '../../../src/engine/linalg/bandedCholesky';
import { backwardError2, pentadiagonalSolve } from '../../../src/engine/smoothers/whittaker/pentadiagonalSolve';
import { whittakerBand } from '../../../src/engine/smoothers/whittaker/whittakerSolve';
import { whittakerInput, scaledLambda } from '../../../src/engine/smoothers/whittaker/whittakerInput';
import { bandedInverseDiagonal } from '../../../src/engine/smoothers/whittaker/bandedInverseBand';
import { differenceOperator, differenceTranspose } from '../../../src/engine/linalg/difference';
import { differenceRows } from '../../../src/engine/linalg/differenceRows';
import { mulberry32, normalStream } from '../../helpers/random';

function unevenSeries(n: number, seed: number) {
  const u = mulberry32(seed), z = normalStream(seed + 7);
  const x = new Float64Array(n), y = new Float64Array(n), w = new Float64Array(n);
  let t = 0;
  for (let i = 0; i < n; i++) { t += 0.2 + 2 * u(); x[i] = t; }
  for (let i = 0; i < n; i++) { y[i] = Math.sin(x[i] / 8) + 0.02 * x[i] + 0.3 * z(); w[i] = 0.5 + u(); }
  return { x, y, w };
}

/** Dense (W + lambda D'D) for small n, from the rows of D(x, d). */
function denseSystem(x: Float64Array, w: Float64Array, lambda: number, d: number): Matrix {
  const n = x.length;
  const A = Matrix.zeros(n, n);
  for (let i = 0; i < n; i++) A.set(i, i, w[i]);
  const rows = differenceRows(x, d);
  for (let r = 0; r < n - d; r++) for (let a = 0; a <= d; a++) for (let b = 0; b <= d; b++) {
    A.set(r + a, r + b, A.get(r + a, r + b) + lambda * rows[r * (d + 1) + a] * rows[r * (d + 1) + b]);
  }
  return A;
}

describe('bandedInverseBand', () => {
  test.each([1, 2, 3, 4])('matches the band of a dense inverse (half-bandwidth %i)', (p) => {
    const n = 30;
    const u = mulberry32(100 + p);
    const A = Matrix.zeros(n, n);
    for (let i = 0; i < n; i++) for (let j = Math.max(0, i - p); j < i; j++) { const v = u() - 0.5; A.set(i, j, v); A.set(j, i, v); }
    for (let i = 0; i < n; i++) A.set(i, i, 2 * p + 1 + u());
    const band = new Float64Array(n * (p + 1));
    for (let i = 0; i < n; i++) for (let d = 0; d <= p && d <= i; d++) band[i * (p + 1) + d] = A.get(i, i - d);
    expect(bandedCholesky(band, n, p)).toBe(-1);
    const s = bandedInverseBand(band, n, p);
    const inv = inverse(A);
    let err = 0;
    for (let i = 0; i < n; i++) for (let d = 0; d <= p && i + d < n; d++) err = Math.max(err, Math.abs(s[i * (p + 1) + d] - inv.get(i, i + d)));
    expect(err).toBeLessThan(1e-13);
  });
});

describe('pentadiagonalSolve (order 2 in fused passes)', () => {
  test.each(['uneven', 'equally spaced'])('gives the banded path\'s solution and leverages bit for bit (%s x, zero weights, reused arrays)', (spacing) => {
    const { x: ux, y, w } = unevenSeries(500, 5);
    const x = spacing === 'uneven' ? ux : Float64Array.from(ux, (_, i) => 3 + 2 * i);
    for (let i = 40; i < 60; i++) w[i] = 0; // a gap filled in by the penalty
    const inp = whittakerInput(x, y, w, 2);
    expect(inp.spacing === null).toBe(spacing !== 'uneven'); // equal spacing: rows (1, -2, 1), no array
    const lam = scaledLambda(inp, 300);
    // the banded path: assemble the band, factor, solve, band of the inverse
    const band = whittakerBand(inp, lam);
    expect(bandedCholesky(band, inp.n, 2)).toBe(-1);
    const z = Float64Array.from(inp.y, (v, i) => inp.w[i] * v);
    bandedCholeskySolve(band, inp.n, 2, z);
    const lev = bandedInverseDiagonal(band, inp.n, 2).map((v, i) => v * inp.w[i]);
    const fresh = pentadiagonalSolve(inp, lam, true);
    expect(fresh.failedRow).toBe(-1);
    expect(Array.from(fresh.fitted)).toEqual(Array.from(z));
    expect(Array.from(fresh.leverage!)).toEqual(Array.from(lev));
    expect(fresh.df).toBe(lev.reduce((a, b) => a + b, 0));
    expect(fresh.residual).toBeLessThan(1e-14);
    const n = inp.n;
    const work = { l: new Float64Array(3 * n), z: new Float64Array(n), lev: new Float64Array(n) };
    pentadiagonalSolve(inp, 10 * lam, true, work); // an earlier solve leaves other numbers in the arrays
    const reused = pentadiagonalSolve(inp, lam, true, work, false);
    expect(Array.from(reused.fitted)).toEqual(Array.from(z));
    expect(reused.df).toBe(fresh.df);
    expect(reused.residual).toBeNaN();
  });

  test('the backward error computed during the backward pass equals the separate pass exactly, down to 3 points and around the pass\'s split after its last 64 rows', () => {
    for (const n of [3, 4, 5, 6, 50, 64, 65, 66, 67, 130]) {
      for (const even of [true, false]) {
        const { x: ux, y, w } = unevenSeries(n, 20 + n);
        const x = even ? Float64Array.from(ux, (_, i) => i + 1) : ux;
        const inp = whittakerInput(x, y, w, 2);
        const lam = scaledLambda(inp, 7);
        const s = pentadiagonalSolve(inp, lam, false);
        expect(s.residual).toBe(backwardError2(inp, lam, s.fitted));
        expect(s.residual).toBeGreaterThan(0); // rounding leaves a (tiny) residual somewhere: the check is not vacuous
      }
    }
  });

  test('reports the row where the system stops being positive definite', () => {
    // weights zero from the third point on and a vanishing penalty: pivot 3 is (numerically) zero
    const x = Float64Array.from({ length: 8 }, (_, i) => i + 1);
    const w = Float64Array.from(x, (_, i) => (i < 2 ? 1 : 0));
    const inp = whittakerInput(x, x, w, 2);
    expect(pentadiagonalSolve(inp, 0, false).failedRow).toBe(2);
  });
});

describe('whittakerFit', () => {
  test.each([1, 2, 3, 4])('solves the normal equations W(y - z) = lambda D^T D z on uneven x (order %i)', (d) => {
    const { x, y, w } = unevenSeries(300, 11 * d);
    const lambda = 50 * Math.pow(1.1, 2 * (d - 1));
    const r = whittakerFit(x, y, w, lambda, d);
    const Dz = differenceOperator(x, d, r.fitted);
    const DtDz = differenceTranspose(x, d, Float64Array.from(Dz));
    // componentwise scale: |W y| + |W z| + lambda |D|'|D| |z| (the size of the terms that cancel)
    const rows = differenceRows(x, d);
    const absDz = new Float64Array(x.length - d);
    for (let rr = 0; rr < x.length - d; rr++) for (let c = 0; c <= d; c++) absDz[rr] += Math.abs(rows[rr * (d + 1) + c] * r.fitted[rr + c]);
    const mag = new Float64Array(x.length);
    for (let rr = 0; rr < x.length - d; rr++) for (let c = 0; c <= d; c++) mag[rr + c] += lambda * Math.abs(rows[rr * (d + 1) + c]) * absDz[rr];
    let err = 0;
    for (let i = 0; i < x.length; i++) {
      const scale = Math.abs(w[i] * y[i]) + Math.abs(w[i] * r.fitted[i]) + mag[i];
      err = Math.max(err, Math.abs(w[i] * (y[i] - r.fitted[i]) - lambda * DtDz[i]) / scale);
    }
    expect(err).toBeLessThan(1e-13);
    expect(r.status.converged).toBe(true);
    expect(r.status.achieved).toBeLessThan(1e-14);
  });

  test.each([1, 2, 3])('leverages and df equal the dense hat-matrix diagonal (order %i)', (d) => {
    const { x, y, w } = unevenSeries(60, 5 + d);
    const lambda = 3;
    const r = whittakerFit(x, y, w, lambda, d);
    const inv = inverse(denseSystem(x, w, lambda, d));
    let df = 0, err = 0;
    for (let i = 0; i < x.length; i++) {
      const h = w[i] * inv.get(i, i);
      df += h;
      err = Math.max(err, Math.abs(h - r.leverage[i]));
    }
    expect(err).toBeLessThan(1e-10);
    expect(Math.abs(r.df - df)).toBeLessThan(1e-9);
    expect(r.df).toBeGreaterThan(d);
    expect(r.df).toBeLessThan(x.length);
  });

  test('order 2 reproduces a straight line exactly, on uneven x and any lambda', () => {
    const { x, w } = unevenSeries(500, 3);
    const y = Float64Array.from(x, (v) => 3.5 - 0.25 * v);
    // The forward error of a solve is about cond(W + lambda D'D) * 1e-16 relative; the
    // condition number grows like lambda * 16 / (min w * min spacing^2) (here about
    // 4e8 at lambda = 1e6), so the allowed error grows with lambda.
    const rangeY = Math.abs(y[y.length - 1] - y[0]);
    for (const [lambda, tol] of [[1e-3, 1e-13], [1, 1e-13], [1600, 1e-11], [1e6, 1e-8]]) {
      const r = whittakerFit(x, y, w, lambda, 2);
      let err = 0;
      for (let i = 0; i < x.length; i++) err = Math.max(err, Math.abs(r.fitted[i] - y[i]));
      expect(err / rangeY).toBeLessThan(tol);
    }
  });

  test('order 3 reproduces a quadratic; order 2 does not (it bends it)', () => {
    const { x } = unevenSeries(200, 4);
    const y = Float64Array.from(x, (v) => 1 + 0.1 * v - 0.002 * v * v);
    const r3 = whittakerFit(x, y, null, 1e4, 3);
    const r2 = whittakerFit(x, y, null, 1e4, 2);
    let e3 = 0, e2 = 0;
    for (let i = 0; i < x.length; i++) { e3 = Math.max(e3, Math.abs(r3.fitted[i] - y[i])); e2 = Math.max(e2, Math.abs(r2.fitted[i] - y[i])); }
    // relative to the range of y (about 100 here); forward error bound as in the line test
    const rangeY = Math.max(...y) - Math.min(...y);
    expect(e3 / rangeY).toBeLessThan(1e-9);
    expect(e2).toBeGreaterThan(1e-3);
  });

  test('zero weights: the trend fills the gap and those rows have zero leverage', () => {
    const { x, y } = unevenSeries(100, 9);
    const w = new Float64Array(100).fill(1);
    for (let i = 40; i < 45; i++) w[i] = 0;
    const r = whittakerFit(x, y, w, 10, 2);
    for (let i = 40; i < 45; i++) expect(r.leverage[i]).toBe(0);
    // changing y where the weight is zero changes nothing
    const y2 = y.slice(); for (let i = 40; i < 45; i++) y2[i] += 100;
    const r2 = whittakerFit(x, y2, w, 10, 2);
    for (let i = 0; i < 100; i++) expect(Math.abs(r2.fitted[i] - r.fitted[i])).toBeLessThan(1e-12);
  });

  test('lambda scales with the units of x as period^(2(d-1)): same trend for x in days as in quarters', () => {
    const n = 80;
    const z = normalStream(21);
    const q = Float64Array.from({ length: n }, (_, i) => i + 1);
    const days = Float64Array.from(q, (v) => v * 91.3125);
    const y = Float64Array.from(q, (v) => Math.log(100 + v) + 0.01 * z());
    const a = whittakerFit(q, y, null, hodrickPrescottLambda('quarterly'), 2);
    const b = whittakerFit(days, y, null, hodrickPrescottLambda('quarterly', 91.3125), 2);
    for (let i = 0; i < n; i++) expect(Math.abs(a.fitted[i] - b.fitted[i])).toBeLessThan(1e-11);
    expect(Math.abs(a.df - b.df)).toBeLessThan(1e-9);
  });

  test('refuses bad input with the offending value', () => {
    const x = Float64Array.of(1, 2, 3, 4, 5), y = Float64Array.of(1, 2, 1, 2, 1);
    expect(() => whittakerFit(x, y, null, 0, 2)).toThrow(/lambda must be a finite number > 0; got 0/);
    expect(() => whittakerFit(x, y, null, 1, 7)).toThrow(/order must be a whole number from 1 to 6; got 7/);
    expect(() => whittakerFit(Float64Array.of(1, 2, 2, 4, 5), y, null, 1, 2)).toThrow(/strictly increasing.*position 3 is 2 after 2/);
    expect(() => whittakerFit(x, Float64Array.of(1, 2, NaN, 2, 1), null, 1, 2)).toThrow(/y at position 3 is not a finite number: NaN/);
    expect(() => whittakerFit(x, y, Float64Array.of(1, 1, -1, 1, 1), 1, 2)).toThrow(/weight at position 3 is negative: -1/);
    expect(() => whittakerFit(x, y, Float64Array.of(0, 0, 0, 0, 1), 1, 2)).toThrow(/at least 2 points with positive weight; got 1/);
    expect(() => whittakerFit(x.subarray(0, 2), y.subarray(0, 2), null, 1, 2)).toThrow(/at least 3 points; got 2/);
    expect(() => hodrickPrescottLambda('weekly' as never)).toThrow(/frequency must be one of/);
    expect(() => hodrickPrescottLambda('toString' as never)).toThrow(/frequency must be one of/);
  });

  test('presets: the conventional values (Hodrick & Prescott 1997; Ravn & Uhlig 2002)', () => {
    expect(hodrickPrescottLambda('annual')).toBe(6.25);
    expect(hodrickPrescottLambda('quarterly')).toBe(1600);
    expect(hodrickPrescottLambda('monthly')).toBe(129600);
    expect(hodrickPrescottLambda('monthly', 2)).toBe(4 * 129600);
  });
});

describe('whittakerGcv', () => {
  test('score equals n rss / (n - df)^2 from the fit, and has an interior minimum on a noisy curve', () => {
    const { x, y, w } = unevenSeries(400, 31);
    const gcv = whittakerGcv(x, y, w, 2);
    const f = whittakerFit(x, y, w, 20, 2);
    const s = gcv(20);
    expect(Math.abs(s.score - f.gcv) / f.gcv).toBeLessThan(1e-12);
    expect(Math.abs(s.df - f.df)).toBeLessThan(1e-12);
    const lambdas = Array.from({ length: 25 }, (_, i) => Math.pow(10, -3 + (i * 13) / 24));
    const scores = lambdas.map((l) => gcv(l).score);
    const best = scores.indexOf(Math.min(...scores));
    expect(best).toBeGreaterThan(0);
    expect(best).toBeLessThan(24);
    // df falls as lambda grows, from near n down to near the order
    const dfs = lambdas.map((l) => gcv(l).df);
    for (let i = 1; i < dfs.length; i++) expect(dfs[i]).toBeLessThan(dfs[i - 1]);
    expect(dfs[0]).toBeGreaterThan(300);
    expect(dfs[dfs.length - 1]).toBeLessThan(2.5);
  });
});

describe('whittakerOneSided', () => {
  test.each([1, 2, 3])('value at t equals the last value of the two-sided fit on rows 0..t (order %i)', (d) => {
    const { x, y, w } = unevenSeries(120, 40 + d);
    const lambda = 30;
    const rt = whittakerOneSided(x, y, w, lambda, d);
    for (const t of [d, d + 1, 10, 37, 80, 119]) {
      const f = whittakerFit(x.subarray(0, t + 1), y.subarray(0, t + 1), w.subarray(0, t + 1), lambda, d);
      expect(Math.abs(rt.trend[t] - f.fitted[t])).toBeLessThan(1e-9);
    }
    // the first d values see too few points to smooth: they equal the data
    for (let t = 0; t < d; t++) expect(Math.abs(rt.trend[t] - y[t])).toBeLessThan(1e-12);
    expect(rt.undetermined).toBe(0);
  });

  test('the last one-sided value equals the last two-sided value (HP, quarterly lambda)', () => {
    const n = 2000;
    const z = normalStream(77);
    const x = Float64Array.from({ length: n }, (_, i) => i + 1);
    let level = 0;
    const y = Float64Array.from(x, () => (level += 0.01 + 0.05 * z()) + 0.2 * z());
    const rt = whittakerOneSided(x, y, null, 1600, 2);
    const two = whittakerFit(x, y, null, 1600, 2);
    expect(Math.abs(rt.trend[n - 1] - two.fitted[n - 1])).toBeLessThan(1e-9 * (1 + Math.abs(two.fitted[n - 1])));
    // and elsewhere they differ: the two-sided trend uses later data
    let diff = 0;
    for (let i = 0; i < n - 1; i++) diff = Math.max(diff, Math.abs(rt.trend[i] - two.fitted[i]));
    expect(diff).toBeGreaterThan(1e-3);
  });

  test('value at t does not change when data after t change', () => {
    const { x, y, w } = unevenSeries(300, 55);
    const a = whittakerOneSided(x, y, w, 100, 2);
    const t = 150;
    const y2 = y.slice(), w2 = w.slice();
    const u = mulberry32(9);
    for (let i = t + 1; i < 300; i++) { y2[i] += 50 * (u() - 0.5); w2[i] = u() * 3; }
    const b = whittakerOneSided(x, y2, w2, 100, 2);
    for (let i = 0; i <= t; i++) expect(b.trend[i]).toBe(a.trend[i]);
    let later = 0;
    for (let i = t + 1; i < 300; i++) later = Math.max(later, Math.abs(b.trend[i] - a.trend[i]));
    expect(later).toBeGreaterThan(0.1);
  });

  test('leading zero-weight rows are left undetermined (NaN), then values resume', () => {
    const { x, y } = unevenSeries(50, 8);
    const w = new Float64Array(50).fill(1);
    w[0] = 0; w[1] = 0;
    const r = whittakerOneSided(x, y, w, 10, 2);
    expect(Number.isNaN(r.trend[0])).toBe(true);
    expect(Number.isNaN(r.trend[1])).toBe(true);
    expect(Number.isFinite(r.trend[3])).toBe(true);
    expect(r.undetermined).toBeGreaterThanOrEqual(2);
    const f = whittakerFit(x.subarray(0, 20), y.subarray(0, 20), w.subarray(0, 20), 10, 2);
    expect(Math.abs(r.trend[19] - f.fitted[19])).toBeLessThan(1e-9);
  });
});
