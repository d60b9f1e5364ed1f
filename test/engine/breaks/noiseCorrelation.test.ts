/**
 * The noise correlation changepoint penalties are scaled by: the variogram estimator
 * (which cross-validation's fold plan also reads) on seeded series whose noise is known.
 */
import { noiseCorrelation, FEWEST_FOR_CORRELATION } from '../../../src/engine/breaks/noiseCorrelation';
import { noiseDependence, variogramPhi } from '../../../src/engine/select/noiseDependence';
import { normalStream } from '../../helpers/random';

function ar1(n: number, phi: number, seed: number): number[] {
  const z = normalStream(seed);
  const e = [z()];
  for (let i = 1; i < n; i++) e.push(phi * e[i - 1] + Math.sqrt(1 - phi * phi) * z());
  return e;
}

describe('noiseCorrelation', () => {
  test('AR(1) noise of coefficient 0.5 on 2,000 points: phi within 0.1 of 0.5, penalty factor near 3', () => {
    const c = noiseCorrelation(ar1(2000, 0.5, 11));
    expect(Math.abs(c.phi - 0.5)).toBeLessThan(0.1);
    expect(c.penaltyFactor).toBeCloseTo((1 + c.phi) / (1 - c.phi), 12);
  });

  test('independent noise on 96 points with a step of 4 sd: phi above 0.5 in at most 2 of 100 seeded series', () => {
    // the former lag-2 / lag-1 spread ratio read phi above 0.5 in 8 of these 100 series
    let high = 0;
    for (let s = 1; s <= 100; s++) {
      const z = normalStream(1000 + s);
      const y = Array.from({ length: 96 }, (_, i) => (i >= 60 ? 4 : 0) + z());
      if (noiseCorrelation(y).phi > 0.5) high++;
    }
    expect(high).toBeLessThanOrEqual(2);
  });

  test('a slow swing of the level (3 sd, 63 points a cycle) over independent noise is mostly not read as correlated noise', () => {
    // its differences grow with the square of the lag, which the variogram's trend term takes (mean phi 0.10 over these seeds)
    let sum = 0;
    for (let s = 1; s <= 20; s++) {
      const z = normalStream(s);
      sum += noiseCorrelation(Array.from({ length: 100 }, (_, i) => 3 * Math.sin(i / 10) + z())).phi;
    }
    expect(sum / 20).toBeLessThan(0.15);
  });

  test('noiseCorrelation reads the variogram of the series alone; the fold plan of cross-validation reads no more than it', () => {
    // the fold plan also reads two wavelet pilots' residuals and keeps the smallest reading (select/noiseDependence.ts)
    const y = ar1(300, 0.3, 21).map((v, i) => v + 0.01 * i);
    expect(noiseCorrelation(y).raw).toBe(variogramPhi(y));
    expect(noiseDependence(y, 5).phi).toBeLessThanOrEqual(variogramPhi(y));
  });

  test(`fewer than ${FEWEST_FOR_CORRELATION} points: taken as independent`, () => {
    const c = noiseCorrelation(ar1(FEWEST_FOR_CORRELATION - 1, 0.8, 3));
    expect(c.phi).toBe(0);
    expect(Number.isNaN(c.raw)).toBe(true);
    expect(c.penaltyFactor).toBe(1);
  });
});
