import { calendarTicks, isoToSerial, serialParts, serialToIso } from '../../src/present';

const d = (iso: string) => isoToSerial(iso)!;

describe('calendarTicks', () => {
  test('three years of weekly data at 4 ticks land on years or half-years, each a first of the month', () => {
    const t = calendarTicks(d('2023-01-02'), d('2025-12-22'), 4);
    expect(t.ticks.length).toBeGreaterThanOrEqual(2);
    expect(t.ticks.length).toBeLessThanOrEqual(4);
    for (const s of t.ticks) expect(serialParts(s).d).toBe(1);
    expect(t.unit).toBe('year');
    expect(t.labels).toEqual(['2024', '2025']);
  });

  test('more room gives quarters, labelled with the quarter, on 1 Jan/Apr/Jul/Oct', () => {
    const t = calendarTicks(d('2023-01-02'), d('2025-12-22'), 12);
    expect(t.unit).toBe('quarter');
    for (const s of t.ticks) { const p = serialParts(s); expect(p.d).toBe(1); expect([1, 4, 7, 10]).toContain(p.m); }
    expect(t.labels[0]).toBe('2023 Q2');
  });

  test('months for a few months, weeks on Mondays for a few weeks, days for a few days', () => {
    const m = calendarTicks(d('2023-01-02'), d('2023-05-20'), 6);
    expect(m.unit).toBe('month');
    expect(m.labels).toEqual(['2023-02', '2023-03', '2023-04', '2023-05']);
    const w = calendarTicks(d('2023-01-01'), d('2023-02-10'), 6);
    expect(w.unit).toBe('week');
    // 2023-01-02 was a Monday (common knowledge; checked against Python's weekday() in isoDate's reference test range)
    for (const s of w.ticks) expect(new Date(Date.UTC(1899, 11, 30) + s * 86400000).getUTCDay()).toBe(1);
    const dd = calendarTicks(d('2023-01-01'), d('2023-01-04'), 6);
    expect(dd.unit).toBe('day');
    expect(dd.labels).toEqual(['2023-01-01', '2023-01-02', '2023-01-03', '2023-01-04']);
  });

  test('never more ticks than asked, and every tick inside the range, over many ranges', () => {
    for (let lo = 30000; lo < 50000; lo += 997) {
      for (const span of [0.3, 3, 20, 95, 400, 2000, 20000]) {
        for (const max of [2, 3, 5, 8]) {
          const t = calendarTicks(lo, lo + span, max);
          expect(t.ticks.length).toBeLessThanOrEqual(max);
          for (const s of t.ticks) { expect(s).toBeGreaterThanOrEqual(lo - 1e-9); expect(s).toBeLessThanOrEqual(lo + span + 1e-9); }
          expect(t.labels).toHaveLength(t.ticks.length);
        }
      }
    }
  });

  test('hours within a day', () => {
    const t = calendarTicks(d('2023-01-02'), d('2023-01-02T18:00'), 4);
    expect(t.unit).toBe('hour');
    expect(t.labels).toEqual(['01-02 00:00', '01-02 06:00', '01-02 12:00', '01-02 18:00']);
    expect(serialToIso(t.ticks[1])).toBe('2023-01-02T06:00');
  });

  test('not dates: no ticks', () => {
    expect(calendarTicks(-3, 5, 4).ticks).toEqual([]);
  });
});
