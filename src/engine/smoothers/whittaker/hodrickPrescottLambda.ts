import { KnotwiseError, showNumber } from '../../errors';

/** Data frequencies with a conventional Hodrick-Prescott lambda. */
export type DataFrequency = 'annual' | 'quarterly' | 'monthly';

const BASE: Record<DataFrequency, number> = { annual: 6.25, quarterly: 1600, monthly: 129600 };

/**
 * The conventional Hodrick-Prescott penalty for a data frequency: 1600 for quarterly
 * data (Hodrick & Prescott 1997), 6.25 for annual and 129600 for monthly data
 * (M. O. Ravn and H. Uhlig, "On adjusting the Hodrick-Prescott filter for the
 * frequency of observations", Rev. Econ. Statist. 84 (2002) 371-376: lambda scales
 * with the fourth power of the observation frequency, 1600 / 4^4 and 1600 * 3^4).
 *
 * These values refer to unit spacing: one step of x per period. With x in other
 * units (say days, for monthly data) pass the length of one period in those units
 * as `period`: the divided-difference penalty of order 2 then needs
 * lambda = base * period^2, which gives the same trend on evenly spaced data and
 * the same penalty per period on unevenly spaced data.
 *
 * @param frequency - 'annual', 'quarterly' or 'monthly'
 * @param period - length of one period in the units of x (default 1), > 0
 * @example
 * ```ts
 * hodrickPrescottLambda('quarterly'); // 1600
 * hodrickPrescottLambda('monthly', 30.4375); // 129600 * 30.4375^2, for x in days
 * ```
 */
export function hodrickPrescottLambda(frequency: DataFrequency, period = 1): number {
  const base = Object.prototype.hasOwnProperty.call(BASE, frequency) ? BASE[frequency] : undefined;
  if (base === undefined) throw new KnotwiseError('bad-option', `frequency must be one of "annual", "quarterly", "monthly"; got ${JSON.stringify(frequency)}.`);
  if (typeof period !== 'number' || !Number.isFinite(period) || period <= 0) {
    throw new KnotwiseError('bad-option', `period must be a finite number > 0 (the length of one period in the units of x); got ${typeof period === 'number' ? showNumber(period) : String(period)}.`);
  }
  return base * period * period;
}
