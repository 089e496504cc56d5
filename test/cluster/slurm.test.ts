// The README's cluster recipe, for real, on one node: a throw-away Slurm cluster (munged, slurmctld,
// slurmd, all from a temporary folder, with their own socket, ports, spool and state) runs a
// 4-task array job of `spotcast run --shard`, then `spotcast gather` merges the shards, and the
// result must equal a single-process run of the same job.
//
// Needs root and the Debian packages slurmctld, slurmd, slurm-client and munge (`.ci/run` installs
// them); without them the file is skipped and says why. The build runs once in beforeAll; set
// SPOTCAST_TEST_NO_BUILD=1 to use an existing dist/ instead.
import { spawn, type ChildProcess } from 'node:child_process';
import { accessSync, constants, existsSync, openSync, closeSync, readdirSync, readFileSync } from 'node:fs';
import { chmod, mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { createServer } from 'node:net';
import { hostname, tmpdir } from 'node:os';
import { delimiter, dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const cli = join(repo, 'dist', 'src', 'cli.js');

/** The absolute path of an executable on PATH or in the usual system folders (daemons live in sbin). */
function findExecutable(name: string): string | null {
  const dirs = [...(process.env.PATH ?? '').split(delimiter), '/usr/sbin', '/usr/bin', '/sbin', '/bin'];
  for (const d of dirs) {
    if (!d) continue;
    const p = join(d, name);
    try {
      accessSync(p, constants.X_OK);
      return p;
    } catch {
      // not here
    }
  }
  return null;
}

const BINARIES = ['sbatch', 'sinfo', 'slurmctld', 'slurmd', 'munged'] as const;
const bin = Object.fromEntries(BINARIES.map((b) => [b, findExecutable(b)])) as Record<(typeof BINARIES)[number], string | null>;

function skipReason(): string | null {
  if (process.platform !== 'linux') return `the cluster test needs Linux (this is ${process.platform})`;
  if (process.getuid?.() !== 0) return 'the cluster test starts Slurm and munge daemons and must run as root';
  const missing = BINARIES.filter((b) => bin[b] === null);
  if (missing.length > 0) {
    return `${missing.join(', ')} not found: install the Debian packages slurmctld slurmd slurm-client munge (.ci/run does)`;
  }
  return null;
}
const skip = skipReason();
if (skip) console.warn(`test/cluster/slurm.test.ts skipped: ${skip}`);

// An invented bench check: a 30 µm slit under a red laser line, screen moved from 1 mm to 1 m.
const JOB_NAME = 'bench-slit-sweep';
const JOB =
  `name: ${JOB_NAME}\n` +
  'description: invented bench check, a 30 um slit from the near field to the far field\n' +
  'wavelength: 633 nm\n' +
  'distance: {from: 1 mm, to: 1 m, count: 12, spacing: log}\n' +
  'aperture: {shape: slit, width: 30 um}\n';
const CASES = 12;
const TASKS = 4;

/** Slurm and the program see only our cluster: no SLURM_* inherited from an outer allocation. */
function clusterEnv(conf: string): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [k, v] of Object.entries(process.env)) if (!k.startsWith('SLURM_')) env[k] = v;
  env.SLURM_CONF = conf;
  return env;
}

