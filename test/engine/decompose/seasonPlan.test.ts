import { seasonPlan, serialDate, looksLikeDates, YEAR_DAYS } from '../../../src/engine/decompose/seasonPlan';
import { KnotwiseError } from '../../../src/engine/errors';
import { decompose } from '../../../src/engine/decompose/decompose';
import { seriesFromArrays } from '../../../src/engine/series';

const serial = (y: number, m: number, d: number) => Math.round(Date.UTC(y, m, d) / 86400000) + 25569;

describe('seasonPlan: the season read from x', () => {
  test('Excel serials: 45292 is Monday 1 January 2024 (common knowledge of the 1900 date system)', () => {
    expect(serialDate(45292)).toEqual({ year: 2024, month: 0, weekday: 1 });
  });
  test('quarterly dates: 4 phases by calendar quarter, gaps keep their phase', () => {
    const x = Float64Array.from([0, 1, 2, 4, 5, 6, 7, 9, 10, 11, 12], (q) => serial(2018, 3 * q, 1));
    const p = seasonPlan(x, undefined, 'auto', true);
    expect(p.spacing).toBe('quarterly');
    expect(Array.from(p.grid)).toEqual([0, 1, 2, 4, 5, 6, 7, 9, 10, 11, 12]);
    const t = p.terms[0];
    expect(t.kind === 'cycle' && Array.from(t.phase)).toEqual([0, 1, 2, 0, 1, 2, 3, 1, 2, 3, 0]);
  });
  test('weekly dates: one yearly Fourier term of 365.2425 days (52.18 weeks), on the dates themselves', () => {
    const x = Float64Array.from({ length: 160 }, (_, i) => serial(2020, 0, 6) + 7 * i);
    const p = seasonPlan(x, undefined, 'auto', true);
    expect(p.spacing).toBe('weekly');
    expect(p.terms).toEqual([{ kind: 'fourier', label: 'yearly', length: YEAR_DAYS, harmonics: 10, onGrid: false }]);
  });
  test('daily dates under two years: weekday only, with a note that the yearly season was not looked for', () => {
    const x = Float64Array.from({ length: 400 }, (_, i) => serial(2021, 0, 1) + i);
    const p = seasonPlan(x, undefined, 'auto', true);
    expect(p.terms.map((t) => t.label)).toEqual(['weekday']);
    expect(p.notes.join(' ')).toMatch(/A yearly season was not looked for/);
  });
  test('exactly two cycles are not enough (STL needs more than two): 730 days get no yearly term, 24 months no season, and decompose runs', () => {
    const days = Float64Array.from({ length: 730 }, (_, i) => serial(2021, 0, 1) + i);
    expect(seasonPlan(days, undefined, 'auto', true).terms.map((t) => t.label)).toEqual(['weekday']);
    expect(seasonPlan(Float64Array.from({ length: 731 }, (_, i) => serial(2021, 0, 1) + i), undefined, 'auto', true).terms.map((t) => t.label)).toEqual(['weekday', 'yearly']);
    const months = Float64Array.from({ length: 24 }, (_, m) => Math.round(Date.UTC(2015, m, 1) / 86400000) + 25569);
    const monthly = seasonPlan(months, undefined, 'auto', true);
    expect(monthly.terms).toEqual([]);
    expect(monthly.notes.join(' ')).toMatch(/monthly season was not looked for: the data span 24 steps, not more than two cycles \(24\)/);
    const y = Float64Array.from(months, (_, m) => 10 + (m % 12) + 0.1 * m);
    expect(() => decompose(seriesFromArrays(months, y))).not.toThrow();
  });
  test('a given period that is not a whole number becomes a Fourier term on the grid', () => {
    const x = Float64Array.from({ length: 60 }, (_, i) => 3 + 0.5 * i);
    const p = seasonPlan(x, [12.5], false, true);
    expect(p.terms).toEqual([{ kind: 'fourier', label: 'period 12.5', length: 12.5, harmonics: 5, onGrid: true }]);
  });
  test('small whole numbers are not dates; dates: true on them is refused', () => {
    expect(looksLikeDates(Float64Array.of(1, 2, 3))).toBe(false);
    expect(() => seasonPlan(Float64Array.of(1, 2, 3), undefined, true, true)).toThrow(KnotwiseError);
  });
  test('weekly dates go to the nearest week; two dates in one week are refused with both dates', () => {
    const x = Float64Array.from({ length: 20 }, (_, i) => serial(2020, 0, 6) + 7 * i);
    x[7] += 3;
    expect(Array.from(seasonPlan(x, undefined, 'auto', true).grid).slice(6, 9)).toEqual([6, 7, 8]);
    x[7] += 1;
    expect(() => seasonPlan(x, undefined, 'auto', true)).toThrow(/two points fall on the same week \(x = 43889 and 43892\)/);
  });
});
