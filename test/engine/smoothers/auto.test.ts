/**
 * The automatic choice on seeded series of our own: a straight line with
 * noise (the simplest fit must win), a series with two sharp kinks, and a
 * smooth wave. Checks follow the rule: the chosen fit's held-out error
 * is within one standard error of the best candidate's.
 */
import { runAnalysis, evaluateAnalysis } from '../../../src/engine';
import { normalStream } from '../../helpers/random';

function series(f: (t: number) => number, n: number, sd: number, seed: number) {
  const z = normalStream(seed);
  const x = Array.from({ length: n }, (_, i) => i + 1);
  return { x, y: x.map((t) => f(t) + sd * z()) };
}

describe('auto', () => {
  test('auto on a straight line with noise picks a fit of at most 3 df', () => {
    const { x, y } = series((t) => 2 + 0.05 * t, 200, 1, 5);
    const r = runAnalysis({ analysis: 'auto', y, x });
    expect(r.smooth!.df).toBeLessThanOrEqual(3);
    expect(r.comparison!.rows.length).toBe(5);
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
