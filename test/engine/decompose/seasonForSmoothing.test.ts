/**
 * Smoothers take a strong season found from the dates out before fitting, so
 * a yearly swing is not taken for trend: an invented weekly series of three
 * years (serial dates from 2023-01-02), a straight trend with one slope change
 * at week 90, a yearly swing of amplitude 20 and noise sd 3.
 */
import { runAnalysis } from '../../../src/engine';
import { normalStream } from '../../helpers/random';

const z = normalStream(17);
const weeks = Array.from({ length: 156 }, (_, i) => 44928 + 7 * i);
const y = weeks.map((d, i) => 400 + 0.5 * i + 2 * Math.max(0, i - 90) + 20 * Math.sin((2 * Math.PI * (d - 44928)) / 365.2425) + 3 * z());

describe('season for smoothing', () => {
  test('trend filtering of a seasonal weekly series fits the series without its season, and says so', () => {
    const r = runAnalysis({ analysis: 'trend', y, x: weeks });
    expect(r.warnings.some((w) => /yearly season .*the trend was fitted to the series without it/.test(w.message))).toBe(true);
    const top = r.smooth!.bends!.find((b) => b.rank === 1)!;
    expect(Math.abs((top.x - 44928) / 7 - 90)).toBeLessThanOrEqual(4);
    const asGiven = runAnalysis({ analysis: 'trend', y, x: weeks, options: { season: 'none' } });
    expect(r.smooth!.bends!.length).toBeLessThan(asGiven.smooth!.bends!.length);
  });

  test('a series without dates is smoothed as given, with no note', () => {
    const r = runAnalysis({ analysis: 'spline', y });
    expect(r.warnings.some((w) => /season/.test(w.message))).toBe(false);
    expect(Array.from(r.series.y)).toEqual(y);
  });
});
