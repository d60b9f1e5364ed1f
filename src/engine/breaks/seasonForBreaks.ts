/**
 * The seasonal pattern changepoints set aside before looking for changes.
 */
import type { Series } from '../series';
import { median } from '../median';
import type { SeasonTreatment } from './types';
import { decompose } from '../decompose/decompose';
import { YEARLY_HARMONICS } from '../decompose/seasonPlan';

/** Longest series handed to the full decomposition (it runs trend filtering; about 20 s at 20,000 points, measured). */
export const DECOMPOSITION_LIMIT = 5000;

/**
 * The season changepoints remove: the adaptive decomposition's seasonal adjustment
 * ({@link seasonalAdjustment}: trend filtering + season + spikes, season kept when its
 * strength reaches 0.64) for additive models on series of up to {@link DECOMPOSITION_LIMIT}
 * points whose x are calendar dates or whose period is given; otherwise, and for counts
 * (whose season multiplies the rate, as a factor the Poisson cost takes), the robust
 * phase estimate {@link seasonForBreaks}.
 *
 * The decomposition's trend takes the shape of the change looked for, so the season is
 * not bent to absorb it: steps (trend filtering of order 0, piecewise constant) for the
 * level and volatility models, kinks (order 1) for the slope model. With an order-1
 * trend a level step is drawn as a ramp over several points and the season takes up the
 * rest, one year's worth of phases raised or lowered, which then reappeared as false
 * changes a year before or after the step. Unchecked.
 */
export function seasonFor(series: Series, request: 'auto' | number, multiplicative: boolean, trend: boolean): SeasonForBreaks {
  const dated = request !== 'auto' || (series.xGiven && calendarPhases(series.x) !== null);
  if (multiplicative || !dated || series.n > DECOMPOSITION_LIMIT) return seasonForBreaks(series, request, multiplicative, trend);
  let d;
  try {
    d = decompose(series, { method: 'adaptive', order: trend ? 1 : 0, ...(request === 'auto' ? {} : { period: request }) });
  } catch (e) {
    // e.g. two rows on one date: the robust phase estimate copes with ties
    const r = seasonForBreaks(series, request, multiplicative, trend);
    return { ...r, how: `${r.how} (the adaptive decomposition declined: ${(e as Error).message})` };
  }
  const kept = d.seasons.filter((t) => t.kept);
  const strength = d.seasons.reduce((m, t) => Math.max(m, t.strength), 0);
  const period = kept.length ? Number(kept[0].length.toFixed(2)) : d.seasons.length ? Number(d.seasons[0].length.toFixed(2)) : NaN;
  if (!kept.length) {
    return { seasonal: false, period, strength, multiplicative: false, how: `adaptive decomposition: largest seasonal strength ${strength.toFixed(2)}, below 0.64` };
  }
  let component: Float64Array = Float64Array.from(d.season);
  let how = `a season of ${kept.map((t) => String(Number(t.length.toFixed(2)))).join(' and ')} steps, found by the adaptive decomposition (trend filtering, season and spikes)`;
  const angle = request === 'auto' ? calendarPhases(series.x)?.angle : undefined;
  if (angle && kept.length === 1 && kept[0].label === 'yearly') {
    // weekly dates: the yearly Fourier season refitted to the series without trend and spikes
    // with as many harmonics as BIC supports (the decomposition's fixed 10 harmonics, 20
    // coefficients, are noisy on a few years of weeks, and their noise reads as changes)
    const r = Float64Array.from(series.y, (v, i) => v - d.trend[i] - d.spikes[i]);
    const h = harmonicsByBic(r, angle, YEARLY_HARMONICS);
    component = h.fit;
    how += `; the yearly pattern refitted with ${h.harmonics} harmonic${h.harmonics === 1 ? '' : 's'} (chosen by BIC), then once more against the fitted changes`;
    const refit = (partial: Float64Array): Float64Array => harmonicsByBic(partial, angle, YEARLY_HARMONICS).fit;
    return { seasonal: true, period, strength, component, multiplicative: false, how, refit };
  }
  return { seasonal: true, period, strength, component, multiplicative: false, how };
}

