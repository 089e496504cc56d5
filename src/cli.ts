#!/usr/bin/env node
// The command line: a thin layer over the library (argument parsing, messages, exit codes).
// Only what parsing the command line needs is loaded up front; the library (a second or two of
// module loading: the job schema, the planner, the report's plotting) is loaded by the command,
// so that a usage error is reported at once.
import yargs from 'yargs';
import { hideBin } from 'yargs/helpers';
import { existsSync } from 'node:fs';
import { relative } from 'node:path';
import { lineReporter, safeMessage, terminalReporter, type RunReporter } from './run/progress.js';
import { parseShard, type ShardSpec } from './run/shard.js';
import { machineThreads } from './run/threads.js';
import type { JobOutcome } from './run/run-job.js';
import type { Crew } from './run/crew.js';
import { safeEcho } from './safe-text.js';
import { settleV8 } from './run/v8-settings.js';
import { TOOL_VERSION } from './version.js';

/** The default of --max-memory, as help shows it: the planner's DEFAULT_MAX_MEMORY (a test holds them equal). */
const DEFAULT_MAX_MEMORY_TEXT = '4GiB';

/** A mistake on the command line itself: reported with exit code 2, before any work. */
class UsageError extends Error {}

/**
 * The range --max-memory accepts: below 64 MiB hardly a case fits (a 50 µm pinhole in the far field
 * is planned at about 75 MiB); above 1 TiB is a typo, not a machine.
 */
export const MEMORY_RANGE = { min: 64 * 1024 ** 2, max: 1024 ** 4 };
/** Most --workers accepted (or the machine's threads, if more): beyond it the number is a typo. */
export const MAX_WORKERS = 1024;

/** A value from the command line as a message may quote it: escaped, and cut if long. */
const quoted = (text: string) => `'${safeEcho(text, 60)}'`;

/**
 * The one value of an option that takes one. yargs makes an array of an option given twice
 * (--out a --out b), which no option here means: refused with the option named.
 */
function single(option: string, value: unknown): string {
  if (Array.isArray(value)) {
    const given = value.slice(0, 4).map((v) => quoted(String(v))).join(', ') + (value.length > 4 ? ', …' : '');
    throw new UsageError(`--${option}: given ${value.length} times (${given}); give it once`);
  }
  return String(value);
}

export function parseSize(value: unknown): number {
  const text = single('max-memory', value);
  const range = 'a size from 64MiB to 1TiB, such as 4GiB or 512MB';
  const m = /^\s*(\d+(?:\.\d+)?)\s*(b|k|kb|kib|m|mb|mib|g|gb|gib|t|tb|tib)?\s*$/i.exec(text);
  if (!m) throw new UsageError(`--max-memory: expected ${range}, got ${quoted(text)}`);
  const unit = (m[2] ?? 'b').toLowerCase();
  const pow = { b: 0, k: 1, kb: 1, kib: 1, m: 2, mb: 2, mib: 2, g: 3, gb: 3, gib: 3, t: 4, tb: 4, tib: 4 }[unit]!;
  const bytes = Math.round(Number(m[1]) * 1024 ** pow);
  if (!(bytes >= MEMORY_RANGE.min && bytes <= MEMORY_RANGE.max)) throw new UsageError(`--max-memory: expected ${range}, got ${quoted(text)}`);
  return bytes;
}

/**
 * --workers: a whole number from 1 to MAX_WORKERS. A count above the machine's threads is taken
 * (a job script written for a bigger machine still runs) and lowered in runCommand, with a note;
 * a non-integer or an absurd count (1e9) is refused: it is a typo, and guessing what was meant
 * would hide it.
 */
function parseWorkers(value: unknown): number {
  const text = single('workers', value);
  const cores = machineThreads();
  const cap = Math.max(MAX_WORKERS, cores);
  const m = /^\s*(\d{1,10})\s*$/.exec(text);
  const n = m ? Number(m[1]) : NaN;
  if (!(n >= 1 && n <= cap)) {
    throw new UsageError(
      `--workers: expected a whole number from 1 to ${cap} (this machine runs ${cores} thread${cores === 1 ? '' : 's'} at once; more are lowered to ${cores}), got ${quoted(text)}`,
    );
  }
  return n;
}

