// Reading a job file is bounded whatever the path names: a FIFO nobody writes to, /dev/zero, a
// folder, a link to a device or a file over the 256 KiB cap is refused from its stat, at once,
// without opening it (opening a FIFO for reading waits for a writer) and without reading it.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtemp, rm, symlink, writeFile } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JobError, MAX_JOB_BYTES, loadJobFile } from '../../src/job/load.js';

const JOB = 'name: pin\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: circle, diameter: 50 um}\n';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-special-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** The refusal of loading `path`, and how long it took (the test fails if it is accepted). */
async function refused(path: string): Promise<{ error: JobError; ms: number }> {
  const t0 = performance.now();
  try {
    await loadJobFile(path);
  } catch (e) {
    expect(e).toBeInstanceOf(JobError);
    return { error: e as JobError, ms: performance.now() - t0 };
  }
  throw new Error(`expected ${path} to be refused`);
}

/** Handles and requests the event loop still holds (a pending open of a FIFO would be one). */
function pending(): string[] {
  return process.getActiveResourcesInfo().filter((r) => r !== 'TTYWrap' && r !== 'Timeout' && r !== 'PipeWrap' && r !== 'ProcessWrap');
}

describe('special files are refused at once, naming the file and what it is', () => {
  it('a FIFO nobody writes to', async () => {
    const fifo = join(dir, 'job.fifo');
    execFileSync('mkfifo', [fifo]);
    const before = pending().length;
    const { error, ms } = await refused(fifo);
    expect(error.message).toBe(`${fifo}: cannot read the job file: is a FIFO (named pipe), not a regular file`);
    // Generous: a blocked open would never return at all; the refusal takes milliseconds.
    expect(ms).toBeLessThan(10_000);
    // Nothing left waiting on the FIFO that would keep the process alive.
    expect(pending().length).toBeLessThanOrEqual(before);
  });

  it('/dev/zero (a character device that never ends), directly and through a link', async () => {
    if (!existsSync('/dev/zero')) return expect.fail('/dev/zero is missing on this machine');
    const { error, ms } = await refused('/dev/zero');
    expect(error.message).toBe('/dev/zero: cannot read the job file: is a character device, not a regular file');
    expect(ms).toBeLessThan(10_000);
    const link = join(dir, 'zero.yaml');
    await symlink('/dev/zero', link);
    expect((await refused(link)).error.message).toBe(`${link}: cannot read the job file: is a character device, not a regular file`);
  });

  it('a folder, a missing file, a path through a file', async () => {
    expect((await refused(dir)).error.message).toBe(`${dir}: cannot read the job file: is a folder, not a job file`);
    expect((await refused(join(dir, 'nope.yaml'))).error.message).toMatch(/cannot read the job file: no such file$/);
    const plain = join(dir, 'plain.yaml');
    await writeFile(plain, JOB);
    expect((await refused(join(plain, 'x.yaml'))).error.message).toMatch(/cannot read the job file: a part of the path is not a folder$/);
  });

  it('a file over the 256 KiB cap, with its size and the cap; a file at the cap is read', async () => {
    expect(MAX_JOB_BYTES).toBe(256 * 1024);
    const big = join(dir, 'big.yaml');
    // A valid job padded with a comment: only the size is wrong.
    const pad = (n: number) => JOB + '#' + 'x'.repeat(n - JOB.length - 2) + '\n';
    await writeFile(big, pad(MAX_JOB_BYTES + 1));
    const { error, ms } = await refused(big);
    expect(error.message).toBe(`${big}: cannot read the job file: is 256 KiB (262145 bytes), more than the 256 KiB a job file may hold`);
    expect(ms).toBeLessThan(10_000);
    const huge = join(dir, 'huge.yaml');
    await writeFile(huge, pad(20 * MAX_JOB_BYTES));
    expect((await refused(huge)).error.message).toMatch(/is 5 MiB \(5242880 bytes\), more than the 256 KiB a job file may hold$/);
    const atCap = join(dir, 'at-cap.yaml');
    await writeFile(atCap, pad(MAX_JOB_BYTES));
    const loaded = await loadJobFile(atCap);
    expect(loaded.spec.name).toBe('pin');
  });

  it('a file name with control characters is escaped in the message', async () => {
    const odd = join(dir, 'odd\u001b[2Jname.yaml');
    const { error } = await refused(odd);
    expect(error.message).toContain('odd\\x1b[2Jname.yaml: cannot read the job file: no such file');
    expect(error.message).not.toMatch(/\u001b/);
  });
});

// The compiled loader (npm test builds dist/ first; run `npx tsc -p tsconfig.json` before running
// this file alone): a child process that loads a FIFO must print the refusal and exit by itself.
const builtLoader = new URL('../../dist/src/job/load.js', import.meta.url).pathname;

describe('a process that loads a FIFO exits by itself', () => {
  it.skipIf(!existsSync(builtLoader))('the refusal leaves nothing that keeps node running (a child process, killed at 20 s if it hangs)', () => {
    const fifo = join(dir, 'child.fifo');
    execFileSync('mkfifo', [fifo]);
    const script = `
      const { loadJobFile } = await import(${JSON.stringify(builtLoader)});
      try { await loadJobFile(${JSON.stringify(fifo)}); console.log('accepted'); }
      catch (e) { console.log(e.message); }`;
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { timeout: 20_000, encoding: 'utf8' });
    expect(r.signal, 'the child hung and was killed').toBeNull();
    expect(r.status).toBe(0);
    expect(r.stdout.trim()).toBe(`${fifo}: cannot read the job file: is a FIFO (named pipe), not a regular file`);
  });
});
