import { smooth, penalty, summary, knots, evaluateAt } from '../../src/functions/smoothing';
import { clearFitCache, fitCacheSize } from '../../src/functions/fitArgs';
import { fitCells } from '../../src/engine';

const col = (a: unknown[]) => a.map((v) => [v]);

// A small invented series with a blank, a text cell and unsorted x.
const xs = [5, 1, 3, 2, 4, 6, 8, 7, 9, 10, 11, 12];
const ys: unknown[] = [14, 10, '', 11, 13, 15, 'n/a', 18, 21, 20, 24, 25];

describe('SMOOTH', () => {
  beforeEach(() => clearFitCache());

  test('returns one value per input row in the original order, empty where a row was dropped', async () => {
    const out = await smooth(col(ys), col(xs), 'spline', undefined, undefined, undefined, 4);
    expect(out).toHaveLength(ys.length);
    expect(out[2][0]).toBe('');
    expect(out[6][0]).toBe('');
    const { series, result } = fitCells(ys as any, xs, null, { method: 'spline', df: 4 });
    for (let r = 0; r < ys.length; r++) {
      const k = series.rowOf[r];
      if (k >= 0) expect(out[r][0]).toBeCloseTo(result.fitted[k], 12);
    }
  });

  test('a row of values gives a row of results', async () => {
    const out = await smooth([[1, 3, 2, 5, 4, 6, 8]], undefined, 'spline', undefined, undefined, 1);
    expect(out).toHaveLength(1);
    expect(out[0]).toHaveLength(7);
  });

  test('bad options come back as an error carrying the engine message', async () => {
    await expect(smooth(col(ys), col(xs), 'spline', undefined, undefined, -3)).rejects.toThrow(/penalty must be a finite number >= 0; got -3/);
    await expect(smooth(col(ys), col(xs), 'wavy')).rejects.toThrow(/unknown method "wavy"/);
    await expect(smooth(col(ys), col([1, 2]))).rejects.toThrow(/x has 2 rows but y has 12/);
  });

  test('output "se" and "residual" are aligned like the fitted values', async () => {
    const se = await smooth(col(ys), col(xs), 'spline', undefined, undefined, undefined, 4, undefined, undefined, undefined, 'se');
    const res = await smooth(col(ys), col(xs), 'spline', undefined, undefined, undefined, 4, undefined, undefined, undefined, 'residual');
    expect(se[2][0]).toBe('');
    expect(typeof se[0][0]).toBe('number');
    expect(se[0][0]).toBeGreaterThan(0);
    const fit = await smooth(col(ys), col(xs), 'spline', undefined, undefined, undefined, 4);
    expect((res[0][0] as number) + (fit[0][0] as number)).toBeCloseTo(14, 12);
  });
});

describe('settings in the rule argument', () => {
  test('"df=8" equals the df argument, and "cv; folds=5" sets both', async () => {
    const a = await smooth(col(ys), col(xs), 'spline', undefined, 'df=4');
    const b = await smooth(col(ys), col(xs), 'spline', undefined, undefined, undefined, 4);
    expect(a).toEqual(b);
    const s = await summary(col(ys), col(xs), 'spline', undefined, 'cv; folds=5');
    expect(s.find((r) => r[0] === 'criterion')?.[1]).toBe('cv');
  });
  test('an unknown setting is refused with the allowed names', async () => {
    await expect(smooth(col(ys), col(xs), 'spline', undefined, 'smoothness=3')).rejects.toThrow(/unknown setting "smoothness" in "smoothness=3"; use rule, df, penalty, folds, relaxed or order/);
  });
  test('a positional argument wins over the same setting', async () => {
    const a = await smooth(col(ys), col(xs), 'spline', undefined, 'df=4', undefined, 6);
    const b = await smooth(col(ys), col(xs), 'spline', undefined, undefined, undefined, 6);
    expect(a).toEqual(b);
  });
});

describe('the fit cache', () => {
  test('several functions on the same range and options fit once', async () => {
    clearFitCache();
    await smooth(col(ys), col(xs), 'spline');
    await penalty(col(ys), col(xs), 'spline');
    await summary(col(ys), col(xs), 'spline');
    expect(fitCacheSize()).toBe(1);
    await smooth(col(ys), col(xs), 'spline', undefined, undefined, undefined, 5);
    expect(fitCacheSize()).toBe(2);
  });
});

describe('PENALTY and SUMMARY', () => {
  test('PENALTY returns the chosen lambda, or the criterion table with a header', async () => {
    const one = await penalty(col(ys), col(xs));
    const { result } = fitCells(ys as any, xs, null, {});
    expect(one[0][0]).toBeCloseTo(result.penalty, 12);
    const table = await penalty(col(ys), col(xs), undefined, undefined, undefined, undefined, undefined, undefined, undefined, undefined, true);
    expect(table[0]).toEqual(['penalty', 'score (gcv)', 'df', 'se', 'knots', 'converged']);
    expect(table.length).toBe(result.criterion.curve!.length + 1);
  });

  test('SUMMARY reports counts of used, dropped and merged rows and every warning', async () => {
    const t = await summary(col(ys), col(xs));
    const get = (k: string) => t.find((r) => r[0] === k)?.[1];
    expect(get('n used')).toBe(10);
    expect(get('n dropped')).toBe(2);
    expect(get('ties merged')).toBe(0);
    const nWarn = get('warnings') as number;
    expect(t.filter((r) => String(r[0]).startsWith('warning ')).length).toBe(nWarn);
    expect(t.some((r) => String(r[0]).includes('dropped-cells'))).toBe(true);
  });
});

describe('KNOTS and EVALUATE', () => {
  test('KNOTS has a header and no rows for the spline, which has no data-chosen knots', async () => {
    expect(await knots(col(ys), col(xs), 'spline')).toEqual([['x', 'row', 'change']]);
  });

  test('EVALUATE flags positions outside the data', async () => {
    const out = await evaluateAt(col(ys), col([0, 6.5, 13, 'text']), col(xs), 'spline', undefined, undefined, undefined, 4);
    expect(out.map((r) => r[1])).toEqual([true, false, true, '']);
    expect(out[3][0]).toBe('');
  });
});
