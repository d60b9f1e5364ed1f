import { recordingResolution } from '../../../src/engine/breaks/recordingResolution';
import { findBreaks } from '../../../src/engine/breaks/findBreaks';
import { prepareSeries } from '../../../src/engine/series';
import { normalStream } from '../../helpers/random';

describe('recordingResolution', () => {
  test('finds the grid of rounded decimals', () => {
    expect(recordingResolution(Float64Array.of(3.17, 3.31, 3.2, 3.25))).toBeCloseTo(0.01, 12);
    expect(recordingResolution(Float64Array.of(10, 30, 20, 50))).toBe(10);
  });
  test('returns 0 for continuous values or too few distinct values', () => {
    const z = normalStream(5);
    expect(recordingResolution(Float64Array.from({ length: 50 }, () => z()))).toBe(0);
    expect(recordingResolution(Float64Array.of(1, 2, 1, 2))).toBe(0);
  });
});

describe('meanvar on rounded data', () => {
  test('segments of repeated rounded values do not become breaks of their own', () => {
    // seeded: 200 values near 3.2 recorded to the cent, sd 0.04 then 0.12 from point 120
    const z = normalStream(77);
    const y = Array.from({ length: 200 }, (_, i) => Math.round((3.2 + (i >= 120 ? 0.12 : 0.04) * z()) * 100) / 100);
    const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'meanvar' });
    expect(r.breaks.length).toBeGreaterThanOrEqual(1);
    expect(r.breaks.length).toBeLessThanOrEqual(2);
    expect(r.breaks.some((b) => Math.abs(b.index - 120) <= 10)).toBe(true);
  });
});

describe('recordingResolution is free of scale and offset', () => {
  test('prices near 1e9 recorded to the cent, and the same prices scaled', () => {
    const z = normalStream(9);
    const cents = Array.from({ length: 300 }, () => Math.round(100 * 5 * z()));
    // values near 1e9 carry a rounding of about 1e-7, so q is found to about 1e-9 relative
    expect(recordingResolution(Float64Array.from(cents, (c) => 1e9 + c / 100)) / 0.01).toBeCloseTo(1, 6);
    expect(recordingResolution(Float64Array.from(cents, (c) => c / 100))).toBeCloseTo(0.01, 12);
    expect(recordingResolution(Float64Array.from(cents, (c) => (1e9 + c / 100) * 1e-9)) / 1e-11).toBeCloseTo(1, 6);
    expect(recordingResolution(Float64Array.from(cents, (c) => (1e9 + c / 100) * 1e15)) / 1e13).toBeCloseTo(1, 6);
  });
  test('1e9 + 0.13 is not a whole number', () => {
    expect(recordingResolution(Float64Array.of(1e9 + 0.13, 1e9 + 0.14, 1e9 + 1.13, 1e9 + 2.26, 1e9 + 3)) / 0.01).toBeCloseTo(1, 6);
    expect(recordingResolution(Float64Array.of(1e9 + 0.13, 1e9 + 2, 1e9 + 3, 1e9 + 5))).toBe(0);
  });
});
