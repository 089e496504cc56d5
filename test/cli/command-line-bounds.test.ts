// The command line against hostile or mistaken input, on the built CLI (dist/src/cli.js) run as a
// child process: `--` ends the options, every option value is bounded (exit 2, the option and its
// range named, nothing written), --workers above the machine is lowered with a note, a failed
// case's reason is printed during the run and at its end, names from input are escaped on the
// console, special files are refused at once, and a signal while no case runs ends the process.
// dist/ is built in beforeAll when older than the sources (test/build-if-stale.ts); set
// SPOTCAST_TEST_NO_BUILD=1 to use an existing dist/ as it is.
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, readdir, rm, writeFile } from 'node:fs/promises';
import { availableParallelism, tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEFAULT_MAX_MEMORY } from '../../src/plan/planner.js';
import { buildIfStale } from '../build-if-stale.js';

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const cli = join(repo, 'dist', 'src', 'cli.js');
let work: string;

interface Ran {
  status: number | null;
  stdout: string;
  stderr: string;
  ms: number;
}

function spotcast(args: string[], env: Record<string, string> = {}): Ran {
  const t0 = Date.now();
  const r = spawnSync(process.execPath, [cli, ...args], { cwd: work, encoding: 'utf8', timeout: 60_000, env: { ...process.env, ...env } });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr, ms: Date.now() - t0 };
}

async function tree(dir: string): Promise<string[]> {
  if (!existsSync(dir)) return [];
  return (await readdir(dir, { recursive: true })).map(String).sort();
}

/** A stack trace's frame line ("    at f (file.js:1:2)"): never shown to the user. */
const STACK = /^\s+at .*:\d+:\d+\)?$/m;
/** Raw control characters other than newline (a job file or a file name must not reach the terminal). */
const RAW_CONTROL = /[\x00-\x09\x0b-\x1f\x7f]/;

// Invented demo jobs: a 50 µm pinhole and a 20 µm slit at 633 nm, the screen at 1 m and 2 m.
const PINHOLE = 'name: dash-pinhole\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: circle, diameter: 50 um}\n';
const SWEEP = 'name: slit-pair\nwavelength: 633 nm\ndistance: [1 m, 2 m]\naperture: {shape: slit, width: 20 um}\n';
const BAD = 'name: bad-value\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: circle, diameter: -3 mm}\n';
// A file name that would clear the screen and ring the bell if echoed raw.
const HOSTILE_NAME = 'job\x1b[2J\x1b[31m\x07.yaml';
const HOSTILE_ECHO = 'job\\x1b[2J\\x1b[31m\\x07.yaml';

beforeAll(async () => {
  buildIfStale(repo);
  if (!existsSync(cli)) throw new Error(`${cli} is missing: run npm run build`);
  work = await mkdtemp(join(tmpdir(), 'spotcast-cli-bounds-'));
  await writeFile(join(work, '-odd.yaml'), PINHOLE);
  await writeFile(join(work, 'pinhole.yaml'), PINHOLE);
  await writeFile(join(work, 'sweep.yaml'), SWEEP);
  await writeFile(join(work, HOSTILE_NAME), BAD);
});

afterAll(async () => {
  if (work) await rm(work, { recursive: true, force: true });
});

