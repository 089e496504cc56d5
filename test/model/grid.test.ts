// The one grid description and the one intensity map (src/model/): positions, the 1-D convention
// (ny = 1, dy = 0; common practice of this project, stated in src/model/grid.ts) and the checks
// the picture writer and the contact sheet rely on.
import { describe, expect, it } from 'vitest';
import { cellMeasure, gridOf, gridProblem, isOneD, pitchPair, xAt, yAt, type Grid } from '../../src/model/grid.js';
import { mapProblem, profileCol, profileRow, type IntensityMap } from '../../src/model/intensity-map.js';
import { centredAxis, createField, intensityMapOf } from '../../src/optics/field.js';

const twoD: Grid = { nx: 4, ny: 3, dx: 1e-6, dy: 2e-6, x0: -1.5e-6, y0: -2e-6 };
const oneD: Grid = { nx: 5, ny: 1, dx: 0.5e-6, dy: 0, x0: -1e-6, y0: 0 };

describe('Grid', () => {
  it('places sample (row, col) at (x0 + col·dx, y0 + row·dy)', () => {
    expect(xAt(twoD, 3)).toBeCloseTo(1.5e-6, 18);
    expect(yAt(twoD, 2)).toBeCloseTo(2e-6, 18);
    expect(xAt(twoD, 1.5)).toBeCloseTo(0, 18);
  });

  it('has one 1-D form: one row with dy = 0, at y = 0, cell measure dx, written [dx, null]', () => {
    expect(isOneD(oneD)).toBe(true);
    expect(isOneD(twoD)).toBe(false);
    // One row of a 2-D grid (dy > 0) is not 1-D: it is a strip of height dy.
    expect(isOneD({ ...twoD, ny: 1 })).toBe(false);
    expect(yAt({ ...oneD, y0: 7 }, 0)).toBe(0);
    expect(cellMeasure(oneD)).toBe(0.5e-6);
    expect(cellMeasure(twoD)).toBe(1e-6 * 2e-6);
    expect(pitchPair(oneD)).toEqual([0.5e-6, null]);
    expect(pitchPair(twoD)).toEqual([1e-6, 2e-6]);
  });

  it('copies the grid fields alone', () => {
    const m: IntensityMap = { ...twoD, intensity: new Float64Array(12) };
    expect(gridOf(m)).toEqual(twoD);
    expect('intensity' in gridOf(m)).toBe(false);
  });

  it('says what is wrong with a grid', () => {
    expect(gridProblem(twoD)).toBeNull();
    expect(gridProblem(oneD)).toBeNull();
    expect(gridProblem({ ...twoD, nx: 0 })).toMatch(/positive integers/);
    expect(gridProblem({ ...twoD, ny: 2.5 })).toMatch(/positive integers/);
    expect(gridProblem({ ...twoD, dx: -1 })).toMatch(/pitch/);
    expect(gridProblem({ ...twoD, dy: 0 })).toMatch(/pitch/);
    expect(gridProblem({ ...twoD, dy: Number.NaN })).toMatch(/pitch/);
    expect(gridProblem({ ...twoD, y0: Infinity })).toMatch(/origin/);
  });
});

describe('IntensityMap', () => {
  it('reads rows and columns row-major', () => {
    const m: IntensityMap = { ...twoD, intensity: Float64Array.from({ length: 12 }, (_, i) => i) };
    expect(Array.from(profileRow(m, 1))).toEqual([4, 5, 6, 7]);
    expect(Array.from(profileCol(m, 2))).toEqual([2, 6, 10]);
    expect(mapProblem(m)).toBeNull();
    expect(mapProblem({ ...m, ny: 2 })).toMatch(/12 values for 2×4/);
  });

  it('is a field’s grid unchanged with |U|² on it, in 1-D and 2-D', () => {
    const f2 = createField(centredAxis(4, 1e-6), centredAxis(3, 2e-6), 5e-7);
    f2.data[2 * 5] = 3;
    f2.data[2 * 5 + 1] = -4;
    const m2 = intensityMapOf(f2);
    expect(gridOf(m2)).toEqual(gridOf(f2));
    expect(m2.intensity[5]).toBe(25);
    const f1 = createField(centredAxis(5, 0.5e-6), null, 5e-7);
    const m1 = intensityMapOf(f1);
    expect(isOneD(f1)).toBe(true);
    expect(isOneD(m1)).toBe(true);
    expect(gridOf(m1)).toEqual({ nx: 5, ny: 1, dx: 0.5e-6, dy: 0, x0: -1e-6, y0: 0 });
  });
});
