/**
 * Sheet addresses (A1 notation) for results: the engine counts input rows
 * from 0 within the data it was given; the analyst thinks in cells such as
 * B36. These helpers translate, given where the data sit on the sheet.
 */

/** Column letters of a 0-based column index: 0 -> A, 25 -> Z, 26 -> AA. */
export function columnLetters(index: number): string {
  let n = Math.floor(index) + 1;
  let s = '';
  while (n > 0) { const r = (n - 1) % 26; s = String.fromCharCode(65 + r) + s; n = Math.floor((n - 1) / 26); }
  return s;
}

/** 0-based column index of column letters: A -> 0, AA -> 26. */
export function columnIndex(letters: string): number {
  let n = 0;
  for (const ch of letters.toUpperCase()) n = n * 26 + (ch.charCodeAt(0) - 64);
  return n - 1;
}

/** A range address split into sheet name and its top-left and bottom-right cells (0-based column, 1-based row). */
export interface RangeAddress {
  sheet: string | null;
  col: number;
  row: number;
  lastCol: number;
  lastRow: number;
}

/**
 * Parses "Sheet1!B2:C157", "'My sheet'!$B$2:$C$157", "B2" or "B2:C9".
 * Returns undefined for anything else (whole columns such as "A:A" included).
 */
export function parseRangeAddress(address: string): RangeAddress | undefined {
  const bang = address.lastIndexOf('!');
  const sheet = bang >= 0 ? address.slice(0, bang).replace(/^'(.*)'$/, '$1').replace(/''/g, "'") : null;
  const m = /^\$?([A-Za-z]{1,3})\$?(\d+)(?::\$?([A-Za-z]{1,3})\$?(\d+))?$/.exec(address.slice(bang + 1).trim());
  if (!m) return undefined;
  const col = columnIndex(m[1]), row = Number(m[2]);
  return { sheet, col, row, lastCol: m[3] ? columnIndex(m[3]) : col, lastRow: m[4] ? Number(m[4]) : row };
}

/** "B36": the cell of a 0-based column and 1-based sheet row. */
export function cellName(col: number, row: number): string {
  return `${columnLetters(col)}${row}`;
}

/** A range name "B2:B157" (or one cell), with its sheet when given ("Sheet1!B2:B157", quoted when needed). */
export function rangeName(sheet: string | null, col: number, row: number, lastCol = col, lastRow = row): string {
  const cells = col === lastCol && row === lastRow ? cellName(col, row) : `${cellName(col, row)}:${cellName(lastCol, lastRow)}`;
  if (!sheet) return cells;
  const q = /^[A-Za-z_][A-Za-z0-9_.]*$/.test(sheet) ? sheet : `'${sheet.replace(/'/g, "''")}'`;
  return `${q}!${cells}`;
}

/**
 * Where the data rows of a selection sit: the sheet row of input row 0
 * (after any header) and the column of the values a warning is about.
 */
export interface DataPlace {
  /** Sheet row (1-based) of the first data row. */
  firstRow: number;
  /** 0-based sheet column of the y values. */
  yCol: number;
}

/** The cell name of a 0-based input row in the y column. */
export function cellOfRow(place: DataPlace, row: number): string {
  return cellName(place.yCol, place.firstRow + row);
}

/**
 * Rewrites the engine's row references in a message ("row 34, 35 and 2 more",
 * 1-based data rows) as cell names in the y column ("cells B35, B36 and 2
 * more"), so a message names the cells the analyst sees.
 *
 * @example cellsInMessage('2 blank (row 34, 35).', { firstRow: 2, yCol: 1 }) === '2 blank (cells B35, B36).'
 */
export function cellsInMessage(message: string, place: DataPlace): string {
  return message.replace(/\brows? (\d+(?:, \d+)*)( and \d+ more)?/g, (_all, list: string, more: string | undefined) => {
    const names = list.split(', ').map((r) => cellOfRow(place, Number(r) - 1));
    return `${names.length > 1 || more ? 'cells' : 'cell'} ${names.join(', ')}${more ?? ''}`;
  });
}
