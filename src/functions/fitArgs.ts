/**
 * The argument tail shared by the fitting functions, translated into engine
 * options. Values are passed through as typed; the engine validates them and
 * its messages name the offending value.
 */
import { FitOptions, KnotwiseError, numberFromText, ruleOptions, SeriesFit } from '../engine';
import { pageRuntime } from '../runtime/browser/pageRuntime';
import { CancelableCall, cancelableCompute } from './async';
import { Matrix, Orientation, optionalNumber, optionalText, readInputs } from './cells';

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


/**
 * The rule argument: a rule name ("gcv", "cv", "cv-1se", "sure", "bic"), or
 * settings separated by semicolons, e.g. "cv; folds=10" or "df=8", so the
 * optional arguments need not be counted out with empty commas. A later
 * positional argument, when given, wins.
 */
function settings(text: string): [string, string][] {
  return text.split(';').map((p) => p.trim()).filter((p) => p !== '').map((p) => {
    const eq = p.indexOf('=');
    return eq < 0 ? ['rule', p.toLowerCase()] : [p.slice(0, eq).trim().toLowerCase(), p.slice(eq + 1).trim().toLowerCase()];
  });
}

/** Translates the worksheet arguments into engine options; the engine validates the values. */
export function toOptions(a: FitArgs): FitOptions {
  const o: FitOptions = {};
  const method = optionalText(a.method);
  if (method !== undefined) o.method = method.trim().toLowerCase();
  const rule = optionalText(a.rule);
  if (rule !== undefined) {
    for (const [key, value] of settings(rule)) {
      if (key === 'rule') Object.assign(o, ruleOptions(value));
      else if (key === 'df' || key === 'penalty' || key === 'folds' || key === 'relaxed' || key === 'order') (o as Record<string, unknown>)[key] = numberFromText(value) ?? value;
      else throw new KnotwiseError('bad-option', `unknown setting "${key}" in "${rule}"; use rule, df, penalty, folds, relaxed or order, e.g. "cv; folds=10" or "df=8".`);
    }
  }
  const order = optionalNumber(a.order);
  if (order !== undefined) o.order = order;
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

/** Fits (or reuses the shared cached fit of) y, x and the argument tail, off the page's thread; `invocation` lets Excel cancel it. */
export async function fitFromCells(y: Matrix, x: unknown, args: FitArgs, invocation?: CancelableCall): Promise<SeriesFit & { orientation: Orientation }> {
  const d = readInputs(y, x, args.weights);
  const { method, ...options } = toOptions(args);
  const out = await cancelableCompute(invocation, { analysis: method ?? 'spline', y: d.y, x: d.x, w: d.w, options: options as Record<string, unknown> });
  if (out.kind !== 'fit') throw new Error(`expected a fit from "${method}", got ${out.kind}.`);
  return { series: out.series, result: out.result, orientation: d.orientation };
}

/** Empties the shared cache of finished results (tests, and the pane after edits). */
export function clearFitCache(): void {
  pageRuntime().client.clear();
}

/** Number of finished results held in the shared cache. */
export function fitCacheSize(): number {
  return pageRuntime().client.size;
}
