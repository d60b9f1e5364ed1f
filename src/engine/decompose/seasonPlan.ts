/**
 * Which seasonal terms a series can carry, from its x: the grid of steps each
 * point sits on (so rows left blank keep their phase) and the cycles on it.
 *
 * x are taken as Excel serial dates when every x is a whole number from 10,000
 * (18 May 1927) to 2,958,465 (31 Dec 9999) and their typical spacing (median
 * difference) is a day, a week, a month or a quarter:
 * - daily (median spacing 1 day; weekends may be missing): a weekday cycle of 7
 *   phases, and a yearly Fourier season when the data span two years or more
 *   (several seasons at once as in MSTL: K. Bandara, R. J. Hyndman and C. Bergmeir,
 *   "MSTL: a seasonal-trend decomposition algorithm for time series with multiple
 *   seasonal patterns", 2021, arXiv:2107.13462);
 * - weekly (6 to 8 days): a year is 365.2425 / 7 = 52.18 weeks, not a whole number
 *   of steps, so the yearly season is a Fourier series in the date itself
 *   (period 365.2425 days, 10 harmonics), evaluated at each week's own date;
 * - monthly (28 to 31 days): 12 phases, the calendar month;
 * - quarterly (89 to 92 days): 4 phases, the calendar quarter.
 * A given `period` (in steps of the grid) overrides this: a whole number gives a
 * cycle of that many phases (phase = grid index mod period), any other number a
 * Fourier season of that length. Without dates the grid step is the smallest
 * spacing of x, and every x must sit on that grid.
 */
import { KnotwiseError, showNumber } from '../errors';
import type { SeasonTerm } from './seasonDesign';

/** Days in a mean Gregorian year. */
export const YEAR_DAYS = 365.2425;

/** Fourier harmonics of a yearly season (common practice: 10 for a yearly season, as in S. J. Taylor and B. Letham, "Forecasting at scale", Am. Stat. 72 (2018) 37-45). */
export const YEARLY_HARMONICS = 10;

/** How the x of a series are read. */
export type Spacing = 'daily' | 'weekly' | 'monthly' | 'quarterly' | 'steps';

/** The seasonal plan of a series. */
export interface SeasonPlan {
  spacing: Spacing;
  /** Whether x were read as Excel serial dates. */
  dates: boolean;
  /** Grid index of each clean point (0 for the first). */
  grid: Int32Array;
  /** Number of grid steps from first to last point, plus 1. */
  gridLength: number;
  /** Candidate seasonal terms. */
  terms: SeasonTerm[];
  /** For each term, its length in grid steps (whole for cycles; rounded for the preliminary STL of a Fourier term). */
  stepsPerCycle: number[];
  /** Notes (terms left out for too short a span). */
  notes: string[];
}

const SERIAL_MIN = 10000;
const SERIAL_MAX = 2958465;

/** Calendar year, month (0-11) and weekday (0 = Sunday) of an Excel serial date >= 61. Unchecked. */
export function serialDate(serial: number): { year: number; month: number; weekday: number } {
  const d = new Date(Date.UTC(1899, 11, 30) + serial * 86400000);
  return { year: d.getUTCFullYear(), month: d.getUTCMonth(), weekday: d.getUTCDay() };
}

/** Whether x look like Excel serial dates (whole numbers from 10,000 to 2,958,465). Unchecked. */
export function looksLikeDates(x: Float64Array): boolean {
  for (let i = 0; i < x.length; i++) if (!(Number.isInteger(x[i]) && x[i] >= SERIAL_MIN && x[i] <= SERIAL_MAX)) return false;
  return x.length >= 2;
}

function medianSpacing(x: Float64Array): number {
  const d = new Float64Array(x.length - 1);
  for (let i = 0; i < d.length; i++) d[i] = x[i + 1] - x[i];
  d.sort();
  const m = d.length >> 1;
  return d.length % 2 ? d[m] : 0.5 * (d[m - 1] + d[m]);
}

/**
 * The seasonal plan of clean, increasing x. `period` (optional) in grid steps;
 * `dates` 'auto' (default), true or false.
 * @throws {@link KnotwiseError} `bad-option` (a period below 2), `bad-data` (x off any regular grid, or dates with an unrecognised spacing while dates: true)
 */
