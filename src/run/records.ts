// What survives a run: each complete case folder holds record.json (its summary, the hash of what
// made it, and every other file's size and SHA-256 digest), and the job folder a manifest of
// completed cases. A case is done only when its record parses, its hash matches, and every file it
// lists is there with the recorded size and digest: the folder is renamed into place whole, so a
// kill leaves either a complete case or none, but a file deleted, cut short or damaged later (or a
// disk that lost data) is found here and the case computed again.
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { lstat, open, readdir, readFile, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import type { Case } from '../plan/types.js';
import { CASE_FILES, EDGE_BYTES, FULL_DIGEST_MAX, REQUIRED_CASE_FILES, jsonNumbers, type FileDigest, type StoredRecord } from '../output/case-output.js';
import { writeFileAtomic } from '../output/atomic.js';
import { safeEcho } from '../safe-text.js';
import { TOOL_VERSION } from '../version.js';

/** Hash of everything that determines a case's result, and of the tool version. */
export function caseHash(c: Case): string {
  // The job name and the position in the sweep do not change the result.
  const params = { ...c, job: undefined, index: undefined };
  return createHash('sha256').update(JSON.stringify({ tool: TOOL_VERSION, params }, jsonNumbers)).digest('hex').slice(0, 32);
}

/** The record of a case as it stands, or null when it is absent or unreadable (not verified: see verifyCase). */
export async function readRecord(jobDir: string, id: string): Promise<StoredRecord | null> {
  try {
    const text = await readFile(join(jobDir, id, CASE_FILES.record), 'utf8');
    return JSON.parse(text) as StoredRecord;
  } catch {
    return null;
  }
}

/**
 * What a case folder on disk is worth:
 * - done: the record matches the case and every file it lists is whole (size and digest);
 * - absent: no folder (not computed yet), or a record for other parameters or another version
 *   (the case changed): computed without comment;
 * - unverified: a record of an earlier version, without file digests: computed again;
 * - damaged: the folder is there but a file is missing, of another size or digest, or the record
 *   itself is missing or unreadable; `problems` says which, in words.
 */
export type CaseState =
  | { state: 'done'; record: StoredRecord }
  | { state: 'absent' }
  | { state: 'unverified' }
  | { state: 'damaged'; problems: string[] };

const RECORD_MAX_BYTES = 64 * 1024 ** 2;

/** Case files' digests are computed this many at a time (reads overlap hashing; a few open files). */
const DIGEST_CONCURRENCY = 4;

async function sha256File(path: string): Promise<string> {
  const h = createHash('sha256');
  for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) h.update(chunk as Buffer);
  return h.digest('hex');
}

/** SHA-256 of the first and last EDGE_BYTES of a file of `size` bytes (size > 2 EDGE_BYTES). */
async function sha256Ends(path: string, size: number): Promise<string> {
  const fh = await open(path, 'r');
  try {
    const buf = Buffer.alloc(EDGE_BYTES);
    const h = createHash('sha256');
    for (const at of [0, size - EDGE_BYTES]) {
      const { bytesRead } = await fh.read(buf, 0, EDGE_BYTES, at);
      h.update(buf.subarray(0, bytesRead));
    }
    return h.digest('hex');
  } finally {
    await fh.close();
  }
}

function isDigest(d: unknown): d is FileDigest {
  const f = d as FileDigest;
  const hex = (v: unknown) => typeof v === 'string' && /^[0-9a-f]{64}$/.test(v);
  return !!f && Number.isSafeInteger(f.size) && f.size >= 0 && hex(f.sha256) && (f.ends === undefined || hex(f.ends));
}

/** What verifying a file reads: all of it, or (large files with a recorded `ends`) its two ends. */
async function contentMatches(path: string, d: FileDigest): Promise<boolean> {
  if (d.ends !== undefined && d.size > FULL_DIGEST_MAX) return (await sha256Ends(path, d.size)) === d.ends;
  return (await sha256File(path)) === d.sha256;
}

/**
 * Verifies a case folder against its record: sizes of every listed file first (cheap, and what
 * deletion and truncation change), then the SHA-256 digest of each (what same-size damage
 * changes). Cost, measured on a typical 2-D case (1.7 MB in 7 files, warm page cache, 2 busy
 * cores): sizes alone 0.4-0.5 ms, with digests 3-7 ms, so a 5000-case sweep is verified in about
 * 15-35 s, or as long as reading its 8.5 GB takes when the files are not cached. A field file above
 * FULL_DIGEST_MAX (16 MiB: a 2048² float64 field is 32 MiB) is checked by its size and the digest of
 * its first and last MiB, so that a resume of a sweep of thousands of such cases does not read
 * hundreds of GB first: deletion, truncation and a zeroed or rewritten file all show in those;
 * a flipped bit in the middle of a large field does not (that is the storage's own checksums' job).
 * The record holds the full digest of every file regardless, for anyone's own checks.
 */
