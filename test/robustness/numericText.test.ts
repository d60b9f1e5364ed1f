/** Text that spells a number is named as such, in notes and in the too-few-points refusal. */
import { prepareSeries } from '../../src/engine';

describe('numbers stored as text', () => {
  test('text with thousands separators, percent or currency signs is named a number stored as text', () => {
    const s = prepareSeries([1, '1,234', '12%', '$5', '-4.5%', 'n/a', 2, 3, 4]);
    expect(s.dropped.map((d) => d.reason)).toEqual(['numeric-text', 'numeric-text', 'numeric-text', 'numeric-text', 'text']);
  });

  test('too few points because numbers are stored as text says so', () => {
    expect(() => prepareSeries(['1', '2', '3', 4], null, null, { minPoints: 3 })).toThrow(/3 of them numbers stored as text: convert those cells to numbers/);
  });
});
