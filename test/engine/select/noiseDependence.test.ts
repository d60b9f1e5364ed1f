/**
 * Cross-validation under correlated noise, on seeded series of our own: a
 * straight trend with one slope change of 0.8 at x = 90 (156 weekly points)
 * plus AR(1) noise. With ordinary interleaved folds, phi = 0.3 already made
 * cross-validation choose the smallest penalty (about 120 knots); leaving the
 * neighbours of held-out points out of training restores a handful of bends
 * with the planted one the largest.
 */
import { noiseDependence, foldPlan, dependencePhi, variogramPhi } from '../../../src/engine/select/noiseDependence';
import { blocks, doppler, noisyTestFunction } from '../smoothers/trendTestFunctions';
import { runAnalysis } from '../../../src/engine';
import { ar1Noise } from '../../helpers/random';


describe('noiseDependence', () => {
  test('noiseDependence recovers phi of AR(1) noise under a kinked trend, within 0.15', () => {
    for (const phi of [0.3, 0.5, 0.7]) {
      const e = ar1Noise(2000, phi, 4);
      const y = e.map((v, i) => 0.01 * i + 0.02 * Math.max(0, i - 900) + v);
      expect(Math.abs(noiseDependence(y, 5).phi - phi)).toBeLessThan(0.15);
    }
  });

  test('noiseDependence finds no dependence in independent noise with a level shift', () => {
    const e = ar1Noise(2000, 0, 8);
    const y = e.map((v, i) => v + (i > 1000 ? 5 : 0));
    const d = noiseDependence(y, 5);
    expect(d.phi).toBeLessThan(0.1);
    expect(d.buffer).toBe(0);
  });
});

describe('dependencePhi', () => {
  test('dependencePhi reads the independent noise on Doppler (Donoho & Johnstone 1994, SNR 7, 256 points) as independent enough for ordinary folds, where the variogram of the series reads its oscillation as strong dependence', () => {
    // measured, seeds 21-24: dependencePhi 0.00 to 0.13 (0.12 to 0.20 with one start per pilot), variogramPhi 0.41 to 0.95
    for (const seed of [21, 22, 23, 24]) {
      const d = noisyTestFunction(doppler, 256, seed);
      expect(variogramPhi(d.y)).toBeGreaterThan(0.4);
      expect(dependencePhi(d.y)).toBeLessThan(0.15);
      expect(noiseDependence(d.y, 5).buffer).toBe(0);
    }
  });

  test('dependencePhi reads the independent noise on Blocks (SNR 7, 256 points) as independent enough for ordinary folds: its jumps are left to the Haar pilot', () => {
    // measured, seeds 21-24: dependencePhi 0.00 to 0.13 (0.00 to 0.29 with one start per pilot), variogramPhi 0.00 to 0.81
    for (const seed of [21, 22, 23, 24]) {
      const d = noisyTestFunction(blocks, 256, seed);
      expect(dependencePhi(d.y)).toBeLessThan(0.15);
      expect(noiseDependence(d.y, 5).buffer).toBe(0);
    }
  });

  test('dependencePhi keeps the dependence of AR(1) noise under a kinked trend: within 0.05 at 2,000 points, and nearer the truth than the variogram of the series at 156 points', () => {
    for (const phi of [0.3, 0.5, 0.7]) {
      const e = ar1Noise(2000, phi, 4);
      expect(Math.abs(dependencePhi(e.map((v, i) => 0.01 * i + 0.02 * Math.max(0, i - 900) + v)) - phi)).toBeLessThan(0.05);
    }
    // 9 short weekly series (phi 0.3, 0.5, 0.7; seeds 1-3): mean absolute error measured 0.09 against the variogram's 0.22
    // (the pilots read 0.23 to 0.62, low rather than high: shorter buffers, blocks still held out)
    let errDep = 0, errVar = 0;
    for (const phi of [0.3, 0.5, 0.7]) {
      for (const seed of [1, 2, 3]) {
        const e = ar1Noise(156, phi, seed);
        const y = e.map((v, i) => 100 + 0.2 * (i + 1) + 0.8 * Math.max(0, i + 1 - 90) + 2 * v);
        errDep += Math.abs(dependencePhi(y) - phi) / 9;
        errVar += Math.abs(variogramPhi(y) - phi) / 9;
      }
    }
    expect(errDep).toBeLessThan(0.1);
    expect(errDep).toBeLessThan(errVar);
  });
});