function parseOut(value: unknown): string {
  const text = single('out', value);
  if (text.trim() === '') throw new UsageError(`--out: expected an output folder, got an empty value`);
  return text;
}

/**
 * The job files: the positional ones, and every argument after `--` (which ends the options, so a
 * file whose name starts with a dash can be named). At least one.
 */
function jobFiles(command: string, a: Record<string, unknown>): string[] {
  const files = [...((a.jobs as unknown[] | undefined) ?? []), ...((a['--'] as unknown[] | undefined) ?? [])].map(String);
  if (files.length === 0) {
    throw new UsageError(`${command}: name at least one job file (a name that starts with a dash goes after --, as in: spotcast ${command} -- -job.yaml)`);
  }
  return files;
}

/** What stopped one job file, as printed: a JobError's own lines, or the file and the message; never a stack. */
function errorLine(file: string, e: unknown): string {
  // A JobError (by name: the class is loaded with the library) has the file and line in each line.
  if (e instanceof Error && e.name === 'JobError') return safeMessage(e.message);
  return safeMessage(`${safeEcho(file, 300)}: ${e instanceof Error ? e.message : String(e)}`);
}

async function planCommand(files: string[], json: boolean, maxMemoryBytes: number | undefined): Promise<number> {
  const [{ formatWarning, loadJobFile }, { expandJob }, { DEFAULT_MAX_MEMORY }, { planCases }, { formatPlan }, { shareSourceSpectra }, { jsonNumbers }] =
    await Promise.all([
      import('./job/load.js'),
      import('./job/expand.js'),
      import('./plan/planner.js'),
      import('./plan/shared-grids.js'),
      import('./plan/format.js'),
      import('./plan/share.js'),
      import('./output/case-output.js'),
    ]);
  maxMemoryBytes ??= DEFAULT_MAX_MEMORY;
  let status = 0;
  const all: unknown[] = [];
  for (const file of files) {
    try {
      const { spec, warnings } = await loadJobFile(file);
      // Load warnings (a number without a unit, a wavelength outside the usual range) go to
      // stderr, so that --json's output stays one JSON document.
      for (const w of warnings) console.error(safeMessage(formatWarning(file, w)));
      const cases = expandJob(spec);
      const plans = planCases(cases, { maxMemoryBytes });
      shareSourceSpectra(plans);
      if (plans.some((p) => p.error)) status = 1;
      if (json) {
        all.push({ file, job: spec.name, plans });
        continue;
      }
      console.log(`job ${safeEcho(spec.name)} (${safeEcho(file, 300)}): ${cases.length} case${cases.length === 1 ? '' : 's'}`);
      // A plan is the planner's own text, as long as it needs; only what it quotes is escaped.
      for (const p of plans) console.log(safeMessage(formatPlan(p), Infinity) + '\n');
    } catch (e) {
      status = 1;
      console.error(errorLine(file, e));
    }
  }
  if (json) console.log(JSON.stringify(all, jsonNumbers, 2));
  return status;
}

interface RunFlags {
  out: string;
  maxMemoryBytes?: number;
  quiet: boolean;
  workers: number;
  force: boolean;
  shard?: ShardSpec;
  acceptLarge: boolean;
}

function reporterFor(quiet: boolean) {
  // A live bar on a terminal; one line per case into logs and scheduler output.
  return process.stdout.isTTY
    ? terminalReporter(process.stdout, process.stderr, quiet)
    : lineReporter((line, problem) => (problem ? console.error(line) : console.log(line)), quiet);
}

/**
 * Ctrl-C or SIGTERM stops the run between cases: running cases are abandoned (their folders were
 * never renamed into place), finished ones are kept, and the same command resumes. A second
 * Ctrl-C leaves at once. While no job's cases are running (loading and planning a job file, or
 * waiting for another run's lock on its folder) there is nothing to finish: the signal ends the
 * process at once (a lock this run holds is removed as it exits).
 */
