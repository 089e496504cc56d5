// Output safety: names from job files cannot reach outside the output folder, and writes are
// atomic (write a temporary file in the same folder, then rename(2) over the target: POSIX
// guarantees that rename replaces the target atomically, IEEE Std 1003.1, rename()).
// These tests run as any user, root included: none relies on permission bits, which root ignores.
import { mkdir, mkdtemp, readdir, readFile, rm, symlink, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { safeJoin, writeFileAtomic } from '../../src/output/atomic.js';

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-atomic-'));
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('safeJoin', () => {
  it('joins plain names under the root', async () => {
    await expect(safeJoin(dir, 'job-1', '01_wl-633nm_z-1m')).resolves.toBe(join(dir, 'job-1', '01_wl-633nm_z-1m'));
    await expect(safeJoin(dir, 'a.b_c-D')).resolves.toBe(join(dir, 'a.b_c-D'));
  });

  it.each(['..', '.', '../x', 'a/../../x', '/etc', '/tmp/x', 'a/b', 'a\\b', '', 'has space', 'tab\t', 'nul\0', 'ünï'])(
    'refuses the name %j',
    async (name) => {
      await expect(safeJoin(dir, name)).rejects.toThrow(/refusing/);
      await expect(safeJoin(dir, 'ok', name)).rejects.toThrow(/refusing/);
    },
  );

  it('refuses writing through a symbolic link that points outside the output folder', async () => {
    const outside = await mkdtemp(join(tmpdir(), 'spotcast-outside-'));
    try {
      const out = join(dir, 'out');
      await mkdir(out);
      await symlink(outside, join(out, 'job'));
      await expect(safeJoin(out, 'job')).rejects.toThrow(/refusing to write through the link/);
      await expect(safeJoin(out, 'job', 'case-1')).rejects.toThrow(/refusing to write through the link/);
      // A link deeper down, inside a real folder, is caught too.
      await mkdir(join(out, 'job2'));
      await symlink(outside, join(out, 'job2', 'case-1'));
      await expect(safeJoin(out, 'job2', 'case-1')).rejects.toThrow(/refusing to write through the link/);
      // A dangling link is still a link.
      await symlink(join(outside, 'does-not-exist'), join(out, 'job3'));
      await expect(safeJoin(out, 'job3', 'x')).rejects.toThrow(/refusing to write through the link/);
      expect(await readdir(outside)).toEqual([]);
    } finally {
      await rm(outside, { recursive: true, force: true });
    }
  });

  it('says so when a folder on the way is a file', async () => {
    await writeFile(join(dir, 'job'), 'a file\n');
    await expect(safeJoin(dir, 'job', 'case-1')).rejects.toThrow(`${join(dir, 'job')} is a file, not a folder`);
    await expect(safeJoin(join(dir, 'job'), 'case-1')).rejects.toThrow(`${join(dir, 'job')} is a file, not a folder`);
  });

  it('accepts names that do not exist yet, and real folders', async () => {
    await mkdir(join(dir, 'job'));
    await expect(safeJoin(dir, 'job', 'new-case')).resolves.toBe(join(dir, 'job', 'new-case'));
    await expect(safeJoin(join(dir, 'not', 'yet'), 'job')).resolves.toBe(join(dir, 'not', 'yet', 'job'));
  });
});

describe('writeFileAtomic', () => {
  it('writes the bytes and leaves no temporary file behind', async () => {
    const target = join(dir, 'result.json');
    await writeFileAtomic(target, '{"a": 1}\n');
    expect(await readFile(target, 'utf8')).toBe('{"a": 1}\n');
    await writeFileAtomic(join(dir, 'data.bin'), new Uint8Array([0, 1, 2, 255]));
    expect([...(await readFile(join(dir, 'data.bin')))]).toEqual([0, 1, 2, 255]);
    expect((await readdir(dir)).sort()).toEqual(['data.bin', 'result.json']);
  });

  it('replaces an older file whole, and creates missing folders', async () => {
    const target = join(dir, 'deep', 'er', 'summary.csv');
    await writeFileAtomic(target, 'old\n');
    await writeFileAtomic(target, 'new content\n');
    expect(await readFile(target, 'utf8')).toBe('new content\n');
    expect(await readdir(join(dir, 'deep', 'er'))).toEqual(['summary.csv']);
  });

  it('fails, changing nothing, when the parent "folder" is a file', async () => {
    const notDir = join(dir, 'job');
    await writeFile(notDir, 'I am a file\n');
    await expect(writeFileAtomic(join(notDir, 'result.json'), 'x')).rejects.toThrow();
    expect(await readFile(notDir, 'utf8')).toBe('I am a file\n');
    expect(await readdir(dir)).toEqual(['job']);
  });

  it('fails without leaving its temporary file when the target cannot be replaced', async () => {
    // A non-empty folder in the way: rename() of a file over it fails (EISDIR) for root too.
    const target = join(dir, 'case');
    await mkdir(target);
    await writeFile(join(target, 'keep.txt'), 'kept\n');
    await expect(writeFileAtomic(target, 'x')).rejects.toThrow(/EISDIR|ENOTEMPTY|EEXIST|directory/i);
    expect(await readdir(dir)).toEqual(['case']);
    expect(await readFile(join(target, 'keep.txt'), 'utf8')).toBe('kept\n');
  });

  it('concurrent writes to one target leave one whole version and no temporary files', async () => {
    const target = join(dir, 'summary.csv');
    const versions = Array.from({ length: 20 }, (_, i) => `version ${i}\n`.repeat(2000));
    await Promise.all(versions.map((v) => writeFileAtomic(target, v)));
    expect(versions).toContain(await readFile(target, 'utf8'));
    expect(await readdir(dir)).toEqual(['summary.csv']);
  });
});
