// What survives a run: each complete case folder holds record.json (its summary and the hash of
// what made it), and the job folder a manifest of completed cases. A case is done when its folder
// has a record whose hash matches; the folder is renamed into place whole, so a kill at any moment
// leaves either a complete case or none.
import { createHash } from 'node:crypto';
import { readdir, readFile, rm } from 'node:fs/promises';
import { join } from 'node:path';
import type { Case } from '../plan/types.js';
import { CASE_FILES, jsonNumbers, type StoredRecord } from '../output/case-output.js';
import { writeFileAtomic } from '../output/atomic.js';
import { TOOL_VERSION } from '../version.js';

/** Hash of everything that determines a case's result, and of the tool version. */
export function caseHash(c: Case): string {
  // The job name and the position in the sweep do not change the result.
  const params = { ...c, job: undefined, index: undefined };
  return createHash('sha256').update(JSON.stringify({ tool: TOOL_VERSION, params }, jsonNumbers)).digest('hex').slice(0, 32);
}

/** The record of a complete case, or null when the folder is absent or incomplete. */
export async function readRecord(jobDir: string, id: string): Promise<StoredRecord | null> {
  try {
    const text = await readFile(join(jobDir, id, CASE_FILES.record), 'utf8');
    return JSON.parse(text) as StoredRecord;
  } catch {
    return null;
  }
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
