// Image masks sampled onto grid cells (src/optics/image-cells.ts): the separable area-weighted sums
// against brute force on random images and grids (fixed seed), and the pixel statistics the
// planner's facts come from, on images small enough to count by hand.
//
// Reference: the cell average of a piecewise-constant function is the sum of its pieces weighted
// by the area each shares with the cell (the definition of the integral of a step function;
// common practice). The brute force below computes every cell × pixel rectangle intersection on
// its own (no separability, O(cells × pixels)); a second, independent check integrates by midpoint
// sampling of each cell, whose error is bounded by the pixel boundaries it can misplace.
import { describe, expect, it } from 'vitest';
import { imageCellAverages, imageHalfExtent, imageNearestOpen, imageStats, type ImagePlanes } from '../../src/optics/image-cells.js';
import type { Axis } from '../../src/optics/field.js';
import { apertureMask } from '../../src/elements/registry.js';
import { mulberry32 } from '../helpers.js';

type Rng = () => number;

function randomImage(rng: Rng, withPhase: boolean): ImagePlanes {
  const width = 3 + Math.floor(rng() * 10);
  const height = 3 + Math.floor(rng() * 10);
  const amplitude = new Float32Array(width * height);
  const phase = withPhase ? new Float32Array(width * height) : null;
  for (let n = 0; n < amplitude.length; n++) {
    const u = rng();
    amplitude[n] = u < 0.3 ? 0 : u < 0.5 ? 1 : rng();
    if (phase) phase[n] = 2 * Math.PI * rng();
  }
  return { width, height, amplitude, phase };
}

function randomAxis(rng: Rng, pitch: number): Axis {
  const n = 3 + Math.floor(rng() * 25);
  const step = pitch * (0.15 + 3 * rng());
  // Anywhere from well inside to partly outside the image.
  const start = -((n - 1) / 2) * step + (rng() - 0.5) * 6 * pitch;
  return { n, start, step };
}

/** t at a point (0 outside the image). */
function tAt(p: ImagePlanes, pitch: number, center: [number, number], x: number, y: number): [number, number] {
  const i = Math.floor((x - (center[0] - (p.width * pitch) / 2)) / pitch);
  const k = Math.floor((y - (center[1] - (p.height * pitch) / 2)) / pitch);
  if (i < 0 || k < 0 || i >= p.width || k >= p.height) return [0, 0];
  const a = p.amplitude[k * p.width + i]!;
  const ph = p.phase ? p.phase[k * p.width + i]! : 0;
  return [a * Math.cos(ph), a * Math.sin(ph)];
}

/** Every cell × pixel intersection on its own. */
function bruteForce(p: ImagePlanes, pitch: number, center: [number, number], xa: Axis, ya: Axis) {
  const t = new Float64Array(2 * xa.n * ya.n);
  const w = new Float64Array(xa.n * ya.n);
  const X0 = center[0] - (p.width * pitch) / 2;
  const Y0 = center[1] - (p.height * pitch) / 2;
  for (let r = 0; r < ya.n; r++) {
    for (let c = 0; c < xa.n; c++) {
      const cx0 = xa.start + (c - 0.5) * xa.step;
      const cy0 = ya.start + (r - 0.5) * ya.step;
      let sr = 0;
      let si = 0;
      let sp = 0;
      for (let k = 0; k < p.height; k++) {
        for (let i = 0; i < p.width; i++) {
          const ox = Math.min(cx0 + xa.step, X0 + (i + 1) * pitch) - Math.max(cx0, X0 + i * pitch);
          const oy = Math.min(cy0 + ya.step, Y0 + (k + 1) * pitch) - Math.max(cy0, Y0 + k * pitch);
          if (ox <= 0 || oy <= 0) continue;
          const area = (ox * oy) / (xa.step * ya.step);
          const a = p.amplitude[k * p.width + i]!;
          const ph = p.phase ? p.phase[k * p.width + i]! : 0;
          sr += area * a * Math.cos(ph);
          si += area * a * Math.sin(ph);
          sp += area * a * a;
        }
      }
      const j = r * xa.n + c;
      t[2 * j] = sr;
      t[2 * j + 1] = si;
      w[j] = sp;
    }
  }
  return { t, w };
}

