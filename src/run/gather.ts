// The job-level files made from what is on disk: summary.csv, summary.json and the report, from
// the complete case folders (record.json) and the manifests' failures. A run calls it at its end;
// `spotcast gather` calls it for shards, and may do so while shards are still writing, since a
// case folder appears only when it is whole.
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { LoadedJob } from '../job/load.js';
import { sweepAxes } from '../job/expand.js';
import { orderOverlaps, type OrderSet } from '../analysis/overlap.js';
import { CASE_FILES, jsonNumbers } from '../output/case-output.js';
import { writeFileAtomic } from '../output/atomic.js';
import { decodeNpy } from '../output/npy.js';
import { summaryCsv, type SummaryRow } from '../output/summary.js';
import { formatPlan } from '../plan/format.js';
import { planCase, type PlannerOptions } from '../plan/planner.js';
import type { Case } from '../plan/types.js';
import { buildJobReport, sheetIndices, sheetTile, sweptLabel, writeJobReport } from '../report/assemble.js';
import type { SheetTile } from '../report/contact-sheet.js';
import { caseHash, readRecord, type Manifest } from './records.js';

export interface GatherResult {
  total: number;
  done: number;
  failed: { case: string; error: string }[];
  missing: string[];
  warnings: number;
  reportError?: string;
}

/** Plans kept for the report, in full; the rest are a `spotcast plan` away. */
const REPORT_PLANS = 200;

/** Failures recorded by this job's runs and shards, for the cases' current hashes. */
async function recordedFailures(jobDir: string): Promise<Map<string, { hash: string; error: string }>> {
  const out = new Map<string, { hash: string; error: string }>();
  let names: string[] = [];
  try {
    names = (await readdir(jobDir)).filter((n) => /^manifest(-shard-\d+-of-\d+)?\.json$/.test(n));
  } catch {
    return out;
  }
  for (const n of names) {
    try {
      const m = JSON.parse(await readFile(join(jobDir, n), 'utf8')) as Manifest;
      for (const [id, f] of Object.entries(m.failed ?? {})) out.set(id, f);
    } catch {
      // A manifest being replaced right now is read on the next gather.
    }
  }
  return out;
}

export async function gatherJob(loaded: LoadedJob, jobDir: string, cases: Case[], opts: PlannerOptions = {}): Promise<GatherResult> {
  const axes = sweepAxes(loaded.spec).filter((a) => a.values.length > 1);
  const failures = await recordedFailures(jobDir);
  const rows: SummaryRow[] = [];
  const result: GatherResult = { total: cases.length, done: 0, failed: [], missing: [], warnings: 0 };
  for (const c of cases) {
    const hash = caseHash(c);
    const rec = await readRecord(jobDir, c.id);
    if (rec && rec.hash === hash) {
      rows.push({ plan: rec.plan, record: rec });
      result.done++;
      result.warnings += rec.warnings.length;
      continue;
    }
    const f = failures.get(c.id);
    if (f && f.hash === hash) {
      rows.push({ plan: planCase(c, opts), case: c, error: f.error });
      result.failed.push({ case: c.id, error: f.error });
    } else {
      rows.push({ plan: planCase(c, opts), case: c, missing: true });
      result.missing.push(c.id);
    }
  }
  await writeFileAtomic(join(jobDir, 'summary.csv'), summaryCsv(axes, rows));
  await writeFileAtomic(
    join(jobDir, 'summary.json'),
    JSON.stringify(
      {
        job: loaded.spec.name,
        file: loaded.file,
        cases: result.total,
        done: result.done,
        failed: result.failed,
        missing: result.missing,
        warnings: result.warnings,
        swept: axes.map((a) => ({ key: a.key, values: a.values, spacing: a.spacing })),
      },
      jsonNumbers,
      2,
    ) + '\n',
  );
  try {
    const done = rows.filter((r) => r.record);
    const onSheet = sheetIndices(done.length);
    const tiles: SheetTile[] = [];
    const orderSets: OrderSet[] = [];
    for (let i = 0; i < done.length; i++) {
      const rec = done[i]!.record!;
      const c = rec.plan.case;
      if (onSheet.has(i)) {
        const npy = decodeNpy(new Uint8Array(await readFile(join(jobDir, c.id, CASE_FILES.intensity))));
        const [rowsN, colsN] = npy.shape as [number, number];
        const p = rec.plan;
        const label = axes.map((a) => sweptLabel(a, c.swept[a.key]!)).join(', ') || c.id;
        tiles.push(
          sheetTile(label, {
            intensity: npy.data,
            rows: rowsN,
            cols: colsN,
            pitch: [p.x.output.step, p.y ? p.y.output.step : null],
            origin: [p.x.output.start, p.y ? p.y.output.start : 0],
            center: [0, 0],
            diagnostics: { powerIn: 0, powerInWindow: 0 },
          }),
        );
      }
      if (rec.metrics.orders && c.aperture.shape === 'slits') {
        orderSets.push({
          caseId: c.id,
          wavelength: c.wavelength,
          distance: c.distance,
          count: c.aperture.count,
          period: c.aperture.period,
          group: JSON.stringify([c.aperture, c.distance, c.illumination]),
          orders: rec.metrics.orders,
        });
      }
    }
    const plans = rows.slice(0, REPORT_PLANS).map((r) => formatPlan(r.record?.plan ?? r.plan!));
    if (rows.length > plans.length) plans.push(`(plans of the other ${rows.length - plans.length} cases: spotcast plan ${loaded.file})`);
    const overlaps = orderOverlaps(orderSets, loaded.spec.orders?.overlap);
    const report = buildJobReport({ loaded, axes, rows, plans, overlaps });
    await writeJobReport(jobDir, report, tiles, overlaps);
  } catch (e) {
    // The case results are on disk; a report that cannot be made is said, not hidden.
    result.reportError = (e as Error).message;
  }
  return result;
}
