import type { Series } from '../series';
import { decompose, DecomposeOptions } from './decompose';

/** Result of {@link seasonalAdjustment}, per clean point. */
export interface SeasonalAdjustment {
  /** y minus the season (spikes kept): where to look for changes. Equals y when there is no season. */
  adjusted: Float64Array;
  /** y minus the season and the spikes. */
  despiked: Float64Array;
  /** Clean-point indices of the spikes, increasing. */
  spikes: number[];
  /** Cycle lengths in steps of the kept seasonal terms (e.g. [7, 52.18]); empty when none. */
  period: number[];
  /** Largest seasonal strength among the candidate terms (0 when there was none). */
  strength: number;
  /** Whether a season was removed. */
  seasonal: boolean;
  /** One sentence for the result's notes, e.g. "Changes were looked for in the series without its weekday and yearly season (strength 0.81, 0.72) and without 2 spikes." */
  note: string;
}

/**
 * The series without its season, and its spikes: what changepoint and knot searches
 * should look at so that a season or a one-off spike is not taken for a change.
 * Runs {@link decompose} (adaptive method; same options) and keeps what those searches need.
 *
 *   adjusted_i = y_i - season_i,   despiked_i = y_i - season_i - spike_i
 *
 * The season is removed only when the seasonal strength reaches 0.64 (see decompose).
 *
 * @param series - clean series (dates as x let the period be inferred)
 * @param options - as for decompose: period, dates, season ('auto' | 'on' | 'off'), spikePenalty, ...
 * @example
 * ```ts
 * const a = seasonalAdjustment(series);
 * const breaks = findBreaks(seriesFromArrays(series.x, a.adjusted), ...); // a.spikes to leave out
 * ```
 * @throws {@link KnotwiseError} as decompose
 */
export function seasonalAdjustment(series: Series, options: DecomposeOptions = {}): SeasonalAdjustment {
  const r = decompose(series, { ...options, method: 'adaptive' });
  const kept = r.seasons.filter((s) => s.kept);
  const despiked = Float64Array.from(r.adjusted, (v, i) => v - r.spikes[i]);
  const strength = r.seasons.reduce((m, s) => Math.max(m, s.strength), 0);
  const parts: string[] = [];
  if (kept.length) parts.push(`without its ${kept.map((s) => s.label).join(' and ')} season (strength ${kept.map((s) => s.strength.toFixed(2)).join(', ')})`);
  if (r.spikeIndex.length) parts.push(`without ${r.spikeIndex.length} spike${r.spikeIndex.length > 1 ? 's' : ''}`);
  const note = parts.length
    ? `Changes were looked for in the series ${parts.join(' and ')}.`
    : r.seasons.length
      ? `No season was removed (strength ${strength.toFixed(2)} below ${r.strengthThreshold}) and no spike was found.`
      : 'No season was looked for (no dates and no period) and no spike was found.';
  return { adjusted: r.adjusted, despiked, spikes: r.spikeIndex, period: kept.map((s) => Number(s.length.toFixed(2))), strength, seasonal: kept.length > 0, note };
}
