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
