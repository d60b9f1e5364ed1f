/** Checks of the difference-based noise scales against seeded noise of known sd. */
import { differenceSigma, differenceSd, noiseScale } from '../../src/engine/robustSigma';
import { seededNormal } from './smoothers/trendTestFunctions';

describe('differenceSigma', () => {
  test('estimates the noise sd of a smooth signal plus noise within 5% (n = 20000, orders 1 and 2)', () => {
    // MAD of differences / sqrt(2) or sqrt(6): common practice for smooth signals
    const rn = seededNormal(17);
    const n = 20000;
    const y = Float64Array.from({ length: n }, (_, i) => Math.sin(i / 500) * 3 + 0.25 * rn());
    expect(Math.abs(differenceSigma(y, 1) / 0.25 - 1)).toBeLessThan(0.05);
    expect(Math.abs(differenceSigma(y, 2) / 0.25 - 1)).toBeLessThan(0.05);
  });

  test('with weights, estimates sigma when var(y_i) = sigma^2 / w_i (weights 1 and 4 alternating)', () => {
    const rn = seededNormal(18);
    const n = 20000;
    const w = Float64Array.from({ length: n }, (_, i) => (i % 2 ? 4 : 1));
    const y = Float64Array.from({ length: n }, (_, i) => Math.sin(i / 500) + (0.3 / Math.sqrt(w[i])) * rn());
    expect(Math.abs(differenceSigma(y, 1, w) / 0.3 - 1)).toBeLessThan(0.05);
    expect(Math.abs(differenceSigma(y, 2, w) / 0.3 - 1)).toBeLessThan(0.05);
    // ignoring the weights misjudges it: the mean variance of a difference is (1 + 1/4) / 2 of the unit-weight one
    expect(Math.abs(differenceSigma(y, 1) / 0.3 - 1)).toBeGreaterThan(0.15);
  });
});

describe('noiseScale', () => {
  test('falls back to the sd of differences when most differences are equal, with a note', () => {
    // a ramp with every tenth step doubled: the MAD of differences is 0, their sd is not
    const y = Float64Array.from({ length: 200 }, (_, i) => i + Math.floor(i / 10));
    expect(differenceSigma(y, 1)).toBe(0);
    const r = noiseScale(y, 1);
    expect(r.value).toBeCloseTo(differenceSd(y, 1), 15);
    expect(r.value).toBeGreaterThan(0);
    expect(r.note).toMatch(/most successive differences are equal/);
  });

  test('uses 1 with a note for points on one straight line (order 2)', () => {
    const r = noiseScale(Float64Array.from({ length: 50 }, (_, i) => 3 + 2 * i), 2);
    expect(r.value).toBe(1);
    expect(r.note).toMatch(/one straight line/);
  });

  test('gives no note when the robust estimate exists', () => {
    const rn = seededNormal(19);
    expect(noiseScale(Float64Array.from({ length: 100 }, () => rn()), 1).note).toBeUndefined();
  });
});
