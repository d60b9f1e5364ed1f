import { dataDecimals, formatFixed, formatNumber, roundForData } from '../../src/present';

describe('numbers at the data precision', () => {
  test('decimals of recorded data', () => {
    expect(dataDecimals([422, 448, 421])).toBe(0);
    expect(dataDecimals([3.17, 3.3, 3.2])).toBe(2);
    expect(dataDecimals([0.1 + 0.2])).toBe(1); // 0.30000000000000004 is 0.3 to binary rounding
    expect(dataDecimals([Math.PI])).toBe(10);
    expect(dataDecimals([NaN, 5])).toBe(0);
  });

  test('a fit of whole-number orders shows one decimal', () => {
    const r = roundForData([422, 448, 421, 560]);
    expect(r.format(494.9178872477054)).toBe('494.9');
    expect(r.round(494.9178872477054)).toBe(494.9);
  });

  test('prices in cents get three decimals; huge values stop at six significant digits; tiny ones keep two', () => {
    expect(roundForData([3.17, 3.3]).format(3.245678)).toBe('3.246');
    expect(roundForData([17401000, 18000000]).format(17412345.678)).toBe('17412300');
    expect(roundForData([1e-7, 3e-7]).format(2.71828e-7)).toBe('0.00000027');
    expect(roundForData([0.0000001, 0.000000314159]).format(2.71828e-7)).toBe('0.00000027183');
  });

  test('penalties and criteria: significant digits with exponents outside 1e-4..1e6', () => {
    expect(formatNumber(17401000000000)).toBe('1.74e13');
    expect(formatNumber(17401000000000, 2)).toBe('1.7e13');
    expect(formatNumber(0.000123456)).toBe('0.000123');
    expect(formatNumber(0.0000123456)).toBe('1.23e-5');
    expect(formatNumber(2.5)).toBe('2.5');
    expect(formatNumber(NaN)).toBe('-');
    expect(formatFixed(-0.04, 1)).toBe('0.0');
  });
});