describe('`--` ends the options', () => {
  it('run -- -odd.yaml --force: the dash file is computed, and --force after -- is a job file (a missing one)', async () => {
    const out = join(work, 'out-dash');
    const r = spotcast(['run', '--out', out, '--quiet', '--', '-odd.yaml', '--force']);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('--force: cannot read the job file: no such file');
    expect(r.stderr).not.toMatch(/-odd\.yaml/);
    expect(await tree(out)).toContain(join('dash-pinhole', '1', 'result.json'));
  });

  it('plan and gather take -- too', () => {
    const p = spotcast(['plan', '--', '-odd.yaml']);
    expect(p.status).toBe(0);
    expect(p.stdout).toMatch(/^job dash-pinhole \(-odd\.yaml\): 1 case$/m);
    const g = spotcast(['gather', '--out', join(work, 'out-dash'), '--', '-odd.yaml']);
    expect(g.status).toBe(0);
    expect(g.stdout).toMatch(/^dash-pinhole: 1 of 1 done/m);
  });

  it('without --, a dash file name is refused as options, with the way to name it, and nothing is written', async () => {
    const out = join(work, 'out-dash3');
    const r = spotcast(['run', '-odd.yaml', '--out', out]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/Unknown arguments?: /);
    expect(r.stderr).toContain("'-odd.yaml' is a file: to name a job file that starts with a dash, put it after --, as in: spotcast run -- -odd.yaml");
    expect(await tree(out)).toEqual([]);
  });

  it('no job file at all: exit 2, saying how to name one', () => {
    for (const args of [['run'], ['run', '--'], ['plan', '--json', '--']]) {
      const r = spotcast(args);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/(run|plan): name at least one job file \(a name that starts with a dash goes after --/);
    }
  });
});

describe('bad option values: exit 2 before any work, the option and its range named, nothing written', () => {
  const cores = availableParallelism();
  const workersRange = new RegExp(`--workers: expected a whole number from 1 to ${Math.max(1024, cores)} \\(this machine runs ${cores} threads? at once; more are lowered to ${cores}\\)`);
  const shardRange = /--shard: expected K\/N with N from 1 to 100000 and K from 1 to N, such as 2\/8, got /;
  const memoryRange = /--max-memory: expected a size from 64MiB to 1TiB, such as 4GiB or 512MB, got /;
  it.each([
    [['--workers', '1e9'], workersRange, "got '1e9'"],
    [['--workers', '1000000000'], workersRange, "got '1000000000'"],
    [['--workers', '0'], workersRange, "got '0'"],
    [['--workers', '2.5'], workersRange, "got '2.5'"],
    [['--workers=-3'], workersRange, "got '-3'"],
    [['--shard', '1/4294967296'], shardRange, 'got 1/4294967296'],
    [['--shard', '1/1000000000'], shardRange, 'got 1/1000000000'],
    [['--shard', '4/3'], shardRange, 'got 4/3'],
    [['--shard', 'half'], shardRange, "got 'half'"],
    [['--max-memory', '1MB'], memoryRange, "got '1MB'"],
    [['--max-memory', '2TiB'], memoryRange, "got '2TiB'"],
    [['--max-memory', '0'], memoryRange, "got '0'"],
    [['--out', 'a', '--out', 'b'], /--out: given 2 times \('a', 'b'\); give it once/, ''],
    [['--workers', '1', '--workers', '2'], /--workers: given 2 times \('1', '2'\); give it once/, ''],
    [['--shard', '1/2', '--shard', '2/2'], /--shard: given 2 times/, ''],
    [['--out'], /Not enough arguments following: out/, ''],
  ])('run %j', async (args, message, echo) => {
    const out = join(work, `out-bad-${args.join('_').replace(/[^\w.-]/g, '_')}`);
    // --out given last (or twice) by the case itself; else into its own folder, which must stay empty.
    const outArgs = args.includes('--out') ? [] : ['--out', out];
    const r = spotcast(['run', 'pinhole.yaml', ...outArgs, ...args]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(message);
    if (echo) expect(r.stderr).toContain(echo);
    expect(r.stderr).toMatch(/Run 'spotcast --help'/);
    expect(r.stderr).not.toMatch(STACK);
    expect(r.stdout).toBe('');
    expect(r.ms).toBeLessThan(10_000);
    expect(await tree(out)).toEqual([]);
    for (const f of ['a', 'b', 'outputs']) expect(existsSync(join(work, f))).toBe(false);
  });

  it('plan checks --max-memory the same way', () => {
    const r = spotcast(['plan', 'pinhole.yaml', '--max-memory', '10GB', '--max-memory', '1TiB']);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--max-memory: given 2 times/);
    // The ends of the range are taken: 1TiB plans the case; at 64MiB the planner itself refuses it
    // (it needs about 75 MiB), which shows the value was used.
    expect(spotcast(['plan', 'pinhole.yaml', '--max-memory', '1TiB']).status).toBe(0);
    const low = spotcast(['plan', 'pinhole.yaml', '--max-memory', '64MiB']);
    expect(low.stderr).toBe('');
    expect(low.stdout).toMatch(/CANNOT RUN .*over the 64 MiB limit/);
  });

  it("help gives --max-memory's default, the planner's DEFAULT_MAX_MEMORY", () => {
    const r = spotcast(['run', '--help']);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(new RegExp(`\[default: ${DEFAULT_MAX_MEMORY / 1024 ** 3}GiB\]`));
    expect(r.stdout).toMatch(/--workers .*1 to 1024/s);
    expect(r.stdout).toMatch(/N up to 100000/);
  });

  it('a value with control characters is echoed escaped and cut', () => {
    const r = spotcast(['run', 'pinhole.yaml', '--out', join(work, 'out-esc'), '--workers', `\x1b[2J${'7'.repeat(5000)}`]);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain("got '\\x1b[2J777");
    expect(r.stderr).toContain('…(5004 characters)');
    expect(r.stderr).not.toMatch(RAW_CONTROL);
    expect(r.stderr.length).toBeLessThan(1000);
  });
});

