// The job-level files made from what is on disk: summary.csv, summary.json and the report, from
// the complete case folders (record.json) and the manifests' failures. A run calls it at its end;
// `spotcast gather` calls it for shards, and may do so while shards are still writing, since a
// case folder appears only when it is whole. A case counts as done only when its folder verifies
// (record, and every file's size and digest: see records.ts); a damaged one is reported as not done.
import { readdir, readFile } from 'node:fs/promises';
import { gratingOf } from '../elements/registry.js';
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
import { buildJobReport, JOB_FILES, writeJobReport } from '../report/assemble.js';
import { writeExplorerPage, type PageCase } from '../report/explorer.js';
import { caseLabel, pageOf, reportSelection, tileOf, type PreparedShare } from '../report/case-share.js';
import type { SheetTile } from '../report/contact-sheet.js';
import { caseHash, readRecord, verifyCases, type CaseState, type Manifest } from './records.js';
import type { StoredRecord } from '../output/case-output.js';
import type { PlotDrawer } from './helpers.js';

export interface GatherResult {
  total: number;
  done: number;
  failed: { case: string; error: string }[];
  /** Cases not done (missing includes the damaged ones). */
  missing: string[];
  /** Cases whose folder is there but does not verify, and why (a file missing, cut short, changed). */
  damaged: { case: string; problems: string[] }[];
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

/**
 * `trusted`: cases the calling run verified or wrote itself while holding the job folder's lock;
 * their records are read without digesting their files a second time.
 */
export async function gatherJob(
  loaded: LoadedJob,
  jobDir: string,
  cases: Case[],
  opts: PlannerOptions = {},
  trusted: ReadonlySet<string> = new Set(),
  /** Draws the report's plots elsewhere (the run's kept workers: run/helpers.ts). */
  drawPlots?: PlotDrawer,
  /** Report shares the run's threads made of trusted cases (report/case-share.ts), by case id. */
  prepared: ReadonlyMap<string, PreparedShare> = new Map(),
): Promise<GatherResult> {
  const axes = sweepAxes(loaded.spec).filter((a) => a.values.length > 1);
  const failures = await recordedFailures(jobDir);
  const rows: SummaryRow[] = [];
  const result: GatherResult = { total: cases.length, done: 0, failed: [], missing: [], damaged: [], warnings: 0 };
  const hashes = cases.map((c) => caseHash(c));
  const known: (StoredRecord | null)[] = [];
  for (const [i, c] of cases.entries()) {
    const rec = trusted.has(c.id) ? await readRecord(jobDir, c.id) : null;
    known.push(rec && rec.hash === hashes[i] && rec.files ? rec : null);
  }
  const toVerify = cases.flatMap((c, i) => (known[i] ? [] : [{ id: c.id, hash: hashes[i]! }]));
  const verified = new Map<string, CaseState>((await verifyCases(jobDir, toVerify)).map((st, i) => [toVerify[i]!.id, st]));
  for (const [i, c] of cases.entries()) {
    const hash = hashes[i]!;
    let rec: StoredRecord | null = known[i] ?? null;
    const st = verified.get(c.id);
    if (st) {
      if (st.state === 'done') rec = st.record;
      else if (st.state === 'damaged') result.damaged.push({ case: c.id, problems: st.problems });
      else if (st.state === 'unverified') result.damaged.push({ case: c.id, problems: ['recorded by an earlier version without file digests'] });
    }
    if (rec) {
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
        damaged: result.damaged,
        warnings: result.warnings,
        swept: axes.map((a) => ({ key: a.key, values: a.values, spacing: a.spacing })),
      },
      jsonNumbers,
      2,
    ) + '\n',
  );
  try {
    const done = rows.filter((r) => r.record);
    const { onSheet, onPage, side } = reportSelection(done.length);
    const tiles: SheetTile[] = [];
    const pageCases: PageCase[] = [];
    const orderSets: OrderSet[] = [];
    for (let i = 0; i < done.length; i++) {
      const rec = done[i]!.record!;
      const c = rec.plan.case;
      const label = caseLabel(axes, c);
      // A share made by the thread that computed the case, where it is the one wanted here (the
      // run's prediction held); else each case's intensity.npy is read once, for its tile and its
      // page entry both, and dropped.
      const ready = trusted.has(c.id) ? prepared.get(c.id) : undefined;
      const mine = ready && ready.label === label ? ready : undefined;
      const tile = onSheet.has(i) ? mine?.tile : undefined;
      const page = onPage.has(i) && mine?.pageSide === side ? mine.page : undefined;
      if ((onSheet.has(i) && !tile) || (onPage.has(i) && !page)) {
        const npy = decodeNpy(new Uint8Array(await readFile(join(jobDir, c.id, CASE_FILES.intensity))));
        const [rowsN, colsN] = npy.shape as [number, number];
        if (onSheet.has(i)) tiles.push(tile ?? tileOf(label, rec.plan, npy.data, rowsN, colsN));
        if (onPage.has(i)) pageCases.push(page ?? pageOf(rec, label, npy.data, npy.shape, side));
      } else {
        if (tile) tiles.push(tile);
        if (page) pageCases.push(page);
      }
      const orders = rec.metrics.orders;
      const grating = orders ? gratingOf(c.aperture) : null;
      if (orders && grating) {
        orderSets.push({
          caseId: c.id,
          wavelength: c.wavelength,
          distance: c.distance,
          count: grating.count,
          period: grating.period,
          group: JSON.stringify([c.aperture, c.distance, c.illumination]),
          orders,
        });
      }
    }
    const plans = rows.slice(0, REPORT_PLANS).map((r) => formatPlan(r.record?.plan ?? r.plan!));
    if (rows.length > plans.length) plans.push(`(plans of the other ${rows.length - plans.length} cases: spotcast plan ${loaded.file})`);
    const overlaps = orderOverlaps(orderSets, loaded.spec.orders?.overlap);
    const report = buildJobReport({ loaded, axes, rows, plans, overlaps });
    if (pageCases.length) {
      await writeExplorerPage(jobDir, JOB_FILES.explorer, loaded.spec.name, pageCases, loaded.spec.output.logDecades);
      report.explorer = JOB_FILES.explorer;
    }
    await writeJobReport(jobDir, report, tiles, overlaps, drawPlots);
  } catch (e) {
    // The case results are on disk; a report that cannot be made is said, not hidden.
    result.reportError = (e as Error).message;
  }
  return result;
}
