// An image mask through the built CLI (dist/src/cli.js) on two worker threads: the decoded pixels
// travel with each case by structured clone (a Map of Float32Arrays), the job file names the PNG
// relative to itself, the run is resumed from the records (the case hash holds the image's digest,
// not its pixels), and result.json carries the digest and the size instead of the pixels. The
// build runs in beforeAll unless SPOTCAST_TEST_NO_BUILD=1.
//
// Reference: the far-field peak of an open area A is (A/(λz))² (Goodman, Introduction to Fourier
// Optics, §4.2: the on-axis Fraunhofer field is the integral of the transmittance over λz).
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeMaskPng } from '../mask-png.js';

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const cli = join(repo, 'dist', 'src', 'cli.js');
let work: string;

// An invented job: a 24 × 24-pixel square opening in a 32 × 32 image, at two pixel pitches.
const JOB = 'name: square-image\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: image, file: masks/square.png, pitch: [1 um, 2 um]}\n';

beforeAll(async () => {
  if (process.env.SPOTCAST_TEST_NO_BUILD !== '1') execFileSync('npm', ['run', 'build'], { cwd: repo, stdio: 'pipe' });
  if (!existsSync(cli)) throw new Error(`${cli} is missing: run npm run build`);
  work = await mkdtemp(join(tmpdir(), 'spotcast-image-cli-'));
  await mkdir(join(work, 'jobs', 'masks'), { recursive: true });
  await writeMaskPng(join(work, 'jobs', 'masks', 'square.png'), 32, 32, (i, k) => [i >= 4 && i < 28 && k >= 4 && k < 28 ? 255 : 0]);
  await writeFile(join(work, 'jobs', 'square.yaml'), JOB);
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

function run() {
  // Run from another folder than the job's: the image is found relative to the job file.
  return spawnSync(process.execPath, [cli, 'run', 'jobs/square.yaml', '--out', 'out', '--workers', '2'], { cwd: work, encoding: 'utf8', timeout: 120_000 });
}

describe('an image mask on worker threads', () => {
  it('computes each case with its pixels, peaks at (A/λz)², and writes the digest, not the pixels', async () => {
    const r = run();
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    for (const [id, p] of [['1_pitch-1um', 1e-6], ['2_pitch-2um', 2e-6]] as const) {
      const text = await readFile(join(work, 'out', 'square-image', id, 'result.json'), 'utf8');
      const res = JSON.parse(text);
      const area = (24 * p) ** 2;
      expect(Math.abs(res.metrics.peakIntensity / (area / (633e-9 * 1)) ** 2 - 1), id).toBeLessThan(5e-3);
      expect(res.parameters.aperture.pixels).toMatchObject({ width: 32, height: 32, digest: expect.stringMatching(/^[0-9a-f]{32}$/), planes: {} });
      expect(text.length).toBeLessThan(200_000);
    }
  });

  it('a second run finds both cases done (the hash is stable across loads of the same image)', () => {
    const r = run();
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/2 of 2 case\(s\) done \(2 skipped, already done\)/);
  });
});
