/**
 * Wavelet shrinkage: the periodic DWT against PyWavelets (db4, sym8, mode
 * 'periodization'; fixture wavelet_pywt.json from gen_wavelet.py), VisuShrink
 * against the same steps done with PyWavelets, orthogonality properties, the
 * SURE threshold against a brute-force minimum, and refusals.
 */
import { periodicDwt, periodicIdwt } from '../../../src/engine/smoothers/wavelet/periodicDwt';
import { waveletShrink, waveletShrinkAt } from '../../../src/engine/smoothers/wavelet/waveletShrink';
import { sureThreshold } from '../../../src/engine/smoothers/wavelet/sureThreshold';
import { WAVELET_FILTERS, WAVELET_FILTER_NAMES } from '../../../src/engine/smoothers/wavelet/waveletFilters';
import { loadFixture, maxAbsDiff } from '../../helpers/fixtures';
import { mulberry32, normalStream } from '../../helpers/random';

interface Series { n: number; signal: string; y: number[]; truth: number[] }
interface DwtCase { series: number; filter: 'db4' | 'sym8'; levels: number; coefficients: number[] }
interface VisuCase { series: number; filter: 'db4' | 'sym8'; levels: number; shrink: 'soft' | 'hard'; sigma: number; threshold: number; fitted: number[] }
const fx = loadFixture<{ series: Series[]; dwt: DwtCase[]; visu: VisuCase[] }>('wavelet_pywt');

describe('periodic DWT against PyWavelets wavedec(mode="periodization")', () => {
  test.each(fx.dwt.map((c) => [fx.series[c.series].signal, fx.series[c.series].n, c.filter, c] as const))('%s, n = %i, %s', (_s, _n, filter, c) => {
    const y = Float64Array.from(fx.series[c.series].y);
    const coef = periodicDwt(y, WAVELET_FILTERS[filter], c.levels);
    expect(maxAbsDiff(coef, c.coefficients)).toBeLessThan(1e-10);
    // perfect reconstruction
    const scale = Math.max(...Array.from(y, Math.abs));
    expect(maxAbsDiff(periodicIdwt(coef, WAVELET_FILTERS[filter], c.levels), y) / scale).toBeLessThan(1e-12);
  });
});

describe('VisuShrink against the same steps with PyWavelets', () => {
  test.each(fx.visu.map((c) => [fx.series[c.series].signal, fx.series[c.series].n, c.filter, c.shrink, c] as const))('%s, n = %i, %s, %s', (_s, _n, filter, shrink, c) => {
    const r = waveletShrink(fx.series[c.series].y, { filter, levels: c.levels, shrink, boundary: 'periodic', threshold: 'universal' });
    expect(Math.abs(r.sigma - c.sigma)).toBeLessThan(1e-12 * c.sigma);
    expect(Math.abs(r.thresholds[0] - c.threshold)).toBeLessThan(1e-12 * c.threshold);
    expect(r.transformLength).toBe(fx.series[c.series].n);
    expect(maxAbsDiff(r.fitted, c.fitted)).toBeLessThan(1e-10);
  });
});

describe('orthogonality', () => {
  test.each(WAVELET_FILTER_NAMES.map((f) => [f]))('%s: filter norms, energy preserved and perfect reconstruction on n = 3 * 2^6', (name) => {
    const h = WAVELET_FILTERS[name];
    let s = 0, ss = 0;
    for (const v of h) { s += v; ss += v * v; }
    // PyWavelets' symmlet table carries about 13 correct digits (its sums of squares differ
    // from 1 by up to 8e-13); its extremal-phase table about 15
    const tol = name.startsWith('sym') ? 2e-12 : 1e-14;
    expect(Math.abs(s - Math.SQRT2)).toBeLessThan(tol);
    expect(Math.abs(ss - 1)).toBeLessThan(tol);
    const n = 192;
    const z = normalStream(5);
    const x = Float64Array.from({ length: n }, () => z());
    const levels = 4;
    const c = periodicDwt(x, h, levels);
    let ex = 0, ec = 0;
    for (let i = 0; i < n; i++) { ex += x[i] * x[i]; ec += c[i] * c[i]; }
    expect(Math.abs(ex - ec) / ex).toBeLessThan(10 * tol);
    expect(maxAbsDiff(periodicIdwt(c, h, levels), x)).toBeLessThan(100 * tol);
  });
});

