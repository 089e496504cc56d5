// A lens's wavefront error given as an image (src/elements/lens.ts wavefront_map,
// src/optics/wavefront-map.ts), through the whole program: job file → loader → expansion → planner
// → propagation, on planner-chosen grids. The PNGs are written here with pngjs into a temporary
// folder, 16 bits a sample, each pixel the wavefront at its centre.
//
// References: Noll's Zernike polynomials and normalisation (R. J. Noll, JOSA 66, 207 (1976)):
// Z2 = 2ρ cos θ, Z4 = √3(2ρ² − 1), each of RMS 1 over the unit disc. Defocus of RMS σ is then
// σ√3(2ρ² − 1), whose peak-to-valley is 2√3σ: as grey levels (0 at the valley, white at the peak)
// the map of pure defocus is exactly ρ². The Strehl ratio of the defocused pupil: the on-axis
// |⟨e^{i2πW}⟩|², for defocus sinc²(πW₂₀), W₂₀ = 2√3σ (Born & Wolf §8.8, from memory; the same
// closed form lens.test.ts checks the Zernike term against), and the estimate exp(−(2πσ)²)
// (V. N. Mahajan, JOSA 72, 1258 (1982)). A tilt moves the focus by f times the wavefront's slope
// (the shift theorem in the focal plane, Goodman, Introduction to Fourier Optics, §2.1 and §5.2).
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadJobFile } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';
import type { Aperture } from '../../src/optics/aperture.js';
import { apertureFacts, lensOf, phaseFrequencyOf } from '../../src/elements/registry.js';
import { mm, nm, runCase } from '../helpers.js';
import { writeMaskPng } from '../mask-png.js';
import type { IntensityMap } from '../../src/model/intensity-map.js';
import { mapPupilCellAverages, mapWavefrontRms, prepareWavefrontMap } from '../../src/optics/wavefront-map.js';
import { sampleMask2D } from '../../src/optics/mask.js';

const lam = 633 * nm;
const D = 10 * mm;
const R = D / 2;
const f = 250 * mm;
const sigma = 0.05;
const N = 96;
const PV = 2 * Math.sqrt(3) * sigma;

/** Pixel (i, k)'s centre in units of the stop's radius, row 0 at the most negative y. */
const uv = (i: number, k: number): [number, number] => [(i + 0.5 - N / 2) / (N / 2), (k + 0.5 - N / 2) / (N / 2)];
/** 16-bit grey of a level 0…1, and what lies outside the stop (not read: see the test below). */
const grey = (level: number) => Math.round(Math.min(1, Math.max(0, level)) * 65535);

/** Intensity at the sample nearest (x, y). */
function at(c: IntensityMap, x: number, y: number): number {
  const col = Math.round((x - c.x0) / c.dx);
  const row = Math.round((y - c.y0) / c.dy);
  return c.intensity[row * c.nx + col]!;
}

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-wavefront-map-'));
  // Defocus σZ4 + √3σ = PV·ρ²: grey level ρ² inside the stop; black outside (the corners).
  await writeMaskPng(join(dir, 'defocus.png'), N, N, (i, k) => {
    const [u, v] = uv(i, k);
    const r2 = u * u + v * v;
    return [r2 <= 1 ? grey(r2) : 0];
  }, { bitDepth: 16 });
  // The same with white outside: what lies outside the stop must not matter.
  await writeMaskPng(join(dir, 'defocus-white.png'), N, N, (i, k) => {
    const [u, v] = uv(i, k);
    const r2 = u * u + v * v;
    return [r2 <= 1 ? grey(r2) : 65535];
  }, { bitDepth: 16 });
  // Defocus σZ4 plus a tilt of 0.1 wave RMS along x, 0.1·Z2 = 0.2u: W = √3σ(2ρ²−1) + 0.2u, shifted
  // to be ≥ 0 and scaled by its own PV (given in the job).
  await writeMaskPng(join(dir, 'tilted.png'), N, N, (i, k) => {
    const [u, v] = uv(i, k);
    const r2 = u * u + v * v;
    return [r2 <= 1 ? grey((tiltedWave(u, v) - TILTED_MIN) / TILTED_PV) : 0];
  }, { bitDepth: 16 });
  await writeMaskPng(join(dir, 'wide.png'), 2 * N, N, () => [0]);
  await writeMaskPng(join(dir, 'colour.png'), 8, 8, (i) => [i, 0, 0], { colorType: 2 });
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const TILT = 0.1;
const tiltedWave = (u: number, v: number) => sigma * Math.sqrt(3) * (2 * (u * u + v * v) - 1) + TILT * 2 * u;
// Over the disc: the minimum of √3σ(2ρ² − 1) + 0.2u lies at u = −0.2/(4√3σ) (inside), the maximum at u = 1.
const TILTED_MIN = tiltedWave(-(2 * TILT) / (4 * Math.sqrt(3) * sigma), 0);
const TILTED_PV = tiltedWave(1, 0) - TILTED_MIN;

