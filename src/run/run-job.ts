// Running a job file: validate, expand, plan every case, skip the ones already done, check that
// the rest fit in memory, compute them on worker threads, and make the job-level files. A failing
// case is recorded and the others go on; an interrupted run keeps every finished case.
import { availableParallelism, freemem } from 'node:os';
import { trimNumber } from '../job/units.js';
import { JobError, formatWarning, loadJobFile, type LoadedJob } from '../job/load.js';
import { expandJob, sweepAxes } from '../job/expand.js';
import { bytes, methodWords, planCase, type PlannerOptions } from '../plan/planner.js';
import { LIMITS } from '../plan/limits.js';
import type { Plan } from '../plan/types.js';
import type { CaseSummary } from '../output/case-output.js';
import { makeFolder, safeJoin, writeFileAtomic } from '../output/atomic.js';
import { searchSentence } from './searches.js';
import { gatherJob } from './gather.js';
import { caseHash, removeLeftovers, verifyCases, writeManifest, type Manifest } from './records.js';
import { acquireRunLock, LockBusyError, type HeldLock } from './lock.js';
import { chooseParallelism, runTasks, workersAvailable } from './scheduler.js';
import { startCrew, type Crew } from './crew.js';
import { plotsOn, stopKept } from './helpers.js';
import type { Worker } from 'node:worker_threads';
import { machineThreads } from './threads.js';
import { createEngine } from '../kernels.js';
import type { Engine } from '../optics/engine.js';
import { shareSourceSpectra } from '../plan/share.js';
import { shareGrids } from '../plan/shared-grids.js';
import type { CaseTask } from './execute.js';
import { reportShares, type PreparedShare, type ReportShare } from '../report/case-share.js';
import { assignShards, type ShardSpec } from './shard.js';
import { lineReporter, silentReporter, type RunReporter } from './progress.js';
import { TOOL_VERSION } from '../version.js';

export interface RunOptions extends PlannerOptions {
  outDir: string;
  /** Worker threads (default 1: this thread). The command line defaults to the number of cores. */
  workers?: number;
  /** Recompute cases that are already done. */
  force?: boolean;
  /** Run only this shard's cases and leave the job-level files to `spotcast gather`. */
  shard?: ShardSpec;
  /** Accept a sweep above the size limits (LARGE_SWEEP). */
  acceptLarge?: boolean;
  /** Stops the run between cases (running cases on worker threads are abandoned). */
  signal?: AbortSignal;
  reporter?: RunReporter;
  /** One line per event, for scripts that want plain text (ignored when reporter is given). */
  log?: (line: string) => void;
  /**
   * Job names already written in this run, with their files: a second job of the same name would
   * overwrite the first one's folder, so it is refused. Share one map across the files of a run.
   */
  namesInRun?: Map<string, string>;
  /** Memory the run may use (bytes); default: what the machine has free now. */
  availableMemoryBytes?: number;
  /**
   * The engine for cases computed in this thread (default: createEngine(), made when cases are to
   * be computed). Worker threads make their own.
   */
  engine?: Engine;
  /**
   * How long to wait for another run that holds this job folder (or this shard of it) before
   * refusing, in ms (default LOCK_WAIT_MS, 30 s; 0 refuses at once). See run/lock.ts.
   */
  lockWaitMs?: number;
  /**
   * Workers the caller started for this job before loading it (run/crew.ts; the command line
   * does, so that their start-up overlaps its own loading): the job takes them over as its crew,
   * or stops them when it would start none (too few cases, no workers asked for).
   */
  crew?: Crew;
}

export interface JobOutcome {
  file: string;
  job?: string;
  folder?: string;
  cases: number;
  /** Cases done, including those done by earlier runs. */
  done: number;
  /** Cases this run skipped because an earlier run had done them. */
  skipped: number;
  failed: { case: string; error: string }[];
  warnings: number;
  /** Set when the job file itself could not be used, or the job was refused before any work. */
  error?: string;
  /** Set when the cases ran but the job report could not be made. */
  reportError?: string;
  /** The run was stopped (Ctrl-C, SIGTERM) before all cases were done. */
  interrupted?: boolean;
}

