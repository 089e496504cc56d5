// Placing elements off the axis and combining them: the masks of parts sampled only over the
// cells their extent covers (an array of 10 000 pinholes costs what its open cells cost, not
// 10 000 full grids), and the facts of a combination from its parts'.
import { axisAt, type Axis } from '../optics/field.js';
import type { ApertureFacts } from '../optics/geometry.js';

/** A part's mask: its open fraction on the given axes (centred on the part's own origin). */
export type PartMask = (xa: Axis, ya: Axis) => Float64Array;

/**
 * Visits the part placed at `at` (its extent ±half about it) on the grid: calls `use` with the
 * part's mask over the sub-grid of cells the extent touches, the sub-grid's first column and row,
 * and its size. Nothing is visited when the part lies outside the grid.
 */
export function forPlacedPart(
  mask: PartMask,
  half: [number, number],
  at: [number, number],
  xa: Axis,
  ya: Axis,
  use: (m: Float64Array, c0: number, r0: number, nx: number, ny: number) => void,
): void {
  const span = (a: Axis, lo: number, hi: number): [number, number] => {
    // Cells whose extent [x − step/2, x + step/2] meets [lo, hi].
    const i0 = Math.max(0, Math.floor((lo - a.start) / a.step - 0.5));
    const i1 = Math.min(a.n - 1, Math.ceil((hi - a.start) / a.step + 0.5));
    return [i0, i1];
  };
  const [c0, c1] = span(xa, at[0] - half[0], at[0] + half[0]);
  const [r0, r1] = span(ya, at[1] - half[1], at[1] + half[1]);
  if (c1 < c0 || r1 < r0) return;
  const nx = c1 - c0 + 1;
  const ny = r1 - r0 + 1;
  const sub = (a: Axis, i0: number, n: number, shift: number): Axis => ({ n, start: axisAt(a, i0) - shift, step: a.step });
  use(mask(sub(xa, c0, nx, at[0]), sub(ya, r0, ny, at[1])), c0, r0, nx, ny);
}

/** Half extents about the axis of a part placed at `at`. */
export function placedHalfExtent(f: ApertureFacts, at: [number, number]): [number, number] {
  return [Math.abs(at[0]) + f.halfExtent[0], Math.abs(at[1]) + f.halfExtent[1]];
}
