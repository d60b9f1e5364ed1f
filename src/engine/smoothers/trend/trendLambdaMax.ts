import { residualDual } from '../../linalg/dualFromResidual';
import { weightedPolynomialFit } from '../../linalg/weightedPolynomialFit';
import { maxAbs } from '../../linalg/maxAbs';

/** The weighted least-squares polynomial of degree k, its dual and lambda_max ({@link polynomialDual}). */
export interface PolynomialDual {
  /** Fitted values of the polynomial. */
  b: Float64Array;
  /** The dual u with D(x, k+1)^T u = W (y - b), length n - k - 1. */
  u: Float64Array;
  /** max |u|. */
  lambdaMax: number;
}

/**
 * The trend-filtering solution at and above lambda_max: the weighted
 * least-squares polynomial of degree k. With r the residual of that polynomial,
 * the dual u solving D(x, k+1)^T u = W r is unique, and the polynomial is optimal
 * exactly when max |u| <= lambda (Tibshirani 2014, section 6; Kim et al. 2009,
 * section 3.1), so lambda_max = max |u|.
 *
 * Unchecked: n >= k + 2.
 */
export function polynomialDual(x: Float64Array, y: Float64Array, w: Float64Array, k: number): PolynomialDual {
  const b = weightedPolynomialFit(x, y, w, k);
  const u = residualDual(x, k + 1, y, w, b).u;
  return { b, u, lambdaMax: maxAbs(u) };
}

/**
 * lambda_max of trend filtering of order k: the smallest penalty at which the
 * solution is the weighted least-squares polynomial of degree k ({@link polynomialDual}).
 *
 * @returns lambda_max in the units of the inputs (>= 0; 0 when y is itself such a polynomial)
 * Unchecked: n >= k + 2.
 */
export function trendLambdaMax(x: Float64Array, y: Float64Array, w: Float64Array, k: number): number {
  return polynomialDual(x, y, w, k).lambdaMax;
}
