#!/usr/bin/env node
// The command line: a thin layer over the library (argument parsing, messages, exit codes).
import yargs from 'yargs';
import { hideBin } from 'yargs/helpers';
import { relative } from 'node:path';
import { JobError, loadJobFile } from './job/load.js';
import { expandJob } from './job/expand.js';
import { DEFAULT_MAX_MEMORY, planCase } from './plan/planner.js';
import { formatPlan } from './plan/format.js';
import { runJobFile, type JobOutcome } from './run/run-job.js';
import { TOOL_VERSION } from './version.js';
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

async function runCommand(files: string[], out: string, maxMemoryBytes: number, quiet: boolean): Promise<number> {
  const outcomes: JobOutcome[] = [];
  const namesInRun = new Map<string, string>();
  for (const file of files) {
    const log = (line: string) => {
      if (line.includes('FAILED') || /^\S+:\d+:\d+: |^\S+: /.test(line)) console.error(line);
      else if (!quiet) console.log(line);
    };
    try {
      outcomes.push(await runJobFile(file, { outDir: out, maxMemoryBytes, log, namesInRun }));
    } catch (e) {
      // Whatever stops one job file (a refused output folder, a full disk) must not stop the others.
      const error = `${file}: ${(e as Error).message}`;
      console.error(error);
      outcomes.push({ file, cases: 0, done: 0, failed: [], warnings: 0, error });
    }
  }
  const bad = outcomes.filter((o) => o.error || o.reportError || o.failed.length > 0);
  const done = outcomes.reduce((s, o) => s + o.done, 0);
  const total = outcomes.reduce((s, o) => s + o.cases, 0);
  const warnings = outcomes.reduce((s, o) => s + o.warnings, 0);
  console.log('');
  console.log(`spotcast: ${done} of ${total} case(s) done in ${outcomes.length} job file(s), ${warnings} warning(s).`);
  for (const o of outcomes) {
    if (o.folder) console.log(`  ${o.job}: ${relative(process.cwd(), o.folder) || '.'}/  (report.html, summary.csv, one folder per case)`);
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
          .options(memoryOption),
      async (a) => {
        code = await runCommand(a.jobs as string[], a.out, a['max-memory'], a.quiet);
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
    .demandCommand(1, 'name a command: run or plan')
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

main(hideBin(process.argv)).then(
  (code) => process.exit(code),
  (e) => {
    console.error(`spotcast: ${(e as Error).message}`);
    process.exit(1);
  },
);
