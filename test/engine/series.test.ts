import { prepareSeries, toColumn } from '../../src/engine/series';
import { KnotwiseError } from '../../src/engine/errors';

describe('prepareSeries', () => {
  test('drops non-numeric cells pairwise and records their rows', () => {
    const s = prepareSeries([3, '', 5, 'abc', true, '12', NaN, 7], [1, 2, 3, 4, 5, 6, 7, 8]);
    expect(Array.from(s.x)).toEqual([1, 3, 8]);
    expect(Array.from(s.y)).toEqual([3, 5, 7]);
    expect(s.dropped.map((d) => [d.row, d.reason])).toEqual([
      [1, 'blank'], [3, 'text'], [4, 'boolean'], [5, 'numeric-text'], [6, 'non-finite'],
    ]);
    expect(Array.from(s.rowOf)).toEqual([0, -1, 1, -1, -1, -1, -1, 2]);
    expect(s.warnings.map((w) => w.code)).toEqual(['dropped-cells']);
  });

  test('sorts unsorted x and maps rows back to their points', () => {
    const s = prepareSeries([30, 10, 20], [3, 1, 2]);
    expect(Array.from(s.x)).toEqual([1, 2, 3]);
    expect(Array.from(s.y)).toEqual([10, 20, 30]);
    expect(Array.from(s.rowOf)).toEqual([2, 0, 1]);
    expect(s.inputSorted).toBe(false);
    expect(s.warnings.map((w) => w.code)).toContain('unsorted-x');
  });

  test('merges tied x into one weighted point', () => {
    const s = prepareSeries([1, 2, 6], [5, 5, 7], [1, 3, 2]);
    expect(Array.from(s.x)).toEqual([5, 7]);
    expect(s.y[0]).toBeCloseTo((1 * 1 + 2 * 3) / 4, 15);
    expect(Array.from(s.w)).toEqual([4, 2]);
    expect(s.tiesMerged).toBe(1);
    expect(Array.from(s.rowOf)).toEqual([0, 0, 1]);
  });

  test('keeps ties as separate points when asked', () => {
    const s = prepareSeries([1, 2, 6], [5, 5, 7], null, { ties: 'keep' });
    expect(s.n).toBe(3);
  });

  test('omitted x is the row position, so dropped rows keep their gap', () => {
    const s = prepareSeries([1, null, 3]);
    expect(Array.from(s.x)).toEqual([1, 3]);
  });

  test('rejects mismatched shapes with the row counts in the message', () => {
    expect(() => prepareSeries([1, 2, 3], [1, 2])).toThrow(/x has 2 rows but y has 3/);
  });

  test('rejects negative weights naming the row', () => {
    expect(() => prepareSeries([1, 2, 3], null, [1, -2, 1])).toThrow(/weight in row 2 is -2/);
  });

  test('rejects constant x', () => {
    expect(() => prepareSeries([1, 2, 3], [4, 4, 4])).toThrow(KnotwiseError);
  });

  test('rejects too few usable points, counting the unusable rows', () => {
    expect(() => prepareSeries([1, 'a', 'b'], null, null, { minPoints: 3 })).toThrow(/need at least 3 usable points; got 1 \(2 of 3 rows/);
  });
});

describe('toColumn', () => {
  test('accepts a column or a row and refuses a block', () => {
    expect(toColumn([[1], [2]], 'y')).toEqual([1, 2]);
    expect(toColumn([[1, 2, 3]], 'y')).toEqual([1, 2, 3]);
    expect(() => toColumn([[1, 2], [3, 4]], 'y')).toThrow(/single column or a single row; got 2 rows by 2 columns/);
  });
});