export async function verifyCase(jobDir: string, id: string, hash: string): Promise<CaseState> {
  const dir = join(jobDir, id);
  let text: string;
  try {
    // A record is a few kB (more with a grating's order table); a huge one was not written by us.
    const st = await lstat(join(dir, CASE_FILES.record));
    if (!st.isFile() || st.size > RECORD_MAX_BYTES) {
      return { state: 'damaged', problems: [`${CASE_FILES.record} is damaged (${st.isFile() ? `${st.size} bytes` : 'not a file'})`] };
    }
    text = await readFile(join(dir, CASE_FILES.record), 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code !== 'ENOENT') return { state: 'damaged', problems: [`${CASE_FILES.record} cannot be read (${code ?? (e as Error).message})`] };
    // No record: a folder without one was damaged after it was written (folders appear whole).
    try {
      await stat(dir);
    } catch {
      return { state: 'absent' };
    }
    return { state: 'damaged', problems: [`${CASE_FILES.record} is missing`] };
  }
  let rec: StoredRecord;
  try {
    rec = JSON.parse(text) as StoredRecord;
    if (!rec || typeof rec !== 'object') throw new Error('not an object');
  } catch {
    return { state: 'damaged', problems: [`${CASE_FILES.record} is damaged (not readable JSON, ${Buffer.byteLength(text)} bytes)`] };
  }
  if (rec.hash !== hash) return { state: 'absent' };
  if (!Array.isArray(rec.warnings) || !rec.plan || typeof rec.plan !== 'object' || !rec.metrics || typeof rec.metrics !== 'object') {
    return { state: 'damaged', problems: [`${CASE_FILES.record} is damaged (its summary is incomplete)`] };
  }
  const files = rec.files;
  if (!files || typeof files !== 'object') return { state: 'unverified' };
  const listed = Object.entries(files);
  const problems: string[] = [];
  for (const required of REQUIRED_CASE_FILES) {
    if (!(required in files)) problems.push(`${required} is not listed in ${CASE_FILES.record}`);
  }
  const toDigest: [string, FileDigest][] = [];
  for (const [name, d] of listed) {
    if (!isDigest(d) || name.includes('/') || name === CASE_FILES.record || name.startsWith('.')) {
      problems.push(`${CASE_FILES.record} is damaged (its entry for '${safeEcho(name, 80)}' is not a file digest)`);
      continue;
    }
    try {
      // lstat: a case folder holds plain files only; a link or a FIFO put in one's place is not read.
      const st = await lstat(join(dir, name));
      if (!st.isFile()) problems.push(`${safeEcho(name, 80)} is not a plain file`);
      else if (st.size !== d.size) problems.push(`${safeEcho(name, 80)} is damaged (size ${st.size}, recorded ${d.size})`);
      else toDigest.push([name, d]);
    } catch {
      problems.push(`${safeEcho(name, 80)} is missing`);
    }
  }
  if (problems.length) return { state: 'damaged', problems };
  // Sizes agree: now the contents.
  for (let i = 0; i < toDigest.length; i += DIGEST_CONCURRENCY) {
    const batch = toDigest.slice(i, i + DIGEST_CONCURRENCY);
    const same = await Promise.all(batch.map(([name, d]) => contentMatches(join(dir, name), d).catch(() => null)));
    batch.forEach(([name], j) => {
      if (same[j] === null) problems.push(`${safeEcho(name, 80)} cannot be read`);
      else if (!same[j]) problems.push(`${safeEcho(name, 80)} is damaged (its content differs from the recorded digest)`);
    });
  }
  return problems.length ? { state: 'damaged', problems } : { state: 'done', record: rec };
}

/** verifyCase for many cases, a few at a time (reads from a network file system overlap), in order. */
export async function verifyCases(jobDir: string, cases: { id: string; hash: string }[], atOnce = 4): Promise<CaseState[]> {
  const out = new Array<CaseState>(cases.length);
  let next = 0;
  const lane = async () => {
    while (next < cases.length) {
      const i = next++;
      out[i] = await verifyCase(jobDir, cases[i]!.id, cases[i]!.hash);
    }
  };
  await Promise.all(Array.from({ length: Math.min(atOnce, cases.length) }, lane));
  return out;
}

export interface Manifest {
  tool: string;
  job: string;
  /** Which cases this manifest covers (a shard's, or all). */
  shard: string | null;
  /** Case id → hash of the cases done. */
  completed: Record<string, string>;
  /** Case id → the hash it failed with and why (so a shard's failures reach the gathered summary). */
  failed: Record<string, { hash: string; error: string }>;
}

export function manifestName(shard: { k: number; n: number } | null): string {
  return shard ? `manifest-shard-${shard.k}-of-${shard.n}.json` : 'manifest.json';
}

export async function writeManifest(jobDir: string, m: Manifest, shard: { k: number; n: number } | null): Promise<void> {
  await writeFileAtomic(join(jobDir, manifestName(shard)), JSON.stringify(m, null, 1) + '\n');
}

/**
 * Folders that a killed run left half-written (the `.<case>.partial-…` and `.old-…` names of
 * writeCase). Only called by a run that owns the job folder, never by a shard: another shard may
 * be writing its own partial folder at that moment.
 */
export async function removeLeftovers(jobDir: string): Promise<number> {
  let n = 0;
  let entries: string[];
  try {
    entries = await readdir(jobDir);
  } catch {
    return 0;
  }
  for (const e of entries) {
    if (/^\..+\.partial-[0-9a-f]+$/.test(e) || /\.old-[0-9a-f]+$/.test(e) || /^\.[0-9a-f]{12}\.tmp$/.test(e)) {
      await rm(join(jobDir, e), { recursive: true, force: true });
      n++;
    }
  }
  return n;
}
