// Writes that never leave a half-written file: write to a temporary name in the same folder, then
// rename over the target (atomic on POSIX file systems). A write that fails says where and why in
// words ("cannot write to <path>: the folder is read-only (EROFS)"), not as the system call's
// "ENOENT: no such file or directory, mkdir …".
import { mkdir, rename, rm, writeFile, lstat, stat } from 'node:fs/promises';
import { dirname, isAbsolute, join, relative, resolve, sep } from 'node:path';
import { randomBytes } from 'node:crypto';
import { safeEcho } from '../safe-text.js';

/** The system's error codes for a write that cannot happen, in words. */
const WHY: Record<string, string> = {
  EACCES: 'is read-only for this user (permission denied, EACCES)',
  EPERM: 'is read-only for this user (operation not permitted, EPERM)',
  EROFS: 'is read-only (a read-only file system, EROFS)',
  ENOSPC: 'is on a full disk (no space left on the device, ENOSPC)',
  EDQUOT: 'is on a disk whose quota is used up (EDQUOT)',
  ENAMETOOLONG: 'has too long a name (ENAMETOOLONG)',
};

/**
 * An error from writing at `path` as a sentence naming the path and, when it is not the path's
 * own folder, the folder that refused; errors with other codes (or none) pass unchanged.
 */
export function writeError(e: unknown, path: string, folder?: string): Error {
  const err = e as NodeJS.ErrnoException;
  const code = err?.code;
  if (!code || !(code in WHY)) return err instanceof Error ? err : new Error(String(e));
  const where = folder && resolve(folder) !== resolve(path) ? `the folder ${safeEcho(folder, 400)}` : 'the folder';
  return Object.assign(new Error(`cannot write to ${safeEcho(path, 400)}: ${where} ${WHY[code]!}`), { code, cause: err });
}

/** The error for a path with a file where a folder should be, naming the file. */
function notAFolder(target: string, file: string): Error {
  return Object.assign(new Error(`cannot write to ${safeEcho(target, 400)}: ${safeEcho(file, 400)} is a file, not a folder (ENOTDIR)`), {
    code: 'ENOTDIR',
  });
}

/** The file that stands where a folder of `path` should be (stat gave ENOTDIR): the deepest part that exists. */
async function fileInTheWay(path: string): Promise<string> {
  let cur = dirname(path);
  while (dirname(cur) !== cur) {
    try {
      await stat(cur);
      return cur;
    } catch {
      cur = dirname(cur);
    }
  }
  return cur;
}

/**
 * Creates `path` and any missing parents one at a time, so that a failure names the folder that
 * could not be made and why. (A recursive mkdir reports "ENOENT … mkdir <path>" when a parent is
 * read-only, and ENOTDIR without saying which part is the file.)
 */
export async function makeFolder(path: string): Promise<void> {
  const target = resolve(path);
  const missing: string[] = [];
  let cur = target;
  for (;;) {
    let isDir: boolean;
    try {
      isDir = (await stat(cur)).isDirectory();
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (code === 'ENOENT' && dirname(cur) !== cur) {
        missing.push(cur);
        cur = dirname(cur);
        continue;
      }
      if (code === 'ENOTDIR') throw notAFolder(target, await fileInTheWay(cur));
      throw writeError(e, target);
    }
    if (!isDir) throw notAFolder(target, cur);
    break;
  }
  for (const dir of missing.reverse()) {
    try {
      await mkdir(dir);
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code === 'EEXIST') continue; // made by another run meanwhile
      throw writeError(e, target, dirname(dir));
    }
  }
}

export async function writeFileAtomic(path: string, data: string | Uint8Array): Promise<void> {
  await makeFolder(dirname(path));
  const tmp = join(dirname(path), `.${randomBytes(6).toString('hex')}.tmp`);
  try {
    await writeFile(tmp, data);
    await rename(tmp, path);
  } catch (e) {
    await rm(tmp, { force: true });
    throw writeError(e, path, dirname(path));
  }
}

/**
 * Resolves name inside root and refuses anything that would land outside it: absolute paths,
 * "..", and links that point elsewhere. Names from job files only ever reach the disk through here.
 */
export async function safeJoin(root: string, ...names: string[]): Promise<string> {
  for (const n of names) {
    if (!/^[A-Za-z0-9._-]+$/.test(n) || n === '.' || n === '..' || isAbsolute(n)) {
      throw new Error(`refusing the output name '${safeEcho(n)}': only letters, digits, '.', '-' and '_' are allowed`);
    }
  }
  const base = resolve(root);
  const target = resolve(base, ...names);
  const rel = relative(base, target);
  if (rel.startsWith('..') || isAbsolute(rel)) throw new Error(`refusing to write outside ${base}: ${target}`);
  // Any existing component that is a link could point outside the output folder.
  let cur = base;
  for (const part of rel.split(sep).filter(Boolean)) {
    cur = join(cur, part);
    try {
      const st = await lstat(cur);
      if (st.isSymbolicLink()) throw new Error(`refusing to write through the link ${cur}`);
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (code === 'ENOENT') break;
      if (code === 'ENOTDIR') throw notAFolder(target, await fileInTheWay(cur));
      throw e;
    }
  }
  return target;
}
