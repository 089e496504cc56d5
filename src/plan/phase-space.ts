// Where the light goes through planes in sequence, per axis, as a convex region of phase space:
// the (position x, direction sin θ) pairs of its rays (paraxial ray optics; the ray transfer
// matrices of free space and of a thin lens are shears: x → x + zθ, θ → θ − x/f). Diffraction at a
// plane widens every ray's direction by ±δ (the region grows by a segment along θ); an element of
// finite size keeps the rays within it (the region is clipped). The region's extent in x at a plane
// is where the light is. Unlike widths added gap by gap, this keeps what imaging does: rays that
// leave a point converge again at its image, so the window there is the image's size and blur.

/** A convex polygon of (x, θ) vertices, in order; empty: no light. */
export type PhaseRegion = [number, number][];

export function rectangleRegion(x0: number, x1: number, t0: number, t1: number): PhaseRegion {
  return [
    [x0, t0],
    [x1, t0],
    [x1, t1],
    [x0, t1],
  ];
}

/** Free space over z: x → x + zθ. */
export function propagateRegion(r: PhaseRegion, z: number): PhaseRegion {
  return r.map(([x, t]) => [x + z * t, t]);
}

/** A thin lens of focal length f centred on the axis: θ → θ − x/f. */
export function lensRegion(r: PhaseRegion, focal: number): PhaseRegion {
  return r.map(([x, t]) => [x, t - x / focal]);
}

/** Every ray's direction widened by ±d (diffraction): the hull of the region moved by −d and +d along θ. */
export function spreadRegion(r: PhaseRegion, d: number): PhaseRegion {
  if (r.length === 0 || !(d > 0)) return r;
  return hull(r.flatMap(([x, t]) => [[x, t - d], [x, t + d]] as [number, number][]));
}

/** The rays within lo ≤ x ≤ hi. */
export function clipRegion(r: PhaseRegion, lo: number, hi: number): PhaseRegion {
  return clipHalf(clipHalf(r, (p) => p[0] - lo), (p) => hi - p[0]);
}

/** [smallest, largest] x of the region (null: empty). */
export function extentOf(r: PhaseRegion): [number, number] | null {
  if (r.length === 0) return null;
  let lo = Infinity;
  let hi = -Infinity;
  for (const [x] of r) {
    lo = Math.min(lo, x);
    hi = Math.max(hi, x);
  }
  return [lo, hi];
}

/** [smallest, largest] θ of the region. */
export function directionsOf(r: PhaseRegion): [number, number] | null {
  if (r.length === 0) return null;
  let lo = Infinity;
  let hi = -Infinity;
  for (const [, t] of r) {
    lo = Math.min(lo, t);
    hi = Math.max(hi, t);
  }
  return [lo, hi];
}

/** Sutherland–Hodgman against one half-plane (inside where side(p) ≥ 0). */
function clipHalf(r: PhaseRegion, side: (p: [number, number]) => number): PhaseRegion {
  const out: PhaseRegion = [];
  for (let i = 0; i < r.length; i++) {
    const a = r[i]!;
    const b = r[(i + 1) % r.length]!;
    const sa = side(a);
    const sb = side(b);
    if (sa >= 0) out.push(a);
    if ((sa >= 0) !== (sb >= 0)) {
      const u = sa / (sa - sb);
      out.push([a[0] + u * (b[0] - a[0]), a[1] + u * (b[1] - a[1])]);
    }
  }
  return out;
}

/** Convex hull (Andrew's monotone chain), counter-clockwise. */
function hull(points: [number, number][]): PhaseRegion {
  const p = [...points].sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  if (p.length <= 2) return p;
  const cross = (o: [number, number], a: [number, number], b: [number, number]) => (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
  const lower: PhaseRegion = [];
  for (const q of p) {
    while (lower.length >= 2 && cross(lower[lower.length - 2]!, lower[lower.length - 1]!, q) <= 0) lower.pop();
    lower.push(q);
  }
  const upper: PhaseRegion = [];
  for (let i = p.length - 1; i >= 0; i--) {
    const q = p[i]!;
    while (upper.length >= 2 && cross(upper[upper.length - 2]!, upper[upper.length - 1]!, q) <= 0) upper.pop();
    upper.push(q);
  }
  return lower.slice(0, -1).concat(upper.slice(0, -1));
}
