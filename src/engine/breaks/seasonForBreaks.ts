/**
 * The seasonal pattern changepoints set aside before looking for changes.
 */
import type { Series } from '../series';
import { median } from '../median';
import type { SeasonTreatment } from './types';

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
function calendarPhases(x: Float64Array): { phases: Int32Array; period: number; how: string } | null {
  const n = x.length;
  if (n < 3) return null;
  const gaps = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) gaps[i - 1] = x[i] - x[i - 1];
  const d = median(gaps);
  const date = (v: number): Date => new Date((v - UNIX_EPOCH_SERIAL) * DAY_MS);
  const phases = new Int32Array(n);
  if (d >= 0.99 && d <= 1.01) {
    for (let i = 0; i < n; i++) phases[i] = date(Math.floor(x[i])).getUTCDay();
    return { phases, period: 7, how: 'daily dates: the weekday pattern (period 7)' };
  }
  if (d >= 6.9 && d <= 7.1) {
    for (let i = 0; i < n; i++) {
      const t = date(Math.floor(x[i]));
      const day = Math.floor((t.getTime() - Date.UTC(t.getUTCFullYear(), 0, 1)) / DAY_MS);
      phases[i] = Math.min(51, Math.floor(day / 7));
    }
    return { phases, period: 52, how: 'weekly dates: the yearly pattern by week of the year (52 phases; the 52.18 weeks of a year are absorbed by placing each week by its calendar date, the last day or two of a year joining week 52)' };
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
export function runningMedian(y: Float64Array, width: number): Float64Array {
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
 * @example
 * ```ts
 * seasonForBreaks(weeklySeries, 'auto', false).period; // 52
 * ```
 */
export function seasonForBreaks(series: Series, request: 'auto' | number, multiplicative: boolean): SeasonForBreaks {
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
  const counts = new Int32Array(period);
  for (let i = 0; i < n; i++) counts[phases[i]]++;
  for (let p = 0; p < period; p++) {
    if (counts[p] < 2) return { seasonal: false, period, strength: NaN, multiplicative, how: `${how}; too short to estimate it (fewer than two points at some phase)` };
  }
  const width = period % 2 ? period : period + 1;
  const byPhase: number[][] = Array.from({ length: period }, () => []);
  const index = new Float64Array(period);
  const d = new Float64Array(n);
  let raw = new Float64Array(period);
  // two passes: the level from the series, then from the series without the first season estimate
  for (let pass = 0; pass < 2; pass++) {
    const base = pass === 0 ? y : Float64Array.from(y, (v, i) => (multiplicative ? v / (index[phases[i]] || 1) : v - index[phases[i]]));
    const level = runningMedian(base, width);
    for (let i = 0; i < n; i++) d[i] = multiplicative ? (level[i] > 0 ? y[i] / level[i] : 1) : y[i] - level[i];
    for (const b of byPhase) b.length = 0;
    for (let i = 0; i < n; i++) byPhase[phases[i]].push(d[i]);
    raw = new Float64Array(period);
    let mean = 0;
    for (let p = 0; p < period; p++) { raw[p] = median(byPhase[p]); mean += raw[p] / period; }
    for (let p = 0; p < period; p++) index[p] = multiplicative ? (mean > 0 ? raw[p] / mean : 1) : raw[p] - mean;
  }
  const R = Float64Array.from(d, (v, i) => v - raw[phases[i]]);
  const sd = madScale(d), sr = madScale(R);
  const strength = sd > 0 ? Math.max(0, 1 - (sr * sr) / (sd * sd)) : 0;
  // no-season test: phase medians have variance about (pi / 2) sr^2 / n_p, so
  // T = sum n_p (raw_p - mean)^2 / ((pi / 2) sr^2) is roughly chi-squared with P - 1 df
  let T = 0;
  let rawMean = 0;
  for (let p = 0; p < period; p++) rawMean += raw[p] / period;
  for (let p = 0; p < period; p++) T += (counts[p] * (raw[p] - rawMean) ** 2) / ((Math.PI / 2) * sr * sr);
  const significant = sr > 0 ? T > chiSquaredUpper(period - 1, 3.09) : sd > 0;
  const seasonal = request !== 'auto' || significant;
  if (!seasonal) return { seasonal, period, strength, multiplicative, how };
  const component = Float64Array.from({ length: n }, (_, i) => index[phases[i]]);
  return { seasonal, period, strength, component, multiplicative, how };
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
  return { adjusted: false, request: req, period: s.period, strength: s.strength, note: `no season removed (${s.how}${Number.isFinite(s.strength) ? `; seasonal strength ${st}, phase differences within what noise explains` : ''}).` };
}
