/**
 * The command line on .xlsx workbooks. The fixture test/cli/fixtures/depot-weekly.xlsx
 * and the same data as CSV (depot-weekly.csv) are written by the seeded script
 * make_depot_workbook.py beside them with Debian's python3-openpyxl (a writer outside
 * the project): the two files must give identical results.
 */
import * as fs from 'fs';
import * as path from 'path';
import { readSheet } from 'read-excel-file/node';
import { CliIO, runCli, runCliWith, runColumn } from '../../src/cli/main';
import { dateToSerial, readWorkbookTable, sheetErrorCells, workbookSheets, SheetReader } from '../../src/cli/xlsx';
import { isoToSerial } from '../../src/present/isoDate';

const DIR = path.join(__dirname, 'fixtures');
const XLSX = path.join(DIR, 'depot-weekly.xlsx');
const CSV = path.join(DIR, 'depot-weekly.csv');
const read = readSheet as unknown as SheetReader;

function host(extra: Record<string, Buffer> = {}) {
  const out: string[] = [], err: string[] = [];
  const file = (p: string) => { if (p in extra) return extra[p]; return fs.readFileSync(p); };
  const io: CliIO = {
    readFile: (p) => file(p).toString('utf8'),
    readBytes: (p) => file(p),
    readWorkbook: read,
    out: (t) => out.push(t), err: (t) => err.push(t),
  };
  return { io, out, err };
}

const inOrder = async (jobs: Parameters<typeof runColumn>[0][]) => jobs.map(runColumn);

async function run(args: string[], extra?: Record<string, Buffer>) {
  const h = host(extra);
  const code = await runCliWith(args, h.io, inOrder);
  return { code, out: h.out.join('\n'), err: h.err };
}

describe('knotwise on .xlsx workbooks', () => {
  test.each(['fit', 'breaks', 'decompose'])('%s: the workbook gives the same result as the same data in CSV', async (cmd) => {
    const extra = cmd === 'decompose' ? ['--period', '4'] : [];
    const x = await run([cmd, XLSX, '--x', 'week_start', '--y', 'parcels', '--json', ...extra]);
    const c = await run([cmd, CSV, '--x', 'week_start', '--y', 'parcels', '--json', ...extra]);
    expect(x.err).toEqual([]);
    expect(c.err).toEqual([]);
    expect(x.code).toBe(0);
    // each candidate's time (milliseconds) differs between runs
    const timeless = (t: string) => JSON.parse(t.replace(/"milliseconds":\d+/g, '"milliseconds":0'));
    expect(timeless(x.out)).toEqual(timeless(c.out));
  });

  test('date cells come out as ISO dates in JSON, and the odd cells are left out with the worksheet reasons and data-row numbers', async () => {
    const r = await run(['fit', XLSX, '--x', 'week_start', '--y', 'parcels', '--json']);
    const o = JSON.parse(r.out);
    expect(o.xDates).toBe(true);
    expect(o.nRows).toBe(60);
    expect(o.n).toBe(55);
    // blank, text, error, boolean, number stored as text: data rows 10, 20, 30, 40, 45 (sheet rows 11, 21, ...)
    const dropped = o.warnings.find((w: any) => w.code === 'dropped-cells').message;
    expect(dropped).toMatch(/1 blank \(row 10\); 1 text \(row 20\); 1 an error value \(row 30\); 1 TRUE\/FALSE \(row 40\); 1 a number stored as text .*\(row 45\)/);
    for (const row of [10, 20, 30, 40, 45]) expect(o.fitted[row - 1]).toBeNull();
    // the text summary shows the same rows by date
    const t = await run(['breaks', XLSX, '--x', 'week_start', '--y', 'parcels', '--json']);
    const b = JSON.parse(t.out);
    expect(b.segments[0].xStartDate).toBe('2024-01-01');
    expect(b.segments[b.segments.length - 1].xEndDate).toBe('2025-02-17'); // 2024-01-01 + 59 weeks
    for (const k of b.breaks) expect(k.xDate).toMatch(/^\d{4}-\d{2}-\d{2}$/);
  });

  test('--sheet chooses a sheet by name (any case) or number; the default is the first', async () => {
    const byName = await run(['fit', XLSX, '--sheet', 'monthly', '--method', 'spline', '--json']);
    const byNumber = await run(['fit', XLSX, '--sheet', '2', '--method', 'spline', '--json']);
    expect(byName.code).toBe(0);
    expect(JSON.parse(byName.out)).toEqual(JSON.parse(byNumber.out));
    expect(JSON.parse(byName.out).column).toBe('value');
    expect(JSON.parse(byName.out).n).toBe(24);
    const first = JSON.parse((await run(['fit', XLSX, '--json'])).out);
    expect(first.column).toBe('returns');
  });

  test('one-line refusals: unknown sheet (listing them), empty sheet, a file that is not .xlsx, --sheet with CSV', async () => {
    const unknown = await run(['fit', XLSX, '--sheet', 'Daily']);
    expect(unknown.code).toBe(2);
    expect(unknown.err).toEqual([`knotwise: ${XLSX}: no sheet "Daily"; the workbook has 3 sheets: 1="Weekly", 2="Monthly", 3="Empty".`]);
    const tooFar = await run(['fit', XLSX, '--sheet', '4']);
    expect(tooFar.err[0]).toMatch(/no sheet "4"; the workbook has 3 sheets/);
    const empty = await run(['fit', XLSX, '--sheet', 'Empty']);
    expect(empty.code).toBe(1);
    expect(empty.err).toEqual([`knotwise: ${XLSX}: sheet "Empty" is empty; choose another sheet.`]);
    const notXlsx = await run(['fit', 'fake.xlsx'], { 'fake.xlsx': Buffer.from('week,value\n1,2\n') });
    expect(notXlsx.code).toBe(1);
    expect(notXlsx.err).toEqual(['knotwise: fake.xlsx: the file is not an .xlsx workbook (an .xlsx file is a zip archive); save it from Excel as .xlsx, or give a CSV file.']);
    const oldXls = await run(['fit', 'old.xls'], { 'old.xls': Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]) });
    expect(oldXls.err).toEqual(['knotwise: old.xls: this is an Excel 97-2003 workbook (.xls), which is not read; save it as .xlsx or CSV.']);
    const zipNotWorkbook = await run(['fit', 'a.zip'], { 'a.zip': fs.readFileSync(XLSX).subarray(0, 30) });
    expect(zipNotWorkbook.code).toBe(1);
    expect(zipNotWorkbook.err).toHaveLength(1);
    expect(zipNotWorkbook.err[0]).toMatch(/^knotwise: a\.zip: the file (is a zip archive but not an Excel workbook|cannot be read as an \.xlsx workbook)/);
    const csvSheet = await run(['fit', CSV, '--sheet', '1']);
    expect(csvSheet.code).toBe(2);
    expect(csvSheet.err).toEqual([`knotwise: --sheet applies to .xlsx workbooks; ${CSV} is read as CSV.`]);
  });

  test('the synchronous entry (CSV only) refuses a workbook by name rather than reading it as text', () => {
    const h = host();
    expect(runCli(['fit', XLSX], h.io)).toBe(2);
    expect(h.err[0]).toMatch(/reads CSV files only/);
  });

  test('--sheet is in the help, from the option table', () => {
    const h = host();
    runCli(['help'], h.io);
    expect(h.out.join('\n')).toMatch(/--sheet NAME\s+with an \.xlsx file: the sheet to read/);
  });
});

