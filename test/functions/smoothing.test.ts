import { smooth, penalty, summary, knots, evaluateAt } from '../../src/functions/smoothing';
import { breaks, segments, breakScan } from '../../src/functions/breaks';
import { options } from '../../src/functions/options';
import { clearComputeCache, computeCacheSize, compute } from '../../src/functions/compute';
import { fitCells, breaksFromCells } from '../../src/engine';

const col = (a: unknown[]) => a.map((v) => [v]);

// A small invented series with a blank, a text cell and unsorted x.
const xs = [5, 1, 3, 2, 4, 6, 8, 7, 9, 10, 11, 12];
const ys: unknown[] = [14, 10, '', 11, 13, 15, 'n/a', 18, 21, 20, 24, 25];

describe('SMOOTH', () => {
  beforeEach(() => clearComputeCache());

  test('SMOOTH returns one value per input row in the original order, empty where a row was dropped', async () => {
    const out = await smooth(col(ys), col(xs), 'spline', 'df=4');
    expect(out).toHaveLength(ys.length);
    expect(out[2][0]).toBe('');
    expect(out[6][0]).toBe('');
    const { series, result } = fitCells(ys as any, xs, null, { method: 'spline', df: 4 });
    for (let r = 0; r < ys.length; r++) {
      const k = series.rowOf[r];
      if (k >= 0) expect(out[r][0]).toBeCloseTo(result.fitted[k], 12);
    }
  });

  test('SMOOTH on a row of values gives a row of results', async () => {
    const out = await smooth([[1, 3, 2, 5, 4, 6, 8]], undefined, 'spline', 1);
    expect(out).toHaveLength(1);
    expect(out[0]).toHaveLength(7);
  });

  test('SMOOTH turns bad options into an error carrying the engine message', async () => {
    await expect(smooth(col(ys), col(xs), 'spline', -3)).rejects.toThrow(/penalty \(spline\) must be a number from 0; got -3/);
    await expect(smooth(col(ys), col(xs), 'wavy')).rejects.toThrow(/unknown method "wavy"/);
    await expect(smooth(col(ys), col([1, 2]))).rejects.toThrow(/x has 2 rows but y has 12/);
    await expect(smooth(col(ys), col(xs), 'level')).rejects.toThrow(/unknown method "level"; use one of: spline, trend/);
    await expect(smooth(5 as any)).rejects.toThrow(/y must be a range of cells/);
  });

  test('SMOOTH output "se" and "residual" are aligned like the fitted values', async () => {
    const se = await smooth(col(ys), col(xs), 'spline', 'df=4', undefined, 'se');
    const res = await smooth(col(ys), col(xs), 'spline', 'df=4', undefined, 'residual');
    expect(se[2][0]).toBe('');
    expect(typeof se[0][0]).toBe('number');
    expect(se[0][0]).toBeGreaterThan(0);
    const fit = await smooth(col(ys), col(xs), 'spline', 'df=4');
    expect((res[0][0] as number) + (fit[0][0] as number)).toBeCloseTo(14, 12);
  });
});

describe('settings', () => {
  test('settings "order=2; sure" equal the engine options order 2 and rule sure', async () => {
    const a = await smooth(col(ys), col(xs), 'trend', 'order=2; sure');
    const { series, result } = fitCells(ys as any, xs, null, { method: 'trend', order: 2, select: 'sure' });
    expect(a[0][0]).toBeCloseTo(result.fitted[series.rowOf[0]], 12);
  });

  test('settings refuse an unknown name with the names the method accepts', async () => {
    await expect(smooth(col(ys), col(xs), 'spline', 'smoothness=3')).rejects.toThrow(/unknown option "smoothness" for spline; spline accepts: rule, penalty, df, folds, noise, search-points/);
  });

  test('settings refuse folds with the spline default GCV and a rule together with a penalty', async () => {
    await expect(smooth(col(ys), col(xs), 'spline', 'folds=5')).rejects.toThrow(/folds applies only when rule is "cv" or "cv-simpler"/);
    await expect(smooth(col(ys), col(xs), 'spline', 'cv; penalty=5')).rejects.toThrow(/give only one of rule or penalty/);
  });

  test('settings take a lone word only when one option has it as a value', async () => {
    await expect(smooth(col(ys), col(xs), 'spline', 'wiggly')).rejects.toThrow(/"wiggly" in the settings "wiggly" is not a value this method knows on its own/);
  });
});

describe('the shared computation', () => {
  beforeEach(() => clearComputeCache());

  test('several functions on the same range and settings share one computation, even when called together', async () => {
    await Promise.all([smooth(col(ys), col(xs), 'spline'), penalty(col(ys), col(xs), 'spline'), summary(col(ys), col(xs), 'spline')]);
    expect(computeCacheSize()).toBe(1);
    await smooth(col(ys), col(xs), 'spline', 'df=5');
    expect(computeCacheSize()).toBe(2);
  });

  test("Excel's cancel of one call rejects that call as cancelled; an equal call still gets its result", async () => {
    const a: { onCanceled?: () => void } = {};
    const first = compute({ analysis: 'spline', y: [1, 2, 3, 5, 4, 6] }, a);
    const second = compute({ analysis: 'spline', y: [1, 2, 3, 5, 4, 6] });
    a.onCanceled!();
    await expect(first).rejects.toThrow(/cancel/);
    expect((await second).smooth!.df).toBeGreaterThan(1);
  });

  test('a failed computation is not kept, so a recalculation tries again', async () => {
    await expect(smooth(col(ys), col(xs), 'spline', 'df=-1')).rejects.toThrow();
    expect(computeCacheSize()).toBe(0);
  });
});

