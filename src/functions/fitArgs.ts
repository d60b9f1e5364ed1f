/**
 * The argument tail shared by the fitting functions, translated into engine
 * options. Values are passed through as typed; the engine validates them and
 * its messages name the offending value.
 */
import { Cell, FitCache, FitOptions, cacheKey, fitCells, SeriesFit } from '../engine';
import { Matrix, Orientation, omitted, optionalNumber, optionalText, readColumn } from './cells';

/** Raw worksheet arguments of a fitting function after y and x. */
export interface FitArgs {
  method?: unknown;
  order?: unknown;
  rule?: unknown;
  penalty?: unknown;
  df?: unknown;
  weights?: unknown;
  folds?: unknown;
  relaxed?: unknown;
}

/** Translates the rule text: "cv-1se" is cross-validation with the one-standard-error rule. */
export function toOptions(a: FitArgs): FitOptions {
  const o: FitOptions = {};
  const method = optionalText(a.method);
  if (method !== undefined) o.method = method.trim().toLowerCase();
  const order = optionalNumber(a.order);
  if (order !== undefined) o.order = order;
  const rule = optionalText(a.rule);
  if (rule !== undefined) {
    const r = rule.trim().toLowerCase();
    if (r === 'cv-1se') { o.select = 'cv'; o.oneSE = true; } else o.select = r as FitOptions['select'];
  }
  const penalty = optionalNumber(a.penalty);
  if (penalty !== undefined) o.penalty = penalty;
  const df = optionalNumber(a.df);
  if (df !== undefined) o.df = df;
  const folds = optionalNumber(a.folds);
  if (folds !== undefined) o.folds = folds;
  const relaxed = optionalNumber(a.relaxed);
  if (relaxed !== undefined) o.relaxed = relaxed;
  return o;
}

const cache = new FitCache<SeriesFit & { orientation: Orientation }>(16);

/** Fits (or reuses the cached fit of) y, x and the argument tail. */
export function fitFromCells(y: Matrix, x: unknown, args: FitArgs): SeriesFit & { orientation: Orientation } {
  const yc = readColumn(y, 'y');
  const xc: Cell[] | null = omitted(x) ? null : readColumn(x as Matrix, 'x').cells;
  const wc: Cell[] | null = omitted(args.weights) ? null : readColumn(args.weights as Matrix, 'weights').cells;
  const options = toOptions(args);
  const key = cacheKey(['fit', yc.cells, xc, wc, options]);
  return cache.get(key, () => ({ ...fitCells(yc.cells, xc, wc, options), orientation: yc.orientation }));
}

/** Empties the shared fit cache (tests, and the pane after edits). */
export function clearFitCache(): void {
  cache.clear();
}

/** Number of fits held in the cache. */
export function fitCacheSize(): number {
  return cache.size;
}
