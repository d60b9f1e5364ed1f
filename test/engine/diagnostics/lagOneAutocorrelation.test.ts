/** The lag-one autocorrelation and the one rule that calls residuals autocorrelated. */
import { lagOneAutocorrelation, isAutocorrelated } from '../../../src/engine/diagnostics/lagOneAutocorrelation';
import { normalStream } from '../../helpers/random';

describe('lagOneAutocorrelation', () => {
  test('recovers phi of an AR(1) series (phi = 0.6, n = 20000) within 0.02', () => {
    // for AR(1) noise e_i = phi e_{i-1} + z_i the lag-one autocorrelation is phi (textbook fact)
    const z = normalStream(31);
    let e = 0;
    const r = Array.from({ length: 20000 }, () => (e = 0.6 * e + z()));
    expect(Math.abs(lagOneAutocorrelation(r) - 0.6)).toBeLessThan(0.02);
  });
});

describe('isAutocorrelated', () => {
  test('needs both r1 > 0.3 and three standard errors (3 / sqrt(n)) of r1', () => {
    expect(isAutocorrelated(0.4, 400)).toBe(true); // 3 / sqrt(400) = 0.15
    expect(isAutocorrelated(0.25, 400)).toBe(false); // significant, but small
    expect(isAutocorrelated(0.4, 30)).toBe(false); // 3 / sqrt(30) = 0.55: within chance
    expect(isAutocorrelated(0.6, 30)).toBe(true);
  });

  test('white noise of 30 points rarely passes it (at most 1 in 200 seeds), though r1 > 0.3 alone would', () => {
    let rule = 0, plain = 0;
    for (let seed = 1; seed <= 200; seed++) {
      const z = normalStream(seed);
      const r1 = lagOneAutocorrelation(Array.from({ length: 30 }, () => z()));
      if (isAutocorrelated(r1, 30)) rule++;
      if (r1 > 0.3) plain++;
    }
    expect(rule).toBeLessThanOrEqual(1);
    expect(plain).toBeGreaterThan(rule);
  });
});
