import { runCli, CliIO } from '../../src/cli/main';
import { parseCsv } from '../../src/cli/csv';
import { weeklyOrders, weeklyOrdersCsv } from '../../src/demo/weeklyOrders';
import { serialToIso } from '../../src/present';

function io(files: Record<string, string>) {
  const out: string[] = [], err: string[] = [];
  const host: CliIO = { readFile: (p) => { if (!(p in files)) throw new Error('no such file'); return files[p]; }, out: (t) => out.push(t), err: (t) => err.push(t) };
  return { host, out, err };
}

const demo = weeklyOrdersCsv();

describe('ISO dates in CSV files', () => {
  test('an ISO date column is read as Excel serials and marked as dates', () => {
    const t = parseCsv(demo);
    expect(t.dateColumns).toEqual([true, false, false, false]);
    expect(t.rows.map((r) => r[0])).toEqual(weeklyOrders().map((r) => r.weekStart));
    const timed = parseCsv('when,v\n2023-01-02 06:00,1\n2023-01-02T18:30:00,2\n');
    expect(timed.rows.map((r) => r[0])).toEqual([44928.25, 44928 + 18.5 / 24]);
  });

  test('JSON keeps the serial and adds ISO 8601 beside it; text shows dates', () => {
    const a = io({ 'd.csv': demo });
    expect(runCli(['breaks', 'd.csv', '--x', 'week_start', '--y', 'returns', '--model', 'poisson', '--json'], a.host)).toBe(0);
    const o = JSON.parse(a.out.join(''));
    expect(o.xDates).toBe(true);
    expect(o.breaks.length).toBeGreaterThanOrEqual(1);
    for (const b of o.breaks) { expect(typeof b.x).toBe('number'); expect(b.xDate).toBe(serialToIso(b.x)); expect(b.xDate).toMatch(/^\d{4}-\d{2}-\d{2}$/); }
    expect(o.segments[0].xStartDate).toBe('2023-01-02');
    expect(o.segments[o.segments.length - 1].xEndDate).toBe('2025-12-22');
    const b = io({ 'd.csv': demo });
    expect(runCli(['breaks', 'd.csv', '--x', 'week_start', '--y', 'returns', '--model', 'poisson'], b.host)).toBe(0);
    const text = b.out.join('\n');
    expect(text).toContain(`break at ${o.breaks[0].xDate} (row ${o.breaks[0].row})`);
    expect(text).not.toMatch(/\b4[45]\d{3}\b/); // no serial numbers in the text
    const c = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--x', 'week_start', '--y', 'orders', '--method', 'trend', '--json'], c.host)).toBe(0);
    const f = JSON.parse(c.out.join(''));
    for (const k of f.knots) expect(k.xDate).toBe(serialToIso(k.x));
  });

  test('numbers as x stay numbers, without date fields', () => {
    const a = io({ 'd.csv': 'x,y\n1,3\n2,5\n3,4\n4,9\n5,8\n6,12\n7,11\n8,15\n' });
    expect(runCli(['fit', 'd.csv', '--x', 'x', '--y', 'y', '--json'], a.host)).toBe(0);
    expect(JSON.parse(a.out.join('')).xDates).toBeUndefined();
  });

  test('a date column in another layout is refused with a message that names the layout read', () => {
    const a = io({ 'd.csv': 'day,v\n02/01/2023,1\n03/01/2023,2\n04/01/2023,3\n' });
    expect(runCli(['fit', 'd.csv', '--x', 'day', '--y', 'v'], a.host)).toBe(2);
    expect(a.err[0]).toMatch(/column "day": row 1 holds "02\/01\/2023", which looks like a date that cannot be read \(3 such rows\)\. Write dates as YYYY-MM-DD/);
  });

  test('an impossible ISO date is named with its data row (the first line after the header is row 1)', () => {
    const a = io({ 'd.csv': 'day,v\n2023-02-27,1\n2023-02-28,2\n2023-02-30,3\n' });
    expect(runCli(['fit', 'd.csv', '--x', 'day', '--y', 'v'], a.host)).toBe(2);
    expect(a.err[0]).toMatch(/row 3 holds "2023-02-30", which is not a valid ISO 8601 date/);
  });

  test('a column that merely contains the odd date-like text among words is left to the engine', () => {
    const a = io({ 'd.csv': 'x,v\n1,4\n2,n/a\n3,n/a\n4,6\n5,1/2/2023\n6,7\n' });
    expect(runCli(['fit', 'd.csv', '--x', 'x', '--y', 'v', '--df', '2'], a.host)).toBe(0);
  });
});
