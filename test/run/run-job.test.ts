// The library entry point reports, rather than throws, whatever stops a whole job.
import { mkdtemp, mkdir, rm, symlink, writeFile, readdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runJobFile } from '../../src/run/run-job.js';

let dir: string;
const JOB = 'name: linked\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: slit, width: 20 um}\n';

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-runjob-'));
  await writeFile(join(dir, 'job.yaml'), JOB);
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('runJobFile', () => {
  it('returns an outcome with the error when the job folder is a link to elsewhere (nothing written there)', async () => {
    const out = join(dir, 'out');
    const elsewhere = join(dir, 'elsewhere');
    await mkdir(out);
    await mkdir(elsewhere);
    await symlink(elsewhere, join(out, 'linked'));
    const o = await runJobFile(join(dir, 'job.yaml'), { outDir: out });
    expect(o.error).toMatch(/refusing to write through the link/);
    expect(o.done).toBe(0);
    expect(await readdir(elsewhere)).toEqual([]);
  });

  it('computes the job and reports it done otherwise', async () => {
    const o = await runJobFile(join(dir, 'job.yaml'), { outDir: join(dir, 'out2') });
    expect(o.error).toBeUndefined();
    expect(o.done).toBe(1);
    expect(o.failed).toEqual([]);
  });
});
