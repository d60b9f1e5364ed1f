/**
 * Excel serial dates <-> ISO 8601 text, in Excel's 1900 date system.
 *
 * In that system serial 1 is 1900-01-01 and each whole number is one day; the
 * fraction is the time of day. Excel keeps a leap-year quirk inherited from
 * Lotus 1-2-3: it counts a 29 February 1900 that never existed (serial 60), so
 * serials 1 to 59 are one day off from a plain day count starting at
 * 1899-12-31, and from serial 61 (1900-03-01) on, serial = days since
 * 1899-12-30. Serial 60 is shown as "1900-02-29", as Excel shows it.
 * (Microsoft documents the quirk in "Excel incorrectly assumes that the year
 * 1900 is a leap year"; common practice for converting serials.)
 *
 * The 1904 date system (old Mac workbooks) is not handled here.
 */

const MS_PER_DAY = 86400000;
/** Days from 1899-12-30 to 1970-01-01. */
const UNIX_EPOCH_SERIAL = 25569;
/** Largest serial Excel shows as a date: 9999-12-31. */
export const LAST_DATE_SERIAL = 2958465;

/** True when a number is a serial Excel can show as a date (1900-01-01 to 9999-12-31, time of day allowed). */
export function isDateSerial(v: number): boolean {
  return Number.isFinite(v) && v >= 1 && v < LAST_DATE_SERIAL + 1;
}

const pad = (n: number, w = 2) => String(n).padStart(w, '0');

/**
 * An Excel serial as ISO 8601 text: "2023-01-02", or "2023-01-02T06:00" /
 * "2023-01-02T06:00:30" when the serial has a time of day (rounded to the
 * second). `undefined` when the serial is outside 1900-01-01 .. 9999-12-31.
 *
 * @example serialToIso(44928) === '2023-01-02'; serialToIso(60) === '1900-02-29'; serialToIso(44928.25) === '2023-01-02T06:00'
 */
export function serialToIso(serial: number, withTime: 'auto' | 'never' = 'auto'): string | undefined {
  if (!isDateSerial(serial)) return undefined;
  let seconds = Math.round(serial * 86400);
  if (withTime === 'never') seconds = Math.floor(serial) * 86400;
  let day = Math.floor(seconds / 86400);
  const secOfDay = seconds - day * 86400;
  let date: string;
  if (day === 60) date = '1900-02-29';
  else {
    if (day < 60) day += 1; // before the fictitious 1900-02-29, serials count one day less
    const d = new Date((day - UNIX_EPOCH_SERIAL) * MS_PER_DAY);
    date = `${pad(d.getUTCFullYear(), 4)}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())}`;
  }
  if (secOfDay === 0) return date;
  const h = Math.floor(secOfDay / 3600), m = Math.floor((secOfDay % 3600) / 60), s = secOfDay % 60;
  return `${date}T${pad(h)}:${pad(m)}${s ? `:${pad(s)}` : ''}`;
}

const ISO = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?)?$/;

/**
 * ISO 8601 date text as an Excel serial: "YYYY-MM-DD", optionally with a time
 * "THH:MM", "THH:MM:SS" or "THH:MM:SS.sss" (a space may replace the T). No
 * time zone: Excel serials have none, so text with an offset or "Z" is not
 * read. `undefined` when the text is not such a date, names a day that does
 * not exist (2023-02-30), or lies before 1900-01-01.
 *
 * @example isoToSerial('2023-01-02') === 44928; isoToSerial('1900-03-01') === 61; isoToSerial('2023-01-02 12:00') === 44928.5
 */
export function isoToSerial(text: string): number | undefined {
  const m = ISO.exec(text.trim());
  if (!m) return undefined;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const h = m[4] ? Number(m[4]) : 0, mi = m[5] ? Number(m[5]) : 0, s = m[6] ? Number(m[6]) : 0;
  const ms = m[7] ? Number(m[7].padEnd(3, '0')) : 0;
  if (mo < 1 || mo > 12 || d < 1 || h > 23 || mi > 59 || s > 59) return undefined;
  const frac = (h * 3600 + mi * 60 + s + ms / 1000) / 86400;
  if (y === 1900 && mo === 2 && d === 29) return 60 + frac;
  const t = Date.UTC(y, mo - 1, d);
  const back = new Date(t);
  if (back.getUTCFullYear() !== y || back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d) return undefined;
  let serial = t / MS_PER_DAY + UNIX_EPOCH_SERIAL;
  if (serial < 61) serial -= 1;
  if (serial < 1) return undefined;
  return serial + frac;
}

/** Calendar year, month (1-12) and day of a serial's date (Excel's 1900-02-29 for serial 60). Unchecked: the serial must pass {@link isDateSerial}. */
export function serialParts(serial: number): { y: number; m: number; d: number } {
  let day = Math.floor(serial);
  if (day === 60) return { y: 1900, m: 2, d: 29 };
  if (day < 60) day += 1;
  const t = new Date((day - UNIX_EPOCH_SERIAL) * MS_PER_DAY);
  return { y: t.getUTCFullYear(), m: t.getUTCMonth() + 1, d: t.getUTCDate() };
}

/** The serial of a calendar day (month 1-12; days and months past the end roll over as in Date.UTC). Unchecked: years 1900 to 9999. */
export function serialFromParts(y: number, m: number, d: number): number {
  const serial = Date.UTC(y, m - 1, d) / MS_PER_DAY + UNIX_EPOCH_SERIAL;
  return serial < 61 ? serial - 1 : serial;
}

/** True when text looks like an attempt at an ISO date (four digits, dash, digits), read or not: used to explain refusals. */
export function looksLikeIsoDate(text: string): boolean {
  return /^\d{4}-\d{1,2}-\d{1,2}/.test(text.trim());
}