describe('--workers above the machine', () => {
  const cores = availableParallelism();
  it.skipIf(cores >= 1024)('is lowered to the machine, with a one-line note, before the job files are read', () => {
    const r = spotcast(['run', 'absent.yaml', '--out', join(work, 'out-workers'), '--workers', '1024', '--quiet']);
    const lines = r.stderr.split('\n');
    expect(lines[0]).toBe(`spotcast: --workers 1024 lowered to ${cores}: this machine runs ${cores} thread${cores === 1 ? '' : 's'} at once`);
    // Not a usage error: the run went on, to the missing file.
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('absent.yaml: cannot read the job file: no such file');
  });
});

describe('a case that fails while running', () => {
  // A worker that dies needs a second thread: on one core the case would run in this thread.
  it.each([
    ['throws in this thread, --quiet', 'throw', '1', /fault injected for 2_z-2m \(SPOTCAST_FAULT\)/],
    ...(availableParallelism() > 1 ? [['kills its worker thread', 'crash', '2', /the worker computing it stopped: exit code 70/] as const] : []),
  ] as const)('%s: its reason is printed as it happens and again at the end', async (_what, kind, workers, reason) => {
    const out = join(work, `out-fault-${kind}`);
    const r = spotcast(['run', 'sweep.yaml', '--out', out, '--workers', workers, ...(kind === 'throw' ? ['--quiet'] : [])], {
      SPOTCAST_FAULT: `${kind}:2_z-2m`,
    });
    expect(r.status).toBe(1);
    const lines = r.stderr.split('\n');
    // As it happens: the reporter's line.
    expect(lines.some((l) => /^\[\d\/2\] 2_z-2m {2}FAILED: /.test(l) && reason.test(l)), r.stderr).toBe(true);
    // At the end: the listing under "problems".
    const at = lines.indexOf('spotcast: problems in 1 job file(s):');
    expect(at, r.stderr).toBeGreaterThan(-1);
    expect(lines.slice(at).some((l) => l.startsWith('  slit-pair/2_z-2m: ') && reason.test(l))).toBe(true);
    expect(r.stderr).not.toMatch(STACK);
    expect(r.stdout).toMatch(/1 of 2 case\(s\) done .* 1 failed/);
  });
});

