import { KnotwiseError, showNumber } from '../../errors';
import { loessInput, loessOptions, loessRun, type LoessFit } from './loessFit';

/** Spans tried by default when the span is chosen (AICc, GCV or cross-validation). */
export const LOESS_SEARCH_POINTS = 30;

/** `count` spans log-spaced from `lo` to 1: the grid every span search uses. Unchecked. */
export function spanGrid(lo: number, count: number): number[] {
  return Array.from({ length: count }, (_, i) => Math.exp(Math.log(lo) + (i * (0 - Math.log(lo))) / (count - 1)));
}

/** One row of the span search. */
export interface SpanScore { span: number; neighbours: number; df: number; score: number }

/** Result of {@link loessSelectSpan}. */
export interface SpanSelection {
  span: number;
  fit: LoessFit;
  criterion: 'aicc' | 'gcv';
  /** Every span tried, in increasing order, with its df and score. */
  table: SpanScore[];
  /** True when the best span is the smallest or largest tried (a wider search might do better). */
  atEdge: boolean;
}

/**
 * Chooses the LOESS span by AICc (Hurvich, Simonoff & Tsai 1998) or GCV (Craven & Wahba 1979):
 *
 *   AICc(span) = log(rss / n) + 1 + 2 (tr L + 1) / (n - tr L - 2),
 *   GCV(span)  = n rss / (n - tr L)^2,
 *
 * with tr L the exact trace of the smoother matrix of {@link loessFit}. The criterion is a
 * step function of the span (the neighbourhood holds a whole number of points), so it is
 * evaluated on a grid: by default 30 spans spaced evenly in log from
 * max((2 degree + 4) / n, 1e-3) to 1, or the spans given. Smaller scores are better.
 *
 * @param x - sorted positions
 * @param y - values
 * @param w - weights or null
 * @param options - degree, robustnessIterations, delta (as loessFit), criterion ('aicc' default or 'gcv'), spans
 * @example
 * ```ts
 * const s = loessSelectSpan(x, y, null, { degree: 2, criterion: 'aicc' });
 * s.span; s.fit.fitted; s.table;
 * ```
 */
export function loessSelectSpan(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number> | null | undefined,
  options: { degree?: 0 | 1 | 2; robustnessIterations?: number; delta?: number; criterion?: 'aicc' | 'gcv'; spans?: number[]; count?: number } = {}): SpanSelection {
  const inp = loessInput(x, y, w);
  const n = inp.n;
  const criterion = options.criterion ?? 'aicc';
  if (criterion !== 'aicc' && criterion !== 'gcv') throw new KnotwiseError('bad-option', `criterion must be "aicc" or "gcv"; got ${JSON.stringify(criterion)}.`);
  const degree = options.degree ?? 1;
  let spans = options.spans;
  if (spans === undefined) {
    spans = spanGrid(Math.min(1, Math.max((2 * degree + 4) / n, 1e-3)), options.count ?? LOESS_SEARCH_POINTS);
  } else if (!Array.isArray(spans) || spans.length === 0) {
    throw new KnotwiseError('bad-option', 'spans must be a non-empty list of numbers in (0, 1].');
  }
  const sorted = [...spans].sort((a, b) => a - b);
  const table: SpanScore[] = [];
  let best = -1, bestFit: LoessFit | null = null;
  for (const s of sorted) {
    const o = loessOptions({ span: s, degree, robustnessIterations: options.robustnessIterations, delta: options.delta }, n, inp.x);
    if (table.length && table[table.length - 1].neighbours === o.q) continue; // same neighbourhood size, same fit
    const f = loessRun(inp, o.span, o.degree, o.iterations, o.delta);
    const score = criterion === 'aicc' ? f.aicc : f.gcv;
    table.push({ span: s, neighbours: o.q, df: f.df, score });
    if (best < 0 || score < table[best].score) { best = table.length - 1; bestFit = f; }
  }
  if (!bestFit || !Number.isFinite(table[best].score)) {
    throw new KnotwiseError('numerical', `no span gave a finite ${criterion} score (smallest span tried ${showNumber(sorted[0])}); try larger spans.`);
  }
  return { span: table[best].span, fit: bestFit, criterion, table, atEdge: best === 0 || best === table.length - 1 };
}