describe('area-weighted resampling of an image onto grid cells', () => {
  it('equals the brute-force sum of every cell × pixel intersection on 200 random images and grids (seed 7)', () => {
    const rng = mulberry32(7);
    let worst = 0;
    for (let trial = 0; trial < 200; trial++) {
      const p = randomImage(rng, trial % 2 === 1);
      const pitch = 1e-6 * (0.5 + 2 * rng());
      const center: [number, number] = [(rng() - 0.5) * 4 * pitch, (rng() - 0.5) * 4 * pitch];
      const xa = randomAxis(rng, pitch);
      const ya = randomAxis(rng, pitch);
      const got = imageCellAverages(p, { pitch, center }, xa, ya);
      const ref = bruteForce(p, pitch, center, xa, ya);
      for (let j = 0; j < ref.t.length; j++) worst = Math.max(worst, Math.abs(got.t[j]! - ref.t[j]!));
      for (let j = 0; j < ref.w.length; j++) worst = Math.max(worst, Math.abs(got.weight[j]! - ref.w[j]!));
    }
    // Values are at most 1: only rounding separates the two sums.
    expect(worst).toBeLessThan(1e-12);
  });

  it('agrees with midpoint integration of each cell (S × S points) within the bound of its misplaced boundaries', () => {
    const rng = mulberry32(11);
    const S = 64;
    for (let trial = 0; trial < 8; trial++) {
      const p = randomImage(rng, true);
      const pitch = 1e-6;
      const center: [number, number] = [(rng() - 0.5) * pitch, (rng() - 0.5) * pitch];
      const xa = randomAxis(rng, pitch);
      const ya = randomAxis(rng, pitch);
      const got = imageCellAverages(p, { pitch, center }, xa, ya);
      // Each pixel boundary inside a cell moves a strip of at most step/S per axis to the wrong
      // pixel: an error of at most 2/S of the cell (|t| ≤ 1 on either side) per boundary.
      const crossings = (a: Axis) => Math.ceil(a.step / pitch) + 2;
      const bound = (2 * (crossings(xa) + crossings(ya))) / S;
      for (let r = 0; r < ya.n; r++) {
        for (let c = 0; c < xa.n; c++) {
          let sr = 0;
          let si = 0;
          for (let v = 0; v < S; v++) {
            for (let u = 0; u < S; u++) {
              const [re, im] = tAt(p, pitch, center, xa.start + (c - 0.5 + (u + 0.5) / S) * xa.step, ya.start + (r - 0.5 + (v + 0.5) / S) * ya.step);
              sr += re;
              si += im;
            }
          }
          const j = r * xa.n + c;
          expect(Math.abs(got.t[2 * j]! - sr / (S * S))).toBeLessThan(bound);
          expect(Math.abs(got.t[2 * j + 1]! - si / (S * S))).toBeLessThan(bound);
        }
      }
    }
  });

  it('a grid whose cells are the pixels returns the pixels themselves', () => {
    const rng = mulberry32(3);
    const p = randomImage(rng, false);
    const pitch = 2e-6;
    const xa: Axis = { n: p.width, start: (-(p.width - 1) / 2) * pitch, step: pitch };
    const ya: Axis = { n: p.height, start: (-(p.height - 1) / 2) * pitch, step: pitch };
    const got = imageCellAverages(p, { pitch, center: [0, 0] }, xa, ya);
    for (let j = 0; j < p.amplitude.length; j++) {
      expect(got.t[2 * j]).toBeCloseTo(p.amplitude[j]!, 12);
      expect(got.t[2 * j + 1]).toBe(0);
      expect(got.weight[j]).toBeCloseTo(p.amplitude[j]! ** 2, 12);
    }
  });
});

describe('an image of a rectangle', () => {
  it("gives the rectangle element's exact open fractions on 50 random grids (seed 5)", () => {
    const rng = mulberry32(5);
    let worst = 0;
    for (let trial = 0; trial < 50; trial++) {
      // A w × h block of open pixels centred in a W × H image (both even or both odd: centred).
      const w = 1 + Math.floor(rng() * 8);
      const h = 1 + Math.floor(rng() * 8);
      const W = w + 2 * Math.floor(rng() * 4);
      const H = h + 2 * Math.floor(rng() * 4);
      const amplitude = new Float32Array(W * H);
      for (let k = (H - h) / 2; k < (H + h) / 2; k++) for (let i = (W - w) / 2; i < (W + w) / 2; i++) amplitude[k * W + i] = 1;
      const pitch = 1e-6 * (0.5 + rng());
      const xa = randomAxis(rng, pitch);
      const ya = randomAxis(rng, pitch);
      const img = imageCellAverages({ width: W, height: H, amplitude, phase: null }, { pitch, center: [0, 0] }, xa, ya);
      const rect = apertureMask({ shape: 'rectangle', width: w * pitch, height: h * pitch, opaque: false }, xa, ya);
      for (let j = 0; j < rect.length; j++) worst = Math.max(worst, Math.abs(img.weight[j]! - rect[j]!), Math.abs(img.t[2 * j]! - rect[j]!));
    }
    expect(worst).toBeLessThan(1e-12);
  });
});

