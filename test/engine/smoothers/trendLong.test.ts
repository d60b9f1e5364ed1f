/**
 * Long series: the fit must come with an honest optimality certificate. At this
 * length the dense checker of trendKkt.ts is out of reach, so the duality gap is
 * recomputed here from the returned fit alone: g = W (y - b), the dual u solving
 * D^T u = g by running sums (this file's own code), scaled into the box
 * |u| <= lambda, and P(b) - G(u) with G(u) = y.g - 1/2 sum g^2 / w (for the scaled u).
 */
import { fitTrend, trendPenaltyMax } from '../../../src/engine/smoothers/trend';
import { seriesFromArrays } from '../../../src/engine/series';
import { seededNormal } from './trendTestFunctions';

function longSeries(n: number, seed: number) {
  const rn = seededNormal(seed);
  const x = new Float64Array(n), y = new Float64Array(n), w = new Float64Array(n);
  let c = 0;
  for (let i = 0; i < n; i++) { c += 0.5 + 0.6 * Math.abs(rn()); x[i] = c; }
  for (let i = 0; i < n; i++) {
    const t = (x[i] - x[0]) / (x[n - 1] - x[0]);
    y[i] = Math.sin(2 * Math.PI * 3 * t * t * t) + (t > 0.6 ? 2 * (t - 0.6) : 0) + 0.2 * rn();
    w[i] = 0.5 + (i % 3) * 0.5;
  }
  return { x, y, w };
}

/** Relative duality gap of an order-1 fit, from the fit alone. */
function order1Gap(x: Float64Array, y: Float64Array, w: Float64Array, b: Float64Array, lambda: number): { relativeGap: number; boxScale: number } {
  const n = x.length;
  const g = new Float64Array(n);
  for (let i = 0; i < n; i++) g[i] = w[i] * (y[i] - b[i]);
  // D(x, 2)^T = D1^T S D1^T with S = diag(1 / (x_{i+1} - x_i)): two running sums and a rescaling
  const z = new Float64Array(n - 1);
  let acc = 0;
  for (let i = 0; i < n - 1; i++) { acc -= g[i]; z[i] = acc * (x[i + 1] - x[i]); }
  const u = new Float64Array(n - 2);
  acc = 0;
  let um = 0;
  for (let i = 0; i < n - 2; i++) { acc -= z[i]; u[i] = acc; um = Math.max(um, Math.abs(acc)); }
  const f = Math.max(1, um / lambda);
  let rss = 0, yg = 0, gg = 0, l1 = 0;
  for (let i = 0; i < n; i++) { rss += 0.5 * w[i] * (y[i] - b[i]) ** 2; yg += y[i] * g[i]; gg += (g[i] * g[i]) / w[i]; }
  for (let r = 0; r < n - 2; r++) l1 += Math.abs((b[r + 2] - b[r + 1]) / (x[r + 2] - x[r + 1]) - (b[r + 1] - b[r]) / (x[r + 1] - x[r]));
  const P = rss + lambda * l1;
  const G = yg / f - (0.5 * gg) / (f * f);
  return { relativeGap: (P - G) / P, boxScale: f };
}

describe('fitTrend on long series', () => {
  test('order 1 on 40000 points converges, and the duality gap recomputed from the fit is below the tolerance', () => {
    const { x, y, w } = longSeries(40000, 2026);
    const s = seriesFromArrays(x, y, w);
    const lam = 1e-3 * trendPenaltyMax(s, { order: 1 });
    const r = fitTrend(s, { order: 1, penalty: lam });
    expect(r.solver.converged).toBe(true);
    const c = order1Gap(x, y, w, r.fitted, lam);
    expect(c.boxScale - 1).toBeLessThan(1e-6);
    expect(c.relativeGap).toBeLessThan(1e-8);
    expect(r.knots.length).toBeGreaterThan(10);
  });
});
