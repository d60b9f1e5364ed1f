/**
 * A small RFC 4180 CSV reader for the command line: quoted fields, doubled
 * quotes, CRLF or LF line ends. Fields become cells by the rule every front
 * follows (README, "Numbers, text and blanks"): a field that is exactly a
 * plain decimal numeral ("12", "-3.5", "1e-4", quoted or not) is a number; an
 * ISO 8601 date (YYYY-MM-DD, optionally with a time "THH:MM[:SS]" or
 * " HH:MM[:SS]") becomes its Excel serial number (1900 date system, as a
 * worksheet holds dates) and marks its column as dates; an empty or all-space
 * field is a blank; an Excel error literal (#N/A, #DIV/0!, ...) is an error
 * cell; TRUE and FALSE are booleans; NaN and Infinity are numbers that are not
 * finite; anything else stays text, so the engine's intake names it,
 * including numbers written with anything around them (" 12 ", "1,234",
 * "12%"), which it leaves out as numbers stored as text exactly as it does for
 * a text cell on a worksheet.
 *
 * Rows are counted as the file's data rows: the first line after the header
 * is row 1 (so a blank on line 35 of the file is row 34).
 */
import type { Cell } from '../engine/series';
import { isoToSerial, looksLikeIsoDate } from '../present/isoDate';

export interface Table {
  header: string[];
  rows: Cell[][];
  /** Per column: true when at least one field was read as an ISO date (its numbers are Excel serials). */
  dateColumns: boolean[];
}

/** Dates in layouts other than ISO 8601 (02/01/2023, 2023/01/02, 2 Jan 2023, 2023-1-2): readable by a person, ambiguous or unsupported here. */
const OTHER_DATE = /^(\d{1,4}[/.]\d{1,2}[/.]\d{1,4}|\d{1,2}[ -][A-Za-z]{3,9}[ -]\d{2,4}|[A-Za-z]{3,9}\.? \d{1,2},? \d{4}|\d{4}-\d{1,2}-\d{1,2}.*)$/;

/**
 * Parses CSV text (or pasted cells with another separator) into a table.
 *
 * @param delimiter - the field separator: ',' (default), '\t' for cells pasted from a spreadsheet, ';' or '|'
 */
export function parseCsv(text: string, delimiter = ','): Table {
  const records: string[][] = [];
  let field = '';
  let record: string[] = [];
  let i = 0;
  let quoted = false;
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  while (i < src.length) {
    const ch = src[i];
    if (quoted) {
      if (ch === '"') {
        if (src[i + 1] === '"') { field += '"'; i += 2; continue; }
        quoted = false; i++; continue;
      }
      field += ch; i++; continue;
    }
    if (ch === '"' && field === '') { quoted = true; i++; continue; }
    if (ch === delimiter) { record.push(field); field = ''; i++; continue; }
    if (ch === '\r' || ch === '\n') {
      record.push(field); field = '';
      records.push(record); record = [];
      if (ch === '\r' && src[i + 1] === '\n') i++;
      i++; continue;
    }
    field += ch; i++;
  }
  if (field !== '' || record.length) { record.push(field); records.push(record); }
  // An empty line inside the data is a row of blanks (a one-column file writes a blank cell so), so
  // rows keep their numbers; empty lines before the header and after the last row are not rows.
  const empty = (r: string[]) => r.length === 1 && r[0].trim() === '';
  let first = 0, last = records.length;
  while (first < last && empty(records[first])) first++;
  while (last > first && empty(records[last - 1])) last--;
  const [header = [], ...body] = records.slice(first, last);
  const dateColumns = header.map(() => false);
  const rows = body.map((r) => r.map((f, j) => {
    const c = fieldToCell(f);
    if (typeof c === 'number' && !PLAIN_NUMBER.test(f) && looksLikeIsoDate(f.trim())) dateColumns[j] = true;
    return c;
  }));
  return { header: header.map((h) => h.trim()), rows, dateColumns };
}

