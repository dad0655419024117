// CSV in and out. Export neutralises spreadsheet formulas: a cell starting with = + - @ (or a tab
// or carriage return) is prefixed with an apostrophe so a spreadsheet shows it as text instead of
// running it (the OWASP "CSV injection" advice). Parsing uses papaparse.
import Papa from 'papaparse';

const FORMULA_START = /^[=+\-@\t\r]/;

export function safeCell(value: unknown): string {
  if (value === null || value === undefined) return '';
  const text = typeof value === 'object' ? JSON.stringify(value) : String(value);
  return FORMULA_START.test(text) ? `'${text}` : text;
}

function quote(cell: string): string {
  return /[",\r\n]/.test(cell) || cell !== cell.trim() ? `"${cell.replace(/"/g, '""')}"` : cell;
}

export function toCsv<T>(columns: Array<{ header: string; value: (row: T) => unknown }>, rows: T[]): string {
  const lines = [columns.map((c) => quote(safeCell(c.header))).join(',')];
  for (const row of rows) lines.push(columns.map((c) => quote(safeCell(c.value(row)))).join(','));
  // A byte-order mark lets spreadsheet programs read UTF-8 (accents, £) correctly.
  return `\uFEFF${lines.join('\r\n')}\r\n`;
}

export type CsvTable = { headers: string[]; rows: Array<Record<string, string>> };

export function parseCsv(text: string): CsvTable {
  const result = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: 'greedy', transformHeader: (h) => h.trim().toLowerCase() });
  return { headers: result.meta.fields ?? [], rows: result.data.map((r) => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, typeof v === 'string' ? v.trim() : '']))) };
}

export function csvResponse(filename: string, body: string): Response {
  return new Response(body, { headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${filename}"`, 'cache-control': 'no-store' } });
}

export type RowError = { row: number; column: string; message: string };
