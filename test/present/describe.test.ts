import { breaksSolverInWords, fitSolverInWords, ruleInWords, smoothPenaltyInWords } from '../../src/present';
import { fitCells, breaksFromCells } from '../../src/engine';
import { knotsTable, segmentsTable, breaksTable } from '../../src/present';

const status = (converged: boolean, achieved: number, tolerance = 1e-8) => ({ converged, iterations: 40, tolerance, achieved, stoppingRule: 'rule' });

describe('penalties and solver status in words', () => {
  test('a huge spline penalty reads as smoothness with its degrees of freedom', () => {
    expect(smoothPenaltyInWords({ method: 'spline', penalty: 17401000000000, df: 21.3 })).toBe('smoothness 1.74e13, about 21 degrees of freedom');
    expect(smoothPenaltyInWords({ method: 'trend', penalty: 292.02, df: 4.26 })).toBe('penalty 292, about 4.3 degrees of freedom');
  });

  test('solver outcomes', () => {
    expect(fitSolverInWords({ method: 'spline', solver: status(true, 0) })).toBe('solved exactly (direct solve)');
    expect(fitSolverInWords({ method: 'trend', solver: status(true, 0, 0) })).toBe('solved exactly');
    expect(fitSolverInWords({ method: 'trend', solver: status(true, 3e-11) })).toBe('solved to accuracy 3e-11 (asked 1e-8)');
    expect(fitSolverInWords({ method: 'trend', solver: status(false, 2e-5) })).toBe('stopped early after 40 steps: accuracy 2e-5 where 1e-8 was asked; treat the fit as approximate');
    const b = { algorithm: 'cpop', converged: false, iterations: 1, evaluations: 1, maxCandidates: 1, meanCandidates: 1, runs: 1, stoppingRule: '' };
    expect(breaksSolverInWords({ solver: b })).toBe('stopped early: CPOP reached its work budget; the result is the best found, not proven the best');
    expect(ruleInWords('cv', { folds: 5, oneSE: true })).toBe('5-fold cross-validation, one-standard-error rule');
  });
});

describe('tables without a sheet (command line): data rows counted from 1, x at its own decimals', () => {
  // y = |x - 10| on x = 0.5, 1.0, ..., 19.5 has one kink at x = 10 (a fact of the function, not a reference value).
  const xs = Array.from({ length: 39 }, (_, i) => 0.5 * (i + 1));
  const ys = xs.map((x) => Math.abs(x - 10));
  test('the trend knot of |x - 10| is at x = 10.0 in data row 20', () => {
    const { series, result } = fitCells(ys, xs, null, { method: 'trend', order: 1, penalty: 1e-3 });
    const t = knotsTable(result, series, { xDates: false });
    expect(t.header).toEqual(['x', 'row', 'slope change per x unit']);
    const at10 = t.rows.find((r) => r[0].text === '10.0');
    expect(at10).toBeDefined();
    expect(at10![1].value).toBe(20);
  });

  test('the mixed trend\'s knots (its kinks) are headed as slope changes, at the kink of |x - 10|', () => {
    const { series, result } = fitCells(ys, xs, null, { method: 'mixed', penalty: 1e-3 });
    const t = knotsTable(result, series, { xDates: false });
    expect(t.header).toEqual(['x', 'row', 'slope change per x unit']);
    const at10 = t.rows.find((r) => r[0].text === '10.0');
    expect(at10).toBeDefined();
    expect(at10![1].value).toBe(20);
    // the slope of |x - 10| goes from -1 to +1: a change of about 2 (a tiny penalty shrinks it a little)
    expect(at10![2].value as number).toBeGreaterThan(1.9);
    expect(at10![2].value as number).toBeLessThanOrEqual(2);
  });

  test('segments list their data rows and the model fields', () => {
    const y = [...Array(20).fill(0), ...Array(20).fill(10)].map((v, i) => v + ((i * 7) % 5) * 0.1);
    const { series, result } = breaksFromCells(y, null, null, { model: 'mean', sigma: 1 });
    const s = segmentsTable(result, series, { xDates: false });
    expect(s.header).toEqual(['from', 'to', 'rows', 'points', 'level']);
    expect(s.rows.map((r) => r[2].text)).toEqual(['1-20', '21-40']);
    expect(breaksTable(result, series, { xDates: false }).rows[0][1].value).toBe(21);
  });
});
