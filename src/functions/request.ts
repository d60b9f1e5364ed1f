/**
 * Worksheet arguments into one engine request, and the request's answer
 * through the shared {@link compute}. Values are passed as typed: the engine
 * validates them once and its messages name what to fix.
 */
import { AnalysisDefinition, AnalysisFamily, AnalysisResult, DEFAULT_SMOOTHER, defaultSmoother, findAnalysis } from '../engine';
import { Matrix, Orientation, optionalText, readInputs, scalar } from './cells';
import { Cancel, compute } from './compute';
import { parseSettings } from './settings';

/** What a worksheet function was given after y: positions, method (or model), settings and weights. */
export interface SheetArgs {
  x?: unknown;
  method?: unknown;
  settings?: unknown;
  weights?: unknown;
  /** Extra options a function sets itself (e.g. the penalty range of the penalty scan). */
  extra?: Record<string, unknown>;
}

/**
 * Builds the request (y, x, weights as cells; the method's settings) and
 * returns its result with the orientation of y (a row in, a row out).
 */
export async function analyseCells(y: Matrix, a: SheetArgs, family: AnalysisFamily | undefined, defaultMethod: string, cancel?: Cancel): Promise<{ result: AnalysisResult; orientation: Orientation }> {
  const d = readInputs(y, a.x, a.weights);
  const named = optionalText(a.method)?.trim() || undefined;
  const settings = scalar(a.settings);
  const parsed = (def: AnalysisDefinition) => ({ ...parseSettings(settings, def.options), ...(a.extra ?? {}) });
  // no method named: the engine's default smoother for these settings (the text is read per method);
  // the request then names none either, so the engine makes the same choice and says so
  const byDefault = !named && defaultMethod === DEFAULT_SMOOTHER;
  const method = named ?? (byDefault ? defaultSmoother(parsed).name : defaultMethod);
  const { def } = findAnalysis(method, family);
  const options = parsed(def);
  const result = await compute({ ...(byDefault ? {} : { analysis: method }), family, y: d.y, x: d.x, w: d.w, options }, cancel);
  return { result, orientation: d.orientation };
}
