/**
 * Warnings: a result that is correct but needs the analyst's attention.
 * One code per kind; the pane, the cells and the CLI print the same message.
 */

/** The kinds of warning. */
export type WarningCode =
  /** Input rows left out (blank, text, boolean, error or non-finite cells). */
  | 'dropped-cells'
  /** Rows sharing an x value were merged into one weighted point. */
  | 'ties-merged'
  /** Rows were not in increasing x order; they were sorted internally and results returned in input order. */
  | 'unsorted-x'
  /** A value is evaluated outside the range of the data. */
  | 'extrapolation'
  /** Fitted values near the ends of the data rest on one side only and are revised as data arrives. */
  | 'boundary'
  /** The chosen penalty sits at the edge of the searched range. */
  | 'penalty-at-edge'
  /** Few points per degree of freedom: the fit is close to interpolating. */
  | 'few-points-per-df'
  /** Residuals look autocorrelated: cross-validation tends to under-smooth such data. */
  | 'autocorrelation'
  /** A requested target could not be met exactly (e.g. df outside the attainable range). */
  | 'target-clamped'
  /** An iterative solver stopped at its iteration limit before reaching its tolerance. */
  | 'not-converged'
  /** A change found statistically is not proof of its cause. */
  | 'break-cause'
  /** Anything else worth a note, with its own message. */
  | 'note';

/** One warning attached to a result. `rows` are 0-based input row positions, when the warning concerns particular rows. */
export interface Warning {
  code: WarningCode;
  message: string;
  rows?: number[];
}

/**
 * Codes that hold for every result of their kind, whatever the data: fitted values
 * near the ends get revised and a trend is not a forecast ('boundary'); a break is
 * not proof of its cause ('break-cause'). The analysis pipeline reports them apart
 * from the warnings, as `caveats`, so that a warning always says something about
 * these data and stays quiet when nothing is wrong.
 */
export const STANDING_CAVEATS: ReadonlySet<WarningCode> = new Set<WarningCode>(['boundary', 'break-cause']);

/** Builds a warning. */
export function warning(code: WarningCode, message: string, rows?: number[]): Warning {
  return rows && rows.length ? { code, message, rows } : { code, message };
}

/** Lists up to `max` 1-based row numbers for a message, with a count of the rest. */
export function listRows(rows: readonly number[], max = 5): string {
  const shown = rows.slice(0, max).map((r) => String(r + 1));
  const rest = rows.length - shown.length;
  return rest > 0 ? `${shown.join(', ')} and ${rest} more` : shown.join(', ');
}
