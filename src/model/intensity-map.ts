// The one result type: an intensity map is a grid (model/grid.ts, with its one 1-D convention) and
// |U|² on it, row-major, index row·nx + col; relative to the incident irradiance where the source
// was scaled so. Every consumer of results (metrics, encircled energy, orders, verdicts, searches,
// case files, pictures, the contact sheet) reads this type; a computed case extends it.
import { gridProblem, type Grid } from './grid.js';

export interface IntensityMap extends Grid {
  intensity: Float64Array;
}

/** The values of row `row` (a copy). */
export function profileRow(m: IntensityMap, row: number): Float64Array {
  return m.intensity.slice(row * m.nx, (row + 1) * m.nx);
}

/** The values of column `col` (a copy). */
export function profileCol(m: IntensityMap, col: number): Float64Array {
  const out = new Float64Array(m.ny);
  for (let r = 0; r < m.ny; r++) out[r] = m.intensity[r * m.nx + col]!;
  return out;
}

/** Why m is not a usable map (its grid, or a value count other than nx·ny), or null. */
export function mapProblem(m: IntensityMap): string | null {
  const g = gridProblem(m);
  if (g) return g;
  if (m.intensity.length !== m.nx * m.ny) return `${m.intensity.length} values for ${m.ny}×${m.nx} (rows × cols)`;
  return null;
}
