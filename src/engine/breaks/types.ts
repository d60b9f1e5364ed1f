/**
 * Shapes of changepoint segmentation: options in, {@link BreaksResult} out.
 *
 * Indices refer to the clean points of the {@link Series} (sorted by x, ties
 * kept in input order); `row` fields give the 0-based input row of a point so
 * the fronts can write results next to the user's cells.
 */
import type { Warning } from '../warnings';
import type { NoiseAssumption } from '../types';

/**
 * The segment model (what changes at a break):
 * - `'mean'`: Gaussian change in mean, common variance (known `sigma` or a robust estimate).
 * - `'meanvar'`: Gaussian change in mean and variance.
 * - `'poisson'`: change in the rate of counts.
 * - `'distribution'`: nonparametric change in distribution (empirical-distribution cost, Haynes, Fearnhead & Eckley 2017).
 * - `'slope'`: continuous piecewise-linear trend, changes in slope without jumps (L0 penalty, exact).
 */
export type BreaksModel = 'mean' | 'meanvar' | 'poisson' | 'distribution' | 'slope';

/** A penalty rule name, or a manual penalty (a non-negative number on the cost's scale). */
export type PenaltyRule = 'bic' | 'mbic';

/** Options of {@link findBreaks}. */
export interface BreaksOptions {
  /** Segment model (required). */
  model: BreaksModel;
  /** Per-change penalty: 'bic' (default), 'mbic', or a number >= 0 on the scale of twice the negative log-likelihood. */
  penalty?: PenaltyRule | number;
  /** When given, run CROPS over penalties in [low, high] and return the table of all optimal segmentations. */
  crops?: [number, number];
  /** Fewest points per segment (integer >= 1; default 1, or 5 for 'meanvar' (at least 2; lowered to n on shorter series)). For 'slope', the fewest points strictly after each kink up to the next. */
  minSegment?: number;
  /** Known noise standard deviation in y units ('mean' and 'slope'); default: a robust estimate from differences. */
  sigma?: number;
  /** Number of quantiles K of the 'distribution' cost (integer 2..100; default 10). */
  quantiles?: number;
  /** Largest number of CROPS penalty evaluations before stopping (default 200). */
  maxRuns?: number;
  /**
   * 'mean' only: true (default) uses the outlier-robust biweight cost, so single far-off
   * values are reported in `spikes` instead of as breaks; false uses plain squared errors.
   */
  robust?: boolean;
  /**
   * Gaussian models ('mean', 'meanvar', 'slope'): 'correlated' (default) estimates the
   * lag-one correlation of the noise and multiplies a named penalty rule by the long-run
   * variance ratio (1 + phi) / (1 - phi); 'independent' assumes independent noise.
   */
  noise?: NoiseAssumption;
  /**
   * Seasonal pattern: 'auto' (default) removes a season when the series has one (period
   * inferred), 'none' leaves the series as it is, a whole number >= 2 gives the period in
   * points. Changes are then looked for in the seasonally adjusted series.
   */
  season?: 'auto' | 'none' | number;
}

/** How the noise is treated by the penalty: see {@link BreaksOptions.noise}. */
export type { NoiseAssumption };

/** A single value far from its segment's level, set aside rather than reported as breaks. */
export interface Spike {
  /** Clean-point index. */
  index: number;
  /** 0-based input row. */
  row: number;
  /** x of that point. */
  x: number;
  /** y - fitted level (y units). */
  size: number;
}

/** What the noise treatment did ({@link BreaksResult.noise}). */
export interface NoiseTreatment {
  assumption: NoiseAssumption;
  /** Estimated lag-one noise correlation used (0 with 'independent'). */
  correlation: number;
  /** Factor applied to the named penalty rule (1 with 'independent' or a manual penalty). */
  penaltyFactor: number;
}

/** What was done about a seasonal pattern ({@link BreaksResult.season}). */
export interface SeasonTreatment {
  /** True when changes were looked for in the seasonally adjusted series. */
  adjusted: boolean;
  /** 'auto', 'none' or 'given' (a period was given). */
  request: 'auto' | 'none' | 'given';
  /** Period in points used or found (NaN when none). */
  period: number;
  /** Seasonal strength in [0, 1] when measured (NaN otherwise). */
  strength: number;
  /** Plain-words account for the tables and text. */
  note: string;
}

