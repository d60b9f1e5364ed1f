/**
 * A small RFC 4180 CSV reader for the command line: quoted fields, doubled
 * quotes, CRLF or LF line ends. A field that is a plain decimal number becomes
 * a number; an empty field becomes null (a blank cell); anything else stays
 * text, so the engine's intake reports it instead of guessing.
 */
import { numberFromText } from '../engine/numberText';

export interface Table {
  header: string[];
  rows: (number | string | null)[][];
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
  const nonEmpty = records.filter((r) => !(r.length === 1 && r[0] === ''));
  const [header = [], ...body] = nonEmpty;
  return { header: header.map((h) => h.trim()), rows: body.map((r) => r.map(toValue)) };
}

function toValue(f: string): number | string | null {
  if (f.trim() === '') return null;
  return numberFromText(f) ?? f;
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
