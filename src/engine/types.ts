/**
 * Shapes shared by every method. Kept small and stable: the fronts depend on
 * them, the methods fill them.
 */
import type { Warning } from './warnings';
import type { Bend } from './diagnostics/knotBends';

/** How the penalty is chosen when none is given. */
export type SelectRule = 'gcv' | 'cv' | 'sure' | 'bic';

/**
 * Options of a fit. Every field is optional; a method ignores what it does
 * not use and rejects values out of range with a `bad-option` error.
 */
/** What a model assumes of the noise: read its correlation from the data, or take it as independent. */
export const NOISE_ASSUMPTIONS = ['correlated', 'independent'] as const;

/** One of {@link NOISE_ASSUMPTIONS}. */
export type NoiseAssumption = (typeof NOISE_ASSUMPTIONS)[number];

export interface FitOptions {
  /** Registered method name: 'spline' (default), 'trend', ... */
  method?: string;
  /** A fixed penalty lambda (in the units the method documents). Overrides `df` and `select`. */
  penalty?: number;
  /** A target equivalent degrees of freedom. Overrides `select`. */
  df?: number;
  /** Rule to choose the penalty when neither `penalty` nor `df` is given. */
  select?: SelectRule;
  /** Number of cross-validation folds (default 5 for trend filtering, 10 for the spline). */
  folds?: number;
  /** Use the one-standard-error rule with cross-validation: the largest penalty within one SE of the minimum. */
  oneSE?: boolean;
  /** Polynomial order k of trend filtering (0 to 3). */
  order?: number;
  /** Relaxed trend filtering: 0 = plain L1 fit, 1 = unpenalised refit on the knots, between = a mix. */
  relaxed?: number;
  /** Number of penalties on the search grid or curve. */
  gridSize?: number;
  /** Solver tolerance (method-specific meaning, documented by each method). */
  tolerance?: number;
  /** Iteration limit of iterative solvers. */
  maxIterations?: number;
  /**
   * What cross-validation assumes of the noise: 'correlated' (default) estimates its dependence and
   * holds out blocks when it is clear; 'independent' uses ordinary folds.
   */
  noise?: NoiseAssumption;
}

/** One point of a criterion curve: the score at one penalty. */
export interface CriterionPoint {
  penalty: number;
  score: number;
  df: number;
  /** Standard error of the score (cross-validation). */
  se?: number;
  /** Number of knots (adaptive methods). */
  knots?: number;
  /** Whether the iterative solver reached its tolerance at this penalty (iterative methods). */
  converged?: boolean;
}

/** How the penalty was arrived at, with the score that chose it. */
export interface Criterion {
  /** 'gcv', 'cv', 'sure', 'bic', 'df' (target df), or 'fixed' (penalty given). */
  name: string;
  /** The criterion's value at the chosen penalty (NaN for 'fixed'). */
  value: number;
  /** Scores along the searched penalties, in increasing penalty. */
  curve?: CriterionPoint[];
  /** True when the chosen penalty is at an end of the searched range. */
  atEdge?: boolean;
}

/** A knot: where the fitted curve changes form. */
export interface Knot {
  /** x location. */
  x: number;
  /** Clean-point index. */
  index: number;
  /** 0-based input row of that point. */
  row: number;
  /** Size of the change (level jump, slope change, or change in the k-th derivative). */
  change: number;
}

/** What an iterative or direct solver reports. */
export interface SolverStatus {
  converged: boolean;
  iterations: number;
  /** The tolerance asked for. */
  tolerance: number;
  /** The accuracy reached, on the same scale as `tolerance`. */
  achieved: number;
  /** One sentence: what stops the solver. */
  stoppingRule: string;
}

/** The result of one fit, per clean point of the series. */
export interface FitResult {
  method: string;
  /** The options as resolved (defaults filled in). */
  options: FitOptions;
  /** Clean x (sorted), the points `fitted` refers to. */
  x: Float64Array;
  /** Fitted value at each clean point. */
  fitted: Float64Array;
  /** The penalty lambda used. */
  penalty: number;
  /** Equivalent degrees of freedom. */
  df: number;
  /** Residual standard deviation: sqrt(RSS_w / (n - df)). */
  sigma: number;
  criterion: Criterion;
  knots: Knot[];
  /**
   * Adaptive methods: the knots as an analyst reads them, neighbouring knots of one bend
   * merged and each bend's size measured on the unpenalised refit ({@link knotBends}).
   */
  bends?: Bend[];
  /** Pointwise standard error of the fitted value (linear smoothers): sigma * sqrt(h_ii / w_i)-style, as the method documents. */
  se?: Float64Array;
  /** Diagonal of the hat matrix (linear smoothers). */
  leverage?: Float64Array;
  warnings: Warning[];
  solver: SolverStatus;
  /** Method-specific state for evaluation at new x. */
  model?: unknown;
}

/** Values at new x, each flagged when outside the data's range. */
export interface Evaluation {
  x: Float64Array;
  value: Float64Array;
  extrapolated: Uint8Array;
}
