import { maxAbs } from '../../../src/engine/linalg/maxAbs';
import { sum } from '../../../src/engine/linalg/sum';
import { scaledInto } from '../../../src/engine/linalg/scaledInto';
import { dividedInto } from '../../../src/engine/linalg/dividedInto';
import { maxAbsDifference } from '../../../src/engine/linalg/maxAbsDifference';

describe('maxAbs', () => {
  test('maxAbs returns the largest magnitude, 0 for no entries, and NaN when an entry is NaN', () => {
    expect(maxAbs(Float64Array.of(1, -3, 2))).toBe(3);
    expect(maxAbs(Float64Array.of(-0.5))).toBe(0.5);
    expect(maxAbs(new Float64Array(0))).toBe(0);
    expect(maxAbs(Float64Array.of(1, NaN, 2))).toBeNaN();
  });
});

describe('sum', () => {
  test('sum adds in index order (the rounding of that order, not of a sorted or pairwise sum)', () => {
    // 1 + 1e-16 + 1e-16 in order rounds back to 1 each time; the small terms first would give 1 + 2.2e-16
    expect(sum(Float64Array.of(1, 1e-16, 1e-16))).toBe(1);
    expect(sum(Float64Array.of(1e-16, 1e-16, 1))).toBe(1e-16 + 1e-16 + 1);
    expect(sum(Float64Array.of(1e-16, 1e-16, 1))).not.toBe(1);
    expect(sum(new Float64Array(0))).toBe(0);
  });
});

describe('scaledInto', () => {
  test('scaledInto writes sc times the first m entries and leaves the rest of the target alone', () => {
    const to = Float64Array.of(9, 9, 9);
    scaledInto(-2, Float64Array.of(1.5, -3, 4), to, 2);
    expect(Array.from(to)).toEqual([-3, 6, 9]);
    // in place
    const v = Float64Array.of(1, 2);
    scaledInto(0.5, v, v, 2);
    expect(Array.from(v)).toEqual([0.5, 1]);
  });
});

describe('dividedInto', () => {
  test('dividedInto writes the first m entries divided by c (a division, not a product with 1 / c) and leaves the rest alone', () => {
    const to = Float64Array.of(9, 9, 9);
    dividedInto(Float64Array.of(1, -3, 4), 3, to, 2);
    expect(Array.from(to)).toEqual([1 / 3, -1, 9]);
    // in place; 0.1 / 7 and 0.1 * (1 / 7) differ in the last bit: the kernel divides
    const v = Float64Array.of(0.1, 0.7);
    dividedInto(v, 7, v, 2);
    expect(Array.from(v)).toEqual([0.1 / 7, 0.7 / 7]);
    expect(0.1 / 7).not.toBe(0.1 * (1 / 7));
  });
});

describe('maxAbsDifference', () => {
  test('maxAbsDifference returns the largest |a_i - b_i| over the first m entries, 0 for m = 0, and NaN when a difference is NaN', () => {
    expect(maxAbsDifference(Float64Array.of(1, 5, -2), Float64Array.of(2, 2, 2), 3)).toBe(4);
    // entries from m on are not read
    expect(maxAbsDifference(Float64Array.of(1, 5, 100), Float64Array.of(2, 2, 0), 2)).toBe(3);
    expect(maxAbsDifference(new Float64Array(0), new Float64Array(0), 0)).toBe(0);
    expect(maxAbsDifference(Float64Array.of(1, NaN), Float64Array.of(1, 0), 2)).toBeNaN();
  });
});
