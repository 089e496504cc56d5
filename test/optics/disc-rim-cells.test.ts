// The open-part mean of e^{iφ} over cells cut by a disc's rim (src/optics/disc-rim-cells.ts)
// against an independent integral in polar coordinates (test/reference/disc-cell.ts), then the
// pupil and lens cell averages built on it.
import { describe, expect, it } from 'vitest';
import { discCellAverage } from '../../src/optics/disc-rim-cells.js';
import { cellRuleFor, pupilCellAverages, zernikeSum } from '../../src/optics/zernike.js';
import { lensCellAverages } from '../../src/optics/thin-lens.js';
import { sampleMask2D } from '../../src/optics/mask.js';
import { centredAxis, axisAt } from '../../src/optics/field.js';
import { polarReference } from '../reference/disc-cell.js';
import { mulberry32 } from '../helpers.js';

/** Cells of pitch h whose centres lie within a cell of the rim of radius R, at random along it. */
function rimCells(seed: number, R: number, h: number, count: number): [number, number][] {
  const rnd = mulberry32(seed);
  const out: [number, number][] = [];
  while (out.length < count) {
    const t = 2 * Math.PI * rnd();
    const r = R + (rnd() - 0.5) * h;
    // On a lattice of pitch h (offset by a random fraction, as grids are not centred on the axis).
    const xc = Math.round((r * Math.cos(t)) / h) * h + 0.3 * h;
    const yc = Math.round((r * Math.sin(t)) / h) * h - 0.1 * h;
    const q = sampleMask2D({ shape: 'circle', diameter: 2 * R, opaque: false }, { n: 1, start: xc, step: h }, { n: 1, start: yc, step: h })[0]!;
    if (q > 0 && q < 1) out.push([xc, yc]);
  }
  return out;
}

describe('discCellAverage against the polar reference', () => {
  const h = 1;
  it('with no phase it is the exact open fraction of mask.ts, to 1e-12', () => {
    for (const R of [2.5, 8, 40]) {
      for (const [xc, yc] of rimCells(7, R, h, 30)) {
        const q = sampleMask2D({ shape: 'circle', diameter: 2 * R, opaque: false }, { n: 1, start: xc, step: h }, { n: 1, start: yc, step: h })[0]!;
        const [re, im] = discCellAverage(() => 0, R, xc, yc, h, h, { panels: 1, nodes: 2 });
        expect(Math.abs(re - q)).toBeLessThan(1e-12);
        expect(im).toBe(0);
      }
    }
  });

  it('a defocus of up to 3 rad across a cell and a cubic term: the open-part mean to 1e-10 of the cell', () => {
    for (const R of [4, 12, 60]) {
      for (const k of [0.05, 0.4, 1.2]) {
        // Phase gradient at the rim 2k + 0.9k rad per cell: up to 3.5 rad across a rim cell.
        const a = k / R;
        const phase = (x: number, y: number) => a * (x * x + y * y) + (0.3 * k * (x * x * x - 3 * x * y * y)) / (R * R);
        const slope = (2 * a * R + (0.9 * k) / 1) / (2 * Math.PI);
        const rule = cellRuleFor(Math.PI * slope * h);
        for (const [xc, yc] of rimCells(11 + R, R, h, 12)) {
          const [re, im] = discCellAverage(phase, R, xc, yc, h, h, rule);
          const [rr, ri] = polarReference(phase, R, xc, yc, h);
          expect(Math.hypot(re - rr, im - ri)).toBeLessThan(1e-10);
        }
      }
    }
  });
});

describe('rim cells of the pupil and the lens are averaged over their open part', () => {
  it('pupilCellAverages: a 3-wave defocus and 1 wave of coma on a 24-cell pupil, every rim cell to 1e-10', () => {
    const R = 12e-6;
    const terms = [
      { j: 4, rms: 3 },
      { j: 8, rms: 1 },
    ];
    const axis = centredAxis(30, 1e-6, 0.25e-6);
    const t = pupilCellAverages(terms, R, axis, axis);
    const w = zernikeSum(terms, R)!;
    const phase = (x: number, y: number) => 2 * Math.PI * w(x * 1e-6, y * 1e-6);
    const q = sampleMask2D({ shape: 'circle', diameter: 2 * R, opaque: false }, axis, axis);
    let rims = 0;
    for (let r = 0; r < axis.n; r++) {
      for (let c = 0; c < axis.n; c++) {
        const i = r * axis.n + c;
        if (!(q[i]! > 0 && q[i]! < 1)) continue;
        rims++;
        // The reference in units of the pitch (1 µm).
        const [rr, ri] = polarReference(phase, 12, axisAt(axis, c) * 1e6, axisAt(axis, r) * 1e6, 1);
        expect(Math.hypot(t[2 * i]! - rr, t[2 * i + 1]! - ri)).toBeLessThan(1e-10);
      }
    }
    expect(rims).toBeGreaterThan(40);
  });

  it('lensCellAverages with a stop: the lens phase over the open part of each rim cell, to 1e-10', () => {
    // λ = 1 µm, f = 1 mm, stop 60 µm across on 1 µm cells: the lens turns 0.19 rad per cell at the rim.
    const lam = 1e-6;
    const f = 1e-3;
    const axis = centredAxis(70, 1e-6, 0.4e-6);
    const t = lensCellAverages(f, lam, 60e-6, axis, axis);
    const q = sampleMask2D({ shape: 'circle', diameter: 60e-6, opaque: false }, axis, axis);
    const phase = (x: number, y: number) => (-Math.PI * (x * x + y * y) * 1e-12) / (lam * f);
    let rims = 0;
    for (let r = 0; r < axis.n; r += 1) {
      for (let c = 0; c < axis.n; c++) {
        const i = r * axis.n + c;
        if (!(q[i]! > 0 && q[i]! < 1) || (r + c) % 3 !== 0) continue;
        rims++;
        const [rr, ri] = polarReference(phase, 30, axisAt(axis, c) * 1e6, axisAt(axis, r) * 1e6, 1);
        expect(Math.hypot(t[2 * i]! - rr, t[2 * i + 1]! - ri)).toBeLessThan(1e-10);
      }
    }
    expect(rims).toBeGreaterThan(20);
  });
});
