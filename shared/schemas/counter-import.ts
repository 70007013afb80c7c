import type { RowError } from '../domain/counter-import';
import type { ErrorCode, FieldErrors } from './common';

/** Files above this are refused before they are read (HTTP 413). */
export const COUNTER_IMPORT_MAX_BYTES = 50 * 1024 * 1024;

export type ImportMeterSummary = { machineCode: string; meterCode: string; unit: string; rows: number; from: string; to: string };

export type ImportPreview = {
  rows: number;
  /** Header as written → the column it was read as. */
  columns: { header: string; column: string }[];
  /** Rows that would be added. */
  toAdd: number;
  /** Rows already recorded (same meter, time, value and reset), skipped. */
  duplicates: number;
  errorCount: number;
  /** The first 200 problems, by line. */
  errors: RowError[];
  meters: ImportMeterSummary[];
  /** The first rows as read, for a look before committing. */
  sample: { line: number; machineCode: string; meterCode: string; readAt: string; value: number; reset: boolean; status: 'add' | 'duplicate' | 'error' }[];
};

export type ImportResult = { rows: number; added: number; duplicates: number };

/** Lines of an NDJSON progress stream (Accept: application/x-ndjson). */
export type ImportStreamLine =
  | { type: 'progress'; phase: 'reading' | 'checking' | 'writing'; done: number; total: number }
  | { type: 'preview'; preview: ImportPreview }
  | { type: 'result'; result: ImportResult }
  | { type: 'error'; status: number; error: ErrorCode; message: string; fields?: FieldErrors };