/** Sweeps above these ask for acceptLarge (--accept-large): a typo in a range should not start a week of work. */
export const LARGE_SWEEP = { cases: 5000, seconds: 12 * 3600 };


/** Memory a case may count on: what is free, kept below 80 % for the rest of the machine. */
export function availableMemory(): number {
  const constrained = typeof process.constrainedMemory === 'function' ? process.constrainedMemory() : 0;
  const free = freemem();
  return 0.8 * (constrained && constrained > 0 ? Math.min(constrained, free) : free);
}

export async function runJobFile(file: string, opts: RunOptions): Promise<JobOutcome> {
  let loaded: LoadedJob;
  try {
    loaded = await loadJobFile(file);
  } catch (e) {
    const msg = e instanceof JobError ? e.message : `${file}: ${(e as Error).message}`;
    reporterOf(opts).note(msg);
    return { file, cases: 0, done: 0, skipped: 0, failed: [], warnings: 0, error: msg };
  }
  // Load warnings (a number without a unit taken as metres, an unusual wavelength) before any work.
  for (const w of loaded.warnings) reporterOf(opts).note(formatWarning(file, w));
  return runJob(loaded, opts);
}

function reporterOf(opts: RunOptions): RunReporter {
  if (opts.reporter) return opts.reporter;
  const log = opts.log;
  return log ? lineReporter((l) => log(l)) : silentReporter;
}

/** The first line and the answers for a finished case, as the reporter shows them. */
export function caseLines(s: CaseSummary): string[] {
  const p = s.plan;
  const lines = [
    `${p.regime}, ${methodWords(p.method, p.form)}  peak ${trimNumber(s.metrics.peakIntensity, 4)}  ${trimNumber(s.seconds, 2)} s` +
      (s.warnings.length ? `  ${s.warnings.length} warning(s)` : ''),
  ];
  for (const v of s.metrics.verdicts ?? []) lines.push(`${v.axis === 'radial' ? '' : `${v.axis}: `}${v.sentence}`);
  if (s.search) lines.push(searchSentence(s.search));
  for (const w of s.warnings) lines.push(`! [${w.code}] ${w.message}`);
  return lines;
}

export async function runJob(loaded: LoadedJob, opts: RunOptions): Promise<JobOutcome> {
  const held: { crew: Crew | null } = { crew: opts.crew ?? null };
  try {
    return await runJobWith(loaded, opts, held);
  } finally {
    // Workers started for the planning and not taken over by the cases (a refused job, an FFT team).
    await held.crew?.stop();
  }
}

/**
 * Whether to start the case workers before planning (run/crew.ts): when more than one worker is
 * asked for, the built worker module is there, and there are at least as many cases as workers
 * (with fewer, the cases may get an FFT team instead). Shards plan every case too, so they use one.
 */
function crewSize(opts: RunOptions, cases: number): number {
  const n = Math.min(Math.max(1, Math.floor(opts.workers ?? 1)), machineThreads());
  return n > 1 && cases >= n && workersAvailable() ? n : 0;
}

