/**
 * Changepoint segmentation: the public entry point.
 */
import { KnotwiseError } from '../errors';
import type { Series } from '../series';
import { slopeBreaks } from './slopeBreaks';
import { stepBreaks } from './stepBreaks';
import { levelBreaks } from './levelBreaks';
import type { BreaksOptions, BreaksResult } from './types';
import type { ResolvedBreaksOptions } from './validateBreaksOptions';
import { validateBreaksOptions } from './validateBreaksOptions';
import { seasonFor, seasonTreatment } from './seasonForBreaks';
import { warning } from '../warnings';

/**
 * Finds the exact optimal segmentation of a series under a per-change penalty:
 *
 *   minimise  sum_{segments} C(segment) + beta * (number of changes),
 *
 * with C twice the negative log-likelihood of the segment under `model` (RSS / sigma^2
 * for 'mean' and 'slope'). 'mean' uses FPOP (functional pruning, Maidstone, Hocking,
 * Rigaill & Fearnhead 2017, Stat Comput 27:519-533: near linear in n whatever the number
 * of changes); 'meanvar', 'poisson', 'distribution' use PELT (Killick, Fearnhead & Eckley
 * 2012, JASA); 'slope' uses CPOP (Fearnhead, Maidstone & Letchford 2019, JCGS), a
 * continuous broken line with kinks at data points. All exact, not heuristic.
 *
 * Before the search (all defaults; each can be turned off):
 * - season ('auto'): when x are spreadsheet dates (daily, weekly, monthly, quarterly) or
 *   a period is given, a seasonal pattern is estimated and, when present, removed; the
 *   changes are looked for in the seasonally adjusted series and `season` says what was
 *   done. Counts take the season as a rate factor (Poisson offset). The decomposition's
 *   trend has the shape of the change looked for (steps for level models, kinks for
 *   'slope'); the yearly season of weekly dates is refitted with as many harmonics as BIC
 *   supports, and once more against the fitted changes before a second search (one
 *   backfitting step). See {@link seasonFor}.
 * - noise ('correlated', Gaussian models): the lag-one noise correlation phi is estimated
 *   robustly from the variogram of the series at lags 1 to 4, with a term for a trend
 *   (the DeCAFS idea, Romano et al. 2022, JASA 117:2147-2162; the same estimator as
 *   cross-validation's fold plan, see noiseCorrelation.ts) and a named penalty rule is
 *   multiplied by the long-run variance ratio (1 + phi) / (1 - phi) (Lavielle & Moulines
 *   2000, J Time Ser Anal 21:33-59).
 *
 * - 'mean': change in level. Default robust: the biweight loss min((y - mu)^2 / sigma^2, 9)
 *   (Fearnhead & Rigaill 2019, JASA 114:169-183), so a single far-off value costs at most
 *   9 and is reported in `spikes` (beyond max(3, z_{1 - 0.025/n}) noise sds from its
 *   segment's level) instead of as two breaks; `robust: false` gives the Gaussian cost.
 *   sigma given, or MAD(first differences) / sqrt(2) / sqrt(1 - phi) (the marginal sd).
 *   Weights are case weights.
 * - 'meanvar': Gaussian change in mean and variance; robust centre and scale; variances
 *   floored at the rounding variance q^2 / 12 of values recorded to a grid q (found free
 *   of scale and offset), else 1e-8 times the series variance. Default minSegment 2.
 *   Each break reports `changeSd`, the change in standard deviation. Case weights.
 * - 'poisson': change in the rate of counts; negative values refused, fractional ones
 *   warned about; a note when the counts are over-dispersed. Case weights.
 * - 'distribution': nonparametric change in distribution, the empirical-distribution cost
 *   with `quantiles` K (Haynes, Fearnhead & Eckley 2017, Stat Comput). Weights ignored.
 * - 'slope': changes in slope, no jumps; sigma given or from second differences (marginal
 *   sd under the estimated phi). Tied x are merged into one weighted position. Exact
 *   within a work budget of 2e8 candidate evaluations.
 * With a named penalty rule, a one-point segment of the PELT models is a spike: set aside,
 * searched again without it, listed in `spikes`.
 *
 * Size: 'mean' handles a full column (1,048,576 rows) in seconds with memory linear in n;
 * the others are refused at once above {@link LONGEST_SEARCH} points (their searches can
 * grow with the square of the length), with a message saying what to do.
 *
 * Penalty: 'bic' = p log n, 'mbic' = (p + 1) log n (Zhang & Siegmund 2007), or a number
 * (used as given, not scaled for correlated noise); p = parameters per change including
 * its location (mean 2, meanvar 3, poisson 2, distribution 2, slope 2). `crops: [low, high]`
 * adds the CROPS table of every optimal segmentation for penalties in that range (Haynes,
 * Eckley & Fearnhead 2017, JCGS). A change is never placed between rows with equal x.
 *
 * @param series - from prepareSeries(y, x, w, { ties: 'keep' }); x in the user's units
 * @param options - see {@link BreaksOptions}
 * @returns breaks (first point of each new segment, with input row, x, change and changeSd),
 *   spikes, segment summaries, fitted values per point (season included), costs, the
 *   noise and season treatment, optional CROPS table, warnings (always including
 *   'break-cause') and solver diagnostics
 * @throws {@link KnotwiseError} `bad-option`, `bad-data`, `too-few-points`
 * @example
 * ```ts
 * const s = prepareSeries(flow, years, null, { ties: 'keep' });
 * const r = findBreaks(s, { model: 'mean', penalty: 'bic' });
 * r.breaks.map((b) => b.x); // e.g. [1899]
 * ```
 */