interface Ran {
  status: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

function run(cmd: string, args: string[], opts: { env?: NodeJS.ProcessEnv; cwd?: string; timeoutMs: number }): Promise<Ran> {
  return new Promise((done, fail) => {
    const p = spawn(cmd, args, { cwd: opts.cwd ?? repo, env: opts.env ?? process.env, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    p.stdout.setEncoding('utf8').on('data', (s: string) => (stdout += s));
    p.stderr.setEncoding('utf8').on('data', (s: string) => (stderr += s));
    const timer = setTimeout(() => p.kill('SIGKILL'), opts.timeoutMs);
    p.on('error', (e) => {
      clearTimeout(timer);
      fail(e);
    });
    p.on('close', (status, signal) => {
      clearTimeout(timer);
      done({ status, signal, stdout, stderr });
    });
  });
}

function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const s = createServer();
    s.once('error', fail);
    s.listen(0, '127.0.0.1', () => {
      const addr = s.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      s.close(() => done(port));
    });
  });
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** Every live descendant of pid, found through /proc parent links (slurmctld forks a helper). */
function descendants(pid: number): number[] {
  const parent = new Map<number, number>();
  for (const e of readdirSync('/proc')) {
    if (!/^\d+$/.test(e)) continue;
    try {
      // /proc/PID/stat: "pid (comm) state ppid ..."; comm may contain spaces, so cut after the last ')'.
      const stat = readFileSync(`/proc/${e}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      parent.set(Number(e), ppid);
    } catch {
      // exited meanwhile
    }
  }
  const out: number[] = [];
  const stack = [pid];
  while (stack.length) {
    const p = stack.pop()!;
    for (const [c, pp] of parent) if (pp === p) (out.push(c), stack.push(c));
  }
  return out;
}

/** RFC 4180 CSV (quoted fields, doubled quotes), written here rather than taken from the program. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i]!;
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') (cell += '"', i++);
      else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') (row.push(cell), (cell = ''));
    else if (ch === '\n') (row.push(cell), rows.push(row), (row = []), (cell = ''));
    else if (ch !== '\r') cell += ch;
  }
  if (cell !== '' || row.length > 0) (row.push(cell), rows.push(row));
  return rows;
}

interface Daemon {
  name: string;
  child: ChildProcess;
  log: string;
}

describe.skipIf(skip !== null)('a one-node Slurm cluster runs the README array job', () => {
  let tmp = '';
  let conf = '';
  let env: NodeJS.ProcessEnv = {};
  const daemons: Daemon[] = [];
  /** The daemons' stdout and stderr: in the foreground they copy their log there, early errors too. */
  const logs: string[] = [];

  function tails(): string {
    return logs
      .filter((f) => existsSync(f))
      .map((f) => {
        const lines = readFileSync(f, 'utf8').trimEnd().split('\n');
        return `--- ${f} (last lines) ---\n${lines.slice(-25).join('\n')}`;
      })
      .join('\n');
  }

  function start(name: string, exe: string, args: string[]): Daemon {
    const log = join(tmp, 'log', `${name}.out`);
    logs.push(log);
    const fd = openSync(log, 'a');
    try {
      const child = spawn(exe, args, { cwd: tmp, env, stdio: ['ignore', fd, fd] });
      const d = { name, child, log };
      daemons.push(d);
      // If the test process dies without afterAll (an interrupted run), take the daemon with it.
      const pid = child.pid;
      if (pid) process.once('exit', () => alive(pid) && process.kill(pid, 'SIGKILL'));
      child.on('error', (e) => console.warn(`${name}: ${e.message}`));
      return d;
    } finally {
      closeSync(fd);
    }
  }

  beforeAll(async () => {
    if (process.env.SPOTCAST_TEST_NO_BUILD !== '1') {
      const b = await run('npm', ['run', 'build'], { timeoutMs: 120_000 });
      if (b.status !== 0) throw new Error(`npm run build failed:\n${b.stdout}\n${b.stderr}`);
    }
    if (!existsSync(cli)) throw new Error(`${cli} is missing: run npm run build`);

    tmp = await mkdtemp(join(tmpdir(), 'spotcast-slurm-'));
    await chmod(tmp, 0o755);
    for (const d of ['munge', 'state', 'spool', 'log', 'work', 'shared', 'single']) await mkdir(join(tmp, d), { recursive: true });
    await chmod(join(tmp, 'munge'), 0o755);
    const node = hostname().split('.')[0]!; // `hostname -s`
    const cpus = Number((await run('nproc', [], { timeoutMs: 10_000 })).stdout.trim()) || 1;
    const [ctldPort, dPort] = [await freePort(), await freePort()];

    // munge: a fresh key of 1024 random bytes (/work/shared/slurm-one-node.md), mode 0400, and a
    // socket of our own so that a munged already running on the machine is left alone.
    const key = join(tmp, 'munge', 'munge.key');
    await writeFile(key, randomBytes(1024), { mode: 0o400 });
    const socket = join(tmp, 'munge', 'munge.socket.2');

    // The settings known to work on this machine class (/work/shared/slurm-one-node.md), with every
    // path in the temporary folder and ports that were free a moment ago.
    conf = join(tmp, 'slurm.conf');
    await writeFile(
      conf,
      [
        'ClusterName=spotcasttest',
        `SlurmctldHost=${node}`,
        'SlurmUser=root',
        'SlurmdUser=root',
        'AuthType=auth/munge',
        `AuthInfo=socket=${socket}`,
        'CredType=cred/munge',
        'ProctrackType=proctrack/linuxproc',
        'TaskPlugin=task/none',
        'JobAcctGatherType=jobacct_gather/none',
        'SelectType=select/cons_tres',
        'SelectTypeParameters=CR_Core',
        'ReturnToService=2',
        'MpiDefault=none',
        'MailProg=/bin/true',
        `SlurmctldPort=${ctldPort}`,
        `SlurmdPort=${dPort}`,
        `StateSaveLocation=${join(tmp, 'state')}`,
        `SlurmdSpoolDir=${join(tmp, 'spool')}`,
        `SlurmctldPidFile=${join(tmp, 'slurmctld.pid')}`,
        `SlurmdPidFile=${join(tmp, 'slurmd.pid')}`,
        `SlurmctldLogFile=${join(tmp, 'log', 'slurmctld.log')}`,
        `SlurmdLogFile=${join(tmp, 'log', 'slurmd.log')}`,
        `NodeName=${node} CPUs=${cpus} RealMemory=16000 State=UNKNOWN`,
        `PartitionName=main Nodes=${node} Default=YES MaxTime=INFINITE State=UP`,
        '',
      ].join('\n'),
    );
    env = clusterEnv(conf);

    // All three in the foreground (-F, -D) as our own children: we hold their pids and stop them.
    start('munged', bin.munged!, [
      '--foreground',
      '--force',
      `--key-file=${key}`,
      `--socket=${socket}`,
      `--log-file=${join(tmp, 'log', 'munged.log')}`,
      `--pid-file=${join(tmp, 'munge', 'munged.pid')}`,
      `--seed-file=${join(tmp, 'munge', 'munged.seed')}`,
    ]);
    for (let i = 0; i < 50 && !existsSync(socket); i++) await sleep(100);
    start('slurmctld', bin.slurmctld!, ['-D', '-f', conf]);
    start('slurmd', bin.slurmd!, ['-D', '-f', conf]);

    // The binaries are there (the skip above) and CI installs them on purpose, so a cluster that
    // does not come up is a failure, not a skip: a skip would hide a broken setup behind a green run.
    // This machine class runs them (checked while writing this test), so no exception is made.
    const deadline = Date.now() + 60_000;
    let state = '';
    while (Date.now() < deadline) {
      for (const d of daemons) {
        if (d.child.exitCode !== null || d.child.signalCode !== null) {
          throw new Error(`${d.name} exited (${d.child.exitCode ?? d.child.signalCode}) before the cluster was up\n${tails()}`);
        }
      }
      const s = await run(bin.sinfo!, ['-h', '-o', '%t'], { env, timeoutMs: 15_000 });
      state = (s.stdout + s.stderr).trim();
      // sinfo(1), NODE STATE CODES: IDLE, "not allocated to any jobs and is available for use".
      if (s.status === 0 && state === 'idle') return;
      await sleep(500);
    }
    throw new Error(`the one-node cluster did not come up within 60 s (sinfo said '${state}')\n${tails()}`);
  }, 180_000);

  afterAll(async () => {
    // Stop what we started, by pid: SIGTERM to each daemon, then SIGKILL to whatever of it (or of
    // the helpers it forked) is left after a grace period.
    const pids = daemons.flatMap((d) => (d.child.pid ? [d.child.pid, ...descendants(d.child.pid)] : []));
    for (const d of [...daemons].reverse()) if (d.child.pid && alive(d.child.pid)) d.child.kill('SIGTERM');
    for (let i = 0; i < 100 && pids.some(alive); i++) await sleep(100);
    for (const p of pids.filter(alive)) {
      try {
        process.kill(p, 'SIGKILL');
      } catch {
        // gone
      }
    }
    for (let i = 0; i < 50 && pids.some(alive); i++) await sleep(100);
    const left = pids.filter(alive);
    if (tmp) await rm(tmp, { recursive: true, force: true });
    if (left.length > 0) throw new Error(`daemon processes still running after cleanup: ${left.join(', ')}`);
  }, 60_000);

  it('4 array tasks each run one shard; gather equals a single-process run', async () => {
    const work = join(tmp, 'work');
    const shared = join(tmp, 'shared');
    const single = join(tmp, 'single');
    const jobFile = join(work, `${JOB_NAME}.yaml`);
    await writeFile(jobFile, JOB);

    // The README's array-job script, with the repo's built CLI in place of `spotcast` on PATH.
    // sbatch(1), OUTPUT ENVIRONMENT VARIABLES: SLURM_ARRAY_TASK_ID is the task's index (0..3 here),
    // SLURM_ARRAY_TASK_COUNT the number of tasks in the array.
    const script = join(work, 'shards.sh');
    await writeFile(
      script,
      [
        '#!/bin/bash',
        '#SBATCH --job-name=bench-slit-sweep',
        `#SBATCH --array=0-${TASKS - 1}`,
        '#SBATCH --ntasks=1',
        '#SBATCH --cpus-per-task=1',
        '#SBATCH --time=00:10:00',
        `#SBATCH --chdir=${work}`,
        `#SBATCH --output=${join(work, 'task-%a.log')}`,
        'set -euo pipefail',
        `echo "array task $SLURM_ARRAY_TASK_ID of $SLURM_ARRAY_TASK_COUNT"`,
        `${JSON.stringify(process.execPath)} ${JSON.stringify(cli)} run ${JSON.stringify(jobFile)} \\`,
        `  --shard $((SLURM_ARRAY_TASK_ID + 1))/$SLURM_ARRAY_TASK_COUNT --out ${JSON.stringify(shared)} --workers 1`,
        '',
      ].join('\n'),
      { mode: 0o755 },
    );

    // sbatch(1), --wait: "the exit code of the sbatch command will be the same as the exit code of
    // the submitted job ... in the case of a job array, ... the highest value for any task".
    const sb = await run(bin.sbatch!, ['--wait', script], { env, cwd: work, timeoutMs: 300_000 });
    const taskLogs = (await readdir(work))
      .filter((f) => /^task-\d+\.log$/.test(f))
      .sort()
      .map((f) => `--- ${f}\n${readFileSync(join(work, f), 'utf8')}`)
      .join('\n');
    expect(sb.status, `sbatch --wait failed:\n${sb.stdout}\n${sb.stderr}\n${taskLogs}\n${tails()}`).toBe(0);
    expect(sb.stdout).toMatch(/Submitted batch job \d+/);

    // Every array task ran, each once, and saw the count (sbatch(1) as above).
    const seen = [...taskLogs.matchAll(/^array task (\d+) of (\d+)$/gm)].map((m) => [Number(m[1]), Number(m[2])]);
    expect(seen.map((s) => s[0]).sort()).toEqual([0, 1, 2, 3]);
    expect(seen.every((s) => s[1] === TASKS)).toBe(true);

    const gathered = await run(process.execPath, [cli, 'gather', jobFile, '--out', shared], { cwd: work, timeoutMs: 120_000 });
    expect(gathered.status, gathered.stdout + gathered.stderr).toBe(0);
    const alone = await run(process.execPath, [cli, 'run', jobFile, '--out', single, '--quiet'], { cwd: work, timeoutMs: 240_000 });
    expect(alone.status, alone.stdout + alone.stderr).toBe(0);

    const sharedJob = join(shared, JOB_NAME);
    const singleJob = join(single, JOB_NAME);

    // Each shard's manifest lists its completed cases; together they are every case, each once.
    const manifests = (await readdir(sharedJob)).filter((f) => /^manifest-shard-\d+-of-\d+\.json$/.test(f)).sort();
    expect(manifests).toEqual([1, 2, 3, 4].map((k) => `manifest-shard-${k}-of-${TASKS}.json`));
    const perShard = await Promise.all(
      manifests.map(async (m) => Object.keys((JSON.parse(await readFile(join(sharedJob, m), 'utf8')) as { completed: Record<string, string> }).completed)),
    );
    const listed = perShard.flat();
    for (const ids of perShard) expect(ids.length).toBeGreaterThan(0); // 12 cases over 4 shards: none idle
    expect(new Set(listed).size).toBe(listed.length); // disjoint
    const singleCases = (await readdir(singleJob, { withFileTypes: true })).filter((e) => e.isDirectory() && /^\d+_/.test(e.name)).map((e) => e.name).sort();
    const sharedCases = (await readdir(sharedJob, { withFileTypes: true })).filter((e) => e.isDirectory() && /^\d+_/.test(e.name)).map((e) => e.name).sort();
    expect(singleCases).toHaveLength(CASES);
    expect([...listed].sort()).toEqual(singleCases); // covering
    expect(sharedCases).toEqual(singleCases);

    // summary.csv: the same header, the same cases each once, equal rows except the timing column.
    // The computations are deterministic (the same IEEE 754 operations in the same order give the
    // same bits: common practice), so the numbers must match exactly, not within a tolerance.
    const [sh, ...sRows] = parseCsv(await readFile(join(sharedJob, 'summary.csv'), 'utf8'));
    const [uh, ...uRows] = parseCsv(await readFile(join(singleJob, 'summary.csv'), 'utf8'));
    expect(sh).toEqual(uh);
    const header = sh!;
    const caseCol = header.indexOf('case');
    const statusCol = header.indexOf('status');
    const timing = header.indexOf('seconds');
    expect(caseCol).toBeGreaterThanOrEqual(0);
    expect(timing).toBeGreaterThanOrEqual(0);
    expect(sRows).toHaveLength(CASES);
    expect(uRows).toHaveLength(CASES);
    expect(sRows.map((r) => r[caseCol]).sort()).toEqual(singleCases);
    expect(new Set(sRows.map((r) => r[caseCol])).size).toBe(CASES);
    const byCase = new Map(uRows.map((r) => [r[caseCol]!, r]));
    let numbersCompared = 0;
    for (const r of sRows) {
      const u = byCase.get(r[caseCol]!)!;
      expect(r[statusCol]).toBe('done');
      expect(r).toHaveLength(header.length);
      for (let c = 0; c < header.length; c++) {
        if (c === timing) continue;
        const a = r[c]!;
        const b = u[c]!;
        const where = `${r[caseCol]} ${header[c]}`;
        if (a !== '' && b !== '' && Number.isFinite(Number(a)) && Number.isFinite(Number(b))) {
          expect(Number(a), where).toBe(Number(b));
          numbersCompared++;
        } else {
          expect(a, where).toBe(b);
        }
      }
    }
    // The comparison above must have had numbers to compare (peak, widths, ... per case).
    expect(numbersCompared).toBeGreaterThan(CASES * 10);

    // The maps themselves: the same bytes in both runs.
    for (const id of singleCases) {
      const a = await readFile(join(sharedJob, id, 'intensity.npy'));
      const b = await readFile(join(singleJob, id, 'intensity.npy'));
      expect(a.equals(b), `${id}/intensity.npy differs`).toBe(true);
    }

    const summary = JSON.parse(await readFile(join(sharedJob, 'summary.json'), 'utf8')) as { cases: number; done: number; missing: string[] };
    expect(summary.cases).toBe(CASES);
    expect(summary.done).toBe(CASES);
    expect(summary.missing).toEqual([]);
    expect(existsSync(join(sharedJob, 'report.html'))).toBe(true);
  }, 400_000);
});