async function runJobWith(loaded: LoadedJob, opts: RunOptions, held: { crew: Crew | null }): Promise<JobOutcome> {
  const rep = reporterOf(opts);
  const { spec, file } = loaded;
  const outcome: JobOutcome = { file, job: spec.name, cases: 0, done: 0, skipped: 0, failed: [], warnings: 0 };
  const refuse = (msg: string): JobOutcome => {
    // The job as a whole cannot run (a refused folder, a full disk, a name clash, too big): say so.
    outcome.error = `${file}: ${msg}`;
    rep.note(outcome.error);
    return outcome;
  };
  let jobDir: string;
  let plans: Plan[];
  try {
    const earlier = opts.namesInRun?.get(spec.name);
    if (earlier !== undefined) {
      return refuse(`the job name '${spec.name}' is already used by ${earlier} in this run; its results would overwrite those; rename one job`);
    }
    opts.namesInRun?.set(spec.name, file);
    const cases = expandJob(spec);
    outcome.cases = cases.length;
    // Too many cases is known before any is planned (planning thousands takes a while of its own).
    if (!opts.acceptLarge && cases.length > LARGE_SWEEP.cases) {
      return refuse(`the sweeps make ${cases.length} cases (limit ${LARGE_SWEEP.cases}); if that is meant, run again with --accept-large`);
    }
    // --accept-large lifts the per-case time limit as it lifts the sweep's.
    const planOpts: PlannerOptions = opts.acceptLarge ? { ...opts, maxWork: Infinity } : opts;
    const size = crewSize(opts, cases.length);
    if (held.crew && held.crew.size !== size) {
      await held.crew.stop();
      held.crew = null;
    }
    if (size && !held.crew) held.crew = startCrew(size, opts.maxMemoryBytes !== undefined ? { maxMemoryBytes: opts.maxMemoryBytes } : {});
    const own = held.crew ? await held.crew.plan(cases, planOpts) : cases.map((c) => planCase(c, planOpts));
    // Runs of a sweep's cases on one grid where sharing it is cheaper (plan/shared-grids.ts).
    plans = shareGrids(cases, own, planOpts);
    const seconds = plans.reduce((s, p) => s + p.work, 0) / LIMITS.workPerSecond;
    if (!opts.acceptLarge && seconds > LARGE_SWEEP.seconds) {
      return refuse(
        `the sweeps make ${cases.length} cases, estimated at ${trimNumber(seconds / 3600, 3)} CPU hours ` +
          `(limits ${LARGE_SWEEP.cases} cases, ${LARGE_SWEEP.seconds / 3600} hours); if that is meant, run again with --accept-large`,
      );
    }
    jobDir = await safeJoin(opts.outDir, spec.name);
    await makeFolder(jobDir);
  } catch (e) {
    return refuse((e as Error).message);
  }
  // One run at a time in this folder (or in this shard of it): see run/lock.ts.
  let lock: HeldLock;
  try {
    lock = await acquireRunLock(jobDir, opts.shard ?? null, {
      ...(opts.lockWaitMs !== undefined ? { waitMs: opts.lockWaitMs } : {}),
      ...(opts.signal ? { signal: opts.signal } : {}),
      note: (line) => rep.note(line),
    });
  } catch (e) {
    if (e instanceof LockBusyError && opts.signal?.aborted) outcome.interrupted = true;
    return refuse((e as Error).message);
  }
  try {
    try {
      await writeFileAtomic(`${jobDir}/job.json`, JSON.stringify({ file, job: loaded.given }, null, 2) + '\n');
    } catch (e) {
      return refuse((e as Error).message);
    }
    outcome.folder = jobDir;
    return await runLocked(loaded, opts, rep, outcome, jobDir, plans, held.crew);
  } finally {
    await lock.release();
  }
}

/** Notes on cases found damaged or unverified, capped so that a sweep of thousands does not flood the console. */
const DAMAGE_NOTES = 20;

