/** Excel's value kinds as the worksheet functions receive them. */
import { readColumn, toCell } from '../../src/functions/cells';

describe("Excel's value kinds", () => {
  test('a rich error value is an error cell, not text', () => {
    expect(toCell({ type: 'Error', basicValue: '#N/A', errorType: 'NotAvailable' })).toEqual({ error: '#N/A' });
    expect(toCell({ type: 'Double', basicValue: 3 })).toBe(3);
    expect(toCell({ code: '#DIV/0!', message: '' })).toEqual({ error: '#DIV/0!' });
  });

  test('a flat list is read as one column; a list mixing rows and values is refused', () => {
    expect(readColumn([1, 2, 3] as unknown as unknown[][], 'y').cells).toEqual([1, 2, 3]);
    expect(() => readColumn([[1], 2] as unknown as unknown[][], 'y')).toThrow(/y must be a range of cells \(rows of values\)/);
  });
});
