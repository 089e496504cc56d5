// The report's per-case parts (contact-sheet tiles, explorer entries) made by the thread that
// computed each case (src/report/case-share.ts) give the same report files as gathering the cases
// from disk afterwards (src/run/gather.ts reading intensity.npy): byte for byte, but for the time of
// writing. Checked for a run where the run's prediction (every case done) holds, with float32 maps
// (the share must use the values as written, not the computed doubles), and for a run where a case
// fails so that the other cases' places on the sheet and the page move. Job: a 50 µm pinhole at
// 633 nm at five distances (invented; each case a fraction of a second).
import { cp, mkdtemp, readFile, rm, unlink, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runJobFile } from '../../src/run/run-job.js';
import { gatherJob } from '../../src/run/gather.js';
import { loadJobFile } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';
import { recorder } from '../helpers.js';

const JOB = `name: pin
wavelength: 633 nm
distance: {from: 0.5 m, to: 1.5 m, count: 5}
aperture: {shape: circle, diameter: 50 um}
output: {npy: float32, logDecades: 5}
`;

const REPORT_FILES = ['report.html', 'explorer.html', 'contact-sheet.png', 'contact-sheet-log.png'];

let dir = '';

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-shares-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
  delete process.env.SPOTCAST_FAULT;
});

/** The file without the lines that carry the time it was written. */
async function timeless(path: string): Promise<Buffer | string> {
  const b = await readFile(path);
  if (!path.endsWith('.html')) return b;
  return b
    .toString('utf8')
    .split('\n')
    .filter((l) => !/\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d/.test(l))
    .join('\n');
}

/** Runs the job into `name`, copies the folder, gathers the copy from disk alone, and compares. */
async function runAndRegather(name: string, fault?: string): Promise<{ run: string; again: string; notes: string[] }> {
  const file = join(dir, `${name}.yaml`);
  await writeFile(file, JOB);
  const out = join(dir, name);
  if (fault) process.env.SPOTCAST_FAULT = fault;
  const r = recorder();
  try {
    await runJobFile(file, { outDir: out, reporter: r.reporter });
  } finally {
    delete process.env.SPOTCAST_FAULT;
  }
  const run = join(out, 'pin');
  const again = join(dir, `${name}-again`, 'pin');
  await cp(run, again, { recursive: true });
  for (const f of REPORT_FILES) await unlink(join(again, f));
  const loaded = await loadJobFile(file);
  const g = await gatherJob(loaded, again, expandJob(loaded.spec));
  expect(g.reportError).toBeUndefined();
  return { run, again, notes: r.notes };
}

describe('report shares made where the cases ran', () => {
  it('give the report gathering from disk gives, when every case is done (float32 maps)', async () => {
    const { run, again, notes } = await runAndRegather('all');
    expect(notes.filter((n) => n.startsWith('FAILED'))).toEqual([]);
    for (const f of REPORT_FILES) expect(await timeless(join(run, f)), f).toEqual(await timeless(join(again, f)));
  });

  it('give it too when a case fails and the others move on the sheet and the page', async () => {
    const loaded = await loadJobFile(join(dir, 'all.yaml'));
    const victim = expandJob(loaded.spec)[1]!.id;
    const { run, again, notes } = await runAndRegather('one-failed', `throw:${victim}`);
    expect(notes.some((n) => n.startsWith(`FAILED ${victim}`))).toBe(true);
    for (const f of REPORT_FILES) expect(await timeless(join(run, f)), f).toEqual(await timeless(join(again, f)));
  });
});