/** The cases of a job whose folder this run holds (the lock): skip what is done and verified, compute the rest. */
async function runLocked(
  loaded: LoadedJob,
  opts: RunOptions,
  rep: RunReporter,
  outcome: JobOutcome,
  jobDir: string,
  plans: Plan[],
  crew: Crew | null,
): Promise<JobOutcome> {
  const { spec, file } = loaded;
  const refuse = (msg: string): JobOutcome => {
    outcome.error = `${file}: ${msg}`;
    rep.note(outcome.error);
    return outcome;
  };

  // This run's cases: all, or one shard's.
  const shardOf = opts.shard ? assignShards(plans.map((p) => p.work), opts.shard.n) : null;
  const mine = plans.filter((_, i) => !shardOf || shardOf[i] === opts.shard!.k);
  if (!opts.shard) await removeLeftovers(jobDir);

  const manifest: Manifest = {
    tool: TOOL_VERSION,
    job: spec.name,
    shard: opts.shard ? `${opts.shard.k}/${opts.shard.n}` : null,
    completed: {},
    failed: {},
  };
  const todo: CaseTask[] = [];
  const tooBig: Plan[] = [];
  // A case is skipped only when its folder verifies (record, sizes, digests); else it is computed
  // again, and the run says why when a folder was there.
  const unverified: string[] = [];
  let damaged = 0;
  const mineHashes = mine.map((p) => caseHash(p.case));
  const states = opts.force ? [] : await verifyCases(jobDir, mine.map((p, i) => ({ id: p.case.id, hash: mineHashes[i]! })));
  for (const [i, p] of mine.entries()) {
    const hash = mineHashes[i]!;
    const st = states[i] ?? null;
    if (st?.state === 'done') {
      manifest.completed[p.case.id] = hash;
      outcome.skipped++;
      outcome.warnings += st.record.warnings.length;
      continue;
    }
    if (st?.state === 'unverified') unverified.push(p.case.id);
    if (st?.state === 'damaged' && ++damaged <= DAMAGE_NOTES) {
      const listed = st.problems.slice(0, 10).join(', ') + (st.problems.length > 10 ? `, and ${st.problems.length - 10} more` : '');
      rep.note(`case ${p.case.id}: ${listed}: computing it again`);
    }
    if (p.error) tooBig.push(p);
    else todo.push({ plan: p, jobDir, hash });
  }
  // What the job report will want of each case (its contact-sheet tile, its explorer entry), made
  // by the thread that computes it while the other cases run (report/case-share.ts); a shard makes
  // no report.
  const shares = opts.shard ? new Map<string, ReportShare>() : reportShares(sweepAxes(spec).filter((a) => a.values.length > 1), plans);
  for (const t of todo) {
    const share = shares.get(t.plan.case.id);
    if (share) t.report = share;
  }
  const prepared = new Map<string, PreparedShare>();
  if (damaged > DAMAGE_NOTES) rep.note(`${damaged - DAMAGE_NOTES} more cases had missing or damaged files: computing them again`);
  if (unverified.length) {
    const some = unverified.slice(0, 10).join(', ') + (unverified.length > 10 ? `, and ${unverified.length - 10} more` : '');
    rep.note(
      `${unverified.length} case${unverified.length === 1 ? ' was' : 's were'} recorded by an earlier version without file digests, ` +
        `so ${unverified.length === 1 ? 'it' : 'they'} cannot be verified: computing ${unverified.length === 1 ? 'it' : 'them'} again (${some})`,
    );
  }

  // Cases of a distance sweep on one grid share their source's spectrum (and count the memory it takes).
  shareSourceSpectra(todo.map((t) => t.plan));

  // Memory guard: every case must fit, and as many run at once as the memory allows.
  const requested = Math.max(1, opts.workers ?? 1);
  const available = opts.availableMemoryBytes ?? availableMemory();
  const largest = todo.reduce<Plan | null>((m, t) => (!m || t.plan.memoryBytes > m.memoryBytes ? t.plan : m), null);
  let workers = Math.min(requested, Math.max(1, todo.length));
  if (largest) {
    if (largest.memoryBytes > available) {
      return refuse(
        `case ${largest.case.id} needs about ${bytes(largest.memoryBytes)} but only ${bytes(available)} is available; ` +
          `lower it with a smaller window, a coarser grid.pitch or fewer cases at once, or free memory`,
      );
    }
    const fit = Math.floor(available / largest.memoryBytes);
    if (fit < workers) {
      rep.note(
        `memory: ${workers} cases at once would need up to ${bytes(workers * largest.memoryBytes)} (largest case ${largest.case.id}, ` +
          `${bytes(largest.memoryBytes)}), ${bytes(available)} is available: running ${fit} at a time`,
      );
      workers = fit;
    }
  }

  // One case per worker thread, or the cases one at a time with their FFTs split across the threads.
  const parallel = chooseParallelism(todo.map((t) => t.plan), requested, workers);
  workers = parallel.workers;
  rep.jobStart(spec.name, jobDir, mine.length, outcome.skipped, workers);
  if (parallel.note) rep.note(parallel.note);
  const save = () => writeManifest(jobDir, manifest, opts.shard ?? null);
  const fail = async (id: string, hash: string, error: string) => {
    outcome.failed.push({ case: id, error });
    manifest.failed[id] = { hash, error };
    rep.caseFailed(id, error);
    await save();
  };
  for (const p of tooBig) await fail(p.case.id, caseHash(p.case), p.error!);
  const hashes = new Map(todo.map((t) => [t.plan.case.id, t.hash]));
  const heapMb = largest ? Math.ceil(largest.memoryBytes / 1024 ** 2) + 512 : undefined;
  // Case workers stay for the report's plots (not for a shard, which makes no report).
  const { interrupted, kept } = await runTasks(
    todo,
    { workers, threadsPerCase: parallel.threadsPerCase, engine: opts.engine ?? createEngine(), ...(opts.maxMemoryBytes !== undefined ? { maxMemoryBytes: opts.maxMemoryBytes } : {}), ...(heapMb ? { heapMb } : {}), ...(opts.signal ? { signal: opts.signal } : {}), ...(crew ? { crew } : {}), keep: !opts.shard },
    {
      start: (id) => rep.caseStart(id),
      done: async (d) => {
        outcome.warnings += d.summary.warnings.length;
        manifest.completed[d.id] = hashes.get(d.id)!;
        delete manifest.failed[d.id];
        if (d.report) prepared.set(d.id, d.report);
        rep.caseDone(d.id, caseLines(d.summary), d.summary.warnings.length);
        await save();
      },
      failed: (id, error) => fail(id, hashes.get(id)!, error),
      note: (line) => rep.note(line),
    },
  );
  try {
    return await finishRun(loaded, opts, rep, outcome, jobDir, plans, manifest, save, mine.length, interrupted, kept, prepared);
  } finally {
    await stopKept(kept);
  }
}

