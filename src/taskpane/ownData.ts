/**
 * The analyst's own data in the preview page: cells pasted from a
 * spreadsheet (tab-separated) or a CSV file, read by the command line's own
 * reader ({@link parseCsv}), so a file means the same in the preview as on the
 * command line: plain numerals become numbers, ISO 8601 dates (YYYY-MM-DD,
 * optionally with a time) become Excel serials in a date column, as a
 * worksheet holds them; anything else stays text, for the engine to report.
 */
import { guessDelimiter, parseCsv } from '../cli/csv';
import { looksLikeIsoDate } from '../present/isoDate';

export interface OwnTable {
  header: string[];
  rows: (number | string | boolean)[][];
  dateColumns: boolean[];
  /** Plain-language notes about what was read (dates in a layout that is not read, ragged rows). */
  notes: string[];
}

const OTHER_DATE = /^(\d{1,4}[/.]\d{1,2}[/.]\d{1,4}|\d{1,2}[ -][A-Za-z]{3,9}[ -]\d{2,4})$/;

/** Reads pasted cells or CSV text: the delimiter is detected (tab, comma, semicolon, bar); the first row holds the headers. */
export function readOwnTable(text: string): OwnTable {
  const t = parseCsv(text, guessDelimiter(text));
  const body = t.rows.filter((r) => r.some((c) => c !== null && c !== ''));
  if (!t.header.length || !body.length) throw new Error('no data found: paste or open at least a header row and one row of values.');
  const width = body.reduce((m, r) => Math.max(m, r.length), t.header.length);
  const header = Array.from({ length: width }, (_, j) => (t.header[j] ?? '').trim() || `column ${j + 1}`);
  const dateColumns = header.map((_, j) => !!t.dateColumns[j]);
  const unread = header.map(() => ({ count: 0, example: '', row: 0 }));
  const notes: string[] = [];
  if (body.some((r) => r.length !== body[0].length)) notes.push('rows have different numbers of fields; missing fields are read as blank cells.');
  const rows = body.map((r, i) => header.map((_, j) => {
    const c = r[j];
    if (c === null || c === undefined) return '';
    if (typeof c === 'object') return c.error;
    if (typeof c === 'string') {
      const f = c.trim();
      if (looksLikeIsoDate(f) || OTHER_DATE.test(f)) { const u = unread[j]; if (!u.count) { u.example = f; u.row = i + 2; } u.count++; }
    }
    return c;
  }));
  unread.forEach((u, j) => {
    if (u.count) notes.push(`column "${header[j]}" holds ${u.count} date${u.count > 1 ? 's' : ''} that could not be read (first in sheet row ${u.row}: "${u.example}"); write dates as YYYY-MM-DD, optionally with a time (YYYY-MM-DD HH:MM).`);
  });
  return { header, rows, dateColumns, notes };
}
