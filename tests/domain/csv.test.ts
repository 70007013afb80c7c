import { describe, it, expect } from 'vitest';
import Papa from 'papaparse';
import { neutraliseFormula, toCsv } from '../../shared/domain/csv';
import { templateCsv } from '../../shared/domain/counter-import';

// OWASP "CSV Injection": a cell beginning with =, +, -, @, tab or carriage return is read as a
// formula by spreadsheet programs; a leading apostrophe makes it text.
describe('CSV cells that a spreadsheet would run as a formula', () => {
  it('prefixes an apostrophe to text starting with a formula character', () => {
    for (const bad of ['=1+1', '+1', '-2+3', '@SUM(A1)', '\t=1', '\r=1', '=HYPERLINK("http://x.example","y")\nsecond line', '＝1']) {
      expect(neutraliseFormula(bad)).toBe(`'${bad}`);
    }
  });
  it('leaves ordinary text alone', () => {
    for (const ok of ['C1', 'Locks applied', 'a=b', ' plain', '', "'quoted"]) expect(neutraliseFormula(ok)).toBe(ok);
  });
  it('writes rows whose text cells come back neutralised and whose numbers stay numbers', () => {
    const csv = toCsv(
      ['name', 'delta', 'note'],
      [
        ['=cmd|"/c calc"!A1', -5, '@risk'],
        ['Cell 1', 12.5, null],
      ],
    );
    const rows = Papa.parse<string[]>(csv.trim(), { skipEmptyLines: true }).data;
    expect(rows).toEqual([
      ['name', 'delta', 'note'],
      [`'=cmd|"/c calc"!A1`, '-5', "'@risk"],
      ['Cell 1', '12.5', ''],
    ]);
  });
  it('the counter-import template uses the same rule', () => {
    const rows = Papa.parse<string[]>(templateCsv([{ machineCode: 'C1-T', meterCode: 'dp', unit: '=1+1', value: -3 }]).trim()).data;
    expect(rows[1]).toEqual(['C1-T', 'dp', '2026-03-14T07:30:00Z', '-3', 'no', "'=1+1"]);
  });
});
