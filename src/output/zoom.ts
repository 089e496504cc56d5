// The zoomed view of a case picture: where the spot is small in its window (a far-field spot in a
// window sized for the tails, a focus in a wide field), a second picture of the region that holds
// the spot, cut from the map itself (the samples as computed, not resampled). The region is the
// box about the centroid holding ZOOM_FRACTION of the power in the window along each axis, padded
// by a quarter, or the one the job asks for.
import { isOneD } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';

/** The power fraction the automatic zoom holds, per axis. */
export const ZOOM_FRACTION = 0.99;
/** A zoom is drawn only where its box is at most this fraction of the window along every axis. */
export const ZOOM_WORTH = 0.4;
/** Fewest samples per axis a zoomed picture keeps (it shows samples, not a blur of two). */
const MIN_SAMPLES = 16;

export interface ZoomBox {
  /** Column and row ranges of the map, inclusive. */
  cols: [number, number];
  rows: [number, number];
}

/** The index range about index `c` holding `fraction` of the marginal's total, widened by a quarter each side. */
function holding(marginal: Float64Array, fraction: number): [number, number] {
  const n = marginal.length;
  let total = 0;
  let first = 0;
  for (let i = 0; i < n; i++) {
    total += marginal[i]!;
    first += i * marginal[i]!;
  }
  if (!(total > 0)) return [0, n - 1];
  const c = Math.min(n - 1, Math.max(0, Math.round(first / total)));
  // Grow symmetrically about the centroid until the fraction is held (one side stops at the edge).
  let lo = c;
  let hi = c;
  let held = marginal[c]!;
  while (held < fraction * total && (lo > 0 || hi < n - 1)) {
    if (lo > 0) held += marginal[--lo]!;
    if (hi < n - 1) held += marginal[++hi]!;
  }
  const pad = Math.ceil((hi - lo + 1) / 4);
  lo = Math.max(0, lo - pad);
  hi = Math.min(n - 1, hi + pad);
  // At least MIN_SAMPLES, about the middle.
  if (hi - lo + 1 < MIN_SAMPLES) {
    const mid = Math.round((lo + hi) / 2);
    lo = Math.max(0, Math.min(n - MIN_SAMPLES, mid - MIN_SAMPLES / 2));
    hi = Math.min(n - 1, lo + MIN_SAMPLES - 1);
  }
  return [lo, hi];
}

/**
 * The automatic zoom: the box holding ZOOM_FRACTION of the power per axis (padded), or null where
 * it would show nearly the whole window anyway (over ZOOM_WORTH of it along some axis).
 */
export function spotBox(m: IntensityMap): ZoomBox | null {
  const px = new Float64Array(m.nx);
  const py = new Float64Array(m.ny);
  for (let r = 0; r < m.ny; r++) {
    for (let c = 0; c < m.nx; c++) {
      const v = m.intensity[r * m.nx + c]!;
      px[c] += v;
      py[r] += v;
    }
  }
  const cols = holding(px, ZOOM_FRACTION);
  const rows = isOneD(m) ? ([0, 0] as [number, number]) : holding(py, ZOOM_FRACTION);
  const worth = (a: [number, number], n: number) => a[1] - a[0] + 1 <= ZOOM_WORTH * n;
  if (!worth(cols, m.nx) || (!isOneD(m) && !worth(rows, m.ny))) return null;
  return { cols, rows };
}

/** The box of a region given by its centre and width (m), clipped to the map; null if it misses it. */
export function regionBox(m: IntensityMap, centre: [number, number], width: number): ZoomBox | null {
  const range = (c: number, x0: number, d: number, n: number): [number, number] | null => {
    const lo = Math.max(0, Math.ceil((c - width / 2 - x0) / d - 1e-9));
    const hi = Math.min(n - 1, Math.floor((c + width / 2 - x0) / d + 1e-9));
    return hi >= lo ? [lo, hi] : null;
  };
  const cols = range(centre[0], m.x0, m.dx, m.nx);
  const rows = isOneD(m) ? ([0, 0] as [number, number]) : range(centre[1], m.y0, m.dy, m.ny);
  return cols && rows ? { cols, rows } : null;
}

/** The map's samples in the box, on the same grid (a copy). */
export function cropMap(m: IntensityMap, b: ZoomBox): IntensityMap {
  const nx = b.cols[1] - b.cols[0] + 1;
  const ny = b.rows[1] - b.rows[0] + 1;
  const out = new Float64Array(nx * ny);
  for (let r = 0; r < ny; r++) out.set(m.intensity.subarray((b.rows[0] + r) * m.nx + b.cols[0], (b.rows[0] + r) * m.nx + b.cols[0] + nx), r * nx);
  return {
    nx,
    ny,
    dx: m.dx,
    dy: m.dy,
    x0: m.x0 + b.cols[0] * m.dx,
    y0: isOneD(m) ? 0 : m.y0 + b.rows[0] * m.dy,
    intensity: out,
  };
}