describe('PENALTY and SUMMARY', () => {
  test('PENALTY returns the chosen lambda, or the criterion table with a header', async () => {
    const one = await penalty(col(ys), col(xs), 'spline');
    const { result } = fitCells(ys as any, xs, null, {});
    expect(one[0][0]).toBeCloseTo(result.penalty, 12);
    const table = await penalty(col(ys), col(xs), 'spline', undefined, undefined, true);
    expect(table[0]).toEqual(['penalty', 'score (gcv)', 'df', 'se', 'knots', 'converged']);
    expect(table.length).toBe(result.criterion.curve!.length + 1);
    await expect(penalty(col(ys), col(xs), undefined, undefined, undefined, 'maybe')).rejects.toThrow(/table must be TRUE or FALSE; got "maybe"/);
  });

  test('SUMMARY reports counts of used, dropped and merged rows and every warning', async () => {
    const t = await summary(col(ys), col(xs), 'spline');
    const get = (k: string) => t.find((r) => r[0] === k)?.[1];
    expect(get('n used')).toBe(10);
    expect(get('n dropped')).toBe(2);
    expect(get('ties merged')).toBe(0);
    const nWarn = get('warnings') as number;
    expect(t.filter((r) => String(r[0]).startsWith('warning ')).length).toBe(nWarn);
    expect(t.some((r) => String(r[0]).includes('dropped-cells'))).toBe(true);
  });

  test('SUMMARY shows a changepoint model its warnings, which BREAKS has no room for', async () => {
    const t = await summary(col(ys), col(xs), 'level');
    expect(t.find((r) => r[0] === 'breaks')).toBeDefined();
    expect(t.some((r) => String(r[0]).includes('break-cause'))).toBe(true);
    expect(t.some((r) => String(r[0]).includes('dropped-cells'))).toBe(true);
  });
});

describe('KNOTS and EVALUATE', () => {
  test('KNOTS lists bends with their refit sizes, every knot on request, and none for the spline', async () => {
    expect(await knots(col(ys), col(xs), "spline", undefined, undefined, "all")).toEqual([["x", "row", "change"]]);
    const t = await knots(col(ys), col(xs), "trend", "order=1; penalty=0.5");
    expect(t[0]).toEqual(["x", "row", "change", "from", "to", "knots merged", "rank"]);
    await expect(knots(col(ys), col(xs), "trend", undefined, undefined, "some")).rejects.toThrow(/detail must be "bends" or "all"; got "some"/);
  });

  test('EVALUATE flags positions outside the data', async () => {
    const out = await evaluateAt(col(ys), col([0, 6.5, 13, 'text']), col(xs), 'spline', 'df=4');
    expect(out.map((r) => r[1])).toEqual([true, false, true, '']);
    expect(out[3][0]).toBe('');
  });
});

describe('BREAKS, SEGMENTS and BREAKSCAN', () => {
  const steps = [1, 1.2, 0.9, 1.1, 1, 5, 5.2, 4.9, 5.1, 5, 5.1, 4.8];

  test('BREAKS lists each break with the segment summaries of its model, matching the engine', async () => {
    const t = await breaks(col(steps), undefined, 'volatility', 'penalty=10');
    expect(t[0]).toEqual(['x', 'row', 'change', 'mean before', 'mean after', 'sd before', 'sd after']);
    const d = breaksFromCells(steps, null, null, { model: 'meanvar', penalty: 10 }).result;
    expect(t.length - 1).toBe(d.breaks.length);
    d.breaks.forEach((b, i) => expect(t[i + 1][6]).toBeCloseTo(b.after.sd, 12));
  });

  test('BREAKS accepts the old model names and a number alone as the penalty', async () => {
    const a = await breaks(col(steps), undefined, 'mean', 3);
    const b = await breaks(col(steps), undefined, 'level', 'penalty=3');
    expect(a).toEqual(b);
  });

  test('SEGMENTS gives one value per row, and BREAKSCAN one row per segmentation', async () => {
    const s = await segments(col(steps));
    expect(s).toHaveLength(steps.length);
    const scan = await breakScan(col(steps), 0.5, 50);
    expect(scan[0]).toEqual(['penalty from', 'penalty to', 'changes', 'cost']);
    expect(scan.length).toBeGreaterThan(2);
  });
});

