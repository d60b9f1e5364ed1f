/**
 * The automatic choice on seeded series of our own: a straight line with
 * noise (the simplest fit must win), a series with two sharp kinks, and a
 * smooth wave. Checks follow the rule: the chosen fit's held-out error
 * is within one standard error of the best candidate's.
 */
import { runAnalysis, evaluateAnalysis, analysisDefinitions } from '../../../src/engine';
import { AUTO_LIMIT, AUTO_COARSE_FROM, AUTO_SEARCH_POINTS, FALLBACK_SMOOTHER } from '../../../src/engine/smoothers/auto';
import { TREND_AUTO_MAX_POINTS, TREND_DATA_DRIVEN_LIMITS } from '../../../src/engine/smoothers/trend';
import { MIXED_DATA_DRIVEN_LIMIT } from '../../../src/engine/smoothers/mixed/mixedAnalysis';
import { normalStream } from '../../helpers/random';

function series(f: (t: number) => number, n: number, sd: number, seed: number) {
  const z = normalStream(seed);
  const x = Array.from({ length: n }, (_, i) => i + 1);
  return { x, y: x.map((t) => f(t) + sd * z()) };
}

describe('auto', () => {
  test('beyond the limit no methods are compared: the spline is fitted by its own default rule, and a note says so', () => {
    const { x, y } = series((t) => Math.sin(t / 5000), AUTO_LIMIT + 1, 0.3, 3);
    const defs = analysisDefinitions('smoother').filter((d) => d.name !== 'auto');
    const spies = defs.map((d) => jest.spyOn(d, 'run'));
    try {
      const r = runAnalysis({ analysis: 'auto', y, x });
      // only the spline ran, once: no candidate was cross-validated
      defs.forEach((d, i) => expect(spies[i]).toHaveBeenCalledTimes(d.name === FALLBACK_SMOOTHER ? 1 : 0));
      expect(r.analysis).toBe('auto');
      expect(r.smooth!.method).toBe('spline');
      expect(r.comparison).toBeUndefined();
      expect(r.uncompared).toMatch(/^no methods were compared: on 50,001 points/);
      expect(r.warnings[0].message).toMatch(/^No methods were compared: on 50,001 points .* at most 50,000 points\). Choose a method yourself.* The smoothing spline was fitted instead, its penalty chosen by GCV/);
      // the same fit as the spline asked for by name
      const own = runAnalysis({ analysis: 'spline', y, x });
      expect(Array.from(r.smooth!.fitted)).toEqual(Array.from(own.smooth!.fitted));
      expect(own.smooth!.criterion.name).toBe('gcv');
    } finally {
      for (const s of spies) s.mockRestore();
    }
  });

  test('a variant is left out beyond the length it declares (maxPoints), and the table says why', () => {
    const smoothers = analysisDefinitions('smoother');
    const variant = (name: string, order?: number) => smoothers.find((d) => d.name === name)!.autoVariants!.find((v) => order === undefined || v.options.order === order)!;
    // the declarations: orders 2 and 3 and the mixed trend stop early; order 3 and the mixed trend at their own limits
    expect(variant('trend', 2).maxPoints).toBe(TREND_AUTO_MAX_POINTS[2]);
    expect(variant('trend', 3).maxPoints).toBe(TREND_DATA_DRIVEN_LIMITS[3].cv);
    expect(variant('mixed').maxPoints).toBe(MIXED_DATA_DRIVEN_LIMIT);
    expect(variant('trend', 1).maxPoints).toBeUndefined();
    // the rule at work, on the shortest declared length plus one
    const n = MIXED_DATA_DRIVEN_LIMIT + 1;
    const { x, y } = series((t) => (t < 400 ? 0.01 * t : 4 - 0.005 * (t - 400)) + Math.sin(t / 60), n, 0.3, 23);
    const mixed = smoothers.find((d) => d.name === 'mixed')!;
    const spy = jest.spyOn(mixed, 'run');
    try {
      const r = runAnalysis({ analysis: 'auto', y, x });
      expect(spy).not.toHaveBeenCalled();
      const row = r.comparison!.rows.find((c) => c.method === 'mixed')!;
      expect(row.skipped).toBe('its cross-validation grows faster than the series; the automatic choice includes it on at most 1,000 points (run it on its own with a penalty, or on a shorter range of rows).');
      expect(r.warnings.some((w) => w.message.startsWith('Not compared: straight pieces with kinks plus smooth bends (mixed trend): its cross-validation grows faster'))).toBe(true);
      // every other candidate was compared
      expect(r.comparison!.rows.filter((c) => c.skipped).length).toBe(1);
    } finally {
      spy.mockRestore();
    }
  }, 120000);

  test('from AUTO_COARSE_FROM points the candidates with a longer grid search AUTO_SEARCH_POINTS penalties over their usual range; below it their own grid', () => {
    const defs = analysisDefinitions('smoother').filter((d) => d.name !== 'auto');
    const spies = defs.map((d) => jest.spyOn(d, 'run'));
    const gridOf = (name: string) => defs.find((d) => d.name === name)!.options.find((o) => o.name === 'searchPoints')?.default;
    // the declared grids this rule shortens (and LOESS, wavelets and the mixed trend, which declare none longer)
    expect(gridOf('trend')).toBe(30);
    expect(gridOf('spline')).toBe(25);
    try {
      const long = series((t) => (t < 900 ? 0.01 * t : 9 - 0.02 * (t - 900)) + 0.5 * Math.sin(t / 150), AUTO_COARSE_FROM, 0.3, 13);
      const r = runAnalysis({ analysis: 'auto', y: long.y, x: long.x });
      let trendRuns = 0;
      defs.forEach((d, i) => spies[i].mock.calls.forEach((call, j) => {
        const own = gridOf(d.name);
        const expected = typeof own === 'number' ? Math.min(own, AUTO_SEARCH_POINTS) : undefined;
        expect(call[1].searchPoints).toBe(expected);
        const res = spies[i].mock.results[j];
        if (d.name === 'trend' && res.type === 'return') {
          trendRuns++;
          const curve = (res.value as { criterion: { curve: unknown[] } }).criterion.curve;
          // the path's grid: this many penalties from lambda_max down, as the method's own range; as a
          // candidate it solves every other one (both ends) and then one or two beside the lowest score
          const everyOther = Math.ceil(AUTO_SEARCH_POINTS / 2);
          expect(curve.length).toBeGreaterThanOrEqual(everyOther + 1);
          expect(curve.length).toBeLessThanOrEqual(everyOther + 2);
        }
      }));
      expect(trendRuns).toBe(4); // orders 0 to 3 all fitted at this length
      expect(r.warnings.some((w) => w.message.includes(`searched at most ${AUTO_SEARCH_POINTS} penalties`))).toBe(true);
      // the shared rule still holds: the pick is within one standard error of the best
      const c = r.comparison!;
      expect(c.rows[c.chosen].cv).toBeLessThanOrEqual(c.rows[c.best].cv + c.rows[c.best].se);
      for (const sp of spies) sp.mockClear();
      // shorter series: every candidate's own grid
      const short = series((t) => Math.sin(t / 20), 200, 0.2, 14);
      const r2 = runAnalysis({ analysis: 'auto', y: short.y, x: short.x });
      defs.forEach((d, i) => spies[i].mock.calls.forEach((call) => expect(call[1].searchPoints).toBe(gridOf(d.name))));
      expect(r2.warnings.some((w) => w.message.includes('searched at most'))).toBe(false);
      // and trend filtering solves its whole grid there (no filling near the best score on short series)
      let shortTrendRuns = 0;
      defs.forEach((d, i) => spies[i].mock.results.forEach((res) => {
        if (d.name !== 'trend' || res.type !== 'return') return;
        shortTrendRuns++;
        expect((res.value as { criterion: { curve: unknown[] } }).criterion.curve.length).toBe(gridOf('trend'));
      }));
      expect(shortTrendRuns).toBe(4);
    } finally {
      for (const sp of spies) sp.mockRestore();
    }
  }, 600000);

  test('auto on a straight line with noise picks a fit of at most 3 df', () => {
    const { x, y } = series((t) => 2 + 0.05 * t, 200, 1, 5);
    const r = runAnalysis({ analysis: 'auto', y, x });
    expect(r.smooth!.df).toBeLessThanOrEqual(3);
    // one row per declared candidate of every registered smoother
    expect(r.comparison!.rows.length).toBe(analysisDefinitions('smoother').reduce((k, d) => k + (d.autoVariants?.length ?? 0), 0));
  });

  test('auto picks within one standard error of the best candidate and says why in one sentence', () => {
    const { x, y } = series((t) => (t < 80 ? 0.1 * t : t < 140 ? 8 - 0.15 * (t - 80) : -1 + 0.05 * (t - 140)), 200, 0.5, 7);
    const r = runAnalysis({ analysis: 'auto', y, x });
    const c = r.comparison!;
    const best = c.rows[c.best], chosen = c.rows[c.chosen];
    expect(chosen.cv).toBeLessThanOrEqual(best.cv + best.se);
    expect(c.reason).toMatch(/^[A-Z].*\.$/);
    expect(c.reason.split('. ').length).toBe(1);
    expect(r.warnings[0].message).toContain(c.reason);
  });

  test('auto on kinks prefers straight pieces to a smooth curve', () => {
    const { x, y } = series((t) => (t < 100 ? 0.2 * t : 20 - 0.3 * (t - 100)), 200, 0.4, 9);
    const r = runAnalysis({ analysis: 'auto', y, x, options: { rule: 'cv' } });
    const rows = r.comparison!.rows;
    const k1 = rows.find((q) => q.method === 'trend' && q.options.order === 1)!;
    const spline = rows.find((q) => q.method === 'spline')!;
    expect(k1.cv).toBeLessThan(spline.cv);
    expect(r.comparison!.rows[r.comparison!.chosen].cv).toBe(Math.min(...rows.map((q) => q.cv)));
  });

  test('auto results evaluate at new x through the winning method', () => {
    const { x, y } = series((t) => Math.sin(t / 20), 150, 0.2, 11);
    const r = runAnalysis({ analysis: 'auto', y, x });
    const ev = evaluateAnalysis(r, [10, 151]);
    expect(ev.extrapolated[1]).toBe(1);
    expect(Number.isFinite(ev.value[0])).toBe(true);
  });

  test('auto on too few points for cross-validation fits the spline and says why no methods were compared', () => {
    const y = [1, 2.5, 2.8, 4.4, 5.1, 5.9, 7.3, 8.2];
    const r = runAnalysis({ analysis: 'auto', y });
    expect(r.comparison).toBeUndefined();
    expect(r.uncompared).toBe('no methods were compared: 8 points are too few for 5-fold cross-validation (it needs at least 12). Use fewer folds (folds=2 needs 6 points) or more data.');
    expect(r.warnings[0].message).toMatch(/^No methods were compared: 8 points are too few .* The smoothing spline was fitted instead, its penalty chosen by GCV/);
    expect(Array.from(r.smooth!.fitted)).toEqual(Array.from(runAnalysis({ analysis: 'spline', y }).smooth!.fitted));
    // with fewer folds the same points are compared
    expect(runAnalysis({ analysis: 'auto', y, options: { folds: 2 } }).comparison!.rows.length).toBeGreaterThan(3);
    // and where even the spline cannot fit, its refusal stands
    expect(() => runAnalysis({ analysis: 'auto', y: [1, 2] })).toThrow();
  });
});