/**
 * The harmonic fit of r on angle with K = 1..maxK harmonics that minimises BIC,
 * n log(RSS / n) + 2 K log n (Schwarz 1978; choosing the number of Fourier terms of a
 * season by an information criterion is common practice, e.g. Hyndman & Athanasopoulos,
 * Forecasting: Principles and Practice, section on dynamic harmonic regression).
 * Returns the fitted season without its constant, centred to average 0. Unchecked.
 */
export function harmonicsByBic(r: Float64Array, angle: Float64Array, maxK: number): { fit: Float64Array; harmonics: number } {
  const n = r.length;
  let best: Float64Array = new Float64Array(n), bestK = 0, bestC = Infinity;
  for (let K = 1; K <= Math.min(maxK, Math.floor((n - 2) / 4)); K++) {
    const fit = harmonicFit(r, angle, K);
    let m = 0;
    for (let i = 0; i < n; i++) m += (r[i] - fit[i]) / n;
    let rss = 0;
    for (let i = 0; i < n; i++) rss += (r[i] - fit[i] - m) ** 2;
    const c = n * Math.log(Math.max(rss, Number.MIN_VALUE) / n) + 2 * K * Math.log(n);
    if (c < bestC) { bestC = c; best = fit; bestK = K; }
  }
  let mean = 0;
  for (let i = 0; i < n; i++) mean += best[i] / n;
  return { fit: Float64Array.from(best, (v) => v - mean), harmonics: bestK };
}

/**
 * What a seasonal adjustment hands to the changepoint search: the small internal
 * interface a full decomposition can stand behind (it needs the series, the request
 * 'auto' or a period, and whether the season multiplies the level, and returns the
 * season per point, the period, a strength and the decision).
 */
export interface SeasonForBreaks {
  /** True when a season was found (or a period was given) and is removed. */
  seasonal: boolean;
  /** Period in points (NaN when none). */
  period: number;
  /** Seasonal strength in [0, 1] (NaN when not measured). */
  strength: number;
  /** Season per clean point: added (additive) or a factor (multiplicative, mean 1). Absent when not seasonal. */
  component?: Float64Array;
  multiplicative: boolean;
  /** How the period was found, for the note. */
  how: string;
  /**
   * The season estimated again from a partial residual (the series minus the fitted
   * changes), for one backfitting step; absent when the season is not refitted.
   */
  refit?: (partial: Float64Array) => Float64Array;
}

/**
 * Upper quantile of chi-squared with k degrees of freedom at the normal quantile z, by
 * the Wilson-Hilferty cube-root approximation (1931). Unchecked.
 */
export function chiSquaredUpper(k: number, z: number): number {
  const c = 2 / (9 * k);
  return k * (1 - c + z * Math.sqrt(c)) ** 3;
}

const DAY_MS = 86400000;
/** Serial date of 1970-01-01 in the spreadsheet date system (days since 1899-12-30). */
const UNIX_EPOCH_SERIAL = 25569;

/** Calendar phases of serial dates x for a given spacing, or null when the spacing is not a calendar one. Unchecked. */
export function calendarPhases(x: Float64Array): { phases: Int32Array; period: number; how: string; angle?: Float64Array } | null {
  const n = x.length;
  if (n < 3) return null;
  const gaps = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) gaps[i - 1] = x[i] - x[i - 1];
  const d = median(gaps);
  // spreadsheet dates: serial numbers from 10,000 (1927) to 2,958,465 (9999-12-31)
  if (!(x[0] >= 10000 && x[n - 1] <= 2958465)) return null;
  const date = (v: number): Date => new Date((v - UNIX_EPOCH_SERIAL) * DAY_MS);
  const phases = new Int32Array(n);
  if (d >= 0.99 && d <= 1.01) {
    for (let i = 0; i < n; i++) phases[i] = date(Math.floor(x[i])).getUTCDay();
    return { phases, period: 7, how: 'daily dates: the weekday pattern (period 7)' };
  }
  if (d >= 6.9 && d <= 7.1) {
    const angle = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const t = date(Math.floor(x[i]));
      const day = Math.floor((t.getTime() - Date.UTC(t.getUTCFullYear(), 0, 1)) / DAY_MS);
      phases[i] = Math.min(51, Math.floor(day / 7));
      angle[i] = (2 * Math.PI * day) / 365.25;
    }
    return { phases, period: 52, angle, how: 'weekly dates: the yearly pattern as a function of the calendar day of the year (a year holds 52.18 weeks, so each week is placed by its date, not by a count of 52)' };
  }
  if (d >= 27.5 && d <= 31.5) {
    for (let i = 0; i < n; i++) phases[i] = date(Math.floor(x[i])).getUTCMonth();
    return { phases, period: 12, how: 'monthly dates: the yearly pattern by month (period 12)' };
  }
  if (d >= 88 && d <= 93) {
    for (let i = 0; i < n; i++) phases[i] = Math.floor(date(Math.floor(x[i])).getUTCMonth() / 3);
    return { phases, period: 4, how: 'quarterly dates: the yearly pattern by quarter (period 4)' };
  }
  return null;
}

