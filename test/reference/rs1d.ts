// Exact 1-D reference: the first Rayleigh–Sommerfeld solution for apertures invariant along y
// (test code only; it shares nothing with src/).
//
// What it computes: the complex field U(x, z) behind open intervals of the plane z = 0 lit by a
// plane wave or a Gaussian beam (unit incident irradiance), optionally tilted in x:
//
//   U(x) = ∫ U₀(ξ) · (ikz / (2r)) · H₁⁽¹⁾(kr) dξ,   r = √((x − ξ)² + z²),
//   U₀(ξ) = A(ξ) · e^{ik sinθ ξ},  A = 1 (plane) or exp(−ξ²/w²) (Gaussian, amplitude radius w).
//
// Source: the 2-D Green's function G = (i/4)H₀⁽¹⁾(kr) and the first Rayleigh–Sommerfeld formula
// U = −2∫U₀ ∂G/∂z dξ (Goodman, Introduction to Fourier Optics, §3.5; −∂H₀/∂z = k(z/r)H₁).
// H₁⁽¹⁾ = J₁ + iY₁ from @stdlib (besselj1, bessely1). The kernel's constant is checked against the
// Fresnel-integral limit in rs1d.test.ts.
//
// Obstacles: U = U_free − U_open. For a plane wave U_free = e^{ik(x sinθ + z cosθ)} exactly (the
// Rayleigh–Sommerfeld integral of a plane wave over the whole plane). For a Gaussian beam the
// obstacle's own transmission is integrated instead: the beam over [−L, L] less the open intervals,
// L = 6.5 w (the amplitude beyond is below e^{−42}).
//
// Method: each interval is cut at the foot of the observation point and into panels of 16-point
// Gauss–Legendre, each panel at most 8 rad of phase change of kr + k sinθ ξ (its derivative
// k((ξ − x)/r + sin θ) is monotonic, so the largest value on a panel is at an end), at most r/2 long (the kernel's amplitude scale; r ≥ z, so the peak of
// width z at the foot is resolved), and at most w/2 for a Gaussian.
// Where kr is large and nearly constant across a panel, the slowly varying factor H₁(x)e^{−ix} is
// interpolated between stdlib values at the panel's ends and middle (see `interpolable`).
// Accuracy: the quadrature to about 1e-12 of the field's peak (rs1d.test.ts: halving every panel and
// 24 nodes change the field by less than 1e-11 of the peak where kr ≲ 1e6). J₁ and Y₁ are good to
// about 1e-15 relative (stdlib; checked against their large-argument expansion), but they take kr
// rounded to double: a phase noise of about k·ulp(r) per node, 2e-8 of the peak at kr = 2.5e8
// (z = 20 m at 500 nm), up to a few 1e-7 at the largest kr of the schema (100 m at 250 nm).
import besselj1 from '@stdlib/math-base-special-besselj1';
import bessely1 from '@stdlib/math-base-special-bessely1';
import { gaussLegendre, walkPanels } from './quadrature.js';

export interface Light {
  kind: 'plane' | 'gaussian';
  /** Gaussian amplitude radius (exp(−ρ²/w²)); ignored for plane waves. */
  waist?: number;
  /** sin θ of the tilt in x. */
  sinTilt: number;
}

export interface Problem1D {
  wavelength: number;
  distance: number;
  /** Open intervals [a, b] of the aperture (disjoint, ascending). */
  intervals: [number, number][];
  light: Light;
  /** True: the intervals are opaque and the rest is open. */
  opaque: boolean;
}

export interface Complex {
  re: Float64Array;
  im: Float64Array;
}

const NODES = 16;
const PHASE_PER_PANEL = 8;
const AMPLITUDE_FRACTION = 0.5;
const GAUSS_REACH = 6.5;

/** The intervals of a centred grating of `count` slits (count 1: a single slit). */
export function gratingIntervals(count: number, width: number, period: number): [number, number][] {
  const out: [number, number][] = [];
  const first = -((count - 1) / 2) * period;
  for (let j = 0; j < count; j++) {
    const c = first + j * period;
    out.push([c - width / 2, c + width / 2]);
  }
  return out;
}

