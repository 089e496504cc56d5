// "Finished means verified": each file of a finished case deleted, then cut short, in turn; a rerun
// recomputes exactly that case, says which file and why, and leaves it complete and verified.
// Also: a same-size change found by the digest, records of earlier versions (no digests), and
// gather reporting a damaged case as not done. Job: a 50 µm pinhole at 633 nm, three distances
// (invented; each case a fraction of a second).
import { mkdir, mkdtemp, readFile, rm, truncate, unlink, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runJobFile } from '../../src/run/run-job.js';
import { gatherJob } from '../../src/run/gather.js';
import { caseHash, verifyCase } from '../../src/run/records.js';
import { loadJobFile } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';
import { recorder } from '../helpers.js';
import { digestOf, EDGE_BYTES, FULL_DIGEST_MAX, REQUIRED_CASE_FILES, type StoredRecord } from '../../src/output/case-output.js';

const JOB = `name: pin
wavelength: 633 nm
distance: {from: 0.5 m, to: 1.5 m, count: 3}
aperture: {shape: circle, diameter: 50 um}
`;

let dir = '';
let file = '';
let out = '';
let jobDir = '';
let ids: string[] = [];
let hashes = new Map<string, string>();

/**
 * The same command again. `quick` runs it as shard 1 of 1: the same skip-or-compute decision over
 * every case, without the job report (about 2 s of each rerun here), so that the sixteen
 * delete/truncate rounds stay fast; the unsharded path is taken by the other tests.
 */
async function rerun(quick = false) {
  const r = recorder();
  const o = await runJobFile(file, { outDir: out, reporter: r.reporter, ...(quick ? { shard: { k: 1, n: 1 } } : {}) });
  return { ...r, o };
}

async function record(id: string): Promise<StoredRecord> {
  return JSON.parse(await readFile(join(jobDir, id, 'record.json'), 'utf8')) as StoredRecord;
}