/** 1.4826 * MAD. Unchecked. */
function madScale(v: Float64Array): number {
  const m = median(v);
  return 1.4826 * median(Float64Array.from(v, (a) => Math.abs(a - m)));
}

/**
 * Running median over a window of `width` points, centred where it fits and held at
 * full width against the ends (a truncated window at the ends would follow one part
 * of a seasonal cycle). Unchecked.
 */
export function runningMedian(y: Float64Array, width: number, trend = false): Float64Array {
  const n = y.length, h = Math.floor(width / 2);
  const out = new Float64Array(n);
  const buf = new Float64Array(2 * h + 1);
  for (let i = 0; i < n; i++) {
    let a = i - h, b = i + h;
    if (a < 0) { b = Math.min(n - 1, b - a); a = 0; }
    if (b > n - 1) { a = Math.max(0, a - (b - n + 1)); b = n - 1; }
    const m = b - a + 1;
    for (let k = 0; k < m; k++) buf[k] = y[a + k];
    const s = buf.subarray(0, m).sort();
    out[i] = m % 2 ? s[(m - 1) >> 1] : 0.5 * (s[m / 2 - 1] + s[m / 2]);
  }
  if (trend && n >= 2 * h + 1 + width) {
    // a trend: the ends follow the line through the first (last) two full-window medians one period apart
    const b0 = (out[h + width] - out[h]) / width, b1 = (out[n - 1 - h] - out[n - 1 - h - width]) / width;
    for (let i = 0; i < h; i++) out[i] = out[h] - (h - i) * b0;
    for (let i = n - h; i < n; i++) out[i] = out[n - 1 - h] + (i - (n - 1 - h)) * b1;
  }
  return out;
}

/**
 * Estimates the season changepoints remove, robustly to the level steps and spikes
 * being looked for: the level by a running median over one period (a median filter
 * keeps steps sharp), the seasonal index of each phase as the median of the detrended
 * values at that phase, centred to sum to 0 (to average 1 when multiplicative). The
 * decision uses the seasonal strength of Wang, Smith & Hyndman (2006, "Characteristic-
 * based clustering for time series data", Data Mining and Knowledge Discovery 13:335-364),
 * F = max(0, 1 - var(R) / var(S + R)), with robust variances (1.4826 MAD)^2, and the
 * threshold 0.64 that R's forecast::nsdiffs applies to it (as recalled; common practice).
 *
 * Period: a number given by the user counts phases by position; 'auto' infers it from
 * the spacing of x read as spreadsheet serial dates (daily: weekday; weekly: week of the
 * year; monthly: month; quarterly: quarter), so gaps keep their phase. Series with x as
 * row numbers get no automatic season (give the period). Needs two points per phase.
 * Unchecked.
 *
 * @param series - clean series
 * @param request - 'auto' or a period in points
 * @param multiplicative - the season multiplies the level (counts) rather than adds to it
 * @param trend - the level may trend (the slope model): the running median's ends are extended along the trend
 * @example
 * ```ts
 * seasonForBreaks(weeklySeries, 'auto', false).period; // 52
 * ```
 */
