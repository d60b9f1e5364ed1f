/**
 * The automatic choice on seeded series of our own: a straight line with
 * noise (the simplest fit must win), a series with two sharp kinks, and a
 * smooth wave. Checks follow the rule: the chosen fit's held-out error
 * is within one standard error of the best candidate's.
 */
import { runAnalysis, evaluateAnalysis, analysisDefinitions } from '../../../src/engine';
import { AUTO_LIMIT } from '../../../src/engine/smoothers/auto';
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
