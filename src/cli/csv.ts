/**
 * A small RFC 4180 CSV reader for the command line: quoted fields, doubled
 * quotes, CRLF or LF line ends. A field that is a plain decimal number becomes
 * a number; an ISO 8601 date (YYYY-MM-DD, optionally with a time "THH:MM[:SS]"
 * or " HH:MM[:SS]") becomes its Excel serial number (1900 date system, as a
 * worksheet holds dates) and marks its column as dates; an empty field becomes
 * null (a blank cell); anything else stays text, so the engine's intake
 * reports it instead of guessing.
 *
 * Rows are counted as the file's data rows: the first line after the header
 * is row 1 (so a blank on line 35 of the file is row 34).
 */
import { numberFromText } from '../engine/numberText';
import { isoToSerial, looksLikeIsoDate } from '../present/isoDate';

export interface Table {
  header: string[];
  rows: (number | string | null)[][];
  /** Per column: true when at least one field was read as an ISO date (its numbers are Excel serials). */
  dateColumns: boolean[];
}

/** Dates in layouts other than ISO 8601 (02/01/2023, 2023/01/02, 2 Jan 2023, 2023-1-2): readable by a person, ambiguous or unsupported here. */
const OTHER_DATE = /^(\d{1,4}[/.]\d{1,2}[/.]\d{1,4}|\d{1,2}[ -][A-Za-z]{3,9}[ -]\d{2,4}|[A-Za-z]{3,9}\.? \d{1,2},? \d{4}|\d{4}-\d{1,2}-\d{1,2}.*)$/;

export function parseCsv(text: string): Table {
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
    if (ch === ',') { record.push(field); field = ''; i++; continue; }
    if (ch === '\r' || ch === '\n') {
      record.push(field); field = '';
      records.push(record); record = [];
      if (ch === '\r' && src[i + 1] === '\n') i++;
      i++; continue;
    }
    field += ch; i++;
  }
  if (field !== '' || record.length) { record.push(field); records.push(record); }
  const nonEmpty = records.filter((r) => !(r.length === 1 && r[0] === ''));
  const [header = [], ...body] = nonEmpty;
  const dateColumns = header.map(() => false);
  const rows = body.map((r) => r.map((f, j) => {
    const v = toValue(f);
    if (v.date) dateColumns[j] = true;
    return v.value;
  }));
  return { header: header.map((h) => h.trim()), rows, dateColumns };
}

function toValue(f: string): { value: number | string | null; date?: boolean } {
  if (f.trim() === '') return { value: null };
  const n = numberFromText(f);
  if (n !== undefined) return { value: n };
  const d = isoToSerial(f);
  if (d !== undefined) return { value: d, date: true };
  return { value: f };
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