export function seasonPlan(x: Float64Array, period: number[] | undefined, dates: boolean | 'auto', xGiven: boolean): SeasonPlan {
  const n = x.length;
  const useDates = dates === true || (dates === 'auto' && xGiven && looksLikeDates(x));
  if (dates === true && !looksLikeDates(x)) throw new KnotwiseError('bad-data', `dates: TRUE needs every x to be a whole-number Excel date from ${SERIAL_MIN} to ${SERIAL_MAX}; got x from ${showNumber(x[0])} to ${showNumber(x[n - 1])}.`);
  const notes: string[] = [];
  let spacing: Spacing = 'steps';
  const grid = new Int32Array(n);
  const terms: SeasonTerm[] = [];
  const steps: number[] = [];
  let stepDays = 1;
  if (useDates) {
    const d = medianSpacing(x);
    if (d <= 1.5) spacing = 'daily';
    else if (d >= 6 && d <= 8) spacing = 'weekly';
    else if (d >= 28 && d <= 31) spacing = 'monthly';
    else if (d >= 89 && d <= 92) spacing = 'quarterly';
    else if (dates === true) throw new KnotwiseError('bad-data', `the dates are spaced ${showNumber(d)} days apart (median); a season is inferred for daily, weekly, monthly or quarterly dates only. Give the period instead.`);
  }
  if (spacing === 'daily' || spacing === 'weekly') {
    stepDays = spacing === 'daily' ? 1 : 7;
    for (let i = 0; i < n; i++) grid[i] = Math.round((x[i] - x[0]) / stepDays);
    // weekly: each date goes to the nearest week of the grid started at the first date (at most 3 days off)
  } else if (spacing === 'monthly' || spacing === 'quarterly') {
    const per = spacing === 'monthly' ? 1 : 3;
    const d0 = serialDate(x[0]);
    const base = d0.year * 12 + d0.month;
    for (let i = 0; i < n; i++) {
      const d = serialDate(x[i]);
      grid[i] = Math.floor((d.year * 12 + d.month - base) / per);
    }
  } else {
    // plain steps: the smallest spacing is the step; every x on that grid
    let h = Infinity;
    for (let i = 1; i < n; i++) h = Math.min(h, x[i] - x[i - 1]);
    stepDays = h;
    for (let i = 0; i < n; i++) {
      const g = (x[i] - x[0]) / h;
      grid[i] = Math.round(g);
      if (Math.abs(g - grid[i]) > 1e-6 * Math.max(1, g)) {
        if (period !== undefined) throw new KnotwiseError('bad-data', `a season needs x on a regular grid (gaps allowed); x = ${showNumber(x[i])} is not a whole number of steps of ${showNumber(h)} (the smallest spacing) from ${showNumber(x[0])}.`);
        return { spacing, dates: false, grid, gridLength: 0, terms: [], stepsPerCycle: [], notes: ['x are not on a regular grid, so no season was looked for.'] };
      }
    }
  }
  for (let i = 1; i < n; i++) if (grid[i] === grid[i - 1]) throw new KnotwiseError('bad-data', `two points fall on the same ${spacing === 'steps' ? 'step' : spacing.replace('ly', '')} (x = ${showNumber(x[i - 1])} and ${showNumber(x[i])}); add them up or average them first.`);
  const gridLength = grid[n - 1] + 1;
  const span = gridLength;
  const add = (term: SeasonTerm, len: number, what: string) => {
    // the preliminary STL needs more than two full cycles
    if (span <= 2 * len) { notes.push(`${what} was not looked for: the data span ${span} steps, not more than two cycles (${showNumber(2 * len)}).`); return; }
    terms.push(term);
    steps.push(len);
  };
  if (period !== undefined) {
    for (const p of period) {
      if (typeof p !== 'number' || !Number.isFinite(p) || p < 2) throw new KnotwiseError('bad-option', `period must be a number of steps >= 2; got ${typeof p === 'number' ? showNumber(p) : String(p)}.`);
      if (Number.isInteger(p)) {
        const phase = new Int32Array(n);
        for (let i = 0; i < n; i++) phase[i] = grid[i] % p;
        add({ kind: 'cycle', label: `period ${p}`, period: p, phase }, p, `A season of period ${p}`);
      } else {
        // a Fourier season of length p steps, evaluated at the grid index
        add({ kind: 'fourier', label: `period ${showNumber(p)}`, length: p, harmonics: Math.max(1, Math.min(YEARLY_HARMONICS, Math.floor((p - 1) / 2))), onGrid: true }, p, `A season of period ${showNumber(p)}`);
      }
    }
  } else if (spacing === 'daily') {
    const phase = new Int32Array(n);
    for (let i = 0; i < n; i++) phase[i] = serialDate(x[i]).weekday;
    add({ kind: 'cycle', label: 'weekday', period: 7, phase }, 7, 'A weekday pattern');
    add({ kind: 'fourier', label: 'yearly', length: YEAR_DAYS, harmonics: YEARLY_HARMONICS, onGrid: false }, 365, 'A yearly season');
  } else if (spacing === 'weekly') {
    add({ kind: 'fourier', label: 'yearly', length: YEAR_DAYS, harmonics: YEARLY_HARMONICS, onGrid: false }, 52, 'A yearly season');
  } else if (spacing === 'monthly' || spacing === 'quarterly') {
    const P = spacing === 'monthly' ? 12 : 4;
    const phase = new Int32Array(n);
    for (let i = 0; i < n; i++) { const m = serialDate(x[i]).month; phase[i] = spacing === 'monthly' ? m : Math.floor(m / 3); }
    add({ kind: 'cycle', label: spacing === 'monthly' ? 'month of year' : 'quarter of year', period: P, phase }, P, `A ${spacing === 'monthly' ? 'monthly' : 'quarterly'} season`);
  } else if (!useDates) {
    notes.push(xGiven ? 'x are not dates and no period was given, so no season was looked for.' : 'no x and no period were given, so no season was looked for.');
  }
  return { spacing, dates: useDates, grid, gridLength, terms, stepsPerCycle: steps, notes };
}
