/**
 * Results are the same fit at every scale and offset the doubles carry:
 * fit(c y) = c fit(y) and fit(y + c) = fit(y) + c, with the same df and knots,
 * or a clear refusal past the documented limits (|y| 1e150, |x| 1e75,
 * weight ratio 1e15). Property tests over c = 10^-140 .. 10^140 (fast-check).
 * Tolerances: the fits agree to 1e-8 relative to their scale (the solvers'
 * own tolerance is 1e-8 in relative duality gap; the spline's direct solve is
 * far tighter); offsets lose |c| eps per value in the input itself, so the
 * offset check allows 1e-9 of |c| on top.
 */
import fc from 'fast-check';
import { runAnalysis, KnotwiseError } from '../../../src/engine';
import { normalStream } from '../../helpers/random';

const z = normalStream(99);
const n = 60;
const x = Array.from({ length: n }, (_, i) => i + 1);
const y0 = x.map((t) => Math.sin(t / 6) + (t > 30 ? 1 : 0) + 0.2 * z());
const maxAbs = (a: ArrayLike<number>) => Array.from(a).reduce((m, v) => Math.max(m, Math.abs(v)), 0);

describe('scale and offset equivariance', () => {
  test('the spline with GCV gives c times the fit of y for y scaled by c, with the same df', () => {
    const base = runAnalysis({ analysis: 'spline', y: y0, x }).smooth!;
    fc.assert(fc.property(fc.integer({ min: -140, max: 140 }), fc.double({ min: 1, max: 9.99, noNaN: true }), (e, m) => {
      const c = m * 10 ** e;
      const r = runAnalysis({ analysis: 'spline', y: y0.map((v) => c * v), x }).smooth!;
      expect(Math.abs(r.df - base.df)).toBeLessThan(1e-6);
      for (let i = 0; i < n; i++) expect(Math.abs(r.fitted[i] / c - base.fitted[i])).toBeLessThan(1e-8 * maxAbs(base.fitted));
    }), { numRuns: 40 });
  });

  test('trend filtering gives c times the fit, the same knots and a penalty scaled by c', () => {
    const base = runAnalysis({ analysis: 'trend', y: y0, x, options: { order: 1, penalty: 0.5 } }).smooth!;
    fc.assert(fc.property(fc.integer({ min: -140, max: 140 }), (e) => {
      const c = 3 * 10 ** e;
      const r = runAnalysis({ analysis: 'trend', y: y0.map((v) => c * v), x, options: { order: 1, penalty: 0.5 * c } }).smooth!;
      expect(r.knots.map((k) => k.index)).toEqual(base.knots.map((k) => k.index));
      for (let i = 0; i < n; i++) expect(Math.abs(r.fitted[i] / c - base.fitted[i])).toBeLessThan(1e-8 * maxAbs(base.fitted));
    }), { numRuns: 25 });
  });

  test('offsets shift the spline and the trend by the offset', () => {
    const sp = runAnalysis({ analysis: 'spline', y: y0, x }).smooth!;
    const tr = runAnalysis({ analysis: 'trend', y: y0, x, options: { order: 1, penalty: 0.5 } }).smooth!;
    fc.assert(fc.property(fc.integer({ min: -3, max: 7 }), fc.boolean(), (e, neg) => {
      const c = (neg ? -1 : 1) * 1.7 * 10 ** e;
      const a = runAnalysis({ analysis: 'spline', y: y0.map((v) => v + c), x }).smooth!;
      const b = runAnalysis({ analysis: 'trend', y: y0.map((v) => v + c), x, options: { order: 1, penalty: 0.5 } }).smooth!;
      const tol = 1e-8 * maxAbs(sp.fitted) + 1e-9 * Math.abs(c);
      for (let i = 0; i < n; i++) {
        expect(Math.abs(a.fitted[i] - c - sp.fitted[i])).toBeLessThan(tol);
        expect(Math.abs(b.fitted[i] - c - tr.fitted[i])).toBeLessThan(tol);
      }
      expect(b.knots.map((k) => k.index)).toEqual(tr.knots.map((k) => k.index));
    }), { numRuns: 20 });
  });

  test('the spline is the same fit when x is scaled, with lambda scaled by the cube of the factor', () => {
    const base = runAnalysis({ analysis: 'spline', y: y0, x }).smooth!;
    for (const e of [-60, -20, 20, 60]) {
      const c = 10 ** e;
      const r = runAnalysis({ analysis: 'spline', y: y0, x: x.map((t) => c * t) }).smooth!;
      expect(Math.abs(r.df - base.df)).toBeLessThan(1e-6);
      expect(Math.abs(r.penalty / (base.penalty * c ** 3) - 1)).toBeLessThan(1e-6);
    }
  });

  test('magnitudes past the limits are refused with a message saying how to rescale', () => {
    const huge = [...y0]; huge[6] = 9.9e307;
    expect(() => runAnalysis({ analysis: 'spline', y: huge, x })).toThrow(/y in row 7 is 9\.9e\+307: values beyond 1e\+150 in size cannot be analysed without overflow\. Divide the column/);
    expect(() => runAnalysis({ analysis: 'spline', y: y0, x: x.map((t) => t * 1e300) })).toThrow(KnotwiseError);
    expect(() => runAnalysis({ analysis: 'trend', y: y0, x: x.map((t) => t * 5e-324) })).toThrow(/x spans only/);
    expect(() => runAnalysis({ analysis: 'spline', y: y0, x, w: x.map((t) => (t % 2 ? 1e300 : 1e-300)) })).toThrow(/weights range from 1e-300 \(row 2\) to 1e\+300 \(row 1\)/);
  });
});
