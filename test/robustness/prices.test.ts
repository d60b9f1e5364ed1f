/**
 * Prices near 1e9 with cents: the same series shifted by 1e9 must give the
 * same breaks, and the same smooth shifted by 1e9 (offset equivariance; the
 * cents survive in doubles, whose spacing at 1e9 is 1.2e-7).
 */
import { breaks } from '../../src/functions/breaks';
import { smooth } from '../../src/functions/smoothing';
import { clearComputeCache } from '../../src/functions/compute';
import { BASE_Y } from './catalogue';

const cents = BASE_Y.map((v, i) => v + ((i * 37) % 100) / 100);
const col = (a: number[]) => a.map((v) => [v]);

describe('prices near 1e9 with cents', () => {
  test.each(['level', 'volatility', 'distribution', 'slope'])('%s: the same break rows as the unshifted series', async (model) => {
    clearComputeCache();
    // independent noise, as before the swing stopped hiding the step at default settings (see below)
    const settings = model === 'distribution' ? undefined : 'noise=independent';
    const a = await breaks(col(cents), undefined, model, settings);
    const b = await breaks(col(cents.map((v) => v + 1e9)), undefined, model, settings);
    expect(a.length).toBeGreaterThan(1); // the step at row 21 is found
    expect(b.slice(1).map((r) => r[1])).toEqual(a.slice(1).map((r) => r[1]));
  });

  // Once a known weakness: the smooth swing 3 sin(i / 3) of this series widened lag-2 differences more than lag-1
  // ones, which the former ratio estimator of the noise correlation read as correlated noise, raising the penalty
  // until the step of 10 at row 21 was missed. The variogram estimator fits the swing's growth with the lag apart
  // from the noise, so the step is found at default settings (the slope model draws it as a steep rise over one step).
  test.each(['level', 'volatility', 'slope'])('%s at default settings finds the step at row 21 despite the swing', async (model) => {
    clearComputeCache();
    const a = await breaks(col(cents), undefined, model);
    expect(a.slice(1).some((r) => Math.abs((r[1] as number) - 21) <= 1)).toBe(true);
  });

  test.each(['spline', 'trend'])('%s: the smooth shifted by 1e9', async (method) => {
    clearComputeCache();
    const a = (await smooth(col(cents), undefined, method)).map((r) => r[0] as number);
    const b = (await smooth(col(cents.map((v) => v + 1e9)), undefined, method)).map((r) => (r[0] as number) - 1e9);
    // 1e9 carries about 1.2e-7 of absolute rounding per value; allow a thousand such steps
    b.forEach((v, i) => expect(Math.abs(v - a[i])).toBeLessThan(1e-4));
  });
});