async function allVerified(): Promise<void> {
  for (const id of ids) expect((await verifyCase(jobDir, id, hashes.get(id)!)).state, id).toBe('done');
}

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-verify-'));
  file = join(dir, 'pin.yaml');
  out = join(dir, 'out');
  await writeFile(file, JOB);
  const loaded = await loadJobFile(file);
  const cases = expandJob(loaded.spec);
  ids = cases.map((c) => c.id);
  hashes = new Map(cases.map((c) => [c.id, caseHash(c)]));
  jobDir = join(out, 'pin');
  const first = await rerun();
  expect(first.o.error).toBeUndefined();
  expect(first.computed.sort()).toEqual([...ids].sort());
}, 60_000);
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('a finished case is trusted only when every file verifies', () => {
  it('records the size and SHA-256 of every other file of the case', async () => {
    const rec = await record(ids[0]!);
    const names = Object.keys(rec.files ?? {}).sort();
    // A 2-D pinhole case: the field, both profiles, the encircled energy and its plot, the profile
    // plot, two pictures, result.json (a zoomed picture only where the spot is small in its window).
    expect(names.filter((n) => n !== 'intensity-zoom.png')).toEqual([
      'encircled-energy.csv',
      'encircled-energy.png',
      'intensity-gray.png',
      'intensity.npy',
      'intensity.png',
      'profile-x.csv',
      'profile-y.csv',
      'profile.png',
      'result.json',
    ]);
    for (const n of names) {
      const bytes = await readFile(join(jobDir, ids[0]!, n));
      expect(rec.files![n]!.size).toBe(bytes.length);
      // Digest recomputed here with node:crypto (SHA-256, FIPS 180-4) over the file as it is on disk.
      const { createHash } = await import('node:crypto');
      expect(rec.files![n]!.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    }
    await allVerified();
  });

  it('a rerun of an intact job computes nothing', async () => {
    const r = await rerun();
    expect(r.computed).toEqual([]);
    expect(r.o.skipped).toBe(3);
    expect(r.notes).toEqual([]);
  });

  const FILES = ['intensity.npy', 'result.json', 'intensity.png', 'intensity-gray.png', 'profile-x.csv', 'profile-y.csv', 'encircled-energy.csv', 'record.json'];
  for (const name of FILES) {
    for (const fault of ['deleted', 'truncated'] as const) {
      it(`${name} ${fault}: the rerun recomputes exactly that case and says why`, async () => {
        const victim = ids[1]!;
        const path = join(jobDir, victim, name);
        const size = (await readFile(path)).length;
        if (fault === 'deleted') await unlink(path);
        else await truncate(path, Math.floor(size / 2));
        const r = await rerun(true);
        expect(r.o.error).toBeUndefined();
        expect(r.o.failed).toEqual([]);
        expect(r.computed).toEqual([victim]);
        expect(r.o.skipped).toBe(2);
        const why =
          fault === 'deleted'
            ? `${name} is missing`
            : name === 'record.json'
              ? 'record.json is damaged (not readable JSON'
              : `${name} is damaged (size ${Math.floor(size / 2)}, recorded ${size})`;
        const note = r.notes.find((n) => n.startsWith(`case ${victim}: `));
        expect(note).toBeDefined();
        expect(note).toContain(why);
        expect(note).toMatch(/: computing it again$/);
        expect(r.notes.filter((n) => n.startsWith('case '))).toHaveLength(1);
        await allVerified();
        const manifest = JSON.parse(await readFile(join(jobDir, 'manifest-shard-1-of-1.json'), 'utf8'));
        expect(Object.keys(manifest.completed).sort()).toEqual([...ids].sort());
      }, 30_000);
    }
  }

  it('a change that keeps the size is found by the digest', async () => {
    const victim = ids[2]!;
    const path = join(jobDir, victim, 'intensity.npy');
    const bytes = await readFile(path);
    bytes[bytes.length - 3]! ^= 0xff;
    await writeFile(path, bytes);
    expect(await verifyCase(jobDir, victim, hashes.get(victim)!)).toEqual({
      state: 'damaged',
      problems: ['intensity.npy is damaged (its content differs from the recorded digest)'],
    });
    const r = await rerun(true);
    expect(r.computed).toEqual([victim]);
    expect(r.notes.join('\n')).toContain(`case ${victim}: intensity.npy is damaged (its content differs from the recorded digest): computing it again`);
    await allVerified();
  }, 30_000);

  it('a record that leaves out a file every case has is not trusted', async () => {
    const victim = ids[0]!;
    const rec = await record(victim);
    delete rec.files!['intensity.npy'];
    await writeFile(join(jobDir, victim, 'record.json'), JSON.stringify(rec));
    const st = await verifyCase(jobDir, victim, hashes.get(victim)!);
    expect(st).toEqual({ state: 'damaged', problems: ['intensity.npy is not listed in record.json'] });
    const r = await rerun(true);
    expect(r.computed).toEqual([victim]);
    await allVerified();
  }, 30_000);

  it('records of an earlier version (no digests) are computed again, with one note for them all', async () => {
    for (const id of ids.slice(0, 2)) {
      const rec = await record(id);
      delete rec.files;
      await writeFile(join(jobDir, id, 'record.json'), JSON.stringify(rec));
      expect((await verifyCase(jobDir, id, hashes.get(id)!)).state).toBe('unverified');
    }
    const r = await rerun(true);
    expect(r.computed.sort()).toEqual(ids.slice(0, 2).sort());
    const notes = r.notes.filter((n) => /earlier version/.test(n));
    expect(notes).toHaveLength(1);
    expect(notes[0]).toContain(`2 cases were recorded by an earlier version without file digests`);
    expect(notes[0]).toContain(ids[0]!);
    await allVerified();
  }, 30_000);

  it('a case recorded for other parameters is computed again without a damage note', async () => {
    const victim = ids[0]!;
    const rec = await record(victim);
    rec.hash = '0'.repeat(32);
    await writeFile(join(jobDir, victim, 'record.json'), JSON.stringify(rec));
    expect((await verifyCase(jobDir, victim, hashes.get(victim)!)).state).toBe('absent');
    const r = await rerun(true);
    expect(r.computed).toEqual([victim]);
    expect(r.notes).toEqual([]);
  }, 30_000);

  it('a field file above FULL_DIGEST_MAX is checked by its size and the digest of its ends', async () => {
    // A synthetic case folder: the required files, intensity.npy 20 MiB of counting bytes.
    const folder = join(dir, 'big');
    await mkdir(join(folder, 'c1'), { recursive: true });
    const big = new Uint8Array(FULL_DIGEST_MAX + 4 * EDGE_BYTES).map((_, i) => i % 251);
    const files: Record<string, ReturnType<typeof digestOf>> = {};
    for (const name of REQUIRED_CASE_FILES) {
      const data = name === 'intensity.npy' ? big : new TextEncoder().encode(`${name}\n`);
      await writeFile(join(folder, 'c1', name), data);
      files[name] = digestOf(data);
    }
    expect(files['intensity.npy']!.ends).toMatch(/^[0-9a-f]{64}$/);
    expect(files['result.json']!.ends).toBeUndefined();
    await writeFile(join(folder, 'c1', 'record.json'), JSON.stringify({ hash: 'h', tool: 't', files, warnings: [], plan: {}, metrics: {} }));
    expect((await verifyCase(folder, 'c1', 'h')).state).toBe('done');
    // A change in the last MiB is found...
    const tail = new Uint8Array(big);
    tail[tail.length - 10]! ^= 1;
    await writeFile(join(folder, 'c1', 'intensity.npy'), tail);
    expect((await verifyCase(folder, 'c1', 'h')).state).toBe('damaged');
    // ...a zeroed file of the right size too...
    await writeFile(join(folder, 'c1', 'intensity.npy'), new Uint8Array(big.length));
    expect((await verifyCase(folder, 'c1', 'h')).state).toBe('damaged');
    // ...but not one in the middle: the documented limit of the ends check.
    const middle = new Uint8Array(big);
    middle[middle.length >> 1]! ^= 1;
    await writeFile(join(folder, 'c1', 'intensity.npy'), middle);
    expect((await verifyCase(folder, 'c1', 'h')).state).toBe('done');
    // A record without `ends` (or a file at or below the bound) gets the whole digest.
    delete files['intensity.npy']!.ends;
    await writeFile(join(folder, 'c1', 'record.json'), JSON.stringify({ hash: 'h', tool: 't', files, warnings: [], plan: {}, metrics: {} }));
    expect((await verifyCase(folder, 'c1', 'h')).state).toBe('damaged');
  });

  it('gather counts a damaged case as not done and says why', async () => {
    const victim = ids[2]!;
    await unlink(join(jobDir, victim, 'profile-x.csv'));
    const loaded = await loadJobFile(file);
    const g = await gatherJob(loaded, jobDir, expandJob(loaded.spec));
    expect(g.done).toBe(2);
    expect(g.missing).toEqual([victim]);
    expect(g.damaged).toEqual([{ case: victim, problems: ['profile-x.csv is missing'] }]);
    const summary = JSON.parse(await readFile(join(jobDir, 'summary.json'), 'utf8'));
    expect(summary.damaged).toEqual([{ case: victim, problems: ['profile-x.csv is missing'] }]);
    const csv = (await readFile(join(jobDir, 'summary.csv'), 'utf8')).trim().split('\n');
    expect(csv.filter((l) => l.split(',')[1] === 'missing')).toHaveLength(1);
    // And the next run repairs it.
    const r = await rerun();
    expect(r.computed).toEqual([victim]);
    await allVerified();
  }, 30_000);
});