/** A plain decimal numeral, nothing around it (no spaces, separators, signs of currency or percent). */
const PLAIN_NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;
/** Excel's error values as a worksheet saved as CSV writes them. */
const EXCEL_ERRORS = new Set(['#NULL!', '#DIV/0!', '#VALUE!', '#REF!', '#NAME?', '#NUM!', '#N/A', '#GETTING_DATA', '#SPILL!', '#CALC!', '#FIELD!', '#BUSY!', '#BLOCKED!', '#CONNECT!', '#UNKNOWN!']);
const NOT_FINITE: Record<string, number> = { nan: NaN, infinity: Infinity, '+infinity': Infinity, '-infinity': -Infinity, inf: Infinity, '+inf': Infinity, '-inf': -Infinity };

/** One field as a cell, by the rule above (an ISO date becomes its Excel serial). */
export function fieldToCell(f: string): Cell {
  if (f.trim() === '') return null;
  if (PLAIN_NUMBER.test(f)) return Number(f);
  const t = f.trim();
  const d = isoToSerial(t);
  if (d !== undefined) return d;
  const upper = t.toUpperCase();
  if (EXCEL_ERRORS.has(upper)) return { error: upper };
  if (upper === 'TRUE' || upper === 'FALSE') return upper === 'TRUE';
  const lower = t.toLowerCase();
  if (lower in NOT_FINITE) return NOT_FINITE[lower];
  return f;
}

/**
 * Refuses a column that holds dates the reader could not turn into numbers,
 * with a message that shows one and says which layout is read. A column is
 * refused when a field looks like an ISO date but is not a valid one
 * ("2023-02-30", "2023-1-2"), or when most of its non-blank text fields look
 * like dates in another layout ("02/01/2023", "2 Jan 2023").
 */
export function checkDates(table: Table, index: number): void {
  const name = table.header[index];
  let text = 0, dateLike = 0;
  let first: { row: number; value: string } | undefined;
  table.rows.forEach((r, i) => {
    const v = r[index];
    if (typeof v !== 'string') return;
    text++;
    const t = v.trim();
    if (OTHER_DATE.test(t) || looksLikeIsoDate(t)) {
      dateLike++;
      if (!first) first = { row: i + 1, value: t };
    }
  });
  if (!first) return;
  const iso = looksLikeIsoDate(first.value);
  if (table.dateColumns[index] || iso || dateLike * 2 > text) {
    const what = iso ? 'is not a valid ISO 8601 date' : 'looks like a date that cannot be read';
    throw new CliError(`column "${name}": row ${first.row} holds "${first.value}", which ${what}${dateLike > 1 ? ` (${dateLike} such rows)` : ''}. Write dates as YYYY-MM-DD, optionally with a time (YYYY-MM-DD HH:MM or YYYY-MM-DDTHH:MM:SS), or as Excel serial numbers; rows count the file's data rows, the first after the header being row 1.`);
  }
}

/**
 * The separator of pasted cells or a CSV file, from its first line: a tab
 * (cells copied from a spreadsheet), else the most frequent of ',', ';', '|'
 * outside quotes (',' when none).
 */
export function guessDelimiter(text: string): string {
  const line = (text.split(/\r?\n/).find((l) => l.trim() !== '') ?? '').replace(/"[^"]*"/g, '');
  if (line.includes('\t')) return '\t';
  let best = ',', most = 0;
  for (const d of [',', ';', '|']) { const c = line.split(d).length - 1; if (c > most) { most = c; best = d; } }
  return best;
}

/**
 * Finds a column by header name (exact, then case-insensitive) or 1-based
 * number, and refuses it when it holds dates that could not be read
 * ({@link checkDates}).
 */
export function columnIndex(table: Table, spec: string): number {
  const found = findColumn(table, spec);
  checkDates(table, found);
  return found;
}

function findColumn(table: Table, spec: string): number {
  const exact = table.header.indexOf(spec);
  if (exact >= 0) return exact;
  const lower = table.header.findIndex((h) => h.toLowerCase() === spec.toLowerCase());
  if (lower >= 0) return lower;
  if (/^\d+$/.test(spec)) {
    const k = Number(spec);
    if (k >= 1 && k <= table.header.length) return k - 1;
  }
  throw new CliError(`no column "${spec}"; the file has ${table.header.length} columns: ${table.header.map((h, i) => `${i + 1}="${h}"`).join(', ')}.`);
}

/** A usage or input problem reported as one line with a non-zero exit code. */
export class CliError extends Error {
  constructor(message: string, readonly exitCode = 2) {
    super(message);
    this.name = 'CliError';
  }
}
