/** A constant series: the fit is that constant, with a note, and nothing says it follows noise. */
import { summary } from '../../src/functions/smoothing';
import { clearComputeCache } from '../../src/functions/compute';
import { runAnalysis } from '../../src/engine';

describe('constant y', () => {
  test('the spline of a constant is that constant, with a note and no warning that it follows noise', async () => {
    const r = runAnalysis({ analysis: 'spline', y: Array(30).fill(17) });
    expect(Array.from(r.fitted).every((v) => Math.abs(v - 17) < 1e-9)).toBe(true);
    const codes = r.warnings.map((w) => w.code);
    expect(codes).not.toContain('few-points-per-df');
    expect(r.warnings.map((w) => w.message).join(' ')).toMatch(/all 30 usable y values equal 17/);
    clearComputeCache();
    const t = await summary(Array(30).fill([17]));
    expect(t.some((row) => String(row[1]).includes('all 30 usable y values equal 17'))).toBe(true);
  });
});