export function seasonForBreaks(series: Series, request: 'auto' | number, multiplicative: boolean, trend = false): SeasonForBreaks {
  const n = series.n, y = series.y;
  let phases: Int32Array, period: number, how: string;
  if (request === 'auto') {
    const cal = series.xGiven ? calendarPhases(series.x) : null;
    if (!cal) return { seasonal: false, period: NaN, strength: NaN, multiplicative, how: series.xGiven ? 'x spacing is not daily, weekly, monthly or quarterly dates' : 'no x given (row numbers)' };
    ({ phases, period, how } = cal);
  } else {
    period = request;
    phases = Int32Array.from({ length: n }, (_, i) => i % request);
    how = `period ${request} given, counted by position`;
  }
  let angle: Float64Array | undefined;
  if (request === 'auto') angle = calendarPhases(series.x)?.angle;
  const counts = new Int32Array(period);
  for (let i = 0; i < n; i++) counts[phases[i]]++;
  let fewest = n;
  for (let p = 0; p < period; p++) fewest = Math.min(fewest, counts[p]);
  if (fewest < 2) return { seasonal: false, period, strength: NaN, multiplicative, how: `${how}; too short to estimate it (fewer than two points at some phase)` };
  // few cycles: a smooth pattern of a few harmonics instead of one free value per phase
  const harmonics = fewest < 5 && period >= 4 ? Math.min(4, Math.floor((period - 1) / 2)) : 0;
  if (harmonics && !angle) angle = Float64Array.from(phases, (p) => (2 * Math.PI * p) / period);
  if (harmonics) how += `; ${harmonics} harmonics (too few cycles for a free value per phase)`;
  const width = period % 2 ? period : period + 1;
  const d = new Float64Array(n);
  let fit: Float64Array = new Float64Array(n);
  let df = period - 1;
  // two passes: the level from the series, then from the series without the first season estimate
  for (let pass = 0; pass < 2; pass++) {
    const base = pass === 0 ? y : Float64Array.from(y, (v, i) => (multiplicative ? (fit[i] > 0 ? v / fit[i] : v) : v - fit[i]));
    const level = runningMedian(base, width, trend);
    for (let i = 0; i < n; i++) d[i] = multiplicative ? (level[i] > 0 ? y[i] / level[i] : 1) : y[i] - level[i];
    if (harmonics) { fit = harmonicFit(d, angle!, harmonics); df = 2 * harmonics; } else fit = phaseMedians(d, phases, period);
    // centre: average 0 (additive) or 1 (multiplicative) over the points
    let mean = 0;
    for (let i = 0; i < n; i++) mean += fit[i] / n;
    for (let i = 0; i < n; i++) fit[i] = multiplicative ? (mean > 0 ? fit[i] / mean : 1) : fit[i] - mean;
    if (multiplicative) for (let i = 0; i < n; i++) d[i] = mean > 0 ? d[i] / mean : d[i];
  }
  const season = multiplicative ? Float64Array.from(fit, (v) => v - 1) : fit;
  const dd = multiplicative ? Float64Array.from(d, (v) => v - 1) : d;
  const R = Float64Array.from(dd, (v, i) => v - season[i]);
  const sd = madScale(dd), sr = madScale(R);
  const strength = sd > 0 ? Math.max(0, 1 - (sr * sr) / (sd * sd)) : 0;
  // no-season test: the fitted season's sum of squares against noise, roughly chi-squared
  // with df degrees of freedom when there is none (phase medians carry the factor pi / 2)
  let T = 0;
  for (let i = 0; i < n; i++) T += season[i] * season[i];
  T /= (harmonics ? 1 : Math.PI / 2) * sr * sr;
  const significant = sr > 0 ? T > chiSquaredUpper(df, 3.09) : sd > 0;
  const seasonal = request !== 'auto' || significant;
  if (!seasonal) return { seasonal, period, strength, multiplicative, how: `${how}; seasonal strength ${strength.toFixed(2)}, phase differences within what noise explains` };
  return { seasonal, period, strength, component: fit, multiplicative, how };
}

/** Median of d at each phase, per point. Unchecked. */
function phaseMedians(d: Float64Array, phases: Int32Array, period: number): Float64Array {
  const byPhase: number[][] = Array.from({ length: period }, () => []);
  for (let i = 0; i < d.length; i++) byPhase[phases[i]].push(d[i]);
  const m = byPhase.map((b) => median(b));
  return Float64Array.from(phases, (p) => m[p]);
}