describe('periodicIdwt of the leading values only', () => {
  test.each(WAVELET_FILTER_NAMES.map((f) => [f]))('%s: the first keep values are bit for bit those of the whole inverse, for keep from 1 to N', (name) => {
    // the inverse sums each kept value over the same coefficients in the same order, so equality is exact
    const h = WAVELET_FILTERS[name];
    const z = normalStream(31);
    for (const [N, levels] of [[64, 3], [512, 6], [96, 5]] as const) {
      const c = Float64Array.from({ length: N }, () => z());
      const whole = periodicIdwt(c, h, levels);
      for (const keep of [1, 2, 7, N / 4, N / 2 + 3, N - 5, N]) {
        const part = periodicIdwt(c, h, levels, keep);
        expect(Array.from(part.subarray(0, keep))).toEqual(Array.from(whole.subarray(0, keep)));
      }
    }
  });
});

describe('waveletShrink', () => {
  function noisy(n: number, seed: number) {
    const z = normalStream(seed);
    const truth = Float64Array.from({ length: n }, (_, i) => { const t = (i + 0.5) / n; return 7 * Math.sqrt(t * (1 - t)) * Math.sin((2 * Math.PI * 1.05) / (t + 0.05)) / 0.29; });
    const y = Float64Array.from(truth, (v) => v + z());
    return { truth, y };
  }
  const mse = (a: ArrayLike<number>, b: ArrayLike<number>) => { let s = 0; for (let i = 0; i < a.length; i++) s += (a[i] - b[i]) ** 2; return s / a.length; };

  test.each([[1000, 'reflect'], [1000, 'periodic'], [777, 'reflect'], [2048, 'reflect']] as const)('n = %i, %s: every rule has lower error than the raw data; SURE lower than universal soft', (n, boundary) => {
    const { truth, y } = noisy(n, n);
    const raw = mse(y, truth);
    const got: number[] = [];
    for (const opt of [{ threshold: 'universal' as const }, { threshold: 'sure' as const }, { threshold: 'universal' as const, shrink: 'hard' as const }, { threshold: 'sure' as const, shifts: 8 }]) {
      const r = waveletShrink(y, { boundary, ...opt });
      expect(r.fitted.length).toBe(n);
      got.push(mse(r.fitted, truth) / raw);
      expect(Math.abs(r.sigma - 1)).toBeLessThan(0.15); // the noise sd is 1
    }
    // every rule removes noise; SURE adapts its thresholds per level and beats the
    // universal soft threshold, which over-smooths (Donoho & Johnstone 1995, section 6)
    for (const g of got) expect(g).toBeLessThan(0.75);
    expect(got[1]).toBeLessThan(got[0]);
    expect(got[3]).toBeLessThan(got[0]);
  });

  test('reflect boundary beats periodic at the ends of a trending series', () => {
    const n = 512;
    const z = normalStream(3);
    const truth = Float64Array.from({ length: n }, (_, i) => 10 * i / n);
    const y = Float64Array.from(truth, (v) => v + 0.3 * z());
    const a = waveletShrink(y, { boundary: 'reflect' }), b = waveletShrink(y, { boundary: 'periodic' });
    const endErr = (f: Float64Array) => Math.max(Math.abs(f[0] - truth[0]), Math.abs(f[n - 1] - truth[n - 1]));
    expect(endErr(a.fitted)).toBeLessThan(1);
    expect(endErr(b.fitted)).toBeGreaterThan(2 * endErr(a.fitted));
  });

  test('cycle spinning by s shifts equals the average of shifted shrinkages (periodic, power of two)', () => {
    const { y } = noisy(256, 9);
    const r = waveletShrink(y, { boundary: 'periodic', shifts: 3, filter: 'db4' });
    const t = r.thresholds;
    // recompute shift by shift from the transform
    const h = WAVELET_FILTERS.db4;
    const avg = new Float64Array(256);
    for (let s = 0; s < 3; s++) {
      const sh = new Float64Array(256);
      for (let i = 0; i < 256; i++) sh[(i + s) % 256] = y[i];
      const c = periodicDwt(sh, h, r.levels);
      for (let j = 1; j <= r.levels; j++) for (let i = 256 >> j; i < 256 >> (j - 1); i++) c[i] = Math.sign(c[i]) * Math.max(Math.abs(c[i]) - t[j - 1], 0);
      const back = periodicIdwt(c, h, r.levels);
      for (let i = 0; i < 256; i++) avg[i] += back[(i + s) % 256] / 3;
    }
    expect(maxAbsDiff(r.fitted, avg)).toBeLessThan(1e-12);
  });

  test('refuses unevenly spaced x, and bad options, with the offending values', () => {
    const y = Float64Array.from({ length: 64 }, (_, i) => Math.sin(i));
    const x = Float64Array.from({ length: 64 }, (_, i) => i);
    x[10] = 10.5;
    expect(() => waveletShrink(y, { x })).toThrow(/equally spaced x; the step from position 10 to 11 is 1.5/);
    expect(() => waveletShrink(y, { x: Float64Array.from({ length: 64 }, (_, i) => 2 * i) })).not.toThrow();
    expect(() => waveletShrink(y, { filter: 'db99' as never })).toThrow(/filter must be one of/);
    expect(() => waveletShrink(y, { threshold: 'sure', shrink: 'hard' })).toThrow(/derived for soft shrinkage/);
    expect(() => waveletShrink(y, { shifts: 0 })).toThrow(/shifts must be a whole number from 1 to 64; got 0/);
    expect(() => waveletShrink(y, { levels: 9 })).toThrow(/levels must be a whole number from 1 to 6 for 64 points; got 9/);
    expect(() => waveletShrink([1, 2, NaN, 4, 5])).toThrow(/y at position 3 is not a finite number: NaN/);
  });
});

