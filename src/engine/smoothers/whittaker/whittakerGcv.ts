import { checkWhittakerLambda, scaledLambda, whittakerInput } from './whittakerInput';
import { whittakerSolve } from './whittakerSolve';

/** One GCV evaluation. */
export interface WhittakerScore {
  lambda: number;
  score: number;
  df: number;
  rss: number;
}

/**
 * The generalised cross-validation score of Whittaker-Henderson graduation as a
 * function of lambda (P. Craven and G. Wahba, "Smoothing noisy data with spline
 * functions", Numer. Math. 31 (1979) 377-403):
 *
 *   GCV(lambda) = n * sum_i w_i (y_i - z_i)^2 / (n - tr H(lambda))^2 ,
 *
 * with H the hat matrix of {@link whittakerFit}; its trace is exact (band of the
 * inverse), so each evaluation costs O(n d^2). Input is checked once; the returned
 * function only checks lambda. Smaller is better; units of the score are those of
 * w y^2.
 *
 * @param x - strictly increasing positions
 * @param y - values
 * @param w - weights >= 0 or null
 * @param order - order of differences, 1..6
 * @returns lambda -> {lambda, score, df, rss}
 * @example
 * ```ts
 * const gcv = whittakerGcv(x, y, null, 2);
 * const best = [1, 10, 100, 1e3, 1e4].map(gcv).sort((a, b) => a.score - b.score)[0];
 * ```
 */
export function whittakerGcv(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number> | null | undefined, order = 2): (lambda: number) => WhittakerScore {
  const inp = whittakerInput(x, y, w, order);
  // order 2: one set of arrays for every lambda tried (the search reads only rss and df)
  const n0 = inp.n;
  const work = order === 2 ? { l: new Float64Array(3 * n0), z: new Float64Array(n0), lev: new Float64Array(n0) } : undefined;
  return (lambda: number): WhittakerScore => {
    checkWhittakerLambda(lambda);
    const sol = whittakerSolve(inp, scaledLambda(inp, lambda), true, work, false);
    let rss = 0;
    for (let i = 0; i < inp.n; i++) { const e = inp.y[i] - sol.fitted[i]; rss += inp.w[i] * inp.wScale * e * e; }
    const df = sol.df as number;
    const n = inp.n;
    return { lambda, score: (n * rss) / ((n - df) * (n - df)), df, rss };
  };
}