function stopOnSignals(): {
  signal: AbortSignal;
  dispose(): void;
  stoppedBy(): string | null;
  /** Between a job's first case and its end (jobStart … jobEnd): a signal then stops between cases. */
  casesRunning(running: boolean): void;
} {
  const ctl = new AbortController();
  let by: string | null = null;
  let running = false;
  const handler = (name: string) => () => {
    if (by) process.exit(130);
    by = name;
    if (!running) {
      process.stderr.write(`\nspotcast: ${name} while no case was running; finished cases are kept, and the same command goes on from them\n`);
      process.exit(130);
    }
    process.stderr.write(`\nspotcast: ${name}: stopping after the cases that are finishing; press Ctrl-C again to quit at once\n`);
    ctl.abort();
  };
  const onInt = handler('interrupted');
  const onTerm = handler('terminated');
  process.on('SIGINT', onInt);
  process.on('SIGTERM', onTerm);
  return {
    signal: ctl.signal,
    stoppedBy: () => by,
    casesRunning(r) {
      running = r;
    },
    dispose() {
      process.off('SIGINT', onInt);
      process.off('SIGTERM', onTerm);
    },
  };
}

/**
 * Workers for the first job file, started before the rest of the program is loaded (about half a
 * second of this thread's time, which their own start-up then overlaps); the job takes them over
 * or stops them (run-job.ts RunOptions.crew). None for one worker or without the built worker.
 */
async function earlyCrew(files: string[], flags: RunFlags): Promise<Crew | null> {
  const n = Math.min(flags.workers, machineThreads());
  if (n < 2 || files.length === 0) return null;
  const [{ workersAvailable, startCrew }, { DEFAULT_MAX_MEMORY }] = await Promise.all([import('./run/crew.js'), import('./plan/limits.js')]);
  return workersAvailable() ? startCrew(n, { maxMemoryBytes: flags.maxMemoryBytes ?? DEFAULT_MAX_MEMORY }) : null;
}

async function runCommand(files: string[], flags: RunFlags): Promise<number> {
  settleV8(Math.min(flags.workers, machineThreads()), machineThreads()); // before any worker starts
  let early = await earlyCrew(files, flags);
  const [{ runJobFile }, { DEFAULT_MAX_MEMORY }] = await Promise.all([import('./run/run-job.js'), import('./plan/limits.js')]);
  const outcomes: JobOutcome[] = [];
  const namesInRun = new Map<string, string>();
  const stop = stopOnSignals();
  const shown = reporterFor(flags.quiet);
  // The reporter's job events tell the signal handler when cases are running.
  const reporter: RunReporter = {
    ...shown,
    jobStart(...a) {
      stop.casesRunning(true);
      shown.jobStart(...a);
    },
    jobEnd(line) {
      shown.jobEnd(line);
      stop.casesRunning(false);
    },
  };
  try {
    for (const file of files) {
      if (stop.signal.aborted) break;
      const crew = early;
      early = null;
      try {
        outcomes.push(
          await runJobFile(file, {
            outDir: flags.out,
            maxMemoryBytes: flags.maxMemoryBytes ?? DEFAULT_MAX_MEMORY,
            workers: flags.workers,
            force: flags.force,
            acceptLarge: flags.acceptLarge,
            ...(flags.shard ? { shard: flags.shard } : {}),
            signal: stop.signal,
            reporter,
            namesInRun,
            ...(crew ? { crew } : {}),
          }),
        );
      } catch (e) {
        // Whatever stops one job file (a refused output folder, a full disk) must not stop the others.
        const error = errorLine(file, e);
        console.error(error);
        outcomes.push({ file, cases: 0, done: 0, skipped: 0, failed: [], warnings: 0, error });
      } finally {
        // (A job that could not be loaded never saw its crew; one that ran has taken or stopped it.)
        await crew?.stop();
        stop.casesRunning(false);
      }
    }
  } finally {
    await early?.stop();
    stop.dispose();
  }
  const bad = outcomes.filter((o) => o.error || o.reportError || o.failed.length > 0);
  const done = outcomes.reduce((s, o) => s + o.done, 0);
  const skipped = outcomes.reduce((s, o) => s + o.skipped, 0);
  const total = outcomes.reduce((s, o) => s + o.cases, 0);
  const failed = outcomes.reduce((s, o) => s + o.failed.length, 0);
  const warnings = outcomes.reduce((s, o) => s + o.warnings, 0);
  const job = (o: JobOutcome) => safeEcho(o.job ?? '');
  console.log('');
  console.log(
    `spotcast: ${done} of ${total} case(s) done (${skipped} skipped, already done), ${failed} failed, ${warnings} warning(s), ` +
      `in ${outcomes.length} job file(s)${flags.shard ? ` (shard ${flags.shard.k}/${flags.shard.n})` : ''}.`,
  );
  for (const o of outcomes) {
    if (o.folder) console.log(`  ${job(o)}: ${safeEcho(relative(process.cwd(), o.folder) || '.', 1000)}/  (report.html, summary.csv, one folder per case)`);
  }
  const by = stop.stoppedBy();
  if (by) {
    console.error(`spotcast: ${by} with ${done} case(s) done; run the same command again to go on (finished cases are kept and skipped).`);
    return 130;
  }
  if (bad.length) {
    // Every failed case with its reason, again at the end: a long run's scrolled-away lines are not needed.
    console.error(`spotcast: problems in ${bad.length} job file(s):`);
    for (const o of bad) {
      if (o.error) console.error(`  ${safeEcho(o.file, 300)}: not run (see the message above)`);
      if (o.reportError) console.error(`  ${job(o)}: report not written: ${safeMessage(o.reportError)}`);
      for (const f of o.failed) console.error(`  ${job(o)}/${safeEcho(f.case)}: ${safeMessage(f.error)}`);
    }
    return 1;
  }
  return 0;
}

