// What a metric declares: the quantities it reports, each with its summary.csv column, its label
// and unit for the report, and how it is read off a finished case. The registry (registry.ts) lists
// the metric families in the order their columns appear; summary.csv, the report and the
// definitions in result.json are all built from that one list.
import type { CaseSummary } from '../output/case-output.js';
import type { Case } from '../plan/types.js';

/** What a job's columns may depend on: its cases (detectors are job settings) and what has finished. */
export interface MetricScope {
  /** Every case of the job, computed or not, in sweep order. */
  cases: Case[];
  /** The finished cases' summaries. */
  records: CaseSummary[];
}

/** How a quantity is shown in tables and plots (the report's MetricInfo, plus whether it is plotted). */
export interface QuantityDisplay {
  label: string;
  /** "m" lengths, "1" dimensionless (fractions, relative intensities). */
  unit: 'm' | '1';
  /** A log axis by default (values that span decades). */
  log?: boolean;
  /** The report plots it against the swept keys and lists it per case. */
  plot: boolean;
  /**
   * Quantities of one chart are drawn together, as its series, instead of each on its own (a spot
   * size beside its geometric and far-field references); `reference` series are drawn as lines.
   */
  chart?: { name: string; reference?: boolean };
}

/**
 * One reported quantity: one column of summary.csv. With `display` it is a metric the report knows
 * (its key there is the header); without, a column of the table only (a verdict's kind, a
 * detector's area in the window).
 */
export interface Quantity {
  /** summary.csv header; also the quantity's key in the report. */
  header: string;
  /** The value for a finished case; null or undefined leave the cell empty. */
  read(s: CaseSummary): number | string | null | undefined;
  display?: QuantityDisplay;
}

/** A metric or a family of metrics that the code computes together. */
export interface MetricFamily {
  /** A name for people and tests (not written anywhere). */
  key: string;
  /** The quantities this family reports for a job (some depend on the job's settings or results). */
  quantities(scope: MetricScope): Quantity[];
  /** Words for result.json's `definitions`, by CaseMetrics field (in the order they are written). */
  definitions?: Record<string, string>;
}

/** A plotted or listed number with its display (the usual case). */
export function metric(
  header: string,
  label: string,
  unit: 'm' | '1',
  read: (s: CaseSummary) => number | null | undefined,
  opts: { log?: boolean; plot?: boolean; chart?: { name: string; reference?: boolean } } = {},
): Quantity {
  return { header, read, display: { label, unit, ...(opts.log ? { log: true } : {}), plot: opts.plot ?? false, ...(opts.chart ? { chart: opts.chart } : {}) } };
}

/** A column of summary.csv only. */
export function column(header: string, read: (s: CaseSummary) => number | string | null | undefined): Quantity {
  return { header, read };
}
