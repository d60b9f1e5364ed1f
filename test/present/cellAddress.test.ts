import { cellsInMessage, columnLetters, columnIndex, parseRangeAddress, rangeName } from '../../src/present';

describe('cell addresses', () => {
  test('column letters both ways (A1 notation: Z then AA, AZ then BA, XFD is the last column)', () => {
    expect([0, 25, 26, 51, 52, 16383].map(columnLetters)).toEqual(['A', 'Z', 'AA', 'AZ', 'BA', 'XFD']);
    for (let i = 0; i < 20000; i += 37) expect(columnIndex(columnLetters(i))).toBe(i);
  });

  test('range addresses with sheets, quotes and dollars', () => {
    expect(parseRangeAddress('Sheet1!B2:C157')).toEqual({ sheet: 'Sheet1', col: 1, row: 2, lastCol: 2, lastRow: 157 });
    expect(parseRangeAddress("'My ''data'''!$AA$10")).toEqual({ sheet: "My 'data'", col: 26, row: 10, lastCol: 26, lastRow: 10 });
    expect(parseRangeAddress('A:A')).toBeUndefined();
    expect(rangeName("My 'data'", 1, 2, 1, 9)).toBe("'My ''data'''!B2:B9");
    expect(rangeName('Demo', 3, 1)).toBe('Demo!D1');
  });

  test("the engine's 1-based data rows become the y column's cells below the header", () => {
    // The demo's blanks: data rows 34 and 35 (0-based 33, 34) and the text "n/a" in data row 121; header in row 1.
    const m = '3 of 156 rows left out: 2 blank (row 34, 35); 1 text (row 121). Their output cells are left empty.';
    expect(cellsInMessage(m, { firstRow: 2, yCol: 1 })).toBe('3 of 156 rows left out: 2 blank (cells B35, B36); 1 text (cell B122). Their output cells are left empty.');
    expect(cellsInMessage('rows: row 1, 2, 3, 4, 5 and 7 more.', { firstRow: 10, yCol: 0 })).toBe('rows: cells A10, A11, A12, A13, A14 and 7 more.');
    expect(cellsInMessage('x has 1 rows but y has 2', { firstRow: 2, yCol: 1 })).toBe('x has 1 rows but y has 2');
  });
});
