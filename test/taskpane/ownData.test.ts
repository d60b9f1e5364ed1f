import { isWorkbookName, readOwnTable, readOwnWorkbook } from '../../src/taskpane/ownData';

describe('pasted cells and CSV files in the preview', () => {
  test('tab-separated cells with ISO dates become serials in a date column', () => {
    const t = readOwnTable('week\tsales\n2024-01-01\t100\n2024-01-08\t\n2024-01-15\t103.5\n');
    expect(t.header).toEqual(['week', 'sales']);
    expect(t.dateColumns).toEqual([true, false]);
    expect(t.rows).toEqual([[45292, 100], [45299, ''], [45306, 103.5]]);
    expect(t.notes).toEqual([]);
  });

  test('comma- and semicolon-separated files are read too; text stays text for the engine to report', () => {
    expect(readOwnTable('x,y\n1,2\n2,n/a\n').rows).toEqual([[1, 2], [2, 'n/a']]);
    expect(readOwnTable('x;y\n1;2\n2;3\n').rows).toEqual([[1, 2], [2, 3]]);
  });

  test('dates in another layout are named with their sheet row', () => {
    const t = readOwnTable('day,v\n02/01/2024,1\n03/01/2024,2\n');
    expect(t.dateColumns).toEqual([false, false]);
    expect(t.notes[0]).toBe('column "day" holds 2 dates that could not be read (first in sheet row 2: "02/01/2024"); write dates as YYYY-MM-DD, optionally with a time (YYYY-MM-DD HH:MM).');
  });

  test('a header alone is refused', () => {
    expect(() => readOwnTable('a\tb\n')).toThrow(/no data found/);
  });
});

describe('.xlsx workbooks in the preview', () => {
  // The seeded workbook written by test/cli/fixtures/make_depot_workbook.py (Debian's python3-openpyxl)
  const fs = require('fs') as typeof import('fs');
  const path = require('path') as typeof import('path');
  const bytes = () => new Uint8Array(fs.readFileSync(path.join(__dirname, '../cli/fixtures/depot-weekly.xlsx')));

  test('the first sheet by default: date cells become serials in a date column, the odd cells as the CSV reader gives them', async () => {
    const w = await readOwnWorkbook(bytes());
    expect(w.sheets).toEqual(['Weekly', 'Monthly', 'Empty']);
    expect(w.sheet).toBe('Weekly');
    expect(w.table.header).toEqual(['week_start', 'parcels', 'returns']);
    expect(w.table.dateColumns).toEqual([true, false, false]);
    expect(w.table.rows[0][0]).toBe(45292); // 2024-01-01
    // the same data as CSV, read by the same preview reader, gives the same sheet
    const csv = readOwnTable(fs.readFileSync(path.join(__dirname, '../cli/fixtures/depot-weekly.csv'), 'utf8'));
    expect(w.table.rows).toEqual(csv.rows);
    expect(w.table.rows.map((r) => r[1]).filter((c) => typeof c !== 'number')).toEqual(['', 'n/a', '#N/A', true, ' 512.5']);
    expect(w.table.notes).toEqual([]);
  });

  test('another sheet by name; an empty sheet and a file that is not .xlsx are refused in plain words', async () => {
    const m = await readOwnWorkbook(bytes(), 'Monthly');
    expect(m.table.header).toEqual(['month', 'value']);
    expect(m.table.rows).toHaveLength(24);
    expect(m.table.dateColumns).toEqual([false, false]);
    await expect(readOwnWorkbook(bytes(), 'Empty')).rejects.toThrow('sheet "Empty" is empty; choose another sheet.');
    await expect(readOwnWorkbook(new TextEncoder().encode('a,b\n1,2\n'))).rejects.toThrow(/not an \.xlsx workbook/);
  });

  test('file names that say workbook', () => {
    expect(['a.xlsx', 'B.XLSM', 'c.csv', 'd.xls', 'xlsx.txt'].map(isWorkbookName)).toEqual([true, true, false, false, false]);
  });
});