/** Summary of one segment. Fields not relevant to the model are NaN. */
export interface SegmentSummary {
  /** First point index of the segment (inclusive). */
  start: number;
  /** Last point index of the segment (inclusive). */
  end: number;
  /** x of the first and the last point. */
  xStart: number;
  xEnd: number;
  /** 0-based input rows of the first and last point. */
  rowStart: number;
  rowEnd: number;
  /** Number of points. */
  n: number;
  /** Weighted mean of y over the segment (robust 'mean' model: spikes left out). */
  mean: number;
  /** Weighted standard deviation of y about the segment's mean ('meanvar': the fitted one; robust 'mean': spikes left out). */
  sd: number;
  /** Count rate per point ('poisson'), else NaN. */
  rate: number;
  /** Median of y ('distribution'), else NaN. */
  median: number;
  /**
   * Fitted level of the segment: the robust (biweight) level for the robust 'mean' model,
   * else the mean ('distribution': the median); NaN for 'slope'.
   */
  level: number;
  /** Slope per x unit ('slope'), else NaN. */
  slope: number;
  /** Intercept at x = 0 ('slope'), else NaN. */
  intercept: number;
}

/** A changepoint: the first point of a new segment. */
export interface Break {
  /** Clean-point index of the first point of the new segment ('slope': the kink point, shared by both lines). */
  index: number;
  /** 0-based input row of that point. */
  row: number;
  /** x of that point. */
  x: number;
  before: SegmentSummary;
  after: SegmentSummary;
  /** Size of the change: after.level - before.level, after.rate - before.rate, after.slope - before.slope, ... */
  change: number;
  /** Change in standard deviation after.sd - before.sd (y units): the volatility change of 'meanvar'; descriptive for the other models. */
  changeSd: number;
  /**
   * Uncertainty of the location. PELT and CPOP return a point estimate only; no
   * interval is given here (published intervals need extra modelling assumptions).
   */
  uncertainty: { given: false; note: string };
}

/** One row of the CROPS table: an optimal segmentation and the penalties where it is optimal. */
export interface CropsRow {
  /** A penalty at which this segmentation is optimal (the one evaluated). */
  penalty: number;
  /** The interval of penalties [low, high] within [crops[0], crops[1]] over which it is optimal. */
  penaltyLow: number;
  penaltyHigh: number;
  /** Number of changes. */
  changes: number;
  /** Unpenalised cost (sum of segment costs). */
  cost: number;
  /** Change indices (first point of each new segment). */
  breaks: number[];
}

/** What the dynamic programme reports. */
export interface BreaksSolver {
  /** 'pelt', 'op' (exhaustive optimal partitioning) or 'cpop'. */
  algorithm: string;
  /** True when the result is the proven optimum (always for PELT; for CPOP unless its work budget ran out). */
  converged: boolean;
  /** Number of dynamic-programming steps (points). */
  iterations: number;
  /** Total number of candidate evaluations (segment costs computed). */
  evaluations: number;
  /** Most candidates kept at any step after pruning ('cpop': quadratic pieces). */
  maxCandidates: number;
  /** Mean number of candidates per step. */
  meanCandidates: number;
  /** Number of penalised searches run (1, or more with CROPS). */
  runs: number;
  stoppingRule: string;
}

/** The result of {@link findBreaks}. */
export interface BreaksResult {
  model: BreaksModel;
  /** The penalty used: rule name ('bic', 'mbic', 'manual') and its value on the cost's scale (after any noise factor). */
  penalty: { rule: string; value: number; parametersPerChange: number };
  /** The noise scale used ('mean', 'slope'), and how it was obtained. */
  sigma?: { value: number; source: 'given' | 'estimated' };
  breaks: Break[];
  /** Single far-off values set aside by the robust 'mean' model (empty for the other models). */
  spikes: Spike[];
  /** How the noise was treated by the penalty (Gaussian models). */
  noise?: NoiseTreatment;
  /** What was done about a seasonal pattern. */
  season: SeasonTreatment;
  segments: SegmentSummary[];
  /** Fitted value per clean point: a step function, or the continuous broken line for 'slope'. */
  fitted: Float64Array;
  /** Unpenalised cost of the segmentation (twice the negative log-likelihood up to a constant; RSS/sigma^2 for 'mean' and 'slope'). */
  cost: number;
  /** cost + penalty * number of changes. */
  penalisedCost: number;
  /** The CROPS table in increasing penalty, when `crops` was given. */
  crops?: CropsRow[];
  warnings: Warning[];
  solver: BreaksSolver;
}
