// The exact 2-D Fourier transform of a polygon's indicator function (test code only; it shares
// nothing with src/):
//
//   F(fx, fy) = ∬_P exp(−i2π(fx·x + fy·y)) dx dy.
//
// The edge sum. With q = 2π(fx, fy) and g = e^{−iq·r}, the field w = i·q·g/|q|² has divergence g,
// so by the divergence theorem (Green's theorem in the plane) F = ∮ w·n ds. Along an edge from a
// to b (e = b − a, counter-clockwise outline) n ds = (e_y, −e_x) dt, t ∈ [0, 1], and
// ∫₀¹ e^{−iq·(a + te)} dt = e^{−iq·m}·sinc(q·e/2), m = (a + b)/2, sinc u = sin u / u. Hence
//
//   F = (i/|q|²) Σ_edges (q_x e_y − q_y e_x) · sinc(q·e/2) · e^{−iq·m}       (q ≠ 0),
//
// a clockwise outline flipping the sign. This is the edge-sum (Green's theorem) form published by
// S.-W. Lee and R. Mittra, IEEE Trans. Antennas Propag. 31(1), 99–103 (1983), and, written with
// edge midpoints and half edges as here, by J. Wuttke, J. Appl. Cryst. 54, 580–587 (2021) (both
// from memory: the code relies only on the derivation above). We follow the midpoint-and-sinc
// form. Its limits:
//
// - Edge parallel or perpendicular to q: nothing is singular. q ∥ e makes the edge's weight
//   q × e zero; q ⊥ e makes sinc(0) = 1, and sinc is evaluated by its Taylor series for |u| < 1e-3
//   (1 − u²/6 + u⁴/120, error below u⁶/5040 < 2e-22). (Vertex forms that divide by q·e per edge are
//   singular there; this one is not.)
// - Small |q|: the edge terms are of size |e|/|q| while F ≈ area, so rounding grows like
//   ε/(|q|·R) (R the largest distance of a vertex from the origin of the sum). The sum is taken about
//   the vertex mean c (F = e^{−iq·c}·F_c) and, for |q|·R < 1, replaced by the exact power series
//       F_c = Σ_k (−i)^k/k! ∫ (q·r)^k dA,
//   the moments by the fan of triangles (c, v_j, v_{j+1}): over a triangle with a vertex at the
//   origin, ∫ (q·r)^k dA = 2T·k!/(k+2)!·h_k(α, β), T the signed area, α = q·v_j, β = q·v_{j+1},
//   h_k the complete homogeneous polynomial Σ_{i=0}^k α^i β^{k−i} (the integral of a power of a
//   linear form over a simplex: Hermite–Genocchi, k-th derivative form; checked here against the
//   edge sum at the switch). With |q|R < 1, |h_k| ≤ k + 1, so 26 terms leave less than 1e-24 of the
//   area. The two branches agree to about 1e-15 of the area at the switch
//   (polygon-transform.test.ts).

export type Point = readonly [number, number];

export interface Complex {
  re: number;
  im: number;
}

function sinc(u: number): number {
  if (Math.abs(u) < 1e-3) {
    const u2 = u * u;
    return 1 - (u2 / 6) * (1 - u2 / 20);
  }
  return Math.sin(u) / u;
}

interface Centred {
  u: Float64Array; // x about the vertex mean
  w: Float64Array; // y about the vertex mean
  cx: number;
  cy: number;
  sense: number; // +1 counter-clockwise, −1 clockwise
  radius: number;
}

function centre(v: readonly Point[]): Centred {
  const n = v.length;
  let cx = 0;
  let cy = 0;
  for (const [x, y] of v) {
    cx += x;
    cy += y;
  }
  cx /= n;
  cy /= n;
  const u = new Float64Array(n);
  const w = new Float64Array(n);
  let radius = 0;
  let a2 = 0;
  for (let j = 0; j < n; j++) {
    u[j] = v[j]![0] - cx;
    w[j] = v[j]![1] - cy;
    radius = Math.max(radius, Math.hypot(u[j]!, w[j]!));
  }
  for (let j = 0; j < n; j++) {
    const k = (j + 1) % n;
    a2 += u[j]! * w[k]! - u[k]! * w[j]!;
  }
  return { u, w, cx, cy, sense: a2 >= 0 ? 1 : -1, radius };
}

