// Writes that never leave a half-written file: write to a temporary name in the same folder, then
// rename over the target (atomic on POSIX file systems).
import { mkdir, rename, rm, writeFile, lstat } from 'node:fs/promises';
import { dirname, isAbsolute, join, relative, resolve, sep } from 'node:path';
import { randomBytes } from 'node:crypto';

export async function writeFileAtomic(path: string, data: string | Uint8Array): Promise<void> {
  await mkdir(dirname(path), { recursive: true });
  const tmp = join(dirname(path), `.${randomBytes(6).toString('hex')}.tmp`);
  try {
    await writeFile(tmp, data);
    await rename(tmp, path);
  } catch (e) {
    await rm(tmp, { force: true });
    throw e;
  }
}

/**
 * Resolves name inside root and refuses anything that would land outside it: absolute paths,
 * "..", and links that point elsewhere. Names from job files only ever reach the disk through here.
 */
export async function safeJoin(root: string, ...names: string[]): Promise<string> {
  for (const n of names) {
    if (!/^[A-Za-z0-9._-]+$/.test(n) || n === '.' || n === '..' || isAbsolute(n)) {
      throw new Error(`refusing the output name '${n}': only letters, digits, '.', '-' and '_' are allowed`);
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
      if (code === 'ENOTDIR') throw new Error(`cannot write ${target}: ${dirname(cur)} is a file, not a folder`);
      throw e;
    }
  }
  return target;
}