/** The complement of disjoint ascending intervals within [−L, L]. */
export function complementWithin(intervals: [number, number][], L: number): [number, number][] {
  const out: [number, number][] = [];
  let t = -L;
  for (const [a, b] of intervals) {
    if (a > t) out.push([t, Math.min(a, L)]);
    t = Math.max(t, b);
    if (t >= L) break;
  }
  if (t < L) out.push([t, L]);
  return out.filter(([a, b]) => b > a);
}

/** The intervals actually integrated (opaque Gaussian: the beam less the obstacle; others: the open ones). */
function integrationIntervals(p: Problem1D): [number, number][] {
  if (p.light.kind === 'gaussian') {
    const L = GAUSS_REACH * p.light.waist!;
    if (p.opaque) return complementWithin(p.intervals, L);
    return p.intervals.map(([a, b]): [number, number] => [Math.max(a, -L), Math.min(b, L)]).filter(([a, b]) => b > a);
  }
  return p.intervals;
}

function scaleFor(p: Problem1D, x: number): (t: number) => number {
  const k = (2 * Math.PI) / p.wavelength;
  const z = p.distance;
  const alpha = p.light.sinTilt;
  const w = p.light.kind === 'gaussian' ? p.light.waist! : Infinity;
  return (t: number) => {
    const u = t - x;
    const r = Math.sqrt(u * u + z * z);
    // d/dξ (kr + kαξ) = k((ξ − x)/r + α): monotonic in ξ, so its largest magnitude over a panel is
    // at an end, which is where walkPanels looks.
    const phase = PHASE_PER_PANEL / (k * Math.abs(u / r + alpha));
    return Math.min(phase, AMPLITUDE_FRACTION * r, 0.5 * w);
  };
}

/** The pieces of [a, b] cut at x (so that r is monotonic on each). */
function cutAt(a: number, b: number, x: number): [number, number][] {
  return x > a && x < b ? [[a, x], [x, b]] : [[a, b]];
}

/** Cost of one stdlib J₁ + Y₁ pair, and of a node on the interpolated path (µs, rough, one core). */
export const MICROS = { bessel: 1.6, interpolated: 0.06 } as const;

/**
 * The interpolated path: where kr ≥ 1000 on a panel and changes by at most 1e-3 of itself across
 * it, the slowly varying factor M(x) = H₁⁽¹⁾(x)e^{−ix} (x = kr) is evaluated with stdlib J₁, Y₁ at
 * the panel's two ends and middle and interpolated quadratically in x between them; each node then
 * costs a cosine and a sine. M varies by about (Δx/x) relative across the panel, so the
 * interpolation error is of order (Δx/x)³ ≲ 1e-9 (rs1d.test.ts: both paths agree to 1e-10).
 */
function interpolable(xLo: number, xHi: number): boolean {
  const lo = Math.min(xLo, xHi);
  return lo >= 1000 && Math.abs(xHi - xLo) <= 1e-3 * lo;
}

/** Estimated µs of the reference at these points (stops counting past `limit`). */
export function rs1dCost(p: Problem1D, xs: ArrayLike<number>, limit = Infinity): number {
  const ivs = integrationIntervals(p);
  const k = (2 * Math.PI) / p.wavelength;
  const z = p.distance;
  let micros = 0;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i]!;
    const scale = scaleFor(p, x);
    for (const [a0, b0] of ivs) {
      for (const [a, b] of cutAt(a0, b0, x)) {
        walkPanels(a, b, scale, (lo, hi) => {
          const xl = k * Math.hypot(lo - x, z);
          const xh = k * Math.hypot(hi - x, z);
          micros += interpolable(xl, xh) ? 3 * MICROS.bessel + NODES * MICROS.interpolated : NODES * MICROS.bessel;
        });
        if (micros > limit) return micros;
      }
    }
  }
  return micros;
}

/** M(x) = H₁⁽¹⁾(x)e^{−ix} from stdlib J₁, Y₁ (the same double x in both, so the phases agree). */
function slowFactor(x: number): [number, number] {
  const j = besselj1(x);
  const y = bessely1(x);
  const c = Math.cos(x);
  const s = Math.sin(x);
  // (J + iY)(cos x − i sin x)
  return [j * c + y * s, y * c - j * s];
}

