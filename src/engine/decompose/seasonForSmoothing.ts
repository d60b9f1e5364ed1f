/**
 * The series a smoother should see when it is seasonal: y without its season.
 * A trend fitted through a yearly or weekday swing follows the swing (the
 * spline bends with every hump, trend filtering puts knots at every turn), so
 * smoothers with `season: 'auto'` (their default) fit the seasonally adjusted
 * series when x are dates and the season is strong: STL (Cleveland et al.
 * 1990) through {@link decompose} with its season plan from the dates and its
 * strength rule (Wang, Smith & Hyndman 2006; kept at strength 0.64 or more).
 * The result says so in a note. Series without dates, or whose season is weak,
 * are returned unchanged.
 */
import type { Series } from '../series';
import { Warning, warning } from '../warnings';
import { isKnotwiseError } from '../errors';
import { decompose } from './decompose';
import { looksLikeDates } from './seasonPlan';

/** The series to smooth (adjusted or as given) and the note that says which. */
export interface SeasonForSmoothing {
  series: Series;
  notes: Warning[];
}

/**
 * y without its season when x are dates and the season is strong; else the series unchanged.
 *
 * @example
 * ```ts
 * const { series: s, notes } = seasonForSmoothing(weeklySeries); // s.y = y - yearly season when it is strong
 * ```
 */
export function seasonForSmoothing(series: Series): SeasonForSmoothing {
  if (!series.xGiven || series.n < 8 || !looksLikeDates(series.x)) return { series, notes: [] };
  let r;
  try {
    r = decompose(series, { method: 'stl', season: 'auto' });
  } catch (e) {
    if (!isKnotwiseError(e)) throw e;
    return { series, notes: [warning('note', `The series was smoothed as given: its season could not be checked (${e.message})`)] };
  }
  if (!r.seasonal) return { series, notes: [] };
  const kept = r.seasons.filter((s) => s.kept);
  const what = kept.map((s) => `${s.label} season (strength ${s.strength.toFixed(2)})`).join(' and ');
  return {
    series: { ...series, y: Float64Array.from(r.adjusted) },
    notes: [warning('note', `The series has a ${what}: the trend was fitted to the series without it (STL), so the points shown and the residuals are the seasonally adjusted values. DECOMPOSE gives the season itself; the setting season=none smooths the series as given.`)],
  };
}
