/**
 * What an analysis (a smoother, a changepoint model, a decomposition)
 * provides: its declared options and one function that runs it on a clean
 * series. Register it with {@link registerAnalysis} in `analyses.ts`.
 */
import type { Series } from '../series';
import type { Criterion, Evaluation, FitResult, SolverStatus } from '../types';
import type { Warning } from '../warnings';
import type { BreaksResult } from '../breaks/types';
import type { OptionDeclaration, OptionValue, ResolvedOptions } from './optionDeclaration';
import type { RunContext } from './runContext';

/** What kind of answer an analysis gives; fronts choose their tables by it. */
export type AnalysisFamily = 'smoother' | 'changepoints' | 'decomposition';

/** The part of a result every analysis fills. Per clean point of the series. */
export interface AnalysisCore {
  /** Fitted value per clean point (the smooth, the segment means or line, the trend). */
  fitted: Float64Array;
  warnings: Warning[];
  solver: SolverStatus;
  /** How the penalty was chosen, with its curve, when there is one. */
  criterion?: Criterion;
  /** Smoothers: the full fit (penalty, df, sigma, knots, se, model for evaluation). */
  smooth?: FitResult;
  /** Changepoint models: breaks, segments, penalty, CROPS table. */
  breaks?: BreaksResult;
  /** The automatic choice: every candidate's cross-validation score on the same folds, and why the winner won. */
  comparison?: Comparison;
  /** The automatic choice when it compared no methods (too few or too many points): why, in one sentence; the fit is then the spline's. */
  uncompared?: string;
  /** Decompositions: named components per clean point and whatever else the analysis reports. */
  decomposition?: { components: Record<string, Float64Array>; [more: string]: unknown };
}

/** One candidate of the automatic choice. */
export interface CandidateRow {
  /** Analysis name and the variant's options, e.g. 'trend' with order 1. */
  method: string;
  options: Record<string, OptionValue>;
  /** What shape it fits, in words. */
  label: string;
  penalty: number;
  df: number;
  /** Cross-validation error at its chosen penalty (mean held-out squared error, units of y squared) and its standard error. */
  cv: number;
  se: number;
  /** Milliseconds spent on this candidate (penalty search included). */
  milliseconds: number;
  /** Why a candidate could not be compared (too few points, a refusal), when it could not. */
  skipped?: string;
}

/** The comparison table of the automatic choice. */
export interface Comparison {
  rows: CandidateRow[];
  /** Index of the chosen row. */
  chosen: number;
  /** Index of the row with the lowest cross-validation error. */
  best: number;
  folds: number;
  /** One plain sentence: what was chosen and why. */
  reason: string;
  /**
   * The runner-up: the row with the lowest cross-validation error after the chosen one (none when no other
   * candidate was compared), with its fit as it was compared (same folds, penalty chosen the same way), so a
   * front can draw it beside the winner without fitting it again; with its knot bends, as the winner's.
   */
  runnerUp?: { row: number; fit: FitResult };
}

/** The result of {@link runAnalysis}: plain data (structured-clone-able, so it crosses to and from workers). */
export interface AnalysisResult extends AnalysisCore {
  /** What holds for every result of this kind (codes in STANDING_CAVEATS: ends get revised, a break is not its cause), kept apart from `warnings`, which concern these data. */
  caveats: Warning[];
  /** The analysis's registered name. */
  analysis: string;
  family: AnalysisFamily;
  /** Options as resolved (declared names, defaults filled). */
  options: ResolvedOptions;
  /** The clean series the result refers to; `series.rowOf` maps input rows to points. */
  series: Series;
}

/** One variant of a smoother in the automatic choice (e.g. trend filtering of order 2). */
export interface AutoVariant {
  /** What shape it fits, in plain words (the comparison table's row label). */
  label: string;
  /** The options that make the variant (e.g. { order: 2 }). */
  options: Readonly<Record<string, OptionValue>>;
  /** Rank among fits of equal df: lower is simpler. */
  simplicity: number;
  /**
   * Longest series on which the automatic choice includes it: set where its cross-validation grows
   * faster than the number of points; beyond it the variant is listed as not compared, with why.
   */
  maxPoints?: number;
  /**
   * Rough time of its cross-validation relative to the spline's (default 1): where the candidates
   * run on several workers ({@link autoSplit}), the costliest start first.
   */
  cost?: number;
}

/**
 * One candidate of the automatic choice as computed on its own (on a worker, beside the others):
 * its index in the fixed list of candidates, its comparison row, and its result (null when it could
 * not be compared; the row says why).
 */
export interface CandidateOutcome {
  index: number;
  row: CandidateRow;
  core: AnalysisCore | null;
}

/** One registered analysis. */
export interface AnalysisDefinition {
  /** The name users type (lower case, plain words). */
  name: string;
  /** Earlier names still accepted, with a note. */
  oldNames?: readonly string[];
  family: AnalysisFamily;
  /** What shape it fits, in an analyst's words (pane lists, help). */
  label: string;
  /** One line for help texts: the method's statistical name and reference. */
  summary: string;
  options: readonly OptionDeclaration[];
  /** How rows with equal x are treated at intake. */
  ties: 'merge' | 'keep';
  /** Fewest distinct usable points under these options. */
  minPoints(options: ResolvedOptions): number;
  /** Runs on a clean series with resolved options; reports progress and honours cancellation through `context`. */
  run(series: Series, options: ResolvedOptions, context: RunContext): AnalysisCore;
  /**
   * Smoothers that take part in the automatic choice list their variants here
   * (e.g. one per order), each run with cross-validation on the shared folds.
   */
  autoVariants?: readonly AutoVariant[];
  /** Values of the fit at new x, flagged beyond the data (smoothers). */
  evaluate?(result: AnalysisCore, x: Float64Array): Evaluation;
}