async function gatherCommand(files: string[], out: string): Promise<number> {
  // Gathering computes nothing: no engine.
  const [{ loadJobFile }, { expandJob }, { gatherJob }, { safeJoin }] = await Promise.all([
    import('./job/load.js'),
    import('./job/expand.js'),
    import('./run/gather.js'),
    import('./output/atomic.js'),
  ]);
  let status = 0;
  for (const file of files) {
    try {
      const loaded = await loadJobFile(file);
      const jobDir = await safeJoin(out, loaded.spec.name);
      const g = await gatherJob(loaded, jobDir, expandJob(loaded.spec));
      console.log(
        `${safeEcho(loaded.spec.name)}: ${g.done} of ${g.total} done, ${g.failed.length} failed, ${g.missing.length} not (yet) done; ` +
          `summary.csv and report.html in ${safeEcho(relative(process.cwd(), jobDir) || '.', 1000)}/`,
      );
      for (const f of g.failed) console.error(`  ${safeEcho(f.case)}: ${safeMessage(f.error)}`);
      // Cases whose files do not match their record count as not done: say which and why.
      for (const d of g.damaged.slice(0, 20)) console.error(`  ${safeEcho(d.case)}: not counted as done: ${safeMessage(d.problems.join('; '))}`);
      if (g.damaged.length > 20) console.error(`  … and ${g.damaged.length - 20} more damaged case(s)`);
      if (g.reportError) console.error(`  report not written: ${safeMessage(g.reportError)}`);
      if (g.failed.length || g.missing.length || g.reportError) status = 1;
    } catch (e) {
      status = 1;
      console.error(errorLine(file, e));
    }
  }
  return status;
}

/**
 * A usage error's hint when an argument that yargs took for options is the name of a file: a job
 * file whose name starts with a dash goes after `--`.
 */
function dashHint(argv: string[]): string {
  const end = argv.indexOf('--');
  const named = (end < 0 ? argv : argv.slice(0, end)).find((a) => /^-[^-]/.test(a) && existsSync(a));
  const command = ['plan', 'gather'].includes(argv[0] ?? '') ? argv[0] : 'run';
  return named ? `\n(${quoted(named)} is a file: to name a job file that starts with a dash, put it after --, as in: spotcast ${command} -- ${safeEcho(named, 60)})` : '';
}

