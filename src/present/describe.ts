/**
 * Penalties, rules and solver outcomes in words an analyst can pass on:
 * "smoothness 1.74e13, about 21 degrees of freedom" rather than
 * "lambda 17401000000000"; "solved exactly" rather than "converged (1 steps)".
 */
import type { BreaksResult, FitResult } from '../engine';
import { formatNumber } from './formatNumber';

const RULES: Record<string, string> = {
  gcv: 'generalised cross-validation',
  cv: 'cross-validation',
  sure: "Stein's unbiased risk estimate (SURE)",
  bic: 'BIC',
  mbic: 'modified BIC',
  df: 'a target degrees of freedom',
  fixed: 'a fixed value',
  manual: 'a fixed value',
};

/** The name of a penalty rule in words ("generalised cross-validation"); unknown names are returned as given. */
export function ruleInWords(name: string, options?: { folds?: number; oneSE?: boolean }): string {
  let s = RULES[name] ?? name;
  if (name === 'cv' && options?.folds) s = `${options.folds}-fold ${s}`;
  if (name === 'cv' && options?.oneSE) s += ', one-standard-error rule';
  return s;
}

/** A smoother's penalty with what it means: "smoothness 1.74e13, about 21 degrees of freedom". */
export function smoothPenaltyInWords(r: Pick<FitResult, 'penalty' | 'df' | 'method'>): string {
  const word = r.method === 'spline' ? 'smoothness' : 'penalty';
  const df = r.df >= 10 ? Math.round(r.df) : Number(r.df.toPrecision(2));
  return `${word} ${formatNumber(r.penalty)}, about ${df} degrees of freedom`;
}

/** A segmentation's penalty with what it means: each change must lower the cost by at least that much. */
export function breaksPenaltyInWords(r: Pick<BreaksResult, 'penalty'>): string {
  return `${formatNumber(r.penalty.value)} per change (${ruleInWords(r.penalty.rule)}): a change is kept only when it lowers the cost by more than this`;
}

/** A smoother's solver status in words. */
export function fitSolverInWords(r: Pick<FitResult, 'solver' | 'method'>): string {
  const s = r.solver;
  if (!s.converged) {
    return `stopped early after ${s.iterations} steps: accuracy ${formatNumber(s.achieved, 2)} where ${formatNumber(s.tolerance, 2)} was asked; treat the fit as approximate`;
  }
  if (r.method === 'spline') return 'solved exactly (direct solve)';
  if (s.achieved === 0 || s.tolerance === 0) return 'solved exactly';
  return `solved to accuracy ${formatNumber(s.achieved, 2)} (asked ${formatNumber(s.tolerance, 2)})`;
}

/** A segmentation's search status in words. */
export function breaksSolverInWords(r: Pick<BreaksResult, 'solver'>): string {
  const s = r.solver;
  const name = s.algorithm === 'pelt' ? 'PELT' : s.algorithm === 'cpop' ? 'CPOP' : s.algorithm === 'op' ? 'optimal partitioning' : s.algorithm;
  if (s.converged) return `solved exactly (${name}: the best segmentation for this penalty)`;
  return `stopped early: ${name} reached its work budget; the result is the best found, not proven the best`;
}
