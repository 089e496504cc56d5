// Reading a file a person named (the job file, the images it names) without ever blocking and
// without reading more than a cap: special files (a FIFO, /dev/zero, a socket) and folders are
// refused from their stat before anything is opened (opening a FIFO for reading would wait for a
// writer), and the file is opened O_NONBLOCK and looked at again in case the path changed between.
import { constants } from 'node:fs';
import { open, stat } from 'node:fs/promises';
import type { Stats } from 'node:fs';
import { safeEcho } from '../safe-text.js';

/** Why a file was not read, in words that follow its name ("is a folder, not a job file"). */
export class FileRefusal extends Error {
  constructor(readonly reason: string) {
    super(reason);
    this.name = 'FileRefusal';
  }
}

export interface ReadLimits {
  /** Largest size read, in bytes. */
  maxBytes: number;
  /** What the file should be, with its article: 'a job file', 'a PNG image'. */
  noun: string;
}

/** The file's bytes, or a FileRefusal: never blocks, never reads more than maxBytes + 1 bytes. */
export async function readRegularFile(file: string, limits: ReadLimits): Promise<Buffer> {
  const { maxBytes, noun } = limits;
  let st: Stats;
  try {
    // stat follows links, and looks before opening: opening a FIFO for reading would wait for a writer.
    st = await stat(file);
  } catch (e) {
    throw new FileRefusal(fsReason(e, noun));
  }
  const notRegular = (s: Stats) => (s.isDirectory() ? `is a folder, not ${noun}` : !s.isFile() ? `is ${fileKind(s)}, not a regular file` : undefined);
  const kind = notRegular(st);
  if (kind) throw new FileRefusal(kind);
  if (st.size > maxBytes) throw new FileRefusal(tooBig(st.size, limits));
  let handle;
  try {
    // O_NONBLOCK: if the path was swapped for a FIFO since the stat, opening still returns at once.
    handle = await open(file, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (e) {
    throw new FileRefusal(fsReason(e, noun));
  }
  try {
    const now = await handle.stat();
    const again = notRegular(now);
    if (again) throw new FileRefusal(again);
    // Room for the size the file has now and one byte more (a file that grew since shows it);
    // grown as needed up to maxBytes + 1, so that a small image does not cost the whole cap.
    let buf = Buffer.allocUnsafe(Math.min(maxBytes, now.size) + 1);
    let n = 0;
    for (;;) {
      const { bytesRead } = await handle.read(buf, n, buf.length - n, n);
      if (bytesRead === 0) break;
      n += bytesRead;
      if (n === buf.length) {
        if (buf.length > maxBytes) break;
        const bigger = Buffer.allocUnsafe(Math.min(maxBytes + 1, 2 * buf.length));
        buf.copy(bigger, 0, 0, n);
        buf = bigger;
      }
    }
    if (n > maxBytes) throw new FileRefusal(tooBig(n, limits, true));
    return buf.subarray(0, n);
  } catch (e) {
    if (e instanceof FileRefusal) throw e;
    throw new FileRefusal(fsReason(e, noun));
  } finally {
    await handle.close();
  }
}

function fsReason(e: unknown, noun: string): string {
  const code = (e as NodeJS.ErrnoException).code;
  switch (code) {
    case 'ENOENT':
      return 'no such file';
    case 'EISDIR':
      return `is a folder, not ${noun}`;
    case 'ENOTDIR':
      return 'a part of the path is not a folder';
    case 'EACCES':
    case 'EPERM':
      return 'permission denied';
    case 'ELOOP':
      return 'too many levels of symbolic links';
    case 'ENAMETOOLONG':
      return 'the path is too long';
    default:
      return safeEcho((e as Error)?.message ?? String(e));
  }
}

function fileKind(s: Stats): string {
  if (s.isFIFO()) return 'a FIFO (named pipe)';
  if (s.isCharacterDevice()) return 'a character device';
  if (s.isBlockDevice()) return 'a block device';
  if (s.isSocket()) return 'a socket';
  return 'not a regular file';
}

function tooBig(bytes: number, { maxBytes, noun }: ReadLimits, grew = false): string {
  const cap = `the ${formatBytes(maxBytes)} ${noun} may hold`;
  return grew ? `holds more than ${cap} (it grew while being read)` : `is ${formatBytes(bytes)} (${bytes} bytes), more than ${cap}`;
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} bytes`;
  if (n < 1024 * 1024) return `${Number((n / 1024).toPrecision(3))} KiB`;
  if (n < 1024 ** 3) return `${Number((n / 1024 ** 2).toPrecision(3))} MiB`;
  return `${Number((n / 1024 ** 3).toPrecision(3))} GiB`;
}
