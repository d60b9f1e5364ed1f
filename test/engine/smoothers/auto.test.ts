/**
 * The automatic choice on seeded series of our own: a straight line with
 * noise (the simplest fit must win), a series with two sharp kinks, and a
 * smooth wave. Checks follow the rule: the chosen fit's held-out error
 * is within one standard error of the best candidate's.
 */
import { runAnalysis, evaluateAnalysis, analysisDefinitions } from '../../../src/engine';
import { AUTO_LIMIT, AUTO_COARSE_FROM, AUTO_SEARCH_POINTS } from '../../../src/engine/smoothers/auto';
import { normalStream } from '../../helpers/random';

function series(f: (t: number) => number, n: number, sd: number, seed: number) {
  const z = normalStream(seed);
  const x = Array.from({ length: n }, (_, i) => i + 1);
  return { x, y: x.map((t) => f(t) + sd * z()) };
}

describe('auto', () => {
  test('a series longer than the limit is refused at once, saying what to do instead', () => {
    const { x, y } = series((t) => Math.sin(t / 500), AUTO_LIMIT + 1, 0.3, 3);
    // at once: no candidate is run before the refusal
    const spies = analysisDefinitions('smoother').filter((d) => d.name !== 'auto').map((d) => jest.spyOn(d, 'run'));
    try {
      expect(() => runAnalysis({ analysis: 'auto', y, x })).toThrow(/automatic choice .* at most 10,000 points; this series has 10,001.*Choose a method yourself \(spline, whittaker/);
      for (const s of spies) expect(s).not.toHaveBeenCalled();
      // the check is live: the same spies see candidates run on a short series
      runAnalysis({ analysis: 'auto', y: y.slice(0, 60), x: x.slice(0, 60) });
      expect(spies.some((s) => s.mock.calls.length > 0)).toBe(true);
    } finally {
      for (const s of spies) s.mockRestore();
    }
  });

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
          // the path's grid: this many penalties from lambda_max down, as the method's own range
          expect(curve.length).toBe(AUTO_SEARCH_POINTS);
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

  test('auto on too few points for cross-validation says what to do', () => {
    expect(() => runAnalysis({ analysis: 'auto', y: [1, 2, 3, 4, 5, 6, 7, 8] })).toThrow(/no method could be cross-validated with 5 folds on 8 points/);
  });
});
