// The memory guard is only as good as the estimate: for a spread of cases across methods and
// layouts, each is planned and carried out as a run does (compute, metrics, answers, the case
// folder written) in a child process of the built dist/ (measure-case.mjs), and its peak resident
// size above a baseline taken after the imports (process.resourceUsage().maxRSS, measured by the
// kernel) must stay within plan.memoryBytes. The cases are small enough to take about a second each
// and large enough (tens to hundreds of MB) to stand above the noise of the runtime's own heap.
// Also: sizes no array can hold are refused before anything is allocated, and hostile sizes are
// planned promptly. dist/ is built in beforeAll when older than the sources (test/build-if-stale.ts);
// SPOTCAST_TEST_NO_BUILD=1 uses an existing dist/ as it is.
import { testContext } from '../engine.js';
import { execFile } from 'node:child_process';
import { existsSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { beforeAll, describe, expect, it } from 'vitest';
import type { CaseSpec } from '../helpers.js';
import { makeCase, mm, nm, um } from '../helpers.js';
import { planCase } from '../../src/plan/planner.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { buildIfStale } from '../build-if-stale.js';

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const script = join(repo, 'test', 'plan', 'measure-case.mjs');
const run = promisify(execFile);

beforeAll(() => {
  buildIfStale(repo);
  if (!existsSync(join(repo, 'dist', 'src', 'plan', 'planner.js'))) throw new Error('dist/ is missing: run npm run build');
});

const gauss = (waist: number, tilt: [number, number] = [0, 0]) => ({ kind: 'gaussian' as const, waist, tilt });
const plane = (tilt: [number, number] = [0, 0]) => ({ kind: 'plane' as const, tilt });

/** Invented set-ups, each chosen to take one path of the planner (the method and form it should pick are beside it). */
const CASES: [string, string, CaseSpec][] = [
  ['far-field formula, 1-D slit', 'fraunhofer one-d', { wavelength: 633 * nm, distance: 1, aperture: { shape: 'slit', width: 20 * um, opaque: false }, method: 'fraunhofer' }],
  ['far-field formula, rectangle', 'fraunhofer separable', { wavelength: 633 * nm, distance: 2, aperture: { shape: 'rectangle', width: 100 * um, height: 200 * um, opaque: false }, method: 'fraunhofer' }],
  ['far-field formula, disc (radial line) and its far-field search', 'fraunhofer two-d', { wavelength: 633 * nm, distance: 1, aperture: { shape: 'circle', diameter: 50 * um, opaque: false }, method: 'fraunhofer' }],
  ['far-field formula, tilted disc (spectrum table)', 'fraunhofer two-d', { wavelength: 633 * nm, distance: 0.05, aperture: { shape: 'circle', diameter: 20 * um, opaque: false }, illumination: plane([0.2, 0]), method: 'fraunhofer' }],
  ['far-field formula on a given coarse grid', 'fraunhofer two-d', { wavelength: 633 * nm, distance: 1, aperture: { shape: 'circle', diameter: 40 * um, opaque: false }, grid: { size: 64, pitch: 2 * um }, method: 'fraunhofer' }],
  // A 1 mm window, where direct sums are cheaper than the single FFT (whose grids need not be powers of two).
  ['Fresnel direct sums, rectangle', 'fresnel/direct separable', { wavelength: 633 * nm, distance: 0.5, aperture: { shape: 'rectangle', width: 1 * mm, height: 0.5 * mm, opaque: false }, method: 'fresnel', window: [1 * mm, 1 * mm] }],
  // A grid.size names the transfer-function form (else the single FFT is cheaper here).
  ['Fresnel transfer function, disc', 'fresnel/transfer-function two-d', { wavelength: 633 * nm, distance: 0.5, aperture: { shape: 'circle', diameter: 1 * mm, opaque: false }, method: 'fresnel', grid: { size: 512 } }],
  ['Fresnel single FFT, annulus', 'fresnel/single-fft two-d', { wavelength: 633 * nm, distance: 0.5, aperture: { shape: 'annulus', outer: 1 * mm, inner: 0.5 * mm, opaque: false } }],
  // (At 2 m behind 40 µm × 40 mm the single FFT's lattice, no coarser than the intensity's Nyquist
  // pitch, now costs more than the direct sums.)
  ['Fresnel single FFT, 2 mm Gaussian beam through a 40 µm × 4 mm rectangle', 'fresnel/single-fft separable', { wavelength: 532 * nm, distance: 0.5, aperture: { shape: 'rectangle', width: 40 * um, height: 4 * mm, opaque: false }, illumination: gauss(2 * mm) }],
  ['angular spectrum, disc', 'angular-spectrum two-d', { wavelength: 633 * nm, distance: 5 * mm, aperture: { shape: 'circle', diameter: 300 * um, opaque: false }, method: 'angular-spectrum' }],
  ['angular spectrum in a tilted beam\'s frame', 'angular-spectrum/shifted two-d', { wavelength: 633 * nm, distance: 20 * mm, aperture: { shape: 'circle', diameter: 300 * um, opaque: false }, illumination: plane([0.1, 0]), method: 'angular-spectrum' }],
  ['angular spectrum, 1-D slit of 10 cm (a long 1-D grid and profile)', 'angular-spectrum one-d', { wavelength: 633 * nm, distance: 0.5, aperture: { shape: 'slit', width: 0.1, opaque: false } }],
  ['exact integral along the boundary, disc', 'rayleigh-sommerfeld/boundary two-d', { wavelength: 633 * nm, distance: 0.1, aperture: { shape: 'circle', diameter: 200 * um, opaque: false }, method: 'rayleigh-sommerfeld' }],
  ['exact 2-D cells, Gaussian beam through a disc', 'rayleigh-sommerfeld/direct two-d', { wavelength: 633 * nm, distance: 2 * mm, aperture: { shape: 'circle', diameter: 100 * um, opaque: false }, illumination: gauss(40 * um), method: 'rayleigh-sommerfeld' }],
  ['exact 1-D cells, slit', 'rayleigh-sommerfeld/direct one-d', { wavelength: 633 * nm, distance: 0.01, aperture: { shape: 'slit', width: 200 * um, opaque: false }, method: 'rayleigh-sommerfeld' }],
  ['exact per-period sums, 50-slit grating', 'rayleigh-sommerfeld/per-period one-d', { wavelength: 633 * nm, distance: 0.05, aperture: { shape: 'slits', count: 50, width: 5 * um, period: 20 * um, opaque: false }, method: 'rayleigh-sommerfeld' }],
  ['exact 2-D sums, grating of 10 finite slits', 'rayleigh-sommerfeld two-d', { wavelength: 633 * nm, distance: 0.5, aperture: { shape: 'slits', count: 10, width: 10 * um, period: 40 * um, length: 200 * um, opaque: false }, method: 'rayleigh-sommerfeld' }],
  // A 2 mm window: with 5-smooth FFT sizes the single FFT is cheaper over the planner's own window.
  ['Fresnel direct sums, grating of 10 finite slits', 'fresnel/direct separable', { wavelength: 633 * nm, distance: 0.5, aperture: { shape: 'slits', count: 10, width: 10 * um, period: 40 * um, length: 200 * um, opaque: false }, method: 'fresnel', window: [2 * mm, 2 * mm] }],
  ['opaque disc in a plane wave (Babinet)', 'two-d', { wavelength: 532 * nm, distance: 0.3, aperture: { shape: 'circle', diameter: 1 * mm, opaque: true } }],
  ['opaque disc in a Gaussian beam', 'two-d', { wavelength: 532 * nm, distance: 0.3, aperture: { shape: 'circle', diameter: 0.25 * mm, opaque: true }, illumination: gauss(0.25 * mm) }],
];

interface Measured {
  method: string;
  form: string | null;
  layout: string;
  estimate: number;
  used: number;
  ratio: number;
  error: string | null;
  failed?: string;
}

async function measure(spec: CaseSpec): Promise<Measured> {
  const c = makeCase(spec);
  const { stdout } = await run(process.execPath, [script, JSON.stringify(c)], { cwd: repo, timeout: 120_000, maxBuffer: 1 << 20 });
  return JSON.parse(stdout) as Measured;
}

describe('memory estimate', () => {
  it('holds the measured peak (resident size above the baseline) of every case, compute, answers and files together', async () => {
    const results: (Measured & { name: string; path: string })[] = [];
    // Two at a time (the machine has two cores; each child measures only itself).
    const queue = [...CASES];
    const worker = async () => {
      for (let next = queue.shift(); next; next = queue.shift()) {
        const [name, path, spec] = next;
        results.push({ name, path, ...(await measure(spec)) });
      }
    };
    await Promise.all([worker(), worker()]);
    const MiB = 1024 ** 2;
    const table = results
      .sort((a, b) => CASES.findIndex((c) => c[0] === a.name) - CASES.findIndex((c) => c[0] === b.name))
      .map((r) => `${r.name.padEnd(76)} ${`${r.method}${r.form ? `/${r.form}` : ''} ${r.layout}`.padEnd(38)} estimate ${(r.estimate / MiB).toFixed(0).padStart(5)} MiB, measured ${(r.used / MiB).toFixed(0).padStart(5)} MiB, ratio ${r.ratio.toFixed(2)}`);
    console.log(`measured peak above baseline against plan.memoryBytes:\n${table.join('\n')}`);
    for (const r of results) {
      expect(r.error, r.name).toBeNull();
      expect(r.failed, r.name).toBeUndefined();
      // Each case takes the path it was set up for (else it tests something else).
      for (const part of r.path.split(' ')) expect(`${r.method}/${r.form ?? ''} ${r.layout}`, r.name).toContain(part);
      expect(r.used, `${r.name}: measured ${r.used} bytes, estimated ${r.estimate}`).toBeLessThanOrEqual(r.estimate);
    }
  });
});

describe('sizes no array can hold, and hostile sizes', () => {
  const pinhole = (s: Partial<CaseSpec>) => makeCase({ wavelength: 633 * nm, distance: 1, aperture: { shape: 'circle', diameter: 40 * um, opaque: false }, ...s });

  it('counts the far-field radial line of a coarse given grid: a 1.5 m pitch is refused before any work, with its estimate', () => {
    // The grid reaches 48 m; its radial spectrum line has 5e8 entries × 64 samples (a 34 GiB kernel,
    // then "Invalid typed array length" when it was not counted).
    const p = planCase(pinhole({ grid: { size: 64, pitch: 1.5 }, method: 'fraunhofer' }), { maxMemoryBytes: 1024 ** 3 });
    expect(p.memoryBytes).toBeGreaterThan(100 * 1024 ** 3);
    expect(p.error).toMatch(/needs about [\d.]+ GiB \(over the 1 GiB limit\)/);
  });

  it('a grid.pitch of 2⁵³ + 1 m: the far-field formula is refused with its estimate, and what is chosen instead runs', () => {
    // It used to fail with "Invalid typed array length: 3.27e+24" (the radial line over the grid's reach).
    const forced = planCase(pinhole({ grid: { pitch: 9007199254740993 }, method: 'fraunhofer' }));
    expect(forced.error).toMatch(/needs about [\d.e+]+ GiB \(over the 4 GiB limit\)/);
    const auto = planCase(pinhole({ grid: { pitch: 9007199254740993 } }));
    expect(auto.options.find((o) => o.method === 'fraunhofer')!.fits).toBe(false);
    if (!auto.error) {
      expect(auto.warnings.map((w) => w.code)).toContain('coarse-sampling');
      expect(() => runPlannedCase(auto, testContext())).not.toThrow();
    }
  });

  it('a size no array can hold is an impossible plan, whatever the memory limit', () => {
    // A 1-D angular-spectrum grid of 2⁵³ m at a sub-micrometre pitch: more samples than an array holds.
    const p = planCase(makeCase({ wavelength: 633 * nm, distance: 1, aperture: { shape: 'slit', width: 9007199254740993, opaque: false }, method: 'angular-spectrum' }), {
      maxMemoryBytes: Number.MAX_VALUE,
      maxWork: Infinity,
    });
    expect(p.error).toMatch(/an impossible size \(.*samples in one array \(at most 2147483648 fit in one\)\)/);
    expect(p.options.filter((o) => o.method === 'angular-spectrum').every((o) => !o.fits)).toBe(true);
  });

  it('plans discs, annuli, rectangles and gratings of metres to 2⁵³ m, and a million slits, promptly (no walk over every panel, cell or slit)', () => {
    const hostile: CaseSpec['aperture'][] = [
      { shape: 'circle', diameter: 42, opaque: false },
      { shape: 'annulus', outer: 42, inner: 21, opaque: false },
      { shape: 'rectangle', width: 9007199254740993, height: 50 * um, opaque: false },
      { shape: 'rectangle', width: 50 * um, height: 42, opaque: true },
      { shape: 'slit', width: 50 * um, length: 9007199254740993, opaque: false },
      { shape: 'slits', count: 5, width: 10 * um, period: 20 * um, length: 42, opaque: false },
      // A million finite slits: costing their 2-D sums slit by slit overflowed the stack.
      { shape: 'slits', count: 1_000_000, width: 1 * um, period: 2 * um, length: 1 * mm, opaque: false },
    ];
    for (const aperture of hostile) {
      const t0 = performance.now();
      const p = planCase(makeCase({ wavelength: 633 * nm, distance: 1, aperture }));
      const seconds = (performance.now() - t0) / 1000;
      // A generous bound for a plan that must not hang (it takes well under a second).
      expect(seconds, JSON.stringify(aperture)).toBeLessThan(10);
      expect(p.error, JSON.stringify(aperture)).toBeDefined();
    }
  });
});