describe('workbook cells as engine cells', () => {
  const bytes = new Uint8Array(fs.readFileSync(XLSX));

  test('sheets in tab order with their parts; the error cell found in the sheet XML', () => {
    expect(workbookSheets(bytes)).toEqual([
      { name: 'Weekly', path: 'xl/worksheets/sheet1.xml' },
      { name: 'Monthly', path: 'xl/worksheets/sheet2.xml' },
      { name: 'Empty', path: 'xl/worksheets/sheet3.xml' },
    ]);
    // #N/A at B31 (data row 30): row index 30 from A1, column 1
    expect([...sheetErrorCells(bytes, 'xl/worksheets/sheet1.xml')]).toEqual([['30,1', '#N/A']]);
  });

  test('cells keep their types; dates become the serials ISO dates give in CSV', async () => {
    const { table, sheets } = await readWorkbookTable(fs.readFileSync(XLSX), undefined, read);
    expect(sheets).toEqual(['Weekly', 'Monthly', 'Empty']);
    expect(table.header).toEqual(['week_start', 'parcels', 'returns']);
    expect(table.dateColumns).toEqual([true, false, false]);
    expect(table.rows[0][0]).toBe(isoToSerial('2024-01-01'));
    expect(table.rows.map((r) => r[1]).filter((c) => typeof c !== 'number')).toEqual([null, 'n/a', { error: '#N/A' }, true, ' 512.5']);
    expect(dateToSerial(new Date(Date.UTC(2024, 0, 1, 12)))).toBe(45292.5);
  });

  test('a column mostly of dates stored as text is refused with the row and how to fix it', async () => {
    // sheet data as read-excel-file gives it: text cells that look like dates
    const fake: SheetReader = async () => [['day', 'v'], ['2024-01-01', 1], ['2024-01-08', 2], ['2024-01-15', 3]];
    const h = host({ 'text-dates.xlsx': Buffer.from(fs.readFileSync(XLSX)) });
    h.io.readWorkbook = fake;
    expect(await runCliWith(['fit', 'text-dates.xlsx', '--x', 'day', '--y', 'v'], h.io, inOrder)).toBe(2);
    expect(h.err).toEqual(['knotwise: column "day": row 1 holds the text "2024-01-01", a date stored as text (3 such rows); store the dates as date cells (or serial numbers), or save the sheet as CSV with dates as YYYY-MM-DD; rows count the sheet\'s data rows, the first after the header being row 1.']);
  });
});
