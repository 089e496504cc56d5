// CSV as RFC 4180 describes it: comma-separated, CRLF-free (plain \n), fields quoted when needed.

export type Cell = string | number | boolean | null | undefined;

function field(v: Cell): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  const s = String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function toCsv(header: string[], rows: Cell[][]): string {
  return [header, ...rows].map((r) => r.map(field).join(',')).join('\n') + '\n';
}
