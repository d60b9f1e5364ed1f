/**
 * The analyst's own data in the preview page: cells pasted from a
 * spreadsheet (tab-separated) or a CSV file, read with papaparse. Plain
 * numbers become numbers and ISO 8601 dates (YYYY-MM-DD, optionally with a
 * time) become Excel serials in a date column, as a worksheet holds them;
 * anything else stays text, for the engine to report.
 */
import Papa from 'papaparse';
import { numberFromText } from '../engine/numberText';
import { isoToSerial, looksLikeIsoDate } from '../present/isoDate';

export interface OwnTable {
  header: string[];
  rows: (number | string)[][];
  dateColumns: boolean[];
  /** Plain-language notes about what was read (dates in a layout that is not read, ragged rows). */
  notes: string[];
}

const OTHER_DATE = /^(\d{1,4}[/.]\d{1,2}[/.]\d{1,4}|\d{1,2}[ -][A-Za-z]{3,9}[ -]\d{2,4})$/;

/** Reads pasted cells or CSV text: the delimiter is detected (tab, comma, semicolon); the first row holds the headers. */
export function readOwnTable(text: string): OwnTable {
  const parsed = Papa.parse<string[]>(text.replace(/^\ufeff/, ''), { skipEmptyLines: 'greedy', delimitersToGuess: ['\t', ',', ';', '|'] });
  const [head, ...body] = parsed.data;
  if (!head || !body.length) throw new Error('no data found: paste or open at least a header row and one row of values.');
  const width = body.reduce((m, r) => Math.max(m, r.length), head.length);
  const header = Array.from({ length: width }, (_, j) => (head[j] ?? '').trim() || `column ${j + 1}`);
  const dateColumns = header.map(() => false);
  const unread = header.map(() => ({ count: 0, example: '', row: 0 }));
  const rows = body.map((r, i) => header.map((_, j) => {
    const f = (r[j] ?? '').trim();
    if (f === '') return '';
    const n = numberFromText(f);
    if (n !== undefined) return n;
    const d = isoToSerial(f);
    if (d !== undefined) { dateColumns[j] = true; return d; }
    if (looksLikeIsoDate(f) || OTHER_DATE.test(f)) { const u = unread[j]; if (!u.count) { u.example = f; u.row = i + 2; } u.count++; }
    return f;
  }));
  const notes: string[] = [];
  unread.forEach((u, j) => {
    if (u.count) notes.push(`column "${header[j]}" holds ${u.count} date${u.count > 1 ? 's' : ''} that could not be read (first in sheet row ${u.row}: "${u.example}"); write dates as YYYY-MM-DD, optionally with a time (YYYY-MM-DD HH:MM).`);
  });
  if (parsed.errors.length) notes.push(`the reader reported: ${parsed.errors.slice(0, 2).map((e) => e.message).join('; ')}.`);
  return { header, rows, dateColumns, notes };
}
