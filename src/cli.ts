#!/usr/bin/env node
// The command line: a thin layer over the library (argument parsing, messages, exit codes).
import yargs from 'yargs';
import { hideBin } from 'yargs/helpers';
import { relative } from 'node:path';
import { JobError, loadJobFile } from './job/load.js';
import { expandJob } from './job/expand.js';
import { DEFAULT_MAX_MEMORY, planCase } from './plan/planner.js';
import { formatPlan } from './plan/format.js';
import { shareSourceSpectra } from './plan/share.js';
import { defaultWorkers, runJobFile, type JobOutcome } from './run/run-job.js';
import { gatherJob } from './run/gather.js';
import { lineReporter, terminalReporter } from './run/progress.js';
import { parseShard, type ShardSpec } from './run/shard.js';
import { safeJoin } from './output/atomic.js';
import { TOOL_VERSION } from './version.js';
import { loadFastKernels } from './kernels.js';
import { jsonNumbers } from './output/case-output.js';

/** A mistake on the command line itself: reported with exit code 2, before any work. */
class UsageError extends Error {}

export function parseSize(text: string): number {
  const m = /^\s*(\d+(?:\.\d+)?)\s*(b|k|kb|kib|m|mb|mib|g|gb|gib|t|tb|tib)?\s*$/i.exec(text);
  if (!m) throw new UsageError(`--max-memory: expected a size such as 4GiB or 512MB, got '${text}'`);
  const unit = (m[2] ?? 'b').toLowerCase();
  const pow = { b: 0, k: 1, kb: 1, kib: 1, m: 2, mb: 2, mib: 2, g: 3, gb: 3, gib: 3, t: 4, tb: 4, tib: 4 }[unit]!;
  return Math.round(Number(m[1]) * 1024 ** pow);
}

async function planCommand(files: string[], json: boolean, maxMemoryBytes: number): Promise<number> {
  let status = 0;
  const all: unknown[] = [];
  for (const file of files) {
    try {
      const { spec } = await loadJobFile(file);
      const cases = expandJob(spec);
      const plans = cases.map((c) => planCase(c, { maxMemoryBytes }));
      shareSourceSpectra(plans);
      if (plans.some((p) => p.error)) status = 1;
      if (json) {
        all.push({ file, job: spec.name, plans });
        continue;
      }
      console.log(`job ${spec.name} (${file}): ${cases.length} case${cases.length === 1 ? '' : 's'}`);
      for (const p of plans) console.log(formatPlan(p) + '\n');
    } catch (e) {
      status = 1;
      console.error(e instanceof JobError ? e.message : `${file}: ${(e as Error).message}`);
    }
  }
  if (json) console.log(JSON.stringify(all, jsonNumbers, 2));
  return status;
}

