// Running a job file: validate, expand, plan, compute and write each case, then the job summary.
// Cases run one after another here; a failing case is recorded and the others go on.
import { trimNumber } from '../job/units.js';
import { JobError, loadJobFile, type LoadedJob } from '../job/load.js';
import { expandJob, sweepAxes } from '../job/expand.js';
import { planCase, type PlannerOptions } from '../plan/planner.js';
import type { Plan } from '../plan/types.js';
import { writeCase, jsonNumbers, type CaseRecord } from '../output/case-output.js';
import { safeJoin, writeFileAtomic } from '../output/atomic.js';
import { summaryCsv, type SummaryRow } from '../output/summary.js';
import { runPlannedCase } from './run-case.js';
import { methodWords } from '../plan/planner.js';
import { makeVerdict } from '../analysis/verdict.js';
import { farFieldFrom, newSearchContext, smallestSpot, type SearchContext } from './searches.js';
import { formatLength } from '../job/units.js';
import { formatPlan } from '../plan/format.js';
import { orderOverlaps, type OrderSet } from '../analysis/overlap.js';
import { buildJobReport, sheetIndices, sheetTile, sweptLabel, writeJobReport } from '../report/assemble.js';
import type { SheetTile } from '../report/contact-sheet.js';
import type { SmallestSpot } from '../output/case-output.js';

/**
 * The answers that need extra propagations: from which distance the far-field size holds (added to
 * each verdict) and, when the job asks, the aperture size with the smallest spot.
 */
export function answerQuestions(rec: CaseRecord, ctx: SearchContext): void {
  const c = rec.plan.case;
  if (rec.metrics.verdicts) {
    rec.metrics.verdicts = rec.metrics.verdicts.map((v) => makeVerdict(v.axis, v.size, v.fresnelNumber, farFieldFrom(c, v.axis, ctx)));
  }
  if (c.analysis.smallestSpot) rec.search = smallestSpot(c, ctx);
}

export function searchSentence(s: SmallestSpot): string {
  const what = s.key === 'aperture.diameter' ? 'diameter' : 'width';
  const m = s.measure === 'energy' ? 'spot (radius or half-width holding half the power)' : s.measure === 'fwhm' ? 'FWHM' : 'D4σ width';
  const tb = s.textbookMeasure !== null ? ` (its spot ${formatLength(s.textbookMeasure, 3)})` : ' (outside the range searched)';
  return (
    `Smallest spot: ${what} ${formatLength(s.best, 4)} gives the smallest ${m}, ${formatLength(s.bestMeasure, 3)}; ` +
    `the textbook estimate ${s.key === 'aperture.diameter' ? '√(2.44λz)' : '√(2λz)'} is ${formatLength(s.textbook, 4)}${tb}. ` +
    `Method: ${s.method} (${s.evaluations} propagations).`
  );
}

export interface RunOptions extends PlannerOptions {
  outDir: string;
  /** Receives one line per event; defaults to nothing. */
  log?: (line: string) => void;
  /**
   * Job names already written in this run, with their files: a second job of the same name would
   * overwrite the first one's folder, so it is refused. Share one map across the files of a run.
   */
  namesInRun?: Map<string, string>;
}

export interface JobOutcome {
  file: string;
  job?: string;
  folder?: string;
  cases: number;
  done: number;
  failed: { case: string; error: string }[];
  warnings: number;
  /** Set when the job file itself could not be used. */
  error?: string;
  /** Set when the cases ran but the job report could not be made. */
  reportError?: string;
}

/** Plans kept for the report, in full; the rest are a `spotcast plan` away. */
const REPORT_PLANS = 200;

export async function runJobFile(file: string, opts: RunOptions): Promise<JobOutcome> {
  let loaded: LoadedJob;
  try {
    loaded = await loadJobFile(file);
  } catch (e) {
    const msg = e instanceof JobError ? e.message : `${file}: ${(e as Error).message}`;
    opts.log?.(msg);
    return { file, cases: 0, done: 0, failed: [], warnings: 0, error: msg };
  }
  return runJob(loaded, opts);
}

