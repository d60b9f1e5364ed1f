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
export function columnIndex(table: Table | NumericTable, spec: string): number {
  const found = findColumn(table, spec);
  if ('rows' in table) checkDates(table, found); // an all-numeric file holds no dates
  return found;
}

function findColumn(table: { header: string[] }, spec: string): number {
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

/** A CSV whose every data field is a plain decimal number, read column by column. */
export interface NumericTable {
  header: string[];
  /** One array per column, one value per data row. */
  columns: Float64Array[];
}

const enum Ch { Tab = 9, Lf = 10, Cr = 13, Space = 32, Quote = 34, Plus = 43, Comma = 44, Minus = 45, Dot = 46, D0 = 48, D9 = 57, E = 69, e = 101 }

/** 10^k for k = 0..22: exact in binary64, so m * 10^k and m / 10^k round once (Clinger's fast path). */
const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * The fast path for the common numeric file: reads each field straight into a
 * Float64Array, with no per-cell strings or row arrays. Returns null as soon as
 * the file is anything else (a quote, a blank or text field, rows of unequal
 * length), and the caller reads it with {@link parseCsv}, which reports such
 * cells by row. A field counts as a number exactly when `numberFromText`
 * would take it (the same plain-decimal rule, spaces around allowed), and its
 * value equals `Number(field)`: digits that fit in 2^53 with a power of ten up
 * to 22 are converted in one correctly rounded step, anything else by Number().
 */
export function parseNumericCsv(text: string): NumericTable | null {
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  const n = text.length;
  // Header: up to the first line end; quotes send the file to the general reader.
  let lineEnd = i;
  while (lineEnd < n && text.charCodeAt(lineEnd) !== Ch.Lf && text.charCodeAt(lineEnd) !== Ch.Cr) lineEnd++;
  const headLine = text.slice(i, lineEnd);
  if (headLine.includes('"') || headLine.trim() === '') return null;
  const header = headLine.split(',').map((h) => h.trim());
  const nc = header.length;
  i = lineEnd;
  let cap = 1024;
  let cols = header.map(() => new Float64Array(cap));
  let rows = 0;
  while (i < n) {
    // Skip line ends (blank lines included, as parseCsv does).
    let c = text.charCodeAt(i);
    if (c === Ch.Lf || c === Ch.Cr) { i++; continue; }
    if (rows === cap) {
      cap *= 2;
      cols = cols.map((a) => { const b = new Float64Array(cap); b.set(a); return b; });
    }
    for (let j = 0; j < nc; j++) {
      // One field: [spaces] [sign] digits [. digits] [e [sign] digits] [spaces]
      while (i < n && ((c = text.charCodeAt(i)) === Ch.Space || c === Ch.Tab)) i++;
      const start = i;
      let neg = false;
      c = text.charCodeAt(i);
      if (c === Ch.Minus || c === Ch.Plus) { neg = c === Ch.Minus; i++; }
      let mant = 0, digits = 0, intDigits = 0, fracDigits = 0, sig = 0;
      while (i < n && (c = text.charCodeAt(i)) >= Ch.D0 && c <= Ch.D9) { if (mant !== 0 || c !== Ch.D0) sig++; mant = mant * 10 + (c - Ch.D0); intDigits++; i++; }
      if (c === Ch.Dot && i < n) {
        i++;
        while (i < n && (c = text.charCodeAt(i)) >= Ch.D0 && c <= Ch.D9) { if (mant !== 0 || c !== Ch.D0) sig++; mant = mant * 10 + (c - Ch.D0); fracDigits++; i++; }
      }
      digits = intDigits + fracDigits;
      if (digits === 0) return null;
      let exp = 0;
      if (i < n && ((c = text.charCodeAt(i)) === Ch.E || c === Ch.e)) {
        i++;
        let eneg = false;
        c = text.charCodeAt(i);
        if (c === Ch.Minus || c === Ch.Plus) { eneg = c === Ch.Minus; i++; }
        let ed = 0;
        while (i < n && (c = text.charCodeAt(i)) >= Ch.D0 && c <= Ch.D9) { exp = exp * 10 + (c - Ch.D0); ed++; i++; if (exp > 1e6) exp = 1e6; }
        if (ed === 0) return null;
        if (eneg) exp = -exp;
      }
      const end = i;
      while (i < n && ((c = text.charCodeAt(i)) === Ch.Space || c === Ch.Tab)) i++;
      // The field must end here: a comma between fields, a line end (or the end) after the last.
      const last = j === nc - 1;
      if (i < n) {
        c = text.charCodeAt(i);
        if (last ? c !== Ch.Lf && c !== Ch.Cr : c !== Ch.Comma) return null;
        if (!last) i++;
      } else if (!last) return null;
      const e10 = exp - fracDigits;
      if (sig <= 15 && e10 >= -22 && e10 <= 22) {
        const v = e10 < 0 ? mant / POW10[-e10] : mant * POW10[e10];
        cols[j][rows] = neg ? -v : v;
      } else cols[j][rows] = Number(text.slice(start, end));
    }
    rows++;
  }
  return { header, columns: cols.map((a) => a.slice(0, rows)) };
}
