import Papa from 'papaparse';

/**
 * Text that a spreadsheet program would run as a formula when it opens a CSV file: a cell
 * beginning with =, +, -, @, tab or carriage return (OWASP, "CSV Injection"), and the full-width
 * forms of the first four, which some spreadsheet programs read the same way.
 */
const FORMULA_START = /^[=+\-@\t\r\uFF1D\uFF0B\uFF0D\uFF20]/;

/** Makes a text cell inert by a leading apostrophe (OWASP, "CSV Injection"); other text is unchanged. */
export function neutraliseFormula(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

export type CsvCell = string | number | null | undefined;

/**
 * Every CSV the server writes goes through here. Text cells are neutralised; numbers stay
 * numbers (a negative count or delta is a value, not a formula, and must stay one).
 * Lines end in CRLF (RFC 4180).
 */
export function toCsv(fields: string[], rows: CsvCell[][]): string {
  const data = rows.map((row) => row.map((cell) => (typeof cell === 'string' ? neutraliseFormula(cell) : (cell ?? ''))));
  return Papa.unparse({ fields: fields.map(neutraliseFormula), data }, { newline: '\r\n' });
}
