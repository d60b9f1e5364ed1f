/**
 * Seasonal decomposition of a clean series into trend, season, spikes and remainder:
 *
 *   y_i = trend_i + season_i + spike_i + remainder_i
 *
 * Two methods:
 * - 'adaptive' (default): one convex problem (S.-J. Kim, K. Koh, S. Boyd and
 *   D. Gorinevsky, "l1 trend filtering", SIAM Review 51 (2009) 339-360, section 6):
 *     minimise 1/2 sum w_i (y_i - t_i - s_i - o_i)^2 + lambda ||D(x, k+1) t||_1 + rho ||o||_1,
 *   t a trend-filtering trend of order k (knots chosen by the data), s a fixed seasonal
 *   pattern (per-phase effects summing to zero over a cycle, or a yearly Fourier series),
 *   o sparse spikes. Solved exactly by block coordinate descent finished by an active-set method
 *   (solveDecomposition.ts).
 * - 'stl': STL (Cleveland et al. 1990; several seasons as in MSTL), robust by default.
 *
 * The period: given (in steps), or read from x when x are Excel dates (seasonPlan.ts):
 * daily -> weekday (+ yearly with two years or more), weekly -> yearly Fourier season
 * (52.18 weeks), monthly -> 12, quarterly -> 4. Phases come from x, so blank rows keep
 * their phase.
 *
 * Whether there is a season: the seasonal strength F_S = max(0, 1 - Var(R) / Var(S + R))
 * (Wang, Smith & Hyndman 2006) of each candidate term in a robust preliminary STL/MSTL
 * (variances over the points the robust STL does not give zero weight);
 * a term is kept when F_S >= 0.64, the threshold R's forecast::nsdiffs uses for its
 * seasonal-strength test (from memory of the forecast package). Reported with the decision.
 *
 * Penalties of the adaptive method (stated rules):
 * - rho = sigma * sqrt(2 ln n): the universal threshold of D. L. Donoho and I. M. Johnstone,
 *   "Ideal spatial adaptation by wavelet shrinkage", Biometrika 81 (1994) 425-455. At the
 *   optimum o_i = soft(r_i, rho / w_i), so with Gaussian noise of sd sigma / sqrt(w_i) and
 *   unit weights the expected number of pure-noise points marked a spike is about
 *   2 / (sqrt(2 pi) sqrt(2 ln n)) (Mills' ratio): 0.21 per series at n = 1,826, and it tends to 0.
 *   sigma is the robust scale of the decomposition's own remainder (remainderScale.ts:
 *   1.4826 median sqrt(w_i) |y_i - t_i - s_i|, spikes included, which the median ignores, times
 *   sqrt(n / (n - p)) for the p = knots + k + 1 + season coefficients + spikes the fit spent): the
 *   problem is solved at a first rho, sigma read from its remainder, and solved again from that
 *   solution with the new rho until rho changes by at most 2% (at most 4 solves). The first rho
 *   takes sigma from the remainder of the season fitted to y less the penalty search's trend (often
 *   already within 2%); with a given trend penalty, from second differences of the deseasonalised
 *   series (as the changepoint models do). That scale alone was too small here (it was the rule before): the preliminary STL's yearly
 *   season has a value per day of the year and takes up part of the noise, and second differences
 *   of positively correlated noise are smaller than the noise (for AR(1) with phi = 0.5 by a factor
 *   0.65). With it as rho's scale, invented daily series without spikes had about 6 (Gaussian noise)
 *   and 70 (AR(1) noise) points marked spikes per five-year series.
 * - lambda: chosen by the trend-filtering criteria (`select`, default 'cv') on the
 *   deseasonalised series (preliminary season removed) without the points the preliminary
 *   robust STL gives zero weight (|remainder| > 6 median |remainder|), so that neither the
 *   season nor a spike is taken for a trend change. The grid has 3 penalties per decade (factor 2.15
 *   between neighbours; the trend's own default has 6): near its minimum the cross-validation curve
 *   changes between such neighbours by far less than its standard error (on the bench's five years
 *   of daily data the 16-point grid's choice scores 6.2476 against the 30-point grid's 6.2472, with a
 *   standard error of 0.21), and the search costs half as much. Cross-validation by default (the trend's own
 *   default): on invented monthly and daily series with planted kinks it kept a few knots at the
 *   kinks, while BIC chose near-interpolating trends (84 knots on 93 points) and SURE was erratic.
 *   The cross-validation is the trend path's own (same folds, fold penalties and warm starts), scored
 *   penalty by penalty from lambda_max down and stopped after the score has risen at 2 successive
 *   penalties past its minimum (trendPenaltySearch.ts): the smallest penalties, whose many knots cost
 *   most, are then not solved (on the bench's five years of daily data the last grid penalty, half the
 *   search's time). 'sure' and 'bic' use fitTrend on the same grid.
 * Cost: the solver's first-order steps mostly serve to find the knots and spikes; from the penalty
 * search's knots an active-set method (polishDecomposition.ts) usually finds the exact solution at
 * once (in a dozen rounds on the bench's five years of daily data), and one or two exact trend steps
 * confirm it. Most of the time then goes to the penalty search (about 90 trend-filtering solves there:
 * 15 penalties, each on all the data and on 5 folds), then the solve and the preliminary robust STL/MSTL
 * (npm run bench -- --only=decompose).
 *
 * A trend describes the past: its last values are revised as data arrive, and it is not a
 * forecast. A knot or spike is a statistical finding, not proof of its cause.
 */
import { KnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { NOISE_ASSUMPTIONS, type Criterion, type Knot, type SolverStatus, type NoiseAssumption } from '../types';
import { knotBends, type Bend } from '../diagnostics/knotBends';
import { Warning, warning, listRows } from '../warnings';
import { checkChoice, checkInteger, checkPenalty, checkPositive } from '../options';
import { boundaryWarning } from '../diagnostics/commonWarnings';
import { differenceSigma } from '../robustSigma';
import { fitTrend } from '../smoothers/trend';
import { trendScaling, toScaledPenalty } from '../smoothers/trend/trendScaling';
import { knotPositions, defaultGridRatio } from '../smoothers/trend/trendPath';
import { seasonPlan, Spacing } from './seasonPlan';
import { seasonDesign, SeasonTerm, fitSeasonAndSpikes } from './seasonDesign';
import { preliminaryDecomposition, seasonalStrength, mstlOnGrid } from './preliminaryDecomposition';
import { solveDecomposition, DecompositionStart } from './solveDecomposition';
import { trendPenaltySearch } from './trendPenaltySearch';
import { remainderScale } from './remainderScale';
import { seedOf } from '../smoothers/trend/solveTrend';
import { stlParameters, StlOptions } from './stl';
import type { RunContext } from '../analysis/runContext';

/** Seasonal strength at or above which a seasonal term is kept ('auto'). */
export const SEASONAL_STRENGTH_THRESHOLD = 0.64;

/** Options of {@link decompose}. */
export interface DecomposeOptions {
  /** 'adaptive' (default) or 'stl'. */
  method?: 'adaptive' | 'stl';
  /** Season length(s) in steps of x (whole numbers: phases; others: a Fourier season). Default: read from dates. */
  period?: number | number[];
  /** Read x as Excel dates: 'auto' (default: whole numbers from 10,000 to 2,958,465), true or false. */
  dates?: boolean | 'auto';
  /** 'auto' (default): keep seasonal terms with strength >= 0.64; 'on': keep every candidate; 'off': no season. */
  season?: 'auto' | 'on' | 'off';
  /** Trend order k of the adaptive method (0 to 3, default 1: piecewise linear). */
  order?: number;
  /** Trend penalty lambda in the data's units (as fitTrend); default chosen by `select`. */
  penalty?: number;
  /** Rule for lambda when not given: 'cv' (default), 'cv-simpler' (one-standard-error rule), 'sure' or 'bic' (as fitTrend). */
  select?: 'cv' | 'cv-simpler' | 'sure' | 'bic';
  /** What the trend penalty's cross-validation assumes of the noise (default 'correlated': read from the data; {@link foldPlan}). */
  noise?: NoiseAssumption;
  /** Spike penalty rho (units of y times weight); default sigma sqrt(2 ln n), sigma the robust scale of the remainder. Infinity: no spikes. */
  spikePenalty?: number;
  /** Stopping tolerance of the adaptive solver: largest change of the trend in one step, relative to the sd of y (default 1e-7). */
  tolerance?: number;
  /** Step limit of the adaptive solver (default 500). */
  maxIterations?: number;
  /** STL settings for method 'stl' (period comes from `period` or the dates). Default: robust, seasonal window 13. */
  stl?: Omit<StlOptions, 'period'>;
}

/** One candidate seasonal term and the decision on it. */
export interface SeasonReport {
  label: string;
  /** Cycle length in steps of the grid (52.18 for a yearly season of weekly data). */
  length: number;
  /** Seasonal strength F_S in [0, 1] from the preliminary decomposition. */
  strength: number;
  /** Whether the term is in the decomposition. */
  kept: boolean;
  /** The fitted seasonal pattern of this term per clean point (zeros when not kept). */
  values: Float64Array;
}

/** Result of {@link decompose}, per clean point of the series. */
export interface DecomposeResult {
  method: 'adaptive' | 'stl';
  x: Float64Array;
  y: Float64Array;
  trend: Float64Array;
  /** Sum of the kept seasonal terms. */
  season: Float64Array;
  spikes: Float64Array;
  remainder: Float64Array;
  /** Seasonally adjusted series y - season (spikes and remainder kept). */
  adjusted: Float64Array;
  seasons: SeasonReport[];
  /** Whether any seasonal term was kept. */
  seasonal: boolean;
  strengthThreshold: number;
  spacing: Spacing;
  dates: boolean;
  /** Trend penalty lambda (adaptive; NaN for STL). */
  penalty: number;
  /** Spike penalty rho (adaptive; NaN for STL). */
  spikePenalty: number;
  /** Robust noise sd at unit weight (adaptive: of the remainder, the scale of the default rho). */
  noiseScale: number;
  /** Knots of the trend (adaptive; empty for STL). */
  knots: Knot[];
  /**
   * The trend's bends: neighbouring knots of one sign merged, each sized on the unpenalised refit of the
   * trend's data y - season - spikes (its honest size beside the shrunk one), as the knots table of a
   * trend fit (see knotBends). Adaptive; empty for STL.
   */
  bends: Bend[];
  /** Clean-point indices with a non-zero spike. */
  spikeIndex: number[];
  /** How lambda was chosen. */
  criterion: Criterion;
  warnings: Warning[];
  solver: SolverStatus;
}

/** Most solves of the decomposition while the spike threshold's noise scale settles (the first included). */
export const SPIKE_SCALE_SOLVES = 4;

/** Relative change of rho below which the noise scale of the remainder is taken as settled. */
export const SPIKE_SCALE_AGREEMENT = 0.02;

/** Penalties per decade of the trend penalty search (the trend's own default has about 6). */
export const PENALTY_SEARCH_PER_DECADE = 3;

/** Grid size of the trend penalty search: {@link PENALTY_SEARCH_PER_DECADE} per decade over the trend's default range (5 decades for orders 0 and 1, 7 for 2, 9 for 3). Unchecked. */
export function penaltySearchGrid(order: number): number {
  return Math.round(PENALTY_SEARCH_PER_DECADE * -Math.log10(defaultGridRatio(order))) + 1;
}

function resolve(options: DecomposeOptions) {
  if (options === null || typeof options !== 'object') throw new KnotwiseError('bad-option', `decomposition options must be an object; got ${String(options)}.`);
  const method = options.method === undefined ? 'adaptive' : checkChoice(options.method, 'method', ['adaptive', 'stl'] as const);
  let period: number[] | undefined;
  if (options.period !== undefined) {
    const list = Array.isArray(options.period) ? options.period : [options.period];
    if (list.length === 0 || list.length > 3) throw new KnotwiseError('bad-option', `period must be one to three numbers of steps; got ${list.length}.`);
    period = list.map((p) => {
      if (typeof p !== 'number' || !Number.isFinite(p) || p < 2) throw new KnotwiseError('bad-option', `period must be a number of steps >= 2; got ${typeof p === 'number' ? showNumber(p) : String(p)}.`);
      return p;
    });
  }
  const dates: boolean | 'auto' = options.dates === undefined || options.dates === 'auto' ? 'auto' : (options.dates as boolean);
  if (dates !== 'auto' && typeof dates !== 'boolean') throw new KnotwiseError('bad-option', `dates must be TRUE, FALSE or "auto"; got ${String(dates)}.`);
  const season = options.season === undefined ? 'auto' : checkChoice(options.season, 'season', ['auto', 'on', 'off'] as const);
  const order = options.order === undefined ? 1 : checkInteger(options.order, 'order', 0, 3);
  const penalty = options.penalty === undefined ? undefined : checkPenalty(options.penalty, 'penalty');
  const select = options.select === undefined ? 'cv' : checkChoice(options.select, 'select', ['cv', 'cv-simpler', 'sure', 'bic'] as const);
  let spikePenalty: number | undefined;
  if (options.spikePenalty !== undefined) {
    if (options.spikePenalty !== Infinity) spikePenalty = checkPositive(options.spikePenalty, 'spikePenalty');
    else spikePenalty = Infinity;
  }
  let tolerance = 1e-7;
  if (options.tolerance !== undefined) {
    tolerance = checkPositive(options.tolerance, 'tolerance');
    if (tolerance >= 1e-2) throw new KnotwiseError('bad-option', `tolerance must be below 0.01; got ${showNumber(tolerance)}.`);
  }
  const maxIterations = options.maxIterations === undefined ? 500 : checkInteger(options.maxIterations, 'maxIterations', 1, 1e6);
  const noise = options.noise === undefined ? 'correlated' : checkChoice(options.noise, 'noise', NOISE_ASSUMPTIONS);
  return { method, period, dates, season, order, penalty, select, spikePenalty, tolerance, maxIterations, noise };
}

/**
 * Decomposes a clean series into trend + season + spikes + remainder (see the module note
 * for the model, the rules for lambda, rho and the season, and the references).
 *
 * @param series - clean series (prepareSeries / seriesFromArrays); x in any units, or Excel dates
 * @param options - method, period, dates, season, order, penalty, select, noise, spikePenalty, tolerance, maxIterations, stl
 * @param context - optional progress reports and cancellation
 * @returns per clean point: trend, season, spikes, remainder, adjusted; the seasonal terms with their
 *   strength and decision, knots, penalties, warnings and solver status
 * @throws {@link KnotwiseError} `bad-option`, `bad-data` (x off a regular grid when a season is asked for), `too-few-points`, `numerical`
 * @example
 * ```ts
 * const r = decompose(seriesFromArrays(dates, sales));   // weekly dates: yearly season if strong enough
 * r.seasonal; r.seasons[0].strength; r.knots; r.spikeIndex;
 * ```
 */
export function decompose(series: Series, options: DecomposeOptions = {}, context?: RunContext): DecomposeResult {
  const o = resolve(options);
  const { x, y, w, n } = series;
  if (n < o.order + 3) throw new KnotwiseError('too-few-points', `a decomposition with trend order ${o.order} needs at least ${o.order + 3} points; got ${n}.`);
  const warnings: Warning[] = [...series.warnings];
  const plan = o.season === 'off' ? null : seasonPlan(x, o.period, o.dates, series.xGiven);
  const terms: SeasonTerm[] = plan ? plan.terms : [];
  if (plan) for (const note of plan.notes) warnings.push(warning('note', note));
  const lengths = plan ? plan.stepsPerCycle : [];
  const grid = plan ? plan.grid : Int32Array.from(x, (_, i) => i);
  // preliminary robust STL / MSTL: strength, season to remove before choosing lambda
  const stlMode = o.method === 'stl';
  const prelim = terms.length ? (stlMode ? null : preliminaryDecomposition(y, grid, plan!.gridLength, lengths)) : null;
  let stlOut: ReturnType<typeof stlDecomposition> | null = null;
  if (stlMode) {
    if (!terms.length) throw new KnotwiseError('bad-option', `STL needs a season: give a period, or x as daily, weekly, monthly or quarterly dates (${plan ? plan.notes.join(' ') : 'season is off'}).`);
    stlOut = stlDecomposition(y, grid, plan!.gridLength, lengths, options.stl ?? {});
  }
  const comps = stlOut ?? prelim;
  const strengths = terms.map((_, j) => seasonalStrength(comps!.seasonal[j], comps!.remainder, comps!.weights));
  const kept = terms.map((_, j) => o.season === 'on' || strengths[j] >= SEASONAL_STRENGTH_THRESHOLD);
  const reports: SeasonReport[] = terms.map((t, j) => ({
    label: t.label, length: t.kind === 'cycle' ? t.period : plan!.spacing === 'weekly' ? t.length / 7 : t.length, strength: strengths[j], kept: kept[j], values: new Float64Array(n),
  }));
  for (const r of reports) {
    warnings.push(warning('note', `Season "${r.label}" (${showNumber(Number(r.length.toFixed(2)))} steps): strength ${r.strength.toFixed(2)} ${r.kept ? (o.season === 'on' ? '(kept: season on)' : `>= ${SEASONAL_STRENGTH_THRESHOLD}: kept`) : `< ${SEASONAL_STRENGTH_THRESHOLD}: no season of this length`}.`));
  }
  if (stlOut) return stlResult(series, plan!, reports, stlOut, warnings);

  // ---- adaptive ----
  const keptIdx = terms.map((_, j) => j).filter((j) => kept[j]);
  const sPre = new Float64Array(n);
  if (prelim) for (const j of keptIdx) for (let i = 0; i < n; i++) sPre[i] += prelim.seasonal[j][i];
  const deseason = Float64Array.from(y, (v, i) => v - sPre[i]);
  let sigma = differenceSigma(deseason, 2, series.weighted ? w : undefined);
  if (!(sigma > 0)) {
    sigma = 0;
    warnings.push(warning('note', 'The robust noise scale is 0 (most second differences are equal); no spikes are marked unless spikePenalty is given.'));
  }
  const UNIVERSAL = Math.sqrt(2 * Math.log(n));
  let rho = o.spikePenalty ?? (sigma > 0 ? sigma * UNIVERSAL : Infinity);
  // lambda: trend criteria on the deseasonalised series without the preliminary's zero-weight points
  let lambda: number;
  let criterion: Criterion;
  let startTrend: Float64Array | undefined;
  let startKnots: { rows: number[]; signs: number[] } | undefined;
  if (o.penalty !== undefined) {
    lambda = o.penalty;
    criterion = { name: 'fixed', value: NaN };
  } else {
    const keep: number[] = [];
    for (let i = 0; i < n; i++) if (!prelim || prelim.weights[i] > 0) keep.push(i);
    const sub: Series = {
      ...series, x: Float64Array.from(keep, (i) => x[i]), y: Float64Array.from(keep, (i) => deseason[i]), w: Float64Array.from(keep, (i) => w[i]), n: keep.length,
      rowOf: new Int32Array(0), firstRow: Int32Array.from(keep, (i) => series.firstRow[i]), dropped: [], warnings: [],
    };
    context?.step(0.3, 'choosing the trend penalty');
    const off = o.order === 0 ? 1 : o.order;
    let fitted: Float64Array;
    let subKnots: { rows: number[]; signs: number[] };
    // cross-validation needs enough points per fold (as fitTrend, which then uses SURE)
    const m = sub.n, K = 5;
    const cvPossible = m - 2 >= K && m - Math.ceil((m - 2) / K) >= o.order + 2 && m >= 2 * K;
    if ((o.select === 'cv' || o.select === 'cv-simpler') && cvPossible) {
      const searchSettings = { order: o.order, gridSize: penaltySearchGrid(o.order), ratio: defaultGridRatio(o.order), folds: 5, oneSE: o.select === 'cv-simpler', tolerance: 1e-8, maxIterations: 200, noise: o.noise };
      const f = context ? context.part(0.3, 0.7, () => trendPenaltySearch(sub, { ...searchSettings, context })) : trendPenaltySearch(sub, searchSettings);
      lambda = f.penalty;
      const atEdge = f.chosen === 0 || (f.chosen === f.curve.length - 1 && f.scored === f.gridSize);
      criterion = { name: 'cv', value: f.curve[f.chosen].score, curve: f.curve, atEdge };
      fitted = f.fitted;
      subKnots = f.knots;
    } else {
      const trendOptions = { order: o.order, select: o.select === 'bic' ? 'bic' as const : 'sure' as const, gridSize: penaltySearchGrid(o.order) };
      const f = context ? context.part(0.3, 0.7, () => fitTrend(sub, trendOptions, context)) : fitTrend(sub, trendOptions);
      lambda = f.penalty;
      criterion = f.criterion;
      fitted = f.fitted;
      subKnots = { rows: f.knots.map((kn) => kn.index - off), signs: f.knots.map((kn) => (kn.change < 0 ? -1 : 1)) };
    }
    // start from that trend, linear across the left-out points
    startTrend = new Float64Array(n);
    for (let j = 0; j < keep.length; j++) {
      startTrend[keep[j]] = fitted[j];
      if (j > 0 && keep[j] - keep[j - 1] > 1) {
        const a = keep[j - 1], b = keep[j];
        for (let i = a + 1; i < b; i++) startTrend[i] = fitted[j - 1] + ((fitted[j] - fitted[j - 1]) * (x[i] - x[a])) / (x[b] - x[a]);
      }
    }
    for (let i = 0; i < keep[0]; i++) startTrend[i] = fitted[0];
    for (let i = keep[keep.length - 1] + 1; i < n; i++) startTrend[i] = fitted[keep.length - 1];
    // its knots as rows of the full series' difference operator, where the solver's active-set method starts
    startKnots = { rows: [], signs: [] };
    for (let j = 0; j < subKnots.rows.length; j++) {
      const r = keep[subKnots.rows[j] + off] - off;
      if (r < 0 || r > n - o.order - 2 || (startKnots.rows.length && r <= startKnots.rows[startKnots.rows.length - 1])) continue;
      startKnots.rows.push(r);
      startKnots.signs.push(subKnots.signs[j]);
    }
  }
  const sc = trendScaling(series, o.order);
  // the design's normal equations use the solver's (scaled) weights
  const design = keptIdx.length ? seasonDesign(x, grid, sc.ws, keptIdx.map((j) => terms[j])) : null;
  const ys = sc.ys;
  const lam = toScaledPenalty(lambda, sc);
  const start = {
    trend: startTrend ? Float64Array.from(startTrend, (v) => (v - sc.y0) / sc.c) : Float64Array.from(deseason, (v) => (v - sc.y0) / sc.c),
    season: Float64Array.from(sPre, (v) => v / sc.c),
    knots: startKnots,
  };
  // parameters spent by the season: its coefficients less its zero-sum constraints (the bordered system's extra rows)
  const seasonDf = design ? 2 * design.q - design.size : 0;
  if (o.spikePenalty === undefined && sigma > 0 && startTrend) {
    // a first rho nearer the answer: the remainder's scale after the season (and spikes at the first rho) fitted to y less the search's trend
    const r = Float64Array.from(ys, (v, i) => v - start.trend[i]);
    const sFit = new Float64Array(n), oFit = new Float64Array(n);
    if (design) fitSeasonAndSpikes(design, r, sc.ws, rho / (sc.m * sc.c), new Float64Array(design.q), sFit, oFit);
    let spikes0 = 0;
    for (let i = 0; i < n; i++) if (oFit[i] !== 0) spikes0++;
    const s0 = remainderScale(y, startTrend, Float64Array.from(sFit, (v) => sc.c * v), w, startKnots!.rows.length + o.order + 1 + seasonDf + spikes0);
    if (s0 > 0) {
      sigma = s0;
      rho = s0 * UNIVERSAL;
    }
  }
  context?.step(0.7, 'solving the decomposition');
  const solveAt = (rhoData: number, from: DecompositionStart) =>
    solveDecomposition(sc.xs, ys, sc.ws, o.order, lam, rhoData / (sc.m * sc.c), design, o.tolerance, o.maxIterations, from, (c) => context?.step(0.7 + 0.3 * Math.min(1, c / 50), 'solving the decomposition'));
  let sol = solveAt(rho, start);
  let scaleRounds = 1;
  if (o.spikePenalty === undefined && sigma > 0) {
    // rho from the remainder's own robust scale: solved again, from the last solution, until the scale settles
    for (;;) {
      let spikeCount = 0;
      for (let i = 0; i < n; i++) if (sol.spikes[i] !== 0) spikeCount++;
      const sr = remainderScale(y, Float64Array.from(sol.trend, (v) => sc.y0 + sc.c * v), Float64Array.from(sol.season, (v) => sc.c * v), w, sol.trendFit.knotRows.length + o.order + 1 + seasonDf + spikeCount);
      if (!(sr > 0)) break;
      const next = sr * UNIVERSAL;
      if (Math.abs(next - rho) <= SPIKE_SCALE_AGREEMENT * rho) break;
      if (scaleRounds >= SPIKE_SCALE_SOLVES) {
        warnings.push(warning('note', `The spike threshold's noise scale had not settled after ${scaleRounds} solves (last ${showNumber(sigma)}, the remainder's ${showNumber(sr)}); the last solve's threshold was kept.`));
        break;
      }
      sigma = sr;
      rho = next;
      sol = solveAt(rho, { trend: sol.trend, season: sol.season, knots: seedOf(sol.trendFit) });
      scaleRounds++;
    }
  }
  const trend = Float64Array.from(sol.trend, (v) => sc.y0 + sc.c * v);
  const season = Float64Array.from(sol.season, (v) => sc.c * v);
  const spikes = Float64Array.from(sol.spikes, (v) => sc.c * v);
  keptIdx.forEach((j, m) => { reports[j].values = Float64Array.from(sol.parts[m], (v) => sc.c * v); });
  const remainder = new Float64Array(n), adjusted = new Float64Array(n);
  const spikeIndex: number[] = [];
  for (let i = 0; i < n; i++) {
    remainder[i] = y[i] - trend[i] - season[i] - spikes[i];
    adjusted[i] = y[i] - season[i];
    if (spikes[i] !== 0) spikeIndex.push(i);
  }
  const tf = sol.trendFit;
  const k = o.order;
  const kx = knotPositions(x, k, tf.knotRows);
  const off = k === 0 ? 1 : k;
  const dk = tf.knotDifferences;
  const knots: Knot[] = tf.knotRows.map((r, j) => ({ x: kx[j], index: r + off, row: series.firstRow[r + off], change: dk ? (sc.c * dk[j]) / Math.pow(sc.h, k) : NaN }));
  // bends on the data the trend was fitted to (the series less its season and spikes)
  const bends = knotBends({ ...series, y: Float64Array.from(y, (v, i) => v - season[i] - spikes[i]) }, k, knots);
  if (knots.length > n / 4) warnings.push(warning('few-points-per-df', `The trend has ${knots.length} knots on ${n} points (penalty ${showNumber(lambda)}, chosen by ${criterion.name}): it may be following noise rather than the trend. Give a larger penalty, or a lower order.`));
  if (spikeIndex.length) {
    const rows = spikeIndex.map((i) => series.firstRow[i]);
    warnings.push(warning('note', `${spikeIndex.length} spike${spikeIndex.length > 1 ? 's' : ''} (one-off departures beyond the rule's threshold) at row${spikeIndex.length > 1 ? 's' : ''} ${listRows(rows)}; a spike is a statistical finding, not proof of its cause.`, rows));
  }
  if (!sol.status.converged) warnings.push(warning('not-converged', `The decomposition stopped after ${sol.status.iterations} cycles with largest change ${showNumber(sol.status.achieved)} (asked ${showNumber(sol.status.tolerance)}) relative to the sd of y; components are close to, but not exactly, the optimum. Increase maxIterations.`));
  warnings.push(boundaryWarning());
  return {
    method: 'adaptive', x, y, trend, season, spikes, remainder, adjusted, seasons: reports, seasonal: keptIdx.length > 0,
    strengthThreshold: SEASONAL_STRENGTH_THRESHOLD, spacing: plan ? plan.spacing : 'steps', dates: plan ? plan.dates : false,
    penalty: lambda, spikePenalty: rho, noiseScale: sigma, knots, bends, spikeIndex, criterion, warnings,
    solver: scaleRounds > 1 ? { ...sol.status, stoppingRule: `${sol.status.stoppingRule}; the last of ${scaleRounds} solves while the noise scale of the spike threshold settled` } : sol.status,
  };
}

/** STL / MSTL with the user's settings on the grid (blank steps filled by linear interpolation; robust unless told otherwise). Unchecked. */
function stlDecomposition(y: Float64Array, grid: Int32Array, G: number, lengths: number[], opts: Omit<StlOptions, 'period'>) {
  const robustDefault = opts.robust === undefined ? { robust: true } : {};
  return mstlOnGrid(y, grid, G, lengths, (L) => stlParameters(G, { ...opts, ...robustDefault, period: Math.round(L) }));
}

function stlResult(series: Series, plan: NonNullable<ReturnType<typeof seasonPlan>>, reports: SeasonReport[], out: ReturnType<typeof stlDecomposition>, warnings: Warning[]): DecomposeResult {
  const { x, y, n } = series;
  const season = new Float64Array(n);
  reports.forEach((r, j) => {
    r.values = out.seasonal[j];
    for (let i = 0; i < n; i++) season[i] += out.seasonal[j][i];
  });
  // spikes: points the robust STL gives zero weight (|R| above 6 median |R|)
  const spikes = new Float64Array(n), remainder = new Float64Array(n), adjusted = new Float64Array(n);
  const spikeIndex: number[] = [];
  const robust = out.params.some((p) => p.outer > 0);
  for (let i = 0; i < n; i++) {
    const r = out.remainder[i];
    if (robust && out.weights[i] === 0) { spikes[i] = r; spikeIndex.push(i); } else remainder[i] = r;
    adjusted[i] = y[i] - season[i];
  }
  if (out.filledSteps > 0) warnings.push(warning('note', `${out.filledSteps} blank step${out.filledSteps > 1 ? 's were' : ' was'} filled by linear interpolation for STL, which needs every step; components are reported at the data's points only.`));
  if (spikeIndex.length) {
    const rows = spikeIndex.map((i) => series.firstRow[i]);
    warnings.push(warning('note', `${spikeIndex.length} spike${spikeIndex.length > 1 ? 's' : ''} (robustness weight 0: remainder beyond 6 times its median size) at row${spikeIndex.length > 1 ? 's' : ''} ${listRows(rows)}.`, rows));
  }
  warnings.push(boundaryWarning());
  const passes = out.params.reduce((a, p) => a + p.inner * (p.outer + 1), 0) * (out.params.length > 1 ? 2 : 1);
  return {
    method: 'stl', x, y, trend: out.trend, season, spikes, remainder, adjusted, seasons: reports, seasonal: reports.some((r) => r.kept),
    strengthThreshold: SEASONAL_STRENGTH_THRESHOLD, spacing: plan.spacing, dates: plan.dates, penalty: NaN, spikePenalty: NaN,
    noiseScale: 1.4826 * medianAbs(remainder), knots: [], bends: [], spikeIndex, criterion: { name: 'none', value: NaN }, warnings,
    solver: { converged: true, iterations: passes, tolerance: 0, achieved: 0, stoppingRule: 'STL: fixed numbers of inner and robustness passes (no tolerance)' },
  };
}

function medianAbs(a: Float64Array): number {
  const b = Float64Array.from(a, Math.abs).sort();
  const m = b.length >> 1;
  return b.length % 2 ? b[m] : 0.5 * (b[m - 1] + b[m]);
}
