// Coaxial circular openings in sequence, in the Fresnel (paraxial) approximation, for the random
// property test of planes in sequence (test/physics/random-sequences.ts). Test code only; shares no
// code with src/.
//
// What it computes: a plane wave (amplitude 1) or a centred Gaussian beam e^{−ρ²/w²} (waist at the
// first plane, amplitude 1 on the axis) lights the first plane; each plane is a circular opening of
// radius a, optionally a thin lens of focal length f filling it (transmission e^{−iπρ²/(λf)},
// Goodman, Introduction to Fourier Optics, §5.1). Between planes, and from the last plane to the
// screen, the Fresnel integral with circular symmetry (Goodman §4.2, the Hankel form):
//   U₂(r) = (2π/(iλz))·e^{iπr²/(λz)}·∫₀^a U₁(ρ)·e^{iπρ²/(λz)}·J₀(2πrρ/(λz))·ρ dρ.
// The field after each plane is kept on Gauss–Legendre nodes over [0, a] (16-point panels, each at
// most one period of the integrand's fastest phase, bounded below), the next plane's field computed
// at its own nodes from them: nested sums, N_k·N_{k+1} evaluations of J₀ per gap.
//
// Accuracy: the panel bound counts the quadratic phases with their signs (the incoming field's
// chirp 1/z_prev, the lens's −1/f, the gap's 1/z: ρ·|Σ|/λ cycles per metre), J₀'s r/(λz) and the
// incoming field's J₀ term a_prev/(λz_prev) (the field arriving from an opening of radius a_prev
// is that chirp times a sum of J₀(2πρρ'/(λz_prev)), ρ' ≤ a_prev, which varies no faster), so each
// 16-point panel integrates at most about
// 2π rad of phase: about 1e-12 relative (quadrature.ts: 8 rad over 16 points to 1e-15). Checked in
// coaxial-fresnel.test.ts against closed forms. It is the Fresnel approximation: where the light
// travels at angles whose phase error k·z·θ⁴/8 is not small, it is no reference for an exact result.
import besselj0 from '@stdlib/math-base-special-besselj0';
import { countPanels, gaussLegendre, walkPanels } from './quadrature.js';

const GL = gaussLegendre(16);

export interface CoaxialPlane {
  /** Radius of the opening (m); a lens's stop radius. */
  radius: number;
  /** Focal length of a thin lens filling the opening (m), or undefined for a plain opening. */
  focal?: number;
}

export interface CoaxialSystem {
  lam: number;
  /** Gaussian 1/e amplitude radius at the first plane, or Infinity for a plane wave. */
  w: number;
  /** Plane 0 is the one lit. */
  planes: CoaxialPlane[];
  /** gaps[k]: from plane k to plane k+1; the last one from the last plane to the screen. */
  gaps: number[];
  /** Panels per period of the fastest phase (default 1): more, to check the reference converged. */
  oversample?: number;
}

interface Sampled {
  rho: Float64Array;
  /** GL weight × ρ (the Hankel measure). */
  wt: Float64Array;
  re: Float64Array;
  im: Float64Array;
}

/** Radius the integration at plane k really needs: a Gaussian beyond 8 waists is below e^{−64}. */
function reach(s: CoaxialSystem, k: number): number {
  const a = s.planes[k]!.radius;
  return k === 0 ? Math.min(a, 8 * s.w) : a;
}

/** Fastest phase (cycles per metre) of the integrand at ρ over plane k, toward radii up to rMax. */
function cyclesPerMetre(s: CoaxialSystem, k: number, rMax: number): (rho: number) => number {
  const { lam } = s;
  const z = s.gaps[k]!;
  const f = s.planes[k]!.focal;
  const prev = k > 0 ? { a: reach(s, k - 1), z: s.gaps[k - 1]! } : null;
  // The quadratic phases add with their signs (the incoming field's own chirp, the lens, the gap's
  // chirp): light focused by a lens onto the next plane barely oscillates there.
  const chirp = Math.abs((prev ? 1 / prev.z : 0) - (f !== undefined ? 1 / f : 0) + 1 / z) / lam;
  const bounded = (prev ? prev.a / (lam * prev.z) : 0) + rMax / (lam * z);
  return (rho) => rho * chirp + bounded;
}

function panelScale(s: CoaxialSystem, k: number, rMax: number): (rho: number) => number {
  const nu = cyclesPerMetre(s, k, rMax);
  const R = reach(s, k);
  // At most one period per panel, at most a sixteenth of the radius, and a Gaussian's half waist.
  const cap = Math.min(R / 16, k === 0 && Number.isFinite(s.w) ? s.w / 2 : Infinity);
  const o = s.oversample ?? 1;
  return (rho) => Math.min(cap, 1 / nu(rho)) / o;
}

