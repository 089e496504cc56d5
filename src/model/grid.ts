// The one description of a regular sample grid, shared by complex fields (optics/field.ts) and
// intensity maps (model/intensity-map.ts). Samples are row-major, index [row][col] = [y][x];
// sample (row, col) sits at (x0 + col·dx, y0 + row·dy).
//
// One convention for 1-D results (invariant along y: a slit, a grating of infinitely long lines):
// ny = 1 and dy = 0, and y0 = 0. It is the field's convention, kept for maps too so that a map is
// its field's grid unchanged; the files keep their own form (result.json writes a 1-D pitch as
// [dx, null]: pitchPair).

export interface Grid {
  nx: number;
  ny: number;
  dx: number;
  dy: number;
  x0: number;
  y0: number;
}

export function isOneD(g: Grid): boolean {
  return g.ny === 1 && g.dy === 0;
}

/** x (m) of column col (fractional allowed). */
export function xAt(g: Grid, col: number): number {
  return g.x0 + col * g.dx;
}

/** y (m) of row row (fractional allowed); 0 for a 1-D grid, whose one row stands for every y. */
export function yAt(g: Grid, row: number): number {
  return isOneD(g) ? 0 : g.y0 + row * g.dy;
}

/** Area (2-D) or length (1-D) of one sample cell. */
export function cellMeasure(g: Grid): number {
  return isOneD(g) ? g.dx : g.dx * g.dy;
}

/** [dx, dy], dy null for a 1-D grid: the form result.json's pixelPitch has always had. */
export function pitchPair(g: Grid): [number, number | null] {
  return [g.dx, isOneD(g) ? null : g.dy];
}

/** The grid fields alone (a copy), without whatever else the object carries. */
export function gridOf(g: Grid): Grid {
  return { nx: g.nx, ny: g.ny, dx: g.dx, dy: g.dy, x0: g.x0, y0: g.y0 };
}

/**
 * Why g is not a usable grid (sizes positive integers, pitches finite and > 0 except a 1-D grid's
 * dy, origin finite), or null when it is. Callers put their own name in front.
 */
export function gridProblem(g: Grid): string | null {
  const posInt = (v: number): boolean => Number.isInteger(v) && v > 0;
  if (!posInt(g.nx) || !posInt(g.ny)) return `rows and cols must be positive integers, got ${g.ny}×${g.nx}`;
  const okPitch = (v: number): boolean => Number.isFinite(v) && v > 0;
  if (!okPitch(g.dx) || (!isOneD(g) && !okPitch(g.dy))) return 'pitches must be finite and > 0 (dy = 0 only for a 1-D grid of one row)';
  if (!Number.isFinite(g.x0) || !Number.isFinite(g.y0)) return 'origin must be finite';
  return null;
}