interface RunFlags {
  out: string;
  maxMemoryBytes: number;
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
 * Ctrl-C leaves at once.
 */
function stopOnSignals(): { signal: AbortSignal; dispose(): void; stoppedBy(): string | null } {
  const ctl = new AbortController();
  let by: string | null = null;
  const handler = (name: string) => () => {
    if (by) process.exit(130);
    by = name;
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
    dispose() {
      process.off('SIGINT', onInt);
      process.off('SIGTERM', onTerm);
    },
  };
}

async function runCommand(files: string[], flags: RunFlags): Promise<number> {
  const outcomes: JobOutcome[] = [];
  const namesInRun = new Map<string, string>();
  const stop = stopOnSignals();
  const reporter = reporterFor(flags.quiet);
  try {
    for (const file of files) {
      if (stop.signal.aborted) break;
      try {
        outcomes.push(
          await runJobFile(file, {
            outDir: flags.out,
            maxMemoryBytes: flags.maxMemoryBytes,
            workers: flags.workers,
            force: flags.force,
            acceptLarge: flags.acceptLarge,
            ...(flags.shard ? { shard: flags.shard } : {}),
            signal: stop.signal,
            reporter,
            namesInRun,
          }),
        );
      } catch (e) {
        // Whatever stops one job file (a refused output folder, a full disk) must not stop the others.
        const error = `${file}: ${(e as Error).message}`;
        console.error(error);
        outcomes.push({ file, cases: 0, done: 0, skipped: 0, failed: [], warnings: 0, error });
      }
    }
  } finally {
    stop.dispose();
  }
  const bad = outcomes.filter((o) => o.error || o.reportError || o.failed.length > 0);
  const done = outcomes.reduce((s, o) => s + o.done, 0);
  const skipped = outcomes.reduce((s, o) => s + o.skipped, 0);
  const total = outcomes.reduce((s, o) => s + o.cases, 0);
  const failed = outcomes.reduce((s, o) => s + o.failed.length, 0);
  const warnings = outcomes.reduce((s, o) => s + o.warnings, 0);
  console.log('');
  console.log(
    `spotcast: ${done} of ${total} case(s) done (${skipped} skipped, already done), ${failed} failed, ${warnings} warning(s), ` +
      `in ${outcomes.length} job file(s)${flags.shard ? ` (shard ${flags.shard.k}/${flags.shard.n})` : ''}.`,
  );
  for (const o of outcomes) {
    if (o.folder) console.log(`  ${o.job}: ${relative(process.cwd(), o.folder) || '.'}/  (report.html, summary.csv, one folder per case)`);
  }
  const by = stop.stoppedBy();
  if (by) {
    console.error(`spotcast: ${by} with ${done} case(s) done; run the same command again to go on (finished cases are kept and skipped).`);
    return 130;
  }
  if (bad.length) {
    console.error(`spotcast: problems in ${bad.length} job file(s):`);
    for (const o of bad) {
      if (o.error) console.error(`  ${o.file}: not run (see the message above)`);
      if (o.reportError) console.error(`  ${o.job}: report not written: ${o.reportError}`);
      for (const f of o.failed) console.error(`  ${o.job}/${f.case}: ${f.error}`);
    }
    return 1;
  }
  return 0;
}

async function gatherCommand(files: string[], out: string): Promise<number> {
  let status = 0;
  for (const file of files) {
    try {
      const loaded = await loadJobFile(file);
      const jobDir = await safeJoin(out, loaded.spec.name);
      const g = await gatherJob(loaded, jobDir, expandJob(loaded.spec));
      console.log(
        `${loaded.spec.name}: ${g.done} of ${g.total} done, ${g.failed.length} failed, ${g.missing.length} not (yet) done; ` +
          `summary.csv and report.html in ${relative(process.cwd(), jobDir) || '.'}/`,
      );
      for (const f of g.failed) console.error(`  ${f.case}: ${f.error}`);
      if (g.reportError) console.error(`  report not written: ${g.reportError}`);
      if (g.failed.length || g.missing.length || g.reportError) status = 1;
    } catch (e) {
      status = 1;
      console.error(e instanceof JobError ? e.message : `${file}: ${(e as Error).message}`);
    }
  }
  return status;
}

export async function main(argv: string[]): Promise<number> {
  let code = 0;
  const memoryOption = {
    'max-memory': {
      type: 'string' as const,
      describe: 'refuse cases estimated to need more memory than this (e.g. 4GiB)',
      default: `${DEFAULT_MAX_MEMORY / 1024 ** 3}GiB`,
      // A bad size is a command-line mistake (exit 2), found before any work.
      coerce: parseSize,
    },
  };
  await yargs(argv)
    .scriptName('spotcast')
    .usage('$0 <command> JOB...\n\nDiffraction by small apertures: planned, self-checked, calibrated.')
    .command(
      'run <jobs..>',
      'plan and compute every case of the job files, writing results under --out',
      (y) =>
        y
          .positional('jobs', { type: 'string', array: true, demandOption: true, describe: 'job files (YAML or JSON)' })
          .option('out', { type: 'string', default: 'outputs', describe: 'output folder (one sub-folder per job)' })
          .option('quiet', { type: 'boolean', default: false, describe: 'print only problems and the final lines' })
          .option('workers', {
            type: 'number',
            default: defaultWorkers(),
            describe: 'cases computed at once on worker threads (default: the number of cores)',
            coerce: (n: number) => {
              if (!Number.isInteger(n) || n < 1) throw new UsageError(`--workers: expected a whole number 1 or more, got ${n}`);
              return n;
            },
          })
          .option('force', { type: 'boolean', default: false, describe: 'recompute cases that an earlier run finished' })
          .option('shard', {
            type: 'string',
            describe: 'run only shard K of N (K/N) of the cases, for a cluster array job; then spotcast gather',
            coerce: (t: string | undefined) => {
              if (t === undefined) return undefined;
              try {
                return parseShard(t);
              } catch (e) {
                throw new UsageError((e as Error).message);
              }
            },
          })
          .option('accept-large', { type: 'boolean', default: false, describe: 'run a sweep above the size limits, and cases estimated at more than an hour each' })
          .options(memoryOption),
      async (a) => {
        code = await runCommand(a.jobs as string[], {
          out: a.out,
          maxMemoryBytes: a['max-memory'],
          quiet: a.quiet,
          workers: a.workers,
          force: a.force,
          ...(a.shard ? { shard: a.shard } : {}),
          acceptLarge: a['accept-large'],
        });
      },
    )
    .command(
      'plan <jobs..>',
      'print the plan of every case (regime, method, grid, checks, reasons) without computing',
      (y) =>
        y
          .positional('jobs', { type: 'string', array: true, demandOption: true, describe: 'job files (YAML or JSON)' })
          .option('json', { type: 'boolean', default: false, describe: 'print the plans as JSON' })
          .options(memoryOption),
      async (a) => {
        code = await planCommand(a.jobs as string[], a.json, a['max-memory']);
      },
    )
    .command(
      'gather <jobs..>',
      "merge the shards' case results into the job's summary and report (safe while shards still run)",
      (y) =>
        y
          .positional('jobs', { type: 'string', array: true, demandOption: true, describe: 'job files (YAML or JSON)' })
          .option('out', { type: 'string', default: 'outputs', describe: 'the output folder the shards wrote into' }),
      async (a) => {
        code = await gatherCommand(a.jobs as string[], a.out);
      },
    )
    .demandCommand(1, 'name a command: run, plan or gather')
    .strict()
    .version(TOOL_VERSION)
    .help()
    .fail((msg, err) => {
      // yargs reports its own usage problems, and errors thrown while coercing options, as YError.
      if (err && !(err instanceof UsageError) && err.name !== 'YError') throw err;
      console.error(`spotcast: ${err ? err.message : msg}\nRun 'spotcast --help' for the commands.`);
      process.exit(2);
    })
    .parseAsync();
  return code;
}

loadFastKernels();
main(hideBin(process.argv)).then(
  (code) => process.exit(code),
  (e) => {
    console.error(`spotcast: ${(e as Error).message}`);
    process.exit(1);
  },
);