async function loadLens(aperture: string, light = ''): Promise<Aperture> {
  const file = join(dir, `job-${Math.random().toString(36).slice(2)}.yaml`);
  await writeFile(file, `name: map\nwavelength: 633 nm\ndistance: 250 mm\naperture: ${aperture}\n${light}`);
  return expandJob((await loadJobFile(file)).spec)[0]!.aperture;
}

async function problemsOf(aperture: string, light = ''): Promise<{ path: string; message: string }[]> {
  try {
    await loadLens(aperture, light);
    return [];
  } catch (e) {
    return ((e as { problems?: { path: string; message: string }[] }).problems ?? [{ path: '', message: String(e) }]) as { path: string; message: string }[];
  }
}

const lensKeys = `shape: lens, focal_length: 250 mm, stop: 10 mm`;
const run = (aperture: Aperture) => runCase({ wavelength: lam, distance: f, aperture });

describe('defocus of 0.05 wave RMS given as an image, beside the same Zernike term', () => {
  let clean: ReturnType<typeof run>;
  let map: ReturnType<typeof run>;
  let zern: ReturnType<typeof run>;
  let mapAperture: Aperture;
  let zernAperture: Aperture;
  beforeAll(async () => {
    mapAperture = await loadLens(`{${lensKeys}, wavefront_map: {image: defocus.png, peak_to_valley: ${PV}}}`);
    zernAperture = await loadLens(`{${lensKeys}, aberrations: {4: ${sigma}}}`);
    clean = run(await loadLens(`{${lensKeys}}`));
    map = run(mapAperture);
    zern = run(zernAperture);
  });

  it('is planned with the lens folded into the chirp, as the Zernike term is', () => {
    expect(map.plan.form).toBe('lens-chirp');
    expect(zern.plan.form).toBe('lens-chirp');
  });

  it("has the Zernike term's focal peak within 1 % (Noll's normalisation: the map ρ² is σZ4 + const)", () => {
    const a = at(map.c, 0, 0);
    const b = at(zern.c, 0, 0);
    expect(Math.abs(a / b - 1)).toBeLessThan(0.01);
    expect(Math.abs(map.rec.metrics.peakIntensity / zern.rec.metrics.peakIntensity - 1)).toBeLessThan(0.01);
  });

  it('has the Strehl ratio sinc²(πW₂₀) within 1 % (Born & Wolf §8.8) and exp(−(2πσ)²) within 1 % (Mahajan 1982)', () => {
    const s = map.rec.metrics.strehl!;
    expect(s).toBeDefined();
    const w20 = 2 * Math.sqrt(3) * sigma;
    const closed = (Math.sin(Math.PI * w20) / (Math.PI * w20)) ** 2;
    const mahajan = Math.exp(-((2 * Math.PI * sigma) ** 2));
    expect(Math.abs(s.ratio / closed - 1)).toBeLessThan(0.01);
    expect(Math.abs(s.ratio / mahajan - 1)).toBeLessThan(0.01);
    // The same ratio from the two runs' own peaks (the metric's ideal peak is closed-form).
    expect(Math.abs(at(map.c, 0, 0) / at(clean.c, 0, 0) / closed - 1)).toBeLessThan(0.01);
    expect(Math.abs(s.ratio / zern.rec.metrics.strehl!.ratio - 1)).toBeLessThan(0.01);
  });

  it("takes the Strehl estimate from the map's RMS over the stop: σ = 0.05 wave within 1 %", () => {
    const s = map.rec.metrics.strehl!;
    expect(Math.abs(s.rmsWaves / sigma - 1)).toBeLessThan(0.01);
    expect(Math.abs(s.estimate / Math.exp(-((2 * Math.PI * sigma) ** 2)) - 1)).toBeLessThan(0.002);
  });

  it("samples the map's slope: its phase frequency is the rim slope 4√3σ/R of Z4 within 3 %, and the plan honours it", () => {
    const analytic = (4 * Math.sqrt(3) * sigma) / R; // |dW/dr| at ρ = 1 for σZ4 (Noll's Z4)
    const mapPupil = lensOf(mapAperture)!.pupilFrequency(lam);
    expect(mapPupil / analytic).toBeGreaterThan(0.97);
    expect(mapPupil / analytic).toBeLessThan(1.03);
    // The element's phase frequency adds the lens's own at the rim, R/(λf).
    const total = phaseFrequencyOf(mapAperture, lam, R);
    expect(Math.abs(total - (R / (lam * f) + mapPupil))).toBeLessThan(1e-9 * total);
    expect(map.plan.x.inputPitch).toBeLessThanOrEqual((1 / (4 * mapPupil)) * (1 + 1e-9));
  });

  it('says what it is in the plan', () => {
    expect(apertureFacts(mapAperture).description).toMatch(/wavefront map 'defocus\.png' \(96 × 96 pixels across the stop, white 0\.1732\d* wave\)/);
  });

  it("does not read what lies outside the stop: white corners give the black corners' focus", async () => {
    const white = run(await loadLens(`{${lensKeys}, wavefront_map: {image: defocus-white.png, peak_to_valley: ${PV}}}`));
    expect(Math.abs(at(white.c, 0, 0) / at(map.c, 0, 0) - 1)).toBeLessThan(1e-9);
  });

  it('takes the peak-to-valley as an optical path with its unit (2√3σλ = 109.6 nm) as that many waves', async () => {
    const path = (PV * lam) / nm;
    const a = await loadLens(`{${lensKeys}, wavefront_map: {image: defocus.png, peak_to_valley: '${path} nm'}}`);
    expect(Math.abs(lensOf(a)!.rmsWaves(lam, true) / lensOf(mapAperture)!.rmsWaves(lam, true) - 1)).toBeLessThan(1e-9);
    const r = run(a);
    expect(Math.abs(at(r.c, 0, 0) / at(map.c, 0, 0) - 1)).toBeLessThan(1e-6);
  });

  it('adds to the Zernike terms: the map and −0.05 wave of Z4 cancel, back to the aberration-free peak within 1 %', async () => {
    const both = await loadLens(`{${lensKeys}, aberrations: {4: ${-sigma}}, wavefront_map: {image: defocus.png, peak_to_valley: ${PV}}}`);
    expect(lensOf(both)!.rmsWaves(lam, true)).toBeLessThan(0.05 * sigma);
    const r = run(both);
    expect(Math.abs(at(r.c, 0, 0) / at(clean.c, 0, 0) - 1)).toBeLessThan(0.01);
    expect(r.rec.metrics.strehl!.ratio).toBeGreaterThan(0.99);
    // And with +0.05 wave they add: 0.1 wave of Z4, RMS 0.1 within 1 %.
    const twice = await loadLens(`{${lensKeys}, aberrations: {4: ${sigma}}, wavefront_map: {image: defocus.png, peak_to_valley: ${PV}}}`);
    expect(Math.abs(lensOf(twice)!.rmsWaves(lam, true) / (2 * sigma) - 1)).toBeLessThan(0.01);
  });
});

