/**
 * The automatic choice with the mixed trend among its candidates: the mixed trend is compared on
 * the same folds, each candidate's standard error is that of its own curve point, the pick follows
 * the shared one-standard-error rule, and knot bends are computed for the winner only.
 * Series: invented, seeded (mixedSeries.ts).
 */
import * as bendsModule from '../../../src/engine/diagnostics/knotBends';
import { runAnalysis } from '../../../src/engine';
import type { CandidateRow } from '../../../src/engine/analysis/analysisDefinition';
import { explain } from '../../../src/engine/smoothers/auto';
import { kinkedThenSmoothSeries } from './mixedSeries';
import { normalStream } from '../../helpers/random';
import { kinksAndWave } from '../../helpers/autoBenchShapes';

test('auto compares the mixed trend and computes knot bends for the winner only', () => {
  const { x, y } = kinkedThenSmoothSeries(120, 8, 0.1, 3);
  const spy = jest.spyOn(bendsModule, 'knotBends');
  const r = runAnalysis({ analysis: 'auto', y: Array.from(y), x: Array.from(x) });
  const c = r.comparison!;
  const mixed = c.rows.find((q) => q.method === 'mixed')!;
  expect(mixed.skipped).toBeUndefined();
  expect(Number.isFinite(mixed.cv) && Number.isFinite(mixed.se) && mixed.se > 0).toBe(true);
  // every compared trend-type candidate has knots, but bends are computed once at most: for the winner
  const winner = c.rows[c.chosen];
  const bendsExpected = winner.method === 'trend' || winner.method === 'mixed' ? 1 : 0;
  expect(spy).toHaveBeenCalledTimes(bendsExpected);
  if (bendsExpected) expect(r.smooth!.bends).toBeDefined();
  // the one-standard-error rule: the chosen row is within one se of the best and has no more df than it
  const best = c.rows[c.best];
  expect(winner.cv).toBeLessThanOrEqual(best.cv + best.se);
  expect(winner.df).toBeLessThanOrEqual(best.df);
  for (const q of c.rows) if (!q.skipped && q.cv <= best.cv + best.se && q.df <= best.df) expect(winner.df).toBeLessThanOrEqual(q.df);
  spy.mockRestore();
}, 600000);

test('auto does not say a series has kinks when the chosen mixed trend found none', () => {
  // the automatic choice's 730-point bench series (test/helpers/autoBenchShapes.ts): the mixed trend's paths reach
  // fits with kinks, but its cross-validation prefers smooth bends only here (measured: 0 kinks, 14 bend knots,
  // 18 df), and it is chosen as the simplest fit within one standard error
  const n = 730;
  const z = normalStream(n + 5);
  const x = Array.from({ length: n }, (_, i) => i + 1);
  const y = x.map((t) => kinksAndWave(t / n) + 0.3 * z());
  const r = runAnalysis({ analysis: 'auto', y, x });
  const c = r.comparison!;
  expect(c.rows[c.chosen].method).toBe('mixed');
  expect(r.smooth!.knots.length).toBe(0);
  expect(c.reason).not.toMatch(/kinks in places/);
  // where such a fit has the lowest error outright, the sentence that names the shape says it found no kinks
  const rows: CandidateRow[] = [
    { ...c.rows[c.chosen] },
    { ...c.rows.find((q) => q.method === 'spline')!, cv: 2 * c.rows[c.chosen].cv },
  ];
  expect(explain(rows, 0, 0, 'cv', true)).toMatch(/found no kinks/);
  expect(explain(rows, 0, 0, 'cv', true)).not.toMatch(/kinks in places/);
  expect(explain(rows, 0, 0, 'cv', false)).toMatch(/kinks in places/);
});
