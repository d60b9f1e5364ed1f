/**
 * KNOTWISE.DECOMPOSE: a series taken apart into trend, season, spikes and the
 * rest, one row per input row, with the seasonally adjusted series beside.
 */
import { toRows } from '../engine';
import { cellNumber } from './cells';
import { guardedAsync } from './excelErrors';
import { analyseCells } from './request';

const COMPONENTS = ['trend', 'season', 'spikes', 'remainder', 'adjusted'] as const;

/**
 * Takes a series apart: trend (knots chosen by the data), seasonal pattern (found from dates), one-off spikes, and the remainder; plus the seasonally adjusted series. The trend describes the past; it is not a forecast.
 * @customfunction DECOMPOSE
 * @param y Values: one column (or one row). Blank, text, TRUE/FALSE and error cells are left out; their rows stay empty.
 * @param [x] Positions of the values: dates (the season is then found from them) or numbers. Omitted: 1, 2, 3, ...
 * @param [settings] Settings as text, e.g. "period=12", "season=off", "method=stl" or "order=0; spikes=false"; KNOTWISE.OPTIONS("decompose") lists them.
 * @param [weights] Positive weights, same size as y.
 * @param invocation Excel's handle to cancel the call.
 * @returns A header row (trend, season, spikes, remainder, adjusted), then one row per row of y; y = trend + season + spikes + remainder.
 * @cancelable
 */
export async function decompose(y: any[][], x?: any[][], settings?: any, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return guardedAsync(async () => {
    const { result } = await analyseCells(y, { x, method: 'decompose', settings, weights }, 'decomposition', 'decompose', invocation);
    const c = result.decomposition!.components;
    const cols = COMPONENTS.map((name) => toRows(result.series, c[name], '' as const));
    return [[...COMPONENTS], ...cols[0].map((_, r) => cols.map((col) => (typeof col[r] === 'number' ? cellNumber(col[r] as number) : '')))];
  });
}
