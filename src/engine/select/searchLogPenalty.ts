/**
 * Minimises a criterion over log(lambda): a coarse grid to find the basin,
 * then Brent's method on the bracket around the best grid point.
 *
 * The grid guards against the local minima criteria such as GCV can have
 * (common practice); Brent then pins the minimum to `tol` in log10(lambda).
 * The result says whether the minimum sits at an end of the searched range,
 * in which case a wider range might give a better score.
 */
import { brentMinimize } from './brentMinimize';
import type { CriterionPoint } from '../types';

export interface PenaltyScore {
  score: number;
  df: number;
  se?: number;
}

export interface LogPenaltySearch {
  penalty: number;
  score: number;
  /** Grid points and refinement steps, sorted by penalty. */
  curve: CriterionPoint[];
  atEdge: boolean;
  iterations: number;
  converged: boolean;
  /** Achieved bracket width in log10(lambda). */
  bracket: number;
}

/**
 * @param evaluate - criterion at lambda (smaller is better)
 * @param lo - smallest lambda searched (> 0)
 * @param hi - largest lambda searched
 * @param gridSize - number of log-spaced grid points (>= 3)
 * @param tol - tolerance in log10(lambda) of the refined minimum
 */
export function searchLogPenalty(evaluate: (lambda: number) => PenaltyScore, lo: number, hi: number, gridSize = 25, tol = 1e-3): LogPenaltySearch {
  const a = Math.log10(lo), b = Math.log10(hi);
  const seen = new Map<number, CriterionPoint>();
  const at = (u: number): number => {
    const lambda = Math.pow(10, u);
    const hit = seen.get(u);
    if (hit) return hit.score;
    const s = evaluate(lambda);
    const score = Number.isFinite(s.score) ? s.score : Infinity;
    seen.set(u, { penalty: lambda, score, df: s.df, ...(s.se !== undefined ? { se: s.se } : {}) });
    return score;
  };
  const grid: number[] = [];
  for (let i = 0; i < gridSize; i++) grid.push(a + ((b - a) * i) / (gridSize - 1));
  let best = 0;
  const scores = grid.map((u) => at(u));
  for (let i = 1; i < gridSize; i++) if (scores[i] < scores[best]) best = i;
  let penalty = Math.pow(10, grid[best]);
  let score = scores[best];
  let iterations = gridSize;
  let converged = true;
  let bracket = (b - a) / (gridSize - 1);
  const atEdge = best === 0 || best === gridSize - 1;
  if (!atEdge) {
    const r = brentMinimize(at, grid[best - 1], grid[best + 1], tol / Math.max(1, Math.abs(grid[best])), 60);
    iterations += r.iterations;
    converged = r.converged;
    if (r.fx <= score) { penalty = Math.pow(10, r.x); score = r.fx; }
    bracket = tol;
  }
  const curve = [...seen.values()].sort((p, q) => p.penalty - q.penalty);
  return { penalty, score, curve, atEdge, iterations, converged, bracket };
}