/** Nodes over plane k (values unset). */
function nodes(s: CoaxialSystem, k: number, rMax: number): Sampled {
  const R = reach(s, k);
  const rho: number[] = [];
  const wt: number[] = [];
  walkPanels(0, R, panelScale(s, k, rMax), (lo, hi) => {
    const h = 0.5 * (hi - lo);
    const mid = 0.5 * (hi + lo);
    for (let i = 0; i < GL.x.length; i++) {
      const r = mid + h * GL.x[i]!;
      rho.push(r);
      wt.push(h * GL.w[i]! * r);
    }
  });
  const n = rho.length;
  return { rho: Float64Array.from(rho), wt: Float64Array.from(wt), re: new Float64Array(n), im: new Float64Array(n) };
}

/** Multiplies a plane's field by its lens (if any). */
function applyLens(s: CoaxialSystem, k: number, u: Sampled): void {
  const f = s.planes[k]!.focal;
  if (f === undefined) return;
  for (let j = 0; j < u.rho.length; j++) {
    const p = (-Math.PI * u.rho[j]! * u.rho[j]!) / (s.lam * f);
    const c = Math.cos(p);
    const sn = Math.sin(p);
    const re = u.re[j]! * c - u.im[j]! * sn;
    u.im[j] = u.re[j]! * sn + u.im[j]! * c;
    u.re[j] = re;
  }
}

/** The Fresnel integral from field u (after plane k) over gap z to radius r: [re, im]. */
function propagateTo(u: Sampled, lam: number, z: number, r: number): [number, number] {
  let re = 0;
  let im = 0;
  const b = (2 * Math.PI * r) / (lam * z);
  const c = Math.PI / (lam * z);
  for (let j = 0; j < u.rho.length; j++) {
    const rho = u.rho[j]!;
    const p = c * rho * rho;
    const amp = u.wt[j]! * (r === 0 ? 1 : besselj0(b * rho));
    const cs = Math.cos(p);
    const sn = Math.sin(p);
    re += amp * (u.re[j]! * cs - u.im[j]! * sn);
    im += amp * (u.re[j]! * sn + u.im[j]! * cs);
  }
  // × (2π/(iλz))·e^{iπr²/(λz)} = (2π/(λz))·e^{i(πr²/(λz) − π/2)}.
  const s = (2 * Math.PI) / (lam * z);
  const ph = c * r * r - Math.PI / 2;
  const cs = Math.cos(ph);
  const sn = Math.sin(ph);
  return [s * (re * cs - im * sn), s * (re * sn + im * cs)];
}

/** How many J₀ evaluations fieldAtScreen would spend for screen radii up to rMax. */
export function coaxialCost(s: CoaxialSystem, rMax: number, screenPoints: number): number {
  let cost = 0;
  const n = s.planes.length;
  let prevNodes = 0;
  for (let k = 0; k < n; k++) {
    const target = k + 1 < n ? s.planes[k + 1]!.radius : rMax;
    const nodesK = GL.x.length * countPanels(0, reach(s, k), panelScale(s, k, target), 1e7);
    if (k > 0) cost += prevNodes * nodesK;
    prevNodes = nodesK;
  }
  return cost + prevNodes * screenPoints;
}

/** Power ∫|U|² 2πρ dρ over a plane's nodes. */
function power(u: Sampled): number {
  let p = 0;
  for (let j = 0; j < u.rho.length; j++) p += 2 * Math.PI * u.wt[j]! * (u.re[j]! ** 2 + u.im[j]! ** 2);
  return p;
}

/** The complex field at the screen at each radius in `radii` (amplitude 1 on the lit axis). */
export function fieldAtScreen(s: CoaxialSystem, radii: readonly number[]): [number, number][] {
  return carry(s, radii).screen;
}

/**
 * The power each plane passes (∫|U|² over its opening; the first plane's is the illumination's
 * inside it): passed[k]/passed[k−1] is plane k's transmission of the light that reaches it.
 */
export function passedPowers(s: CoaxialSystem): number[] {
  return carry(s, []).passed;
}

function carry(s: CoaxialSystem, radii: readonly number[]): { screen: [number, number][]; passed: number[] } {
  const n = s.planes.length;
  if (s.gaps.length !== n) throw new Error('one gap per plane: the last is to the screen');
  const rMax = Math.max(0, ...radii);
  let u = nodes(s, 0, n > 1 ? s.planes[1]!.radius : rMax);
  for (let j = 0; j < u.rho.length; j++) u.re[j] = Number.isFinite(s.w) ? Math.exp(-((u.rho[j]! / s.w) ** 2)) : 1;
  applyLens(s, 0, u);
  const passed = [power(u)];
  for (let k = 1; k < n; k++) {
    const next = nodes(s, k, k + 1 < n ? s.planes[k + 1]!.radius : rMax);
    for (let j = 0; j < next.rho.length; j++) {
      const [re, im] = propagateTo(u, s.lam, s.gaps[k - 1]!, next.rho[j]!);
      next.re[j] = re;
      next.im[j] = im;
    }
    applyLens(s, k, next);
    passed.push(power(next));
    u = next;
  }
  return { screen: radii.map((r) => propagateTo(u, s.lam, s.gaps[n - 1]!, r)), passed };
}

/** |U|² at the screen at each radius. */
export function intensityAtScreen(s: CoaxialSystem, radii: readonly number[]): number[] {
  return fieldAtScreen(s, radii).map(([re, im]) => re * re + im * im);
}
