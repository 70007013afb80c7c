/**
 * Kerfbook's own CSV layout for counter readings exported from a machine control or typed
 * up in a spreadsheet (documented in docs/counter-import.md). House format, no published
 * source; dates follow ISO 8601 / RFC 3339, CSV quoting follows RFC 4180.
 * Pure: no I/O; the server looks up machines and meters, this checks the text.
 */
import '../luxon-clock';
import { DateTime } from 'luxon';
import { clock } from '../clock';
import { toCsv } from './csv';

export const REQUIRED_COLUMNS = ['machine_code', 'meter_code', 'read_at', 'value'] as const;
export const OPTIONAL_COLUMNS = ['reset', 'unit'] as const;
export type CounterColumn = (typeof REQUIRED_COLUMNS)[number] | (typeof OPTIONAL_COLUMNS)[number];

export type RowError = { line: number; column: CounterColumn | null; message: string };
export type ParsedRow = { line: number; machineCode: string; meterCode: string; readAt: Date; value: number; reset: boolean; unit: string | null };

/** Header names are compared trimmed and lower-case; a byte-order mark is ignored. */
const norm = (h: string) =>
  h
    .replace(/^\uFEFF/, '')
    .trim()
    .toLowerCase();

/**
 * Maps header cells to column positions. Every required column must be there once; an
 * unknown column is refused too, since a misspelt `reset` would otherwise be silently ignored.
 */
export function mapHeader(header: string[]): { map: Partial<Record<CounterColumn, number>>; problems: string[] } {
  const map: Partial<Record<CounterColumn, number>> = {};
  const problems: string[] = [];
  const known = new Set<string>([...REQUIRED_COLUMNS, ...OPTIONAL_COLUMNS]);
  header.forEach((raw, i) => {
    const h = norm(raw);
    if (!known.has(h)) problems.push(`Unknown column “${raw.trim() || `(empty, position ${i + 1})`}”`);
    else if (map[h as CounterColumn] !== undefined) problems.push(`Column “${h}” appears twice`);
    else map[h as CounterColumn] = i;
  });
  const missing = REQUIRED_COLUMNS.filter((c) => map[c] === undefined);
  if (missing.length) problems.unshift(`Missing column${missing.length > 1 ? 's' : ''} ${missing.map((c) => `“${c}”`).join(', ')}`);
  return { map, problems };
}

const NAIVE_FORMATS = ['yyyy-MM-dd HH:mm:ss', 'yyyy-MM-dd HH:mm', "yyyy-MM-dd'T'HH:mm:ss", "yyyy-MM-dd'T'HH:mm"];

const PLAIN_ISO = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?(?:Z|([+-])(\d{2}):(\d{2}))$/;

/**
 * The common machine-export shape (`2026-03-14T07:30:00Z`, `…:00.250+01:00`) read without
 * luxon, which costs most of an import's time per row. Gives luxon's answer (same validity
 * rules, same millisecond rounding); `undefined` hands any other shape or edge (hour 24,
 * years before 1970, offsets past ±23:59) to luxon.
 */
function readPlainIsoWithOffset(s: string): Date | null | undefined {
  const fixed = readSecondsUtc(s);
  if (fixed !== undefined) return fixed;
  const m = PLAIN_ISO.exec(s);
  if (!m) return undefined;
  const [year, month, day, hour, minute, second, offHour, offMinute] = [m[1], m[2], m[3], m[4], m[5], m[6] ?? '0', m[9] ?? '0', m[10] ?? '0'].map(Number);
  const millis = m[7] ? Math.floor(parseFloat(`0.${m[7]}`) * 1000) : 0;
  const offset = (m[8] === '-' ? -1 : 1) * (offHour * 60 + offMinute);
  return checkedUtc(year, month, day, hour, minute, second, millis, offHour, offMinute, offset);
}

/** Luxon's validity rules for the parts of a plain ISO time; `undefined` hands the edges to luxon. */
function checkedUtc(
  year: number,
  month: number,
  day: number,
  hour: number,
  minute: number,
  second: number,
  millis: number,
  offHour: number,
  offMinute: number,
  offset: number,
): Date | null | undefined {
  if (year < 1970 || hour > 23 || offHour > 23 || offMinute > 59) return undefined;
  if (month < 1 || month > 12 || day < 1 || minute > 59 || second > 59) return null;
  if (new Date(Date.UTC(year, month - 1, day)).getUTCDate() !== day) return null;
  return new Date(Date.UTC(year, month - 1, day, hour, minute, second, millis) - offset * 60_000);
}

const digitAt = (s: string, i: number) => {
  const d = s.charCodeAt(i) - 48;
  return d >= 0 && d <= 9 ? d : NaN;
};
const twoDigits = (s: string, i: number) => digitAt(s, i) * 10 + digitAt(s, i + 1);

/**
 * `2026-03-14T07:30:00Z` exactly, the shape most machine exports write, read digit by digit
 * without the regular expression's allocations (the import reads up to a million of them);
 * any other shape is `undefined` here and goes through the expression.
 */