describe('orientation and placement', () => {
  it("the image's top row lies at the most negative y (row 0 of intensity.npy), its left column at the most negative x", () => {
    // 2 × 2 pixels of 1 µm, only the top-left one open; a 2 × 2 grid of the same cells.
    const p: ImagePlanes = { width: 2, height: 2, amplitude: Float32Array.from([1, 0, 0, 0]), phase: null };
    const axis: Axis = { n: 2, start: -0.5e-6, step: 1e-6 };
    expect(Array.from(imageCellAverages(p, { pitch: 1e-6, center: [0, 0] }, axis, axis).weight)).toEqual([1, 0, 0, 0]);
  });
  it('the centre key moves the image: shifted by one pixel to +x, the open pixel sits in the second column', () => {
    const p: ImagePlanes = { width: 2, height: 2, amplitude: Float32Array.from([1, 0, 0, 0]), phase: null };
    const axis: Axis = { n: 2, start: -0.5e-6, step: 1e-6 };
    const w = Array.from(imageCellAverages(p, { pitch: 1e-6, center: [1e-6, 0] }, axis, axis).weight);
    expect(w.map((v) => Math.round(v * 1e12) / 1e12)).toEqual([0, 1, 0, 0]);
  });
});

describe('pixel statistics for the planner (counted by hand)', () => {
  // 6 × 4 image, rows from the top:
  //   0 0 0 0 0 0
  //   0 1 1 1 0 0
  //   0 1 0 1 0 0
  //   0 0 0 0 0 0
  const bits = [0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 0, 0, 0, 1, 0, 1, 0, 0, 0, 0, 0, 0, 0, 0];
  const p: ImagePlanes = { width: 6, height: 4, amplitude: Float32Array.from(bits), phase: null };
  const s = imageStats(p);
  it('box, power and edges', () => {
    expect(s.box).toEqual({ i0: 1, i1: 3, k0: 1, k1: 2 });
    expect(s.power).toBe(5);
    // The outline of the 5 open pixels: row 1 has 3 on top, row 2's two legs 2 at the bottom;
    // the hole under the middle: 1; sides: rows 1 and 2 each 2 outer sides, the legs' inner sides 2.
    expect(s.edges).toBe(3 + 2 + 1 + 4 + 2);
  });
  it('the smallest run is the single pixel of the legs and of the hole between them', () => {
    expect(s.minRun).toBe(1);
    // Without the hole: a 3 × 2 block has runs of 3 (rows) and 2 (columns).
    const block = imageStats({ ...p, amplitude: Float32Array.from(bits.map((b, n) => (n === 14 ? 1 : b))) });
    expect(block.minRun).toBe(2);
  });
  it('zero runs that reach the frame are not features; an open image edge is', () => {
    const full = imageStats({ width: 3, height: 2, amplitude: new Float32Array(6).fill(0.5), phase: null });
    expect(full.minRun).toBe(2);
    expect(full.edges).toBeCloseTo(0.25 * (3 + 3 + 2 + 2), 12);
  });
  it('a π phase step counts |Δt|² = 4 times an open/closed edge', () => {
    const ph = Float32Array.from([0, Math.PI]);
    const st = imageStats({ width: 2, height: 1, amplitude: Float32Array.from([1, 1]), phase: ph });
    expect(st.edges).toBeCloseTo(6 + 4, 6);
    expect(st.minRun).toBe(1);
  });
  it('extent and the nearest open point follow the pitch and the centre', () => {
    const at = { pitch: 1e-6, center: [0, 0] as [number, number] };
    // Image spans x −3…3 µm, y −2…2 µm; open box columns 1–3 → x −2…1 µm, rows 1–2 → y −1…1 µm.
    const [hx, hy] = imageHalfExtent(p, s, at);
    expect(hx).toBeCloseTo(2e-6, 18);
    expect(hy).toBeCloseTo(1e-6, 18);
    // The axis (0, 0) is the corner shared by pixels (2,1) open and (2,2) closed: distance 0.
    expect(imageNearestOpen(p, s, at)).toBe(0);
    // Moved 5 µm to the right: the open pixels span x = 3…6 µm, the nearest at 3 µm (its row reaches y = 0).
    expect(imageNearestOpen(p, s, { pitch: 1e-6, center: [5e-6, 0] })).toBeCloseTo(3e-6, 15);
  });
});