describe('OPTIONS', () => {
  test('OPTIONS lists every method, and a method its declared settings', () => {
    const all = options();
    expect(all.map((r) => r[0])).toEqual(expect.arrayContaining(['spline', 'trend', 'level', 'volatility', 'counts', 'distribution', 'slope']));
    const trend = options('trend');
    expect(trend[0]).toEqual(['setting', 'allowed', 'default', 'what it does']);
    expect(trend.find((r) => r[0] === 'order')).toEqual(['order', 'whole number >= 0 and <= 3', 1, expect.stringMatching(/kinks/)]);
    expect(() => options('wavy')).toThrow(/unknown method "wavy"/);
  });
});

describe('DECOMPOSE', () => {
  test('DECOMPOSE spills trend, season, spikes, remainder and adjusted per row, adding back to y', async () => {
    const { decompose } = require('../../src/functions/decompose');
    // invented monthly series: a level, a yearly pattern of period 12 and noise-free values, one blank row
    const y: unknown[] = Array.from({ length: 48 }, (_, i) => 100 + 0.5 * i + 10 * Math.sin((2 * Math.PI * i) / 12));
    y[20] = '';
    const out = await decompose(col(y), undefined, 'period=12');
    expect(out[0]).toEqual(['trend', 'season', 'spikes', 'remainder', 'adjusted']);
    expect(out).toHaveLength(49);
    expect(out[21]).toEqual(['', '', '', '', '']);
    for (let r = 0; r < 48; r++) {
      if (r === 20) continue;
      const [t, s, o, e] = out[r + 1] as number[];
      expect(t + s + o + e).toBeCloseTo(y[r] as number, 8);
    }
  });
});

describe('no method named', () => {
  // an invented series: a ramp that turns down, with a little wobble (60 points: enough for 5 folds)
  const y = Array.from({ length: 60 }, (_, i) => (i < 30 ? 0.2 * i : 6 - 0.1 * (i - 30)) + 0.3 * Math.sin(i * 7.7));

  test('SMOOTH, PENALTY and SUMMARY run the automatic choice, and SUMMARY names what it kept and why', async () => {
    const { runAnalysis } = require('../../src/engine');
    const direct = runAnalysis({ analysis: 'auto', y });
    const kept = direct.comparison.rows[direct.comparison.chosen];
    const out = await smooth(col(y));
    out.forEach((r, i) => expect(r[0]).toBeCloseTo(direct.smooth.fitted[i], 12));
    expect((await penalty(col(y)))[0][0]).toBeCloseTo(direct.smooth.penalty, 12);
    const t = await summary(col(y));
    const get = (k: string) => t.find((r) => r[0] === k)?.[1];
    expect(get('method')).toBe(`auto: ${kept.method}${kept.options.order !== undefined ? ` (order ${kept.options.order})` : ''}`);
    expect(get('why this method')).toBe(direct.comparison.reason);
  });

  test('settings the automatic choice does not take go to the spline, with a note; others are refused saying no method was named', async () => {
    const out = await smooth(col(y), undefined, undefined, 'df=5');
    const { runAnalysis } = require('../../src/engine');
    const spline = runAnalysis({ analysis: 'spline', y, options: { df: 5 } });
    out.forEach((r, i) => expect(r[0]).toBeCloseTo(spline.smooth.fitted[i], 12));
    const t = await summary(col(y), undefined, undefined, 'gcv');
    expect(t.find((r) => r[0] === 'method')?.[1]).toBe('spline');
    expect(t.some((r) => String(r[1]).startsWith('No method was named and these settings are not the automatic choice\'s, so they were applied to the smoothing spline'))).toBe(true);
    // the automatic choice's own settings stay its own
    const t2 = await summary(col(y), undefined, undefined, 'folds=4');
    expect(String(t2.find((r) => r[0] === 'method')?.[1])).toMatch(/^auto: /);
    await expect(smooth(col(y), undefined, undefined, 'order=2')).rejects.toThrow(/unknown option "order" for auto; .*No method was named, so the automatic choice ran; name a method to use these settings\./);
  });

  test('COMPARE on too few points for cross-validation says why no methods were compared', async () => {
    const { compare } = require('../../src/functions/smoothing');
    await expect(compare(col(y.slice(0, 9)))).rejects.toThrow(/^no methods were compared: 9 points are too few for 5-fold cross-validation \(it needs at least 12\)/);
    // SMOOTH still gives the spline there
    const out = await smooth(col(y.slice(0, 9)));
    expect(out.every((r) => typeof r[0] === 'number')).toBe(true);
  });
});

describe('COMPARE', () => {
  test('COMPARE spills every candidate with its cross-validation error, marks the chosen one and gives the reason', async () => {
    const { compare } = require('../../src/functions/smoothing');
    const y = Array.from({ length: 60 }, (_, i) => (i < 30 ? 0.2 * i : 6 - 0.1 * (i - 30)) + 0.3 * Math.sin(i * 7.7));
    const t = await compare(col(y));
    expect(t[0]).toEqual(['method', 'df', 'CV error', 'se', 'milliseconds', 'chosen']);
    const body = t.slice(1, -1);
    expect(body.filter((r: unknown[]) => r[5] === 'chosen')).toHaveLength(1);
    expect(String(t[t.length - 1][0])).toMatch(/\.$/);
    for (const r of body) if (r[5] !== 'not compared' && typeof r[2] === 'number') expect(r[2]).toBeGreaterThan(0);
  });
});