/** After the cases: the manifest, and the job-level files (or, for a shard, what to do next). */
async function finishRun(
  loaded: LoadedJob,
  opts: RunOptions,
  rep: RunReporter,
  outcome: JobOutcome,
  jobDir: string,
  plans: Plan[],
  manifest: Manifest,
  save: () => Promise<void>,
  mineCount: number,
  interrupted: boolean,
  kept: Worker[],
  prepared: ReadonlyMap<string, PreparedShare>,
): Promise<JobOutcome> {
  const { spec, file } = loaded;
  await save();
  outcome.done = Object.keys(manifest.completed).length;
  if (interrupted) outcome.interrupted = true;

  const cases = plans.map((p) => p.case);
  if (opts.shard) {
    rep.jobEnd(
      `job ${spec.name}, shard ${opts.shard.k}/${opts.shard.n}: ${outcome.done} of ${mineCount} cases done, ${outcome.failed.length} failed` +
        `${interrupted ? ' (interrupted)' : ''}; gather the shards with: spotcast gather ${file} --out ${opts.outDir}`,
    );
    return outcome;
  }
  // The cases verified or written by this run (which holds the folder) need not be read again.
  const g = await gatherJob(loaded, jobDir, cases, opts, new Set(Object.keys(manifest.completed)), kept.length ? plotsOn(kept) : undefined, prepared);
  if (g.reportError) {
    outcome.reportError = g.reportError;
    rep.note(`job ${spec.name}: the report could not be written: ${g.reportError}`);
  }
  rep.jobEnd(
    `job ${spec.name}: ${g.done} of ${g.total} done (${outcome.skipped} from earlier runs), ${g.failed.length} failed, ` +
      `${outcome.warnings} warning(s)${interrupted ? `, stopped with ${g.missing.length} not done` : ''}; results in ${jobDir} (report.html)`,
  );
  return outcome;
}

/** The default worker count of the command line: one per core. */
export function defaultWorkers(): number {
  return typeof availableParallelism === 'function' ? availableParallelism() : 1;
}

