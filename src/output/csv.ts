// CSV as RFC 4180 describes it: comma-separated, CRLF-free (plain \n), fields quoted when needed.
// Text cells can come from input (case ids, errors quoting a job file) and the file is opened in
// spreadsheets: a text cell that a spreadsheet would take for a formula is guarded (guardFormula)
// and control characters are written as visible escapes (escapeControl), so a cell never holds an
// escape sequence or a line break. Whether a cell is text or a number is decided by its JS type:
// numbers are written as numbers and never guarded (-3 stays -3).
import { escapeControl, guardFormula } from '../safe-text.js';

export type Cell = string | number | boolean | null | undefined;

function field(v: Cell): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'boolean') return String(v);
  // Guard first, then escape: a tab or CR before "=" is guarded as such, then shown as \x09.
  const s = escapeControl(guardFormula(v));
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function toCsv(header: string[], rows: Cell[][]): string {
  return [header, ...rows].map((r) => r.map(field).join(',')).join('\n') + '\n';
}
