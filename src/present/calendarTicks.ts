/**
 * Axis ticks for dates that land on calendar boundaries: midnight of a day,
 * Mondays for weeks, the first of a month, quarter, half-year or year; hours
 * within a day. Inputs and ticks are Excel serial dates (see isoDate.ts).
 *
 * The step is the smallest calendar step that gives at most `maxTicks`
 * ticks, so a chart's width (divided by a label's width) sets the density.
 * Weeks start on Monday (ISO 8601).
 */
import { isDateSerial, serialFromParts, serialParts, serialToIso } from './isoDate';

export type TickUnit = 'hour' | 'day' | 'week' | 'month' | 'quarter' | 'half-year' | 'year';

export interface CalendarTicks {
  /** Tick positions as serials, increasing, within [lo, hi]. */
  ticks: number[];
  /** One label per tick. */
  labels: string[];
  unit: TickUnit;
  /** Number of units between ticks (e.g. 2 weeks, 5 years). */
  every: number;
}

const STEPS: { unit: TickUnit; every: number; days: number }[] = [
  { unit: 'hour', every: 1, days: 1 / 24 }, { unit: 'hour', every: 3, days: 3 / 24 }, { unit: 'hour', every: 6, days: 0.25 }, { unit: 'hour', every: 12, days: 0.5 },
  { unit: 'day', every: 1, days: 1 }, { unit: 'day', every: 2, days: 2 },
  { unit: 'week', every: 1, days: 7 }, { unit: 'week', every: 2, days: 14 },
  { unit: 'month', every: 1, days: 30.44 }, { unit: 'quarter', every: 1, days: 91.3 }, { unit: 'half-year', every: 1, days: 182.6 },
  ...[1, 2, 5, 10, 20, 50, 100, 200, 500, 1000].map((every) => ({ unit: 'year' as const, every, days: 365.25 * every })),
];

/** Whole months per tick of a month-based step. */
const MONTHS: Partial<Record<TickUnit, number>> = { month: 1, quarter: 3, 'half-year': 6, year: 12 };

function label(serial: number, unit: TickUnit): string {
  const iso = serialToIso(serial) ?? String(serial);
  const { y, m } = serialParts(serial);
  switch (unit) {
    case 'hour': return iso.replace('T', ' ').slice(5) + (iso.length === 10 ? ' 00:00' : '');
    case 'day': case 'week': return iso.slice(0, 10);
    case 'month': case 'half-year': return `${y}-${String(m).padStart(2, '0')}`;
    case 'quarter': return `${y} Q${Math.floor((m - 1) / 3) + 1}`;
    case 'year': return String(y);
  }
}

function generate(lo: number, hi: number, step: (typeof STEPS)[number]): number[] {
  const out: number[] = [];
  if (step.unit === 'hour' || step.unit === 'day') {
    const k = step.days;
    for (let t = Math.ceil(lo / k - 1e-9) * k; t <= hi + 1e-9; t += k) out.push(Math.round(t * 24) / 24);
    return out;
  }
  if (step.unit === 'week') {
    // serial 2 (1900-01-02) is a Monday; Monday <=> serial mod 7 === 2 from 1900-03-01 on.
    let t = Math.ceil(lo);
    while (((t % 7) + 7) % 7 !== 2) t++;
    // Biweekly ticks keep a fixed phase (even ISO-week count from serial 2) so panning does not shift them.
    if (step.every === 2 && ((t - 2) / 7) % 2 !== 0) t += 7;
    for (; t <= hi + 1e-9; t += 7 * step.every) out.push(t);
    return out;
  }
  const months = MONTHS[step.unit]! * (step.unit === 'year' ? step.every : 1);
  const start = serialParts(Math.max(1, Math.floor(lo)));
  // First boundary at or after lo, aligned to the step (months from year 0).
  let index = start.y * 12 + (start.m - 1);
  index = Math.ceil(index / months) * months;
  for (;; index += months) {
    const t = serialFromParts(Math.floor(index / 12), (index % 12) + 1, 1);
    if (t < lo - 1e-9) continue;
    if (t > hi + 1e-9) break;
    out.push(t);
  }
  return out;
}

/**
 * Calendar ticks for serial dates in [lo, hi], at most `maxTicks` of them
 * (at least 2 asked for). Returns an empty list when lo or hi is not a date
 * serial (1900-01-01 to 9999-12-31).
 *
 * @example calendarTicks(44928, 45012, 4) gives months: 2023-02, 2023-03, 2023-04 (labels "2023-02", ...)
 */
export function calendarTicks(lo: number, hi: number, maxTicks: number): CalendarTicks {
  const max = Math.max(2, Math.floor(maxTicks));
  if (!isDateSerial(lo) || !isDateSerial(hi) || !(hi > lo)) return { ticks: [], labels: [], unit: 'day', every: 1 };
  for (const step of STEPS) {
    if ((hi - lo) / step.days > max * 1.5 + 1) continue; // cheap skip of far too dense steps
    const ticks = generate(lo, hi, step);
    if (ticks.length <= max) return { ticks, labels: ticks.map((t) => label(t, step.unit)), unit: step.unit, every: step.every };
  }
  const last = STEPS[STEPS.length - 1];
  const ticks = generate(lo, hi, last);
  return { ticks, labels: ticks.map((t) => label(t, last.unit)), unit: last.unit, every: last.every };
}
