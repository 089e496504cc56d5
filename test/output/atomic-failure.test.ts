// writeFileAtomic when the disk fails part-way: the write is made to fail with vi.mock (root, which
// these tests may run as, ignores permission bits, so a read-only folder would not fail it). The
// old file must stay whole and no temporary file may be left.
import { mkdtemp, readdir, readFile, rm, writeFile as realWriteFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';

const failure = vi.hoisted(() => ({ writeFile: false, rename: false }));

vi.mock('node:fs/promises', async (importOriginal) => {
  const real = await importOriginal<typeof import('node:fs/promises')>();
  return {
    ...real,
    // Writes half the bytes, then fails as a full disk would (ENOSPC).
    writeFile: async (path: string, data: string | Uint8Array) => {
      if (!failure.writeFile) return real.writeFile(path, data);
      const bytes = typeof data === 'string' ? new TextEncoder().encode(data) : data;
      await real.writeFile(path, bytes.subarray(0, Math.floor(bytes.length / 2)));
      throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' });
    },
    rename: async (from: string, to: string) => {
      if (failure.rename) throw Object.assign(new Error(`EXDEV: cross-device link not permitted, rename '${from}' -> '${to}'`), { code: 'EXDEV' });
      return real.rename(from, to);
    },
  };
});

const { writeFileAtomic } = await import('../../src/output/atomic.js');

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-atomic-fail-'));
  failure.writeFile = false;
  failure.rename = false;
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('writeFileAtomic under failure', () => {
  it('a write that fails half-way leaves the old file intact and no temporary file', async () => {
    const target = join(dir, 'summary.csv');
    await realWriteFile(target, 'case,peak\n1,0.5\n');
    failure.writeFile = true;
    await expect(writeFileAtomic(target, 'case,peak\n1,0.5\n2,0.25\n3,0.125\n')).rejects.toThrow(/ENOSPC/);
    expect(await readFile(target, 'utf8')).toBe('case,peak\n1,0.5\n');
    expect(await readdir(dir)).toEqual(['summary.csv']);
  });

  it('a failing rename leaves the old file intact and no temporary file', async () => {
    const target = join(dir, 'result.json');
    await realWriteFile(target, '{"old": true}\n');
    failure.rename = true;
    await expect(writeFileAtomic(target, '{"new": true}\n')).rejects.toThrow(/EXDEV/);
    expect(await readFile(target, 'utf8')).toBe('{"old": true}\n');
    expect(await readdir(dir)).toEqual(['result.json']);
  });

  it('a failing first write creates no target at all', async () => {
    failure.writeFile = true;
    await expect(writeFileAtomic(join(dir, 'intensity.npy'), new Uint8Array(1000))).rejects.toThrow(/ENOSPC/);
    expect(await readdir(dir)).toEqual([]);
  });

  it('the mock is only active when asked (control)', async () => {
    await writeFileAtomic(join(dir, 'ok.txt'), 'whole\n');
    expect(await readFile(join(dir, 'ok.txt'), 'utf8')).toBe('whole\n');
  });
});
