// summary.csv: one row per case, the swept parameters first, then the plan, the metrics of
// metrics/registry.ts and the run.
import type { SweepAxis } from '../job/expand.js';
import type { CaseSummary } from './case-output.js';
import type { Case, Plan } from '../plan/types.js';
import { metricQuantities } from '../metrics/registry.js';
import type { MetricScope, Quantity } from '../metrics/types.js';
import { toCsv, type Cell } from './csv.js';

export interface SummaryRow {
  plan?: Plan | undefined;
  record?: CaseSummary;
  case?: Case;
  error?: string;
  /** A case not (yet) computed: a shard still running it, or a run that stopped before it. */
  missing?: boolean;
}

export interface Column {
  header: string;
  get(r: SummaryRow): Cell;
}

function caseOf(r: SummaryRow): Case {
  return r.record?.plan.case ?? r.plan?.case ?? r.case!;
}

function planOf(r: SummaryRow): Plan | undefined {
  return r.record?.plan ?? r.plan;
}

/** What the job's metric columns depend on: its cases and the finished ones' summaries, in row order. */
export function metricScope(rows: SummaryRow[]): MetricScope {
  return { cases: rows.map(caseOf), records: rows.flatMap((r) => (r.record ? [r.record] : [])) };
}

/** A registered quantity as a column: empty for cases not (yet) finished. */
function quantityColumn(q: Quantity): Column {
  return { header: q.header, get: (r) => (r.record ? (q.read(r.record) ?? null) : null) };
}

/**
 * The columns after the swept parameters: the case's plan, then every registered metric
 * (metrics/registry.ts; detector and verdict columns follow the job's settings), then the run.
 */
export function summaryColumns(rows: SummaryRow[]): Column[] {
  return [
    { header: 'status', get: (r) => (r.error ? 'failed' : r.missing ? 'missing' : 'done') },
    { header: 'wavelength_m', get: (r) => caseOf(r).wavelength },
    { header: 'distance_m', get: (r) => caseOf(r).distance },
    {
      header: 'fresnel_number',
      get: (r) => {
        const p = planOf(r);
        return p ? Math.max(p.checks.fresnelNumbers[0], p.checks.fresnelNumbers[1] ?? 0) : null;
      },
    },
    { header: 'regime', get: (r) => planOf(r)?.regime ?? null },
    {
      header: 'method',
      get: (r) => {
        const p = planOf(r);
        return p ? (p.form ? `${p.method}/${p.form}` : p.method) : null;
      },
    },
    ...metricQuantities(metricScope(rows)).map(quantityColumn),
    { header: 'seconds', get: (r) => r.record?.seconds ?? null },
    { header: 'warnings', get: (r) => (r.record ? r.record.warnings.map((w) => w.code).join(';') : null) },
    { header: 'error', get: (r) => r.error ?? null },
  ];
}

/** Swept keys other than wavelength and distance, which have columns of their own. */
function sweptColumns(allAxes: SweepAxis[]): Column[] {
  return allAxes
    .filter((a) => a.key !== 'wavelength' && a.key !== 'distance')
    .map((a) => ({ header: a.unit === 'm' ? `${a.key}_m` : a.key, get: (r: SummaryRow) => caseOf(r).swept[a.key] ?? null }));
}

export function summaryCsv(allAxes: SweepAxis[], rows: SummaryRow[]): string {
  const cols = [{ header: 'case', get: (r: SummaryRow) => caseOf(r).id }, ...sweptColumns(allAxes), ...summaryColumns(rows)];
  return toCsv(
    cols.map((c) => c.header),
    rows.map((r) => cols.map((c) => c.get(r))),
  );
}