export async function main(argv: string[]): Promise<number> {
  let code = 0;
  const memoryOption = {
    'max-memory': {
      type: 'string' as const,
      describe: 'refuse cases estimated to need more memory than this (64MiB to 1TiB, e.g. 4GiB)',
      defaultDescription: DEFAULT_MAX_MEMORY_TEXT,
      requiresArg: true,
      // A bad size is a command-line mistake (exit 2), found before any work.
      coerce: parseSize,
    },
  };
  const jobsPositional = {
    type: 'string' as const,
    array: true,
    describe: 'job files (YAML or JSON), at least one; names starting with a dash go after --',
  };
  await yargs(argv)
    .scriptName('spotcast')
    .usage('$0 <command> JOB...\n\nDiffraction by small apertures: planned, self-checked, calibrated.')
    // `--` ends the options: what follows is job files, even when a name starts with a dash.
    .parserConfiguration({ 'populate--': true })
    .command(
      'run [jobs..]',
      'plan and compute every case of the job files, writing results under --out',
      (y) =>
        y
          .positional('jobs', jobsPositional)
          .option('out', { type: 'string', default: 'outputs', requiresArg: true, describe: 'output folder (one sub-folder per job)', coerce: parseOut })
          .option('quiet', { type: 'boolean', default: false, describe: 'print only problems and the final lines' })
          .option('workers', {
            type: 'string',
            requiresArg: true,
            describe: `cases computed at once on worker threads, 1 to ${MAX_WORKERS} (default: the number of cores; more than that is lowered to it)`,
            coerce: (v: unknown) => (v === undefined ? undefined : parseWorkers(v)),
          })
          .option('force', { type: 'boolean', default: false, describe: 'recompute cases that an earlier run finished' })
          .option('shard', {
            type: 'string',
            requiresArg: true,
            describe: 'run only shard K of N (K/N, N up to 100000) of the cases, for a cluster array job; then spotcast gather',
            coerce: (v: unknown) => {
              if (v === undefined) return undefined;
              try {
                return parseShard(single('shard', v));
              } catch (e) {
                throw e instanceof UsageError ? e : new UsageError((e as Error).message);
              }
            },
          })
          .option('accept-large', { type: 'boolean', default: false, describe: 'run a sweep above the size limits, and cases estimated at more than an hour each' })
          .options(memoryOption),
      async (a) => {
        const files = jobFiles('run', a);
        const cores = machineThreads();
        let workers = (a.workers as number | undefined) ?? cores;
        if (workers > cores) {
          // More threads than cores only share the cores, each with its own memory.
          console.error(`spotcast: --workers ${workers} lowered to ${cores}: this machine runs ${cores} thread${cores === 1 ? '' : 's'} at once`);
          workers = cores;
        }
        code = await runCommand(files, {
          out: a.out,
          maxMemoryBytes: a['max-memory'],
          quiet: a.quiet,
          workers,
          force: a.force,
          ...(a.shard ? { shard: a.shard } : {}),
          acceptLarge: a['accept-large'],
        });
      },
    )
    .command(
      'plan [jobs..]',
      'print the plan of every case (regime, method, grid, checks, reasons) without computing',
      (y) =>
        y
          .positional('jobs', jobsPositional)
          .option('json', { type: 'boolean', default: false, describe: 'print the plans as JSON' })
          .options(memoryOption),
      async (a) => {
        code = await planCommand(jobFiles('plan', a), a.json, a['max-memory']);
      },
    )
    .command(
      'gather [jobs..]',
      "merge the shards' case results into the job's summary and report (safe while shards still run)",
      (y) =>
        y
          .positional('jobs', jobsPositional)
          .option('out', { type: 'string', default: 'outputs', requiresArg: true, describe: 'the output folder the shards wrote into', coerce: parseOut }),
      async (a) => {
        code = await gatherCommand(jobFiles('gather', a), a.out);
      },
    )
    .demandCommand(1, 'name a command: run, plan or gather')
    .strict()
    .version(TOOL_VERSION)
    .help()
    .fail((msg, err) => {
      // yargs reports its own usage problems, and errors thrown while coercing options, as YError.
      if (err && !(err instanceof UsageError) && err.name !== 'YError') throw err;
      // yargs quotes what it was given (an unknown option may hold anything): escaped and bounded.
      console.error(`spotcast: ${safeMessage(err ? err.message : msg)}${dashHint(argv)}\nRun 'spotcast --help' for the commands.`);
      process.exit(2);
    })
    .parseAsync();
  return code;
}

// Whatever escapes (a bug, not a bad input) is said in one line, without a stack trace.
const internal = (e: unknown) => {
  console.error(`spotcast: ${safeMessage(e instanceof Error ? e.message : String(e))}`);
  process.exit(1);
};
process.on('uncaughtException', internal);
process.on('unhandledRejection', internal);

main(hideBin(process.argv)).then((code) => process.exit(code), internal);
