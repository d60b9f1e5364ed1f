/**
 * Whittaker-Henderson graduation against outside references
 * (fixture test/reference/fixtures/whittaker_hp.json, made by gen_whittaker.py):
 * statsmodels' hpfilter on statsmodels' macrodata at lambda 6.25, 1600, 129600,
 * and 60-digit solves of the same systems (mpmath), including uneven x and weights.
 */
import { whittakerFit } from '../../../src/engine/smoothers/whittaker/whittakerFit';
import { whittakerOneSided } from '../../../src/engine/smoothers/whittaker/whittakerOneSided';
import { loadFixture } from '../../helpers/fixtures';

interface HpCase { series: string; lambda: number; y: number[]; trend_statsmodels: number[]; trend_exact: number[] }
interface UnevenCase { order: number; lambda: number; x: number[]; y: number[]; w: number[]; fitted_exact: number[]; df_exact: number }
const fx = loadFixture<{ hp: HpCase[]; uneven: UnevenCase[] }>('whittaker_hp');

function maxRel(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0, s = 0;
  for (let i = 0; i < b.length; i++) s = Math.max(s, Math.abs(b[i]));
  for (let i = 0; i < b.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m / s;
}

describe('Hodrick-Prescott trend against statsmodels hpfilter (macrodata)', () => {
  test.each(fx.hp.map((c) => [c.series, c.lambda, c] as const))('%s at lambda %d', (_s, lambda, c) => {
    const x = Float64Array.from(c.y, (_, i) => i + 1);
    const r = whittakerFit(x, c.y, null, lambda, 2);
    // statsmodels solves (I + lambda K'K) trend = y by a sparse LU; agreement to 1e-8 of max |trend|
    expect(maxRel(r.fitted, c.trend_statsmodels)).toBeLessThan(1e-8);
    // the 60-digit solve of the same system: the gap is the rounding of our banded Cholesky,
    // about cond(I + lambda K'K) * 1e-16 (cond up to 2e6 at lambda = 129600)
    expect(maxRel(r.fitted, c.trend_exact)).toBeLessThan(1e-10);
    // last one-sided value = last two-sided value (the filter's last state is the smoother's)
    const rt = whittakerOneSided(x, c.y, null, lambda, 2);
    expect(Math.abs(rt.trend[x.length - 1] - c.trend_exact[x.length - 1]) / Math.abs(c.trend_exact[x.length - 1])).toBeLessThan(1e-10);
  });
});

describe('uneven x, weights, orders 2 and 3 against 60-digit solves', () => {
  test.each(fx.uneven.map((c) => [c.order, c] as const))('order %i', (order, c) => {
    const r = whittakerFit(c.x, c.y, c.w, c.lambda, order);
    expect(maxRel(r.fitted, c.fitted_exact)).toBeLessThan(1e-11);
    expect(Math.abs(r.df - c.df_exact) / c.df_exact).toBeLessThan(1e-11);
  });
});
