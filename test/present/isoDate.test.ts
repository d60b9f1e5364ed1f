import { spawnSync } from 'child_process';
import fc from 'fast-check';
import { isoToSerial, looksLikeIsoDate, serialFromParts, serialParts, serialToIso } from '../../src/present';

/**
 * Reference: Python's datetime (proleptic Gregorian calendar), run here with
 * Debian's /usr/bin/python3. Excel's 1900 system is days since 1899-12-30 from
 * serial 61 (1900-03-01) on, and days since 1899-12-31 below serial 60,
 * because Excel counts a 1900-02-29 that never existed (serial 60; a fact of
 * the trade, from Microsoft's documentation of the quirk).
 */
function pythonDates(serials: number[]): string[] {
  const script = [
    'import json, sys, datetime',
    'out = []',
    'for s in json.loads(sys.stdin.read()):',
    '    base = datetime.datetime(1899, 12, 30) if s >= 61 else datetime.datetime(1899, 12, 31)',
    '    t = base + datetime.timedelta(days=s)',
    '    out.append(t.strftime("%Y-%m-%d") if t.hour == 0 and t.minute == 0 and t.second == 0 else t.strftime("%Y-%m-%dT%H:%M:%S"))',
    'print(json.dumps(out))',
  ].join('\n');
  const r = spawnSync('/usr/bin/python3', ['-c', script], { input: JSON.stringify(serials), encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`python3 failed: ${r.stderr}`);
  return JSON.parse(r.stdout);
}

const trimSeconds = (s: string) => s.replace(/T(\d\d:\d\d):00$/, 'T$1');

describe('serial dates against Python datetime', () => {
  const serials = [1, 2, 31, 59, 61, 62, 366, 25569, 36526, 44927, 44928, 45291, 45292, 45351, 45352, 2958465, 44928.25, 44928.5, 44928.75, 45000 + 1 / 1440];
  const ref = pythonDates(serials);

  test('serialToIso gives the same calendar day and time as Python', () => {
    serials.forEach((s, i) => expect(serialToIso(s)).toBe(trimSeconds(ref[i])));
  });

  test('isoToSerial inverts it', () => {
    serials.forEach((s, i) => expect(isoToSerial(ref[i])).toBeCloseTo(s, 9));
  });

  test('1000 seeded integer serials agree with Python and round-trip', () => {
    const many = fc.sample(fc.integer({ min: 61, max: 2958465 }), { numRuns: 1000, seed: 7 });
    const r = pythonDates(many);
    many.forEach((s, i) => {
      expect(serialToIso(s)).toBe(r[i]);
      expect(isoToSerial(r[i])).toBe(s);
      const p = serialParts(s);
      expect(serialFromParts(p.y, p.m, p.d)).toBe(s);
    });
  });
});

describe("Excel's 1900 leap-year quirk", () => {
  test('serial 60 is the fictitious 1900-02-29 and both directions agree', () => {
    expect(serialToIso(59)).toBe('1900-02-28');
    expect(serialToIso(60)).toBe('1900-02-29');
    expect(serialToIso(61)).toBe('1900-03-01');
    expect(isoToSerial('1900-02-29')).toBe(60);
    expect(isoToSerial('1900-01-01')).toBe(1);
  });
});

describe('what is not a date', () => {
  test('impossible days, zones, other layouts and serials out of range are refused', () => {
    for (const t of ['2023-02-30', '2023-13-01', '2023-1-2', '02/01/2023', '2023-01-02Z', '2023-01-02T25:00', '1899-12-31', 'week 1', '']) expect(isoToSerial(t)).toBeUndefined();
    for (const s of [0, -5, 2958466, NaN, Infinity]) expect(serialToIso(s)).toBeUndefined();
  });
  test('text that looks like an attempt at an ISO date is recognised for messages', () => {
    expect(looksLikeIsoDate('2023-1-2')).toBe(true);
    expect(looksLikeIsoDate('2023-02-30')).toBe(true);
    expect(looksLikeIsoDate('12.5')).toBe(false);
  });
  test('a space may stand for the T, and seconds and milliseconds are read', () => {
    expect(isoToSerial('2023-01-02 06:00')).toBeCloseTo(44928.25, 12);
    expect(isoToSerial('2023-01-02T06:00:30.5')).toBeCloseTo(44928.25 + 30.5 / 86400, 12);
  });
});
