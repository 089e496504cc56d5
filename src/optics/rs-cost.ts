// Work estimates of the direct Rayleigh–Sommerfeld sums, in the planner's unit: src/plan/planner.ts
// counts floating-point operations roughly, a direct Fourier sum (dft.ts) being 8 per input ×
// output pair (a complex multiply-add).
//
// A Rayleigh–Sommerfeld pair is a square root or two, divisions, about 60 multiplications and
// additions, and four sines or cosines (the kernel's e^{ikr} and the cell integral's sin v, cos v),
// which cost most. Counted in the planner's unit by time: on the development machine (Node 20,
// one core) rsDirect1D took 94–101 ns per cell × output pair and rsDirect2D 103–118 ns, where
// dft1 took 5.5–5.9 ns for its 8 units; so a 1-D pair is about 140 units and a 2-D pair 160.
// (Measured by hand with 2000 × 2000 pairs in 1-D and 3600 × 1600 in 2-D, best of 5 runs.)

/** Work of one cell × output pair of rsDirect1D. */
export const RS1D_PAIR_WORK = 140;
/** Work of one cell × output pair of rsDirect2D. */
export const RS2D_PAIR_WORK = 160;

/** rsDirect1D over `cells` cells onto `outputs` points. */
export function costRsDirect1D(cells: number, outputs: number): number {
  return RS1D_PAIR_WORK * cells * outputs + 20 * outputs;
}

/**
 * rsPerPeriod1D: one period's cells on the lattice of (count − 1)·p + (outputs − 1)·s + 1 points,
 * the strided recurrence over the lattice (a complex multiply-add per point) and the final
 * difference per output. Its memory is one complex lattice array, 16 bytes a point.
 */
export function costRsPerPeriod1D(cellsPerPeriod: number, count: number, outputs: number, p: number, s: number): number {
  const lattice = (count - 1) * p + (outputs - 1) * s + 1;
  return RS1D_PAIR_WORK * cellsPerPeriod * lattice + 8 * lattice + 8 * outputs;
}

/**
 * rsDirect2D over `cells` non-zero source cells onto `outputs` points. An upper bound: a source
 * even about the axis, untilted, on a symmetric window costs a half (one axis) or a quarter (both).
 */
export function costRsDirect2D(cells: number, outputs: number): number {
  return RS2D_PAIR_WORK * cells * outputs + 20 * outputs;
}

// The exact 2-D sums over cells with exact edges (rs-2d-sum.ts), measured by hand against dft1 on
// the development machine (Node 20, one core of two, other work running: CPU time, best of 5, in
// the same process; dft1 took 5.4–5.7 ns for its 8 units): a box × point pair 95–107 ns under a
// plane wave (140 units; the old rsDirect2D measured 156–170 ns beside it), 180–245 ns under a
// Gaussian envelope (270: the complex sinc), an edge cell with m nodes per axis 101, 156, 227, 331,
// 435, 552, 831 ns for m = 2, 4, 6, 8, 10, 12, 16 (fitted by 100 + 20m + 3m² units within 6 %);
// the radial path's interpolation 120–180 ns per output point (200 units). 4865 boxes and 320
// edge cells (a 40λ disc at λ/2) onto 60 × 60 points; the interpolation onto 400 × 400.

/** Work of one box × point pair of rsSum2D under a plane wave. */
export const RS2D_BOX_PAIR_WORK = 140;
/** Work of one box × point pair of rsSum2D under a Gaussian envelope. */
export const RS2D_GAUSSIAN_BOX_PAIR_WORK = 270;
/** Work of one output point of the radial path's interpolation. */
export const RS2D_RADIAL_POINT_WORK = 200;

/** Work of one edge-cell × point pair with m nodes per axis. */
export function rs2DEdgePairWork(m: number): number {
  return 100 + 20 * m + 3 * m * m;
}

/**
 * rsSum2D: `points` points each summed over `box` boxes and `edge` edge cells (in `rows` rows,
 * each of which first prepares every cell's Δy), `interpolated` points of the radial path's
 * interpolation, and 20 a point of the window for the field itself.
 */
export function costRsSum2D(s: { box: number; edge: number; edgeNodes: number; gaussian: boolean; points: number; rows: number; interpolated: number; outputs: number }): number {
  const boxWork = s.gaussian ? RS2D_GAUSSIAN_BOX_PAIR_WORK : RS2D_BOX_PAIR_WORK;
  return s.points * (s.box * boxWork + s.edge * rs2DEdgePairWork(s.edgeNodes)) + 4 * s.rows * (s.box + s.edge) + RS2D_RADIAL_POINT_WORK * s.interpolated + 20 * s.outputs;
}

/**
 * Bytes rsSum2D and its cells hold: a box is 8 numbers and 2 of work space, an edge cell 5 numbers,
 * its m² weights and 2 of work space, the field 16 bytes a point, the radial samples 16 bytes each.
 */
export function memoryRsSum2D(s: { box: number; edge: number; edgeNodes: number; outputs: number; radial: number }): number {
  return 8 * (10 * s.box + (7 + s.edgeNodes * s.edgeNodes) * s.edge) + 16 * s.outputs + 16 * s.radial;
}