export async function runJob(loaded: LoadedJob, opts: RunOptions): Promise<JobOutcome> {
  const log = opts.log ?? (() => {});
  const { spec, file } = loaded;
  const outcome: JobOutcome = { file, job: spec.name, cases: 0, done: 0, failed: [], warnings: 0 };
  let cases;
  let jobDir: string;
  try {
    const earlier = opts.namesInRun?.get(spec.name);
    if (earlier !== undefined) {
      throw new Error(`the job name '${spec.name}' is already used by ${earlier} in this run; its results would overwrite those; rename one job`);
    }
    opts.namesInRun?.set(spec.name, file);
    cases = expandJob(spec);
    outcome.cases = cases.length;
    jobDir = await safeJoin(opts.outDir, spec.name);
    await writeFileAtomic(`${jobDir}/job.json`, JSON.stringify({ file, job: loaded.given }, null, 2) + '\n');
  } catch (e) {
    // The job as a whole cannot run (a refused folder, a full disk, a name clash): say so and return.
    outcome.error = `${file}: ${(e as Error).message}`;
    log(outcome.error);
    return outcome;
  }
  outcome.folder = jobDir;
  log(`job ${spec.name} (${file}): ${cases.length} case${cases.length === 1 ? '' : 's'} → ${jobDir}`);
  const axes = sweepAxes(spec).filter((a) => a.values.length > 1);
  const rows: SummaryRow[] = [];
  const search = newSearchContext(opts);
  const onSheet = sheetIndices(cases.length);
  const tiles: SheetTile[] = [];
  const plans: string[] = [];
  const orderSets: OrderSet[] = [];
  for (const c of cases) {
    let plan: Plan | undefined;
    const tag = `[${c.index + 1}/${cases.length}] ${c.id}`;
    try {
      plan = planCase(c, opts);
      if (plan.error) throw new Error(plan.error);
      const rec: CaseRecord = runPlannedCase(plan);
      answerQuestions(rec, search);
      await writeCase(jobDir, rec);
      outcome.done++;
      outcome.warnings += rec.warnings.length;
      if (onSheet.has(c.index)) {
        const label = axes.map((a) => sweptLabel(a, c.swept[a.key]!)).join(', ') || c.id;
        tiles.push(sheetTile(label, rec.computed));
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
      // The job keeps each case's numbers, not its field: a long sweep must not hold every map.
      rows.push({ plan, record: { ...rec, computed: { ...rec.computed, intensity: new Float64Array(0) }, energy: null } });
      log(
        `${tag}  ${plan.regime}, ${methodWords(plan.method, plan.form)}  peak ${trimNumber(rec.metrics.peakIntensity, 4)}  ` +
          `${trimNumber(rec.seconds, 2)} s${rec.warnings.length ? `  ${rec.warnings.length} warning(s)` : ''}`,
      );
      for (const v of rec.metrics.verdicts ?? []) log(`    ${v.axis === 'radial' ? '' : `${v.axis}: `}${v.sentence}`);
      if (rec.search) log(`    ${searchSentence(rec.search)}`);
      for (const w of rec.warnings) log(`    ! [${w.code}] ${w.message}`);
    } catch (e) {
      const error = (e as Error).message;
      outcome.failed.push({ case: c.id, error });
      rows.push({ plan, case: c, error });
      log(`${tag}  FAILED: ${error}`);
    }
    if (plan && plans.length < REPORT_PLANS) plans.push(formatPlan(plan));
    // Rewritten after every case, so that an interrupted run still leaves a usable table.
    await writeFileAtomic(`${jobDir}/summary.csv`, summaryCsv(axes, rows));
  }
  await writeFileAtomic(
    `${jobDir}/summary.json`,
    JSON.stringify(
      {
        job: spec.name,
        file,
        cases: outcome.cases,
        done: outcome.done,
        failed: outcome.failed,
        warnings: outcome.warnings,
        swept: axes.map((a) => ({ key: a.key, values: a.values, spacing: a.spacing })),
      },
      jsonNumbers,
      2,
    ) + '\n',
  );
  try {
    const overlaps = orderOverlaps(orderSets, spec.orders?.overlap);
    const report = buildJobReport({ loaded, axes, rows, plans, overlaps });
    if (cases.length > plans.length) report.plans.push(`(plans of the other ${cases.length - plans.length} cases: spotcast plan ${file})`);
    await writeJobReport(jobDir, report, tiles, overlaps);
  } catch (e) {
    // The case results are written; a failed report is reported, not hidden.
    outcome.reportError = (e as Error).message;
    log(`job ${spec.name}: the report could not be written: ${outcome.reportError}`);
  }
  log(
    `job ${spec.name}: ${outcome.done} of ${outcome.cases} done, ${outcome.failed.length} failed, ${outcome.warnings} warning(s); ` +
      `results in ${jobDir} (report.html)`,
  );
  return outcome;
}