/**
 * Least-squares fit of d on 1, cos(k a), sin(k a) for k = 1..K, refitted once with
 * values beyond 3 robust sds of the first fit clipped (so spikes do not shape the
 * season). Returns the fitted values without the constant. Unchecked.
 */
function harmonicFit(d: Float64Array, a: Float64Array, K: number): Float64Array {
  const n = d.length, m = 2 * K + 1;
  const row = (i: number, out: Float64Array): void => {
    out[0] = 1;
    for (let k = 1; k <= K; k++) { out[2 * k - 1] = Math.cos(k * a[i]); out[2 * k] = Math.sin(k * a[i]); }
  };
  const r = new Float64Array(m);
  let target: Float64Array = d;
  let coef: Float64Array = new Float64Array(m);
  for (let pass = 0; pass < 2; pass++) {
    const A = new Float64Array(m * m), b = new Float64Array(m);
    for (let i = 0; i < n; i++) {
      row(i, r);
      for (let j = 0; j < m; j++) { b[j] += r[j] * target[i]; for (let k = 0; k < m; k++) A[j * m + k] += r[j] * r[k]; }
    }
    coef = solveSmall(A, b, m);
    const fitted = Float64Array.from({ length: n }, (_, i) => { row(i, r); let v = 0; for (let j = 0; j < m; j++) v += coef[j] * r[j]; return v; });
    const res = Float64Array.from(d, (v, i) => v - fitted[i]);
    const lim = 3 * madScale(res);
    target = Float64Array.from(d, (v, i) => fitted[i] + Math.max(-lim, Math.min(lim, v - fitted[i])));
  }
  return Float64Array.from({ length: n }, (_, i) => { row(i, r); let v = 0; for (let j = 1; j < m; j++) v += coef[j] * r[j]; return v; });
}

/** Gaussian elimination with partial pivoting for a small dense system. Unchecked. */
function solveSmall(A: Float64Array, b: Float64Array, m: number): Float64Array {
  const M = Float64Array.from(A), v = Float64Array.from(b);
  for (let c = 0; c < m; c++) {
    let piv = c;
    for (let r = c + 1; r < m; r++) if (Math.abs(M[r * m + c]) > Math.abs(M[piv * m + c])) piv = r;
    if (piv !== c) {
      for (let k = 0; k < m; k++) { const t = M[c * m + k]; M[c * m + k] = M[piv * m + k]; M[piv * m + k] = t; }
      const t = v[c]; v[c] = v[piv]; v[piv] = t;
    }
    const p = M[c * m + c];
    if (p === 0) continue;
    for (let r = c + 1; r < m; r++) {
      const f = M[r * m + c] / p;
      if (f === 0) continue;
      for (let k = c; k < m; k++) M[r * m + k] -= f * M[c * m + k];
      v[r] -= f * v[c];
    }
  }
  const x = new Float64Array(m);
  for (let c = m - 1; c >= 0; c--) {
    let s = v[c];
    for (let k = c + 1; k < m; k++) s -= M[c * m + k] * x[k];
    x[c] = M[c * m + c] !== 0 ? s / M[c * m + c] : 0;
  }
  return x;
}

/** The season field of a result, with its plain-words note. Unchecked. */
export function seasonTreatment(request: 'auto' | 'none' | number, s: SeasonForBreaks | null): SeasonTreatment {
  const req = request === 'auto' ? 'auto' : request === 'none' ? 'none' : 'given';
  if (!s) return { adjusted: false, request: req, period: NaN, strength: NaN, note: 'season none: changes were looked for in the series as given.' };
  const st = Number.isFinite(s.strength) ? s.strength.toFixed(2) : 'not measured';
  if (s.seasonal) {
    return {
      adjusted: true, request: req, period: s.period, strength: s.strength,
      note: `changes were looked for in the series without its season (${s.how}; seasonal strength ${st}${s.multiplicative ? '; the season multiplies the rate' : ''}). Segment levels describe the seasonally adjusted series; fitted values include the season. Set season 'none' to look in the raw series.`,
    };
  }
  return { adjusted: false, request: req, period: s.period, strength: s.strength, note: `no season removed (${s.how}).` };
}
