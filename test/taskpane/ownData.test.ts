import { readOwnTable } from '../../src/taskpane/ownData';

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