describe('sureThreshold', () => {
  test('minimises SURE(t) over t in [0, sqrt(2 log d)] (checked on a fine grid)', () => {
    const u = mulberry32(17), z = normalStream(18);
    for (let rep = 0; rep < 5; rep++) {
      const d = 200;
      const x = Float64Array.from({ length: d }, (_, i) => z() + (i % 5 === 0 ? 3 + 3 * u() : 0) * (rep + 1));
      const r = sureThreshold(x);
      const sure = (t: number) => { let s = d; for (const v of x) { if (Math.abs(v) <= t) s -= 2; s += Math.min(v * v, t * t); } return s; };
      const tU = Math.sqrt(2 * Math.log(d));
      if (r.universal) { expect(r.threshold).toBe(tU); continue; }
      const at = sure(r.threshold);
      for (let k = 0; k <= 2000; k++) expect(at).toBeLessThanOrEqual(sure((tU * k) / 2000) + 1e-9);
    }
  });

  test('sparse levels take the universal threshold (hybrid rule)', () => {
    const x = new Float64Array(256).fill(0.1);
    x[3] = 9;
    expect(sureThreshold(x)).toEqual({ threshold: Math.sqrt(2 * Math.log(256)), universal: true });
  });
});

describe('waveletShrinkAt', () => {
  // A seeded noisy ramp with a jump (invented), 300 points: not a power of two.
  const z = normalStream(41);
  const y = Array.from({ length: 300 }, (_, i) => 0.01 * i + (i > 170 ? 2 : 0) + 0.3 * z());

  test('each threshold of a grid gives exactly what waveletShrink gives at that fixed threshold (one transform for the grid)', () => {
    const grid = [0, 0.05, 0.3, 1.1, 5];
    for (const opts of [{}, { shifts: 4 }, { shrink: 'hard' as const, boundary: 'periodic' as const, filter: 'db4' as const }]) {
      const many = waveletShrinkAt(y, opts, grid);
      expect(many).toHaveLength(grid.length);
      grid.forEach((t, q) => {
        const one = waveletShrink(y, { ...opts, fixedThreshold: t });
        expect(Array.from(many[q].fitted)).toEqual(Array.from(one.fitted));
        expect(many[q].kept).toBe(one.kept);
        expect(many[q].thresholds).toEqual(one.thresholds);
        expect(many[q].sigma).toBe(one.sigma);
      });
      // the fits differ along the grid: the largest threshold keeps fewest details
      expect(many[grid.length - 1].kept).toBeLessThan(many[0].kept);
    }
  });

  test('a threshold that is not a finite number from 0 is refused with its position', () => {
    expect(() => waveletShrinkAt(y, {}, [0.1, -1])).toThrow('every threshold must be a finite number from 0; got -1 at position 2.');
    expect(() => waveletShrinkAt(y, {}, [NaN])).toThrow(/got NaN at position 1/);
  });
});
