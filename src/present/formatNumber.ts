/**
 * Numbers for people: as many digits as the data carry, no more.
 *
 * Data typed into a sheet have a precision of their own (whole orders, prices
 * in cents). A fitted value is an average of such readings, so one decimal
 * more than the data is honest and more is noise: 494.9178872477054 orders is
 * shown and written as 494.9. Quantities without a data scale (penalties,
 * criteria) get a fixed number of significant digits. Common practice in
 * reporting; no reference beyond that.
 */

/** Largest number of decimals looked for in the data. */
const MAX_DECIMALS = 10;

/**
 * The number of decimals the data are recorded with: the smallest d in
 * 0..10 such that every finite value is a whole multiple of 10^-d (to a
 * the last place, so binary fractions such as 3.17 count as 2 decimals).
 * Values needing more than 10 are taken as unrounded (returns 10).
 *
 * @example dataDecimals([422, 448, 421]) === 0; dataDecimals([3.17, 3.3]) === 2
 */
export function dataDecimals(values: ArrayLike<number>): number {
  let best = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v) || v === 0) continue;
    let d = best;
    while (d < MAX_DECIMALS) {
      const s = v * 10 ** d;
      if (Math.abs(s - Math.round(s)) <= 1e-12 * Math.max(1, Math.abs(s))) break;
      d++;
    }
    best = d;
    if (best === MAX_DECIMALS) break;
  }
  return best;
}

/** Rounds to `decimals` decimals (negative rounds to tens, hundreds, ...). */
export function roundTo(v: number, decimals: number): number {
  if (!Number.isFinite(v)) return v;
  const f = 10 ** Math.abs(decimals);
  const r = decimals >= 0 ? Math.round(v * f) / f : Math.round(v / f) * f;
  return Object.is(r, -0) ? 0 : r;
}

/** How values derived from a data column are rounded and written. */
export interface DataRounding {
  /** Decimals kept: the data's own plus one, capped so no value shows more than `maxSignificant` significant digits. */
  decimals: number;
  round(v: number): number;
  format(v: number): string;
}

/**
 * The rounding for values derived from `data` (fitted values, segment means,
 * level changes): the data's decimals plus one, but never more than 6
 * significant digits on the largest value and never fewer than 2 on the
 * typical one (so series of tiny numbers still show their shape).
 *
 * @example roundForData([422, 448]).format(494.9178872477054) === '494.9'
 */
export function roundForData(data: ArrayLike<number>, maxSignificant = 6): DataRounding {
  let maxAbs = 0;
  const mags: number[] = [];
  // The typical magnitude is the median of at most about 2000 evenly spaced values, so long series stay cheap.
  const stride = Math.max(1, Math.floor(data.length / 2000));
  for (let i = 0; i < data.length; i++) {
    const a = Math.abs(data[i]);
    if (Number.isFinite(a)) { maxAbs = Math.max(maxAbs, a); if (a > 0 && i % stride === 0) mags.push(a); }
  }
  let decimals = dataDecimals(data) + 1;
  if (maxAbs > 0) {
    const lead = Math.floor(Math.log10(maxAbs));
    decimals = Math.min(decimals, maxSignificant - 1 - lead);
    mags.sort((a, b) => a - b);
    const typical = mags.length ? mags[mags.length >> 1] : maxAbs;
    decimals = Math.max(decimals, 1 - Math.floor(Math.log10(typical)));
  }
  return { decimals, round: (v) => roundTo(v, decimals), format: (v) => formatFixed(v, decimals) };
}

/** A value at `decimals` decimals as plain text (no exponent, no thousands separators, "-" for a missing value). */
export function formatFixed(v: number, decimals: number): string {
  if (!Number.isFinite(v)) return '-';
  const r = roundTo(v, decimals);
  return decimals > 0 ? r.toFixed(Math.min(decimals, 20)) : String(r);
}

/**
 * A number with `significant` significant digits, in plain notation between
 * 1e-4 and 1e6 and as "1.7e13" outside, trailing zeros dropped. "-" for NaN.
 *
 * @example formatNumber(17401000000000) === '1.74e13'; formatNumber(0.000123456) === '0.000123'; formatNumber(2.5) === '2.5'
 */
export function formatNumber(v: number, significant = 3): string {
  if (Number.isNaN(v)) return '-';
  if (!Number.isFinite(v)) return v > 0 ? 'infinite' : '-infinite';
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e6 || a < 1e-4) {
    const [m, e] = v.toExponential(significant - 1).split('e');
    return `${String(Number(m))}e${Number(e)}`;
  }
  return String(Number(v.toPrecision(significant)));
}
