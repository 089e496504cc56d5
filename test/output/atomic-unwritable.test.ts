// A folder that cannot be written is named as such, with the path: not "ENOENT: no such file or
// directory, mkdir …". Tests may run as root, which ignores permission bits: the always-run case
// puts the output under a regular file (ENOTDIR); the read-only case runs only for other users.
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { chmod, mkdir, mkdtemp, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeFolder, writeError, writeFileAtomic } from '../../src/output/atomic.js';
import { runJobFile } from '../../src/run/run-job.js';

const JOB = 'name: pin\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: circle, diameter: 50 um}\n';
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
const cli = join(resolve(dirname(fileURLToPath(import.meta.url)), '..', '..'), 'dist', 'src', 'cli.js');
/** As root, the read-only case can still be run: the built command line as user nobody (util-linux setpriv). */
const asNobody = isRoot && existsSync(cli) && spawnSync('setpriv', ['--version']).status === 0;

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-unwritable-'));
  await writeFile(join(dir, 'pin.yaml'), JOB);
  await writeFile(join(dir, 'afile'), 'a file, not a folder\n');
});
afterAll(async () => {
  if (dir) {
    await chmod(join(dir, 'ro'), 0o755).catch(() => undefined);
    await rm(dir, { recursive: true, force: true });
  }
});

describe('an output folder that cannot be written', () => {
  it('a run into a path under a regular file names the path and the file in the way', async () => {
    const out = join(dir, 'afile', 'sub');
    const o = await runJobFile(join(dir, 'pin.yaml'), { outDir: out });
    expect(o.error).toBe(`${join(dir, 'pin.yaml')}: cannot write to ${join(out, 'pin')}: ${join(dir, 'afile')} is a file, not a folder (ENOTDIR)`);
    expect(o.done).toBe(0);
    expect((await readdir(dir)).sort()).toEqual(['afile', 'pin.yaml']);
  });

  it('makeFolder and writeFileAtomic name the file in the way', async () => {
    await expect(makeFolder(join(dir, 'afile', 'a', 'b'))).rejects.toThrow(`${join(dir, 'afile')} is a file, not a folder (ENOTDIR)`);
    await expect(writeFileAtomic(join(dir, 'afile', 'x', 'summary.csv'), 'x')).rejects.toThrow(
      `cannot write to ${join(dir, 'afile', 'x')}: ${join(dir, 'afile')} is a file, not a folder (ENOTDIR)`,
    );
  });

  it('the system codes for a refused write are said in words, with the path', () => {
    const err = (code: string) => Object.assign(new Error(`${code}: something, mkdir '/x'`), { code });
    expect(writeError(err('EACCES'), '/data/out/job').message).toBe('cannot write to /data/out/job: the folder is read-only for this user (permission denied, EACCES)');
    expect(writeError(err('EROFS'), '/mnt/ro/job', '/mnt/ro').message).toBe('cannot write to /mnt/ro/job: the folder /mnt/ro is read-only (a read-only file system, EROFS)');
    expect(writeError(err('ENOSPC'), '/data/job/summary.csv').message).toContain('full disk');
    // Codes that are not about writability pass unchanged.
    expect(writeError(err('EISDIR'), '/x').message).toBe("EISDIR: something, mkdir '/x'");
  });

  it.skipIf(isRoot)('a read-only folder (skipped when the tests run as root, whom permission bits do not stop)', async () => {
    const ro = join(dir, 'ro');
    await mkdir(ro);
    await chmod(ro, 0o555);
    const o = await runJobFile(join(dir, 'pin.yaml'), { outDir: join(ro, 'out') });
    expect(o.error).toBe(
      `${join(dir, 'pin.yaml')}: cannot write to ${join(ro, 'out', 'pin')}: the folder ${ro} is read-only for this user (permission denied, EACCES)`,
    );
    expect(await readdir(ro)).toEqual([]);
  });

  it.skipIf(!asNobody)('a read-only folder, as user nobody (skipped unless run as root with setpriv and a built dist/)', async () => {
    const base = await mkdtemp(join(tmpdir(), 'spotcast-ro-'));
    try {
      const ro = join(base, 'ro');
      await mkdir(ro);
      await writeFile(join(base, 'pin.yaml'), JOB);
      await chmod(base, 0o755);
      await chmod(join(base, 'pin.yaml'), 0o644);
      await chmod(ro, 0o555);
      const r = spawnSync('setpriv', ['--reuid=65534', '--regid=65534', '--clear-groups', process.execPath, cli, 'run', join(base, 'pin.yaml'), '--out', join(ro, 'out')], {
        cwd: base,
        encoding: 'utf8',
        timeout: 60_000,
      });
      expect(r.status).toBe(1);
      expect(r.stderr).toContain(`cannot write to ${join(ro, 'out', 'pin')}: the folder ${ro} is read-only for this user (permission denied, EACCES)`);
      expect(r.stderr).not.toMatch(/ENOENT|at .*\.js:\d+/);
      expect(await readdir(ro)).toEqual([]);
    } finally {
      await rm(base, { recursive: true, force: true });
    }
  }, 60_000);
});