describe('defocus and a tilt of 0.1 wave RMS (Z2) in one image', () => {
  let a: Aperture;
  let r: ReturnType<typeof run>;
  beforeAll(async () => {
    a = await loadLens(`{${lensKeys}, wavefront_map: {image: tilted.png, peak_to_valley: ${TILTED_PV}}}`);
    r = run(a);
  });

  it('removes the tilt by the least-squares plane: RMS σ without it, √(σ² + 0.1²) with it, within 1 % (Noll: Z2, Z4 orthonormal)', () => {
    const lens = lensOf(a)!;
    expect(Math.abs(lens.rmsWaves(lam, true) / sigma - 1)).toBeLessThan(0.01);
    expect(Math.abs(lens.rmsWaves(lam, false) / Math.hypot(sigma, TILT) - 1)).toBeLessThan(0.01);
  });

  it('moves the focus by f times the slope, 2·0.1·λf/R along x, within a fifth of the output pitch (Goodman §2.1, §5.2)', () => {
    const shift = (2 * TILT * lam * f) / R;
    expect(Math.abs(r.rec.metrics.peakPosition[0]! - shift)).toBeLessThan(0.2 * r.plan.x.output.step);
    expect(Math.abs(r.rec.metrics.peakPosition[1]!)).toBeLessThan(0.2 * r.plan.y!.output.step);
  });
});

