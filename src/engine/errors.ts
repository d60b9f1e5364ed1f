/**
 * The one error type the engine throws. Every message names the offending
 * value and says what to change; fronts translate it (an Excel error value
 * with the message, a CLI exit code with one line).
 */

/** Machine-readable reason for a {@link KnotwiseError}. */
export type ErrorCode =
  /** Two inputs that must align row for row do not (y and x, y and weights). */
  | 'shape-mismatch'
  /** Fewer usable points than the method needs. */
  | 'too-few-points'
  /** All x values are equal, so no curve in x can be fitted. */
  | 'constant-x'
  /** A weight is negative. */
  | 'negative-weight'
  /** An option has a wrong type or is out of its range. */
  | 'bad-option'
  /** A method name that is not registered. */
  | 'unknown-method'
  /** Data unsuitable for a model (e.g. non-integer counts for a Poisson cost). */
  | 'bad-data'
  /** A numerical failure the user can avoid (e.g. a singular system). */
  | 'numerical'
  /** The caller stopped the analysis before it finished. */
  | 'cancelled';

/**
 * A problem with the input or options that the user can fix.
 *
 * @example
 * ```ts
 * throw new KnotwiseError('bad-option', `folds must be an integer from 2 to 50; got ${k}.`);
 * ```
 */
export class KnotwiseError extends Error {
  readonly code: ErrorCode;
  constructor(code: ErrorCode, message: string) {
    super(message);
    this.name = 'KnotwiseError';
    this.code = code;
    Object.setPrototypeOf(this, KnotwiseError.prototype);
  }
}

/** True when `e` is a {@link KnotwiseError} (works across bundles). */
export function isKnotwiseError(e: unknown): e is KnotwiseError {
  return e instanceof KnotwiseError || (typeof e === 'object' && e !== null && (e as { name?: unknown }).name === 'KnotwiseError');
}

/** Formats a number for an error or warning message: short, but exact enough to find the cell. */
export function showNumber(v: number): string {
  if (Number.isNaN(v)) return 'NaN';
  if (!Number.isFinite(v)) return v > 0 ? 'Infinity' : '-Infinity';
  if (Number.isInteger(v) && Math.abs(v) < 1e15) return String(v);
  return Number(v.toPrecision(6)).toString();
}
