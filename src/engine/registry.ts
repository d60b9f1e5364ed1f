/**
 * The method registry. A method is added by writing one file that exports a
 * {@link MethodDefinition} and registering it in `methods.ts`; the fronts, the
 * cache and the selection code do not change.
 */
import { KnotwiseError } from './errors';
import type { Series } from './series';
import type { Evaluation, FitOptions, FitResult } from './types';

/** What a smoothing method provides. */
export interface MethodDefinition {
  /** The name users type (lower case). */
  name: string;
  /** One line for help texts. */
  summary: string;
  /** Fewest distinct points the method needs under these options. */
  minPoints(options: FitOptions): number;
  /** Fits a clean series. Validates its own options. */
  fit(series: Series, options: FitOptions): FitResult;
  /** Evaluates a fit at new x (sorted or not); flags extrapolation. */
  evaluate(result: FitResult, x: Float64Array): Evaluation;
}

const methods = new Map<string, MethodDefinition>();

/** Registers a method under its name (replacing any earlier one). */
export function registerMethod(def: MethodDefinition): void {
  methods.set(def.name, def);
}

/** Looks a method up by name, case-insensitively. */
export function getMethod(name: string): MethodDefinition {
  const def = methods.get(name.trim().toLowerCase());
  if (!def) {
    throw new KnotwiseError('unknown-method', `unknown method "${name}"; use one of: ${[...methods.keys()].join(', ')}.`);
  }
  return def;
}

/** Names of the registered methods. */
export function methodNames(): string[] {
  return [...methods.keys()];
}