describe('a plane as a map, on its own (optics/wavefront-map.ts)', () => {
  // Levels (u + 1)/2 at the pixel centres, black outside the stop: W = 3·(x/R + 1)/2 waves, a tilt
  // that the bilinear interpolant (and the linear extrapolation outside the stop) holds exactly.
  const n = 32;
  const wpl = 3;
  const levels = new Float32Array(n * n);
  for (let k = 0; k < n; k++) {
    for (let i = 0; i < n; i++) {
      const u = (i + 0.5 - n / 2) / (n / 2);
      const v = (k + 0.5 - n / 2) / (n / 2);
      levels[k * n + i] = u * u + v * v <= 1 ? (u + 1) / 2 : 0;
    }
  }
  const map = prepareWavefrontMap(levels, n);
  const radius = 1 * mm;

  it('has the cell averages e^{i2πW(x_c)}·sinc(πGΔ) of a linear phase inside the stop within 1e-5 (common practice: the mean of e^{iαx} over a cell)', () => {
    const step = (2 * radius) / 37;
    const axis = { n: 41, start: -20 * step, step };
    const t = mapPupilCellAverages(map, wpl, [], radius, axis, axis);
    const open = sampleMask2D({ shape: 'circle', diameter: 2 * radius, opaque: false }, axis, axis);
    const g = wpl / (2 * radius); // waves per metre
    const sinc = Math.sin(Math.PI * g * step) / (Math.PI * g * step);
    let checked = 0;
    let worst = 0;
    for (let r = 0; r < axis.n; r++) {
      for (let c = 0; c < axis.n; c++) {
        const xc = axis.start + c * step;
        // Cells wholly inside the stop, and away from the half pixel beyond the outermost samples.
        if (open[r * axis.n + c] !== 1 || Math.abs(xc) + step > radius * (1 - 2 / n)) continue;
        const phi = 2 * Math.PI * wpl * (xc / radius + 1) / 2;
        const k = 2 * (r * axis.n + c);
        worst = Math.max(worst, Math.hypot(t[k]! - Math.cos(phi) * sinc, t[k + 1]! - Math.sin(phi) * sinc));
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(800);
    expect(worst).toBeLessThan(1e-5);
  });

  it('has the RMS 3 × ½ × ½ wave with the piston removed (u has RMS ½ over the disc: Noll, Z2 = 2u of RMS 1), and none with the plane removed', () => {
    expect(Math.abs(mapWavefrontRms(map, wpl, [], false) / 0.75 - 1)).toBeLessThan(0.01);
    expect(mapWavefrontRms(map, wpl, [], true)).toBeLessThan(1e-5);
  });
});

describe('refusals, each naming its key', () => {
  it('a missing image: aperture.wavefront_map.image', async () => {
    const p = await problemsOf(`{${lensKeys}, wavefront_map: {image: nowhere.png, peak_to_valley: 0.1}}`);
    expect(p).toHaveLength(1);
    expect(p[0]!.path).toBe('aperture.wavefront_map.image');
    expect(p[0]!.message).toMatch(/cannot read 'nowhere\.png'/);
  });

  it('a non-square image: aperture.wavefront_map.image, with its size', async () => {
    const p = await problemsOf(`{${lensKeys}, wavefront_map: {image: wide.png, peak_to_valley: 0.1}}`);
    expect(p).toHaveLength(1);
    expect(p[0]!.path).toBe('aperture.wavefront_map.image');
    expect(p[0]!.message).toMatch(/192 × 96 pixels: expected a square image/);
  });

  it('a colour image: aperture.wavefront_map.image (the image mask\'s rule)', async () => {
    const p = await problemsOf(`{${lensKeys}, wavefront_map: {image: colour.png, peak_to_valley: 0.1}}`);
    expect(p[0]!.path).toBe('aperture.wavefront_map.image');
    expect(p[0]!.message).toMatch(/is in colour/);
  });

  it('no stop: aperture.wavefront_map (a Gaussian beam, so that the stop itself is not asked for)', async () => {
    const p = await problemsOf(`{shape: lens, focal_length: 250 mm, wavefront_map: {image: defocus.png, peak_to_valley: 0.1}}`, 'illumination: {kind: gaussian, waist: 2 mm}\n');
    expect(p).toHaveLength(1);
    expect(p[0]!.path).toBe('aperture.wavefront_map');
    expect(p[0]!.message).toMatch(/expected a stop/);
  });

  it('a peak-to-valley beyond 100 waves, and an unknown key: their paths', async () => {
    const big = await problemsOf(`{${lensKeys}, wavefront_map: {image: defocus.png, peak_to_valley: 1000}}`);
    expect(big[0]!.path).toBe('aperture.wavefront_map.peak_to_valley');
    const extra = await problemsOf(`{${lensKeys}, wavefront_map: {image: defocus.png, peak_to_valley: 0.1, scale: 2}}`);
    expect(extra[0]!.path).toMatch(/^aperture\.wavefront_map/);
  });
});
