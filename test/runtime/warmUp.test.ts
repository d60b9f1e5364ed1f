/**
 * The browser workers' warm-up: the automatic choice on a short invented series, run once when a
 * worker loads so that the kernels are compiled before the first real job.
 */
import { warmUp, warmUpRequest, WARM_UP_POINTS } from '../../src/runtime/engineEntry';
import { runAnalysis } from '../../src/engine';

describe('warmUp', () => {
  test('warmUpRequest is the same invented series every time, of WARM_UP_POINTS finite values', () => {
    const a = warmUpRequest(), b = warmUpRequest();
    expect(a.y).toEqual(b.y);
    expect(a.x).toEqual(b.x);
    expect((a.y as number[]).length).toBe(WARM_UP_POINTS);
    expect((a.y as number[]).every(Number.isFinite)).toBe(true);
  });

  test('its automatic choice compares every candidate (so every kernel runs), and warmUp runs it to its end', () => {
    const r = runAnalysis(warmUpRequest());
    const c = r.comparison!;
    expect(c.rows.length).toBeGreaterThanOrEqual(9);
    expect(c.rows.filter((row) => row.skipped)).toEqual([]);
    expect(warmUp()).toBe(true);
  }, 60000);
});