function readSecondsUtc(s: string): Date | null | undefined {
  if (s.length !== 20 || s[4] !== '-' || s[7] !== '-' || s[10] !== 'T' || s[13] !== ':' || s[16] !== ':' || s[19] !== 'Z') return undefined;
  const year = twoDigits(s, 0) * 100 + twoDigits(s, 2);
  const month = twoDigits(s, 5);
  const day = twoDigits(s, 8);
  const hour = twoDigits(s, 11);
  const minute = twoDigits(s, 14);
  const second = twoDigits(s, 17);
  if (Number.isNaN(year + month + day + hour + minute + second)) return undefined;
  return checkedUtc(year, month, day, hour, minute, second, 0, 0, 0, 0);
}

/**
 * Reads a reading time. With an offset (`Z`, `+02:00`) it is taken as written; without one
 * it is wall-clock time in the site's time zone (what a machine control's clock shows).
 */
export function parseReadAt(text: string, timeZone: string): Date | null {
  const s = text.trim();
  if (!s) return null;
  const plain = readPlainIsoWithOffset(s);
  if (plain !== undefined) return plain;
  if (/(Z|[+-]\d{2}:?\d{2})$/i.test(s)) {
    const dt = DateTime.fromISO(s, { setZone: true });
    return dt.isValid ? dt.toJSDate() : null;
  }
  for (const f of NAIVE_FORMATS) {
    const dt = DateTime.fromFormat(s, f, { zone: timeZone });
    if (dt.isValid) return dt.toJSDate();
  }
  return null;
}

const RESET_WORDS: Record<string, boolean> = { '': false, no: false, false: false, '0': false, n: false, yes: true, true: true, '1': true, y: true };

/** Parses one data row; `line` is the 1-based line number in the file (header = 1). */
export function parseRow(
  cells: string[],
  map: Partial<Record<CounterColumn, number>>,
  line: number,
  timeZone: string,
  now = clock.now(),
): ParsedRow | RowError[] {
  const cell = (c: CounterColumn) => (map[c] === undefined ? '' : (cells[map[c]!] ?? '').trim());
  const errors: RowError[] = [];
  const expected = Object.keys(map).length;
  if (cells.length !== expected)
    errors.push({ line, column: null, message: `Has ${cells.length} field${cells.length === 1 ? '' : 's'}, the header has ${expected}` });
  const machineCode = cell('machine_code');
  const meterCode = cell('meter_code');
  if (!machineCode) errors.push({ line, column: 'machine_code', message: 'Machine code is empty' });
  if (!meterCode) errors.push({ line, column: 'meter_code', message: 'Meter code is empty' });
  const readAtText = cell('read_at');
  const readAt = parseReadAt(readAtText, timeZone);
  if (!readAt)
    errors.push({
      line,
      column: 'read_at',
      message: readAtText ? `“${readAtText}” is not a date-time; write e.g. 2026-03-14T07:30:00Z or 2026-03-14 07:30` : 'Reading time is empty',
    });
  else if (readAt.getTime() > now.getTime() + 5 * 60_000) errors.push({ line, column: 'read_at', message: `${readAtText} lies in the future` });
  const valueText = cell('value');
  // Plain decimal with a point: thousands separators and decimal commas are ambiguous.
  const value = /^-?\d+(\.\d+)?$/.test(valueText) ? Number(valueText) : NaN;
  if (!Number.isFinite(value))
    errors.push({
      line,
      column: 'value',
      message: valueText ? `“${valueText}” is not a number; use digits with a point for decimals, no thousands separators` : 'Value is empty',
    });
  const resetText = cell('reset').toLowerCase();
  const reset = RESET_WORDS[resetText];
  if (reset === undefined) errors.push({ line, column: 'reset', message: `“${cell('reset')}” is not yes or no` });
  if (errors.length) return errors;
  return { line, machineCode, meterCode, readAt: readAt!, value, reset: reset!, unit: map.unit === undefined ? null : cell('unit') || null };
}

/** The file-independent identity of a reading: the same reading in any file gets the same key. */
export function importKeySource(meterId: string, readAt: Date, value: number, reset: boolean): string {
  return importKeySourceIso(meterId, readAt.toISOString(), value, reset);
}

/** The same, with the time already written by `Date.prototype.toISOString` (an import writes it once per row). */
export function importKeySourceIso(meterId: string, readAtIso: string, value: number, reset: boolean): string {
  return `${meterId}|${readAtIso}|${value}|${reset ? 1 : 0}`;
}

/** The template served for download: header and a few example lines. */
export function templateCsv(examples: { machineCode: string; meterCode: string; unit: string; value: number }[]): string {
  const at = '2026-03-14T07:30:00Z';
  const rows = examples.map((e) => [e.machineCode, e.meterCode, at, e.value, 'no', e.unit]);
  return `${toCsv(['machine_code', 'meter_code', 'read_at', 'value', 'reset', 'unit'], rows)}\r\n`;
}