/** U(x) at each x: the Rayleigh–Sommerfeld field of the problem (unit incident irradiance). */
export function rs1d(
  p: Problem1D,
  xs: ArrayLike<number>,
  opts: { nodes?: number; phasePerPanel?: number; direct?: boolean } = {},
): Complex {
  const k = (2 * Math.PI) / p.wavelength;
  const z = p.distance;
  const alpha = p.light.sinTilt;
  const gamma = Math.sqrt(1 - alpha * alpha);
  const w = p.light.kind === 'gaussian' ? p.light.waist! : Infinity;
  const rule = gaussLegendre(opts.nodes ?? NODES);
  const ivs = integrationIntervals(p);
  const re = new Float64Array(xs.length);
  const im = new Float64Array(xs.length);
  const phaseScale = (opts.phasePerPanel ?? PHASE_PER_PANEL) / PHASE_PER_PANEL;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i]!;
    const base = scaleFor(p, x);
    const scale = phaseScale === 1 ? base : (t: number) => base(t) * phaseScale;
    let sr = 0;
    let si = 0;
    const panel = (lo: number, hi: number) => {
      const half = (hi - lo) / 2;
      const mid = (hi + lo) / 2;
      const xl = k * Math.hypot(lo - x, z);
      const xh = k * Math.hypot(hi - x, z);
      const interp = !opts.direct && interpolable(xl, xh);
      let m0: [number, number] = [0, 0];
      let m1: [number, number] = [0, 0];
      let m2: [number, number] = [0, 0];
      const xm = (xl + xh) / 2;
      if (interp) {
        m0 = slowFactor(xl);
        m1 = slowFactor(xm);
        m2 = slowFactor(xh);
      }
      for (let j = 0; j < rule.x.length; j++) {
        const xi = mid + half * rule.x[j]!;
        const u = x - xi;
        const r = Math.sqrt(u * u + z * z);
        const kr = k * r;
        let hr: number;
        let hi_: number;
        if (interp && xh !== xl) {
          // Quadratic Lagrange interpolation of M in x through xl, xm, xh; then H = M e^{ix}.
          const l0 = ((kr - xm) * (kr - xh)) / ((xl - xm) * (xl - xh));
          const l1 = ((kr - xl) * (kr - xh)) / ((xm - xl) * (xm - xh));
          const l2 = ((kr - xl) * (kr - xm)) / ((xh - xl) * (xh - xm));
          const mr = l0 * m0[0] + l1 * m1[0] + l2 * m2[0];
          const mi = l0 * m0[1] + l1 * m1[1] + l2 * m2[1];
          const c = Math.cos(kr);
          const s = Math.sin(kr);
          hr = mr * c - mi * s;
          hi_ = mr * s + mi * c;
        } else if (interp) {
          const c = Math.cos(kr);
          const s = Math.sin(kr);
          hr = m1[0] * c - m1[1] * s;
          hi_ = m1[0] * s + m1[1] * c;
        } else {
          hr = besselj1(kr);
          hi_ = bessely1(kr);
        }
        // (ikz/2r)(J₁ + iY₁) = (kz/2r)(−Y₁ + iJ₁)
        const f = (k * z) / (2 * r);
        const kr_ = -f * hi_;
        const ki_ = f * hr;
        const amp = (w === Infinity ? 1 : Math.exp(-(xi * xi) / (w * w))) * rule.w[j]! * half;
        const ph = k * alpha * xi;
        const cr = amp * Math.cos(ph);
        const ci = amp * Math.sin(ph);
        sr += cr * kr_ - ci * ki_;
        si += cr * ki_ + ci * kr_;
      }
    };
    for (const [a0, b0] of ivs) for (const [a, b] of cutAt(a0, b0, x)) walkPanels(a, b, scale, panel);
    if (p.opaque && p.light.kind === 'plane') {
      const ph = k * (alpha * x + gamma * z);
      re[i] = Math.cos(ph) - sr;
      im[i] = Math.sin(ph) - si;
    } else {
      re[i] = sr;
      im[i] = si;
    }
  }
  return { re, im };
}

export function intensity(u: Complex): Float64Array {
  const out = new Float64Array(u.re.length);
  for (let i = 0; i < out.length; i++) out[i] = u.re[i]! ** 2 + u.im[i]! ** 2;
  return out;
}
