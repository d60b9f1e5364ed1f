/**
 * A small RFC 4180 CSV reader for the command line: quoted fields, doubled
 * quotes, CRLF or LF line ends. Fields become cells by the rule every front
 * follows (README, "Numbers, text and blanks"): a field that is exactly a
 * plain decimal numeral ("12", "-3.5", "1e-4", quoted or not) is a number;
 * an empty or all-space field is a blank; an Excel error literal (#N/A,
 * #DIV/0!, ...) is an error cell; TRUE and FALSE are booleans; NaN and
 * Infinity are numbers that are not finite; anything else stays text, so the
 * engine's intake names it, including numbers written with anything around
 * them (" 12 ", "1,234", "12%"), which it leaves out as numbers stored as text
 * exactly as it does for a text cell on a worksheet.
 */
import type { Cell } from '../engine/series';

export interface Table {
  header: string[];
  rows: Cell[][];
}

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
  // An empty line inside the data is a row of blanks (a one-column file writes a blank cell so), so
  // rows keep their numbers; empty lines before the header and after the last row are not rows.
  const empty = (r: string[]) => r.length === 1 && r[0].trim() === '';
  let first = 0, last = records.length;
  while (first < last && empty(records[first])) first++;
  while (last > first && empty(records[last - 1])) last--;
  const [header = [], ...body] = records.slice(first, last);
  return { header: header.map((h) => h.trim()), rows: body.map((r) => r.map(fieldToCell)) };
}

/** A plain decimal numeral, nothing around it (no spaces, separators, signs of currency or percent). */
const PLAIN_NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;
/** Excel's error values as a worksheet saved as CSV writes them. */
const EXCEL_ERRORS = new Set(['#NULL!', '#DIV/0!', '#VALUE!', '#REF!', '#NAME?', '#NUM!', '#N/A', '#GETTING_DATA', '#SPILL!', '#CALC!', '#FIELD!', '#BUSY!', '#BLOCKED!', '#CONNECT!', '#UNKNOWN!']);
const NOT_FINITE: Record<string, number> = { nan: NaN, infinity: Infinity, '+infinity': Infinity, '-infinity': -Infinity, inf: Infinity, '+inf': Infinity, '-inf': -Infinity };

/** One field as a cell, by the rule above. */
export function fieldToCell(f: string): Cell {
  if (f.trim() === '') return null;
  if (PLAIN_NUMBER.test(f)) return Number(f);
  const t = f.trim();
  const upper = t.toUpperCase();
  if (EXCEL_ERRORS.has(upper)) return { error: upper };
  if (upper === 'TRUE' || upper === 'FALSE') return upper === 'TRUE';
  const lower = t.toLowerCase();
  if (lower in NOT_FINITE) return NOT_FINITE[lower];
  return f;
}

/** Finds a column by header name (exact, then case-insensitive) or 1-based number. */
export function columnIndex(table: Table, spec: string): number {
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
