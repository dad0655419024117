// CSV for spreadsheets, safe against formula injection: a text cell that a spreadsheet would read
// as a formula (starting with = + - @, tab or carriage return) is prefixed with a single quote.
// Numbers stay numbers. Pure; the export route and the tests share it.
import Papa from 'papaparse';

const FORMULA_START = /^[=+\-@\t\r]/;

export type CsvValue = string | number | null | undefined;

export function safeCell(value: CsvValue): string | number {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? value : '';
  return FORMULA_START.test(value) ? `'${value}` : value;
}

export function toCsv(input: { header: string[]; rows: CsvValue[][] }): string {
  // CRLF line ends (RFC 4180) and every field quoted where needed by papaparse.
  return Papa.unparse({ fields: input.header.map((h) => String(safeCell(h))), data: input.rows.map((r) => r.map(safeCell)) }, { newline: '\r\n', escapeFormulae: false });
}