describe('file names from the command line are escaped on the console', () => {
  it('plan: a bad job in a file whose name holds ESC and BEL', () => {
    const r = spotcast(['plan', HOSTILE_NAME]);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`${HOSTILE_ECHO}:4:`);
    expect(r.stderr + r.stdout).not.toMatch(RAW_CONTROL);
  });

  it('run: the refusal, and the listing at the end; a missing file of such a name too', () => {
    const r = spotcast(['run', HOSTILE_NAME, `missing\x1b]0;title\x07.yaml`, '--out', join(work, 'out-hostile')]);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`${HOSTILE_ECHO}:4:`);
    expect(r.stderr).toContain(`  ${HOSTILE_ECHO}: not run (see the message above)`);
    expect(r.stderr).toContain('missing\\x1b]0;title\\x07.yaml: cannot read the job file: no such file');
    expect(r.stderr + r.stdout).not.toMatch(RAW_CONTROL);
    expect(r.stderr).not.toMatch(STACK);
  });

  it('plan prints the load warnings (a number without a unit), escaped, on stderr', async () => {
    await writeFile(join(work, 'bare.yaml'), 'name: bare\nwavelength: 633 nm\ndistance: 1\naperture: {shape: slit, width: 20 um}\n');
    const r = spotcast(['plan', '--json', 'bare.yaml']);
    expect(r.status).toBe(0);
    expect(r.stderr).toMatch(/^bare\.yaml:3:11: distance: warning: .*1 m/m);
    expect(() => JSON.parse(r.stdout)).not.toThrow();
  });
});

describe('special files and signals', () => {
  it('a FIFO nobody writes to and /dev/zero are refused at once, without reading them', () => {
    const fifo = join(work, 'pipe.yaml');
    execFileSync('mkfifo', [fifo]);
    const out = join(work, 'out-special');
    const r = spotcast(['run', fifo, '/dev/zero', '--out', out]);
    expect(r.status).toBe(1);
    expect(r.ms).toBeLessThan(10_000);
    expect(r.stderr).toMatch(/pipe\.yaml: cannot read the job file: .*FIFO/);
    expect(r.stderr).toMatch(/\/dev\/zero: cannot read the job file: .*not a regular file/);
    expect(r.stderr).not.toMatch(STACK);
  });

  it('SIGTERM while a job file is being planned (no case running) ends the process at once, the finished job kept', async () => {
    // The first job runs to its end; its last line says the second is next. 0.3 s later that one is
    // being planned (1000 cases: seconds, in one go, with nothing written yet). The signal goes then.
    // (It was 5000 cases; the planning under way is finished before the process ends, so the test
    // paid for all of it, about 20 s of CPU; 1000 take about 4 s, still ten times the 0.3 s.)
    await writeFile(join(work, 'many.yaml'), 'name: many\nwavelength: 633 nm\ndistance: {from: 1 m, to: 2 m, count: 1000}\naperture: {shape: slit, width: 20 um}\n');
    const out = join(work, 'out-signal');
    const child = spawn(process.execPath, [cli, 'run', 'pinhole.yaml', 'many.yaml', '--out', out, '--accept-large', '--workers', '1', '--quiet'], { cwd: work });
    let stdout = '';
    let stderr = '';
    let sent = 0;
    child.stdout.on('data', (d) => {
      stdout += String(d);
      if (!sent && /^job dash-pinhole: 1 of 1 done/m.test(stdout)) {
        sent = -1;
        setTimeout(() => {
          sent = Date.now();
          child.kill('SIGTERM');
        }, 300);
      }
    });
    child.stderr.on('data', (d) => (stderr += String(d)));
    const timer = setTimeout(() => child.kill('SIGKILL'), 60_000);
    const e = await new Promise<{ code: number | null; at: number }>((res) => child.on('exit', (code) => res({ code, at: Date.now() })));
    clearTimeout(timer);
    expect(sent, stdout + stderr).toBeGreaterThan(0);
    // (Before, the signal only asked the run to stop between cases: the job was planned, its folder
    // made, and its empty report written before the process ended.)
    expect(e.code, stderr).toBe(130);
    expect(stderr).toMatch(/^spotcast: terminated while no case was running; finished cases are kept/m);
    // Only the planning under way is waited for (it runs without a break); a bound, not a timing.
    expect(e.at - sent).toBeLessThan(20_000);
    expect(stdout).not.toMatch(/job many/);
    const files = await tree(out);
    expect(files).toContain(join('dash-pinhole', '1', 'result.json'));
    expect(files.filter((f) => f.startsWith('many'))).toEqual([]);
  });
});