/** The edge sum about the vertex mean, without the phase of the mean (q ≠ 0). */
function edgeSum(p: Centred, qx: number, qy: number): Complex {
  const n = p.u.length;
  const q2 = qx * qx + qy * qy;
  let re = 0;
  let im = 0;
  for (let j = 0; j < n; j++) {
    const k = (j + 1) % n;
    const ex = p.u[k]! - p.u[j]!;
    const ey = p.w[k]! - p.w[j]!;
    const mx = (p.u[k]! + p.u[j]!) / 2;
    const my = (p.w[k]! + p.w[j]!) / 2;
    const a = (qx * ey - qy * ex) * sinc((qx * ex + qy * ey) / 2);
    const phi = qx * mx + qy * my;
    // i·a·e^{−iφ} = a·sin φ + i·a·cos φ
    re += a * Math.sin(phi);
    im += a * Math.cos(phi);
  }
  const s = p.sense / q2;
  return { re: re * s, im: im * s };
}

/** The moment series about the vertex mean, without the phase of the mean. */
function momentSeries(p: Centred, qx: number, qy: number, terms = 26): Complex {
  const n = p.u.length;
  const T2 = new Float64Array(n); // twice the signed fan-triangle areas
  const al = new Float64Array(n);
  const be = new Float64Array(n);
  const h = new Float64Array(n).fill(1); // h_k(α, β), k = 0
  const bk = new Float64Array(n).fill(1); // β^k
  for (let j = 0; j < n; j++) {
    const k = (j + 1) % n;
    T2[j] = p.u[j]! * p.w[k]! - p.u[k]! * p.w[j]!;
    al[j] = qx * p.u[j]! + qy * p.w[j]!;
    be[j] = qx * p.u[k]! + qy * p.w[k]!;
  }
  let re = 0;
  let im = 0;
  let fact = 2; // (k + 2)!
  for (let k = 0; k < terms; k++) {
    if (k > 0) {
      for (let j = 0; j < n; j++) {
        bk[j]! *= be[j]!;
        h[j] = al[j]! * h[j]! + bk[j]!;
      }
      fact *= k + 2;
    }
    let S = 0;
    for (let j = 0; j < n; j++) S += T2[j]! * h[j]!;
    const t = S / fact;
    // (−i)^k: 1, −i, −1, i
    switch (k % 4) {
      case 0: re += t; break;
      case 1: im -= t; break;
      case 2: re -= t; break;
      default: im += t;
    }
  }
  // Σ T2 = 2·(signed area); the sense makes the k = 0 term the area.
  return { re: re * p.sense, im: im * p.sense };
}

function withPhase(f: Complex, p: Centred, qx: number, qy: number): Complex {
  const phi = qx * p.cx + qy * p.cy;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  // f·e^{−iφ}
  return { re: f.re * c + f.im * s, im: f.im * c - f.re * s };
}

/** F(fx, fy) of a simple polygon given in either orientation. */
export function polygonTransform(v: readonly Point[], fx: number, fy: number): Complex {
  const p = centre(v);
  const qx = 2 * Math.PI * fx;
  const qy = 2 * Math.PI * fy;
  const qR = Math.hypot(qx, qy) * p.radius;
  const f = qR < 1 ? momentSeries(p, qx, qy) : edgeSum(p, qx, qy);
  return withPhase(f, p, qx, qy);
}

/** The two branches by name, for the test that holds them equal where they meet. */
export function polygonTransformBranches(v: readonly Point[], fx: number, fy: number): { series: Complex; edges: Complex } {
  const p = centre(v);
  const qx = 2 * Math.PI * fx;
  const qy = 2 * Math.PI * fy;
  return { series: withPhase(momentSeries(p, qx, qy, 40), p, qx, qy), edges: withPhase(edgeSum(p, qx, qy), p, qx, qy) };
}

/** Area by the shoelace formula (common practice), for F(0). */
export function shoelaceArea(v: readonly Point[]): number {
  let s = 0;
  for (let j = 0; j < v.length; j++) {
    const [ax, ay] = v[j]!;
    const [bx, by] = v[(j + 1) % v.length]!;
    s += ax * by - bx * ay;
  }
  return Math.abs(s) / 2;
}