describe('dependencePhi on the same array', () => {
  test('dependencePhi gives an array the same reading again, and a new one when its values change in place', () => {
    const y = ar1Noise(500, 0.6, 12).map((v, i) => v + 0.01 * i);
    const first = dependencePhi(y);
    expect(dependencePhi(y)).toBe(first);
    expect(dependencePhi([...y])).toBe(first);
    // the same array with other values (independent noise): read anew, as a copy of it is
    const z = ar1Noise(500, 0, 13);
    for (let i = 0; i < y.length; i++) y[i] = z[i];
    expect(dependencePhi(y)).toBe(dependencePhi([...z]));
    expect(dependencePhi(y)).not.toBe(first);
  });
});

describe('trend filtering with correlated noise', () => {
  test.each([0.3, 0.5])('default cross-validation keeps to a few bends under AR(1) noise with phi %s', (phi) => {
    for (const seed of [1, 2, 3]) {
      const e = ar1Noise(156, phi, seed);
      const x = e.map((_, i) => i + 1);
      const y = x.map((t, i) => 100 + 0.2 * t + 0.8 * Math.max(0, t - 90) + 2 * e[i]);
      const fit = runAnalysis({ analysis: 'trend', y, x }).smooth!;
      expect(fit.bends!.length).toBeLessThanOrEqual(10);
      const top = fit.bends!.find((b) => b.rank === 1)!;
      expect(Math.abs(top.x - 90)).toBeLessThanOrEqual(5);
    }
  });
});

describe('the noise setting of the smoothers', () => {
  test('foldPlan with independent noise gives ordinary folds where the estimate would hold out blocks', () => {
    const y = ar1Noise(400, 0.7, 5);
    expect(foldPlan(y, 5).buffer).toBeGreaterThan(0);
    expect(foldPlan(y, 5, 'independent')).toEqual({ phi: 0, buffer: 0, block: 1 });
  });

  test('trend filtering under AR(1) noise with phi 0.5: noise independent takes the correlated noise for trend (many more bends), as cross-validation with ordinary folds does', () => {
    // the reason the default reads the dependence: the same series and folds with the setting turned off
    const e = ar1Noise(156, 0.5, 1);
    const x = e.map((_, i) => i + 1);
    const y = x.map((t, i) => 100 + 0.2 * t + 0.8 * Math.max(0, t - 90) + 2 * e[i]);
    const read = runAnalysis({ analysis: 'trend', y, x }).smooth!;
    const assumed = runAnalysis({ analysis: 'trend', y, x, options: { noise: 'independent' } }).smooth!;
    expect(assumed.knots.length).toBeGreaterThan(2 * read.knots.length);
    // the autocorrelation warning of the default names the way out; with the setting it describes no blocks
    expect(runAnalysis({ analysis: 'trend', y, x }).warnings.some((w) => w.code === 'autocorrelation' && w.message.includes('set noise to independent'))).toBe(true);
    expect(assumed.warnings.some((w) => w.message.includes('held out blocks'))).toBe(false);
  });

  test('a smoother refuses the setting with a rule that does not cross-validate', () => {
    expect(() => runAnalysis({ analysis: 'spline', y: [1, 3, 2, 5, 4, 6, 5, 8], options: { rule: 'gcv', noise: 'independent' } })).toThrow(/noise applies only when rule is "cv" or "cv-simpler"/);
  });
});