export function findBreaks(series: Series, options: BreaksOptions): BreaksResult {
  const o = validateBreaksOptions(options);
  // the volatility model's default of 5 points a segment, lowered to the series' length on a shorter series
  if (options.minSegment === undefined && o.model === 'meanvar') o.minSegment = Math.min(o.minSegment, Math.max(2, series.n));
  if (series.n < Math.max(2, o.minSegment)) {
    throw new KnotwiseError('too-few-points', `changepoints need at least ${Math.max(2, o.minSegment)} usable points (minSegment ${o.minSegment}); got ${series.n}.`);
  }
  refuseLongSearch(series.n, o);
  const multiplicative = o.model === 'poisson';
  const season = o.season === 'none' ? null : seasonFor(series, o.season, multiplicative, o.model === 'slope');
  const treatment = seasonTreatment(o.season, season);
  const comp = season && season.seasonal ? season.component! : null;
  let r: BreaksResult;
  if (comp && multiplicative) r = stepBreaks(series, o, comp);
  else {
    const search = (c: Float64Array | null): BreaksResult => {
      const s = c ? { ...series, y: Float64Array.from(series.y, (v, i) => v - c[i]) } : series;
      return o.model === 'slope' ? slopeBreaks(s, o) : o.model === 'mean' ? levelBreaks(s, o) : stepBreaks(s, o);
    };
    let c = comp;
    r = search(c);
    if (c && season!.refit) {
      // one backfitting step (Hastie & Tibshirani 1990, Generalized Additive Models, ch. 4): the
      // season estimated again from the series minus the fitted changes, so that a trend the
      // decomposition drew smoothly round a kink or step does not bend the season, then the
      // changes searched again without it
      c = season!.refit(Float64Array.from(series.y, (v, i) => v - r.fitted[i]));
      r = search(c);
    }
    if (c) for (let i = 0; i < series.n; i++) r.fitted[i] += c[i];
  }
  r.season = treatment;
  if (treatment.adjusted) r.warnings.splice(r.warnings.length - 1, 0, warning('note', treatment.note));
  return r;
}

/**
 * Largest series each model searches, so that no search runs much beyond 30 s: PELT
 * ('meanvar', 'poisson', 'distribution') and CPOP ('slope') take time growing with the
 * square of the segment lengths when changes are few. Limits from the benchmark on a
 * series with no change (PELT's slowest case), on a shared 2-core machine: meanvar 40,000
 * points 6 s; poisson and distribution 15,000 points 3 s. CPOP is slowest with many
 * kinks: 10,000 points with a kink every 1,000 took 4.9 s, 20,000 points 113 s (work
 * budget reached).
 * 'mean' uses functional pruning (near linear): no limit (a full column of 1,048,576
 * rows takes about 1.5 to 3 s per search).
 */
export const LONGEST_SEARCH: Readonly<Record<string, number>> = { meanvar: 60000, poisson: 30000, distribution: 30000, slope: 12000 };

/** Refuses, at once and saying what to do, a search that could run for minutes. Unchecked. */
function refuseLongSearch(n: number, o: ResolvedBreaksOptions): void {
  const limit = LONGEST_SEARCH[o.model];
  if (limit !== undefined && n > limit) {
    throw new KnotwiseError('bad-data', `the ${({ mean: 'level', meanvar: 'volatility', poisson: 'counts' } as Record<string, string>)[o.model] ?? o.model} model on ${n.toLocaleString('en-US')} points is refused: its exact search can take time growing with the square of the series length when there are few changes (minutes at this size). Use at most ${limit.toLocaleString('en-US')} points (a shorter range, or the series aggregated to a coarser time step), or the level model for changes in level, which handles a full column in seconds.`);
  }
  if (o.model === 'mean' && o.crops) {
    // about 3 microseconds per point per search (biweight, measured): keep CROPS under ~30 s
    const runs = Math.max(2, Math.floor(30 / (3e-6 * n)));
    if (o.maxRuns > runs) {
      throw new KnotwiseError('bad-option', `crops on ${n.toLocaleString('en-US')} points may run up to maxRuns ${o.maxRuns} searches of about ${(3e-6 * n).toFixed(1)} s each; give maxRuns ${runs} or less, or a shorter range.`);
    }
  }
}
