// Is the spot diffraction-limited here? The computed spot is compared, with one size measure, with
// the aperture's geometric shadow and with the far-field pattern, and the answer is put in words.
import { formatLength, trimNumber } from '../job/units.js';
import { elementOf, type Aperture } from '../elements/registry.js';
import { energyCurve, radiusHolding, type EnergyCurve } from './encircled.js';
import { isOneD } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';

/** Si(x) = ∫₀ˣ sin t / t dt by its power series (Abramowitz & Stegun 5.2.14), fine for |x| < 10. */
export function sineIntegral(x: number): number {
  let term = x;
  let sum = x;
  for (let n = 1; n < 60; n++) {
    term *= (-x * x * (2 * n - 1)) / ((2 * n) * (2 * n + 1) * (2 * n + 1));
    sum += term;
    if (Math.abs(term) < 1e-17 * Math.abs(sum)) break;
  }
  return sum;
}

/** J₀ and J₁ by their power series (Abramowitz & Stegun 9.1.10), accurate for the small arguments used here. */
function besselJ(order: 0 | 1, x: number): number {
  const h = x / 2;
  let term = order === 0 ? 1 : h;
  let sum = term;
  for (let m = 1; m < 60; m++) {
    term *= (-h * h) / (m * (m + order));
    sum += term;
    if (Math.abs(term) < 1e-17) break;
  }
  return sum;
}

function bisect(f: (x: number) => number, lo: number, hi: number): number {
  for (let i = 0; i < 80; i++) {
    const mid = (lo + hi) / 2;
    if (f(lo) * f(mid) <= 0) hi = mid;
    else lo = mid;
  }
  return (lo + hi) / 2;
}

/**
 * The size measure: the radius (circle) or half-width (slit, per axis of a rectangle) holding half
 * of the power through the aperture. Half, because there the encircled-energy curve is steep: at
 * the first dark ring it is flat (the Airy pattern is dark there), and a radius read off a plateau
 * is ill-conditioned. The far-field values come from the closed forms: Airy, 1 − J₀²(v) − J₁²(v)
 * (Born & Wolf §8.5.2), and sinc², (2/π)[Si(2πu) − sin²(πu)/(πu)] (from ∫sin²x/x² dx =
 * Si(2x) − sin²x/x); the shadow's are D/(2√2) and w/4.
 */
export const AIRY_HALF_POWER_V = bisect((v) => 1 - besselJ(0, v) ** 2 - besselJ(1, v) ** 2 - 0.5, 0.5, 3);
export const SINC_HALF_POWER_U = bisect(
  (u) => (2 / Math.PI) * (sineIntegral(2 * Math.PI * u) - Math.sin(Math.PI * u) ** 2 / (Math.PI * u)) - 0.5,
  0.1,
  1,
);

export interface SpotSize {
  measure: 'radius-50%' | 'half-width-50%';
  computed: number | null;
  geometric: number;
  farField: number;
  /** The far-field pattern's first zero (1.22λz/D for a circle, λz/w for a slit), in angle exact. */
  farFieldFirstZero: number;
}

export type VerdictKind = 'far-field' | 'diffraction-dominated' | 'geometric';

export interface Verdict {
  axis: 'radial' | 'x' | 'y';
  size: SpotSize;
  fresnelNumber: number;
  /** far-field size / geometric size (> 1: diffraction dominates). */
  diffractionOverShadow: number;
  spotOverFarField: number | null;
  spotOverShadow: number | null;
  kind: VerdictKind;
  /** Distance beyond which the far-field size matches the computed one within 1 % (null: not found). */
  farFieldFrom?: number | null;
  sentence: string;
}

/** The aperture width the verdict measures along an axis: circle diameter, slit or rectangle side. */
export function verdictWidth(a: Aperture, axis: 'radial' | 'x' | 'y'): number | null {
  if (a.opaque) return null;
  return elementOf(a).verdictWidth?.(a, axis) ?? null;
}

/** Marginal 1-D distribution along x or y (sum over the other axis), as a 1-D map. */
export function marginal(map: IntensityMap, axis: 'x' | 'y'): IntensityMap {
  if (isOneD(map)) return map;
  const dy = map.dy;
  if (axis === 'x') {
    const out = new Float64Array(map.nx);
    for (let r = 0; r < map.ny; r++) for (let c = 0; c < map.nx; c++) out[c] += map.intensity[r * map.nx + c]! * dy;
    return { intensity: out, nx: map.nx, ny: 1, dx: map.dx, dy: 0, x0: map.x0, y0: 0 };
  }
  const out = new Float64Array(map.ny);
  for (let r = 0; r < map.ny; r++) for (let c = 0; c < map.nx; c++) out[r] += map.intensity[r * map.nx + c]! * map.dx;
  return { intensity: out, nx: map.ny, ny: 1, dx: dy, dy: 0, x0: map.y0, y0: 0 };
}

/**
 * The spot size along an axis, with its geometric and far-field counterparts. centre: the spot's
 * centre along x and y (the centroid). power: the power through the aperture (the 100 % mark).
 * curve: the map's radial energy curve about centre as fractions of power (energyCurve's default
 * bins), when the caller has it already: the radial verdict then reads it instead of computing it
 * again.
 */
export function spotSize(
  map: IntensityMap,
  axis: 'radial' | 'x' | 'y',
  width: number,
  wavelength: number,
  z: number,
  centre: [number, number],
  power: number,
  curve?: EnergyCurve | null,
): SpotSize {
  const onScreen = (sinTheta: number) => z * Math.tan(Math.asin(Math.min(1, sinTheta)));
  if (axis === 'radial') {
    const k = (2 * Math.PI) / wavelength;
    return {
      measure: 'radius-50%',
      computed: radiusHolding(curve ?? energyCurve(map, centre, power), 0.5),
      geometric: width / (2 * Math.SQRT2),
      farField: onScreen(AIRY_HALF_POWER_V / (k * (width / 2))),
      farFieldFirstZero: onScreen((1.21967 * wavelength) / width),
    };
  }
  const line = marginal(map, axis);
  const c = axis === 'x' ? centre[0] : centre[1];
  return {
    measure: 'half-width-50%',
    computed: radiusHolding(energyCurve(line, [c, 0], power), 0.5),
    geometric: width / 4,
    farField: onScreen((SINC_HALF_POWER_U * wavelength) / width),
    farFieldFirstZero: onScreen(wavelength / width),
  };
}

const len = (x: number) => formatLength(x, 3);
const times = (x: number) => `${trimNumber(x, 3)}×`;

export function makeVerdict(axis: Verdict['axis'], size: SpotSize, fresnelNumber: number, farFieldFrom?: number | null): Verdict {
  const ratio = size.farField / size.geometric;
  const spotOverFarField = size.computed === null ? null : size.computed / size.farField;
  const spotOverShadow = size.computed === null ? null : size.computed / size.geometric;
  const kind: VerdictKind =
    spotOverFarField !== null && Math.abs(spotOverFarField - 1) <= 0.01 ? 'far-field' : ratio > 1 ? 'diffraction-dominated' : 'geometric';
  const what = `${size.measure === 'radius-50%' ? 'radius' : 'half-width'}${axis === 'radial' ? '' : ` along ${axis}`} holding half the power`;
  const zero = size.measure === 'radius-50%' ? '1.22λz/D' : 'λz/w';
  const nf = `N_F = ${trimNumber(fresnelNumber, 3)}; far-field first zero ${zero} at ${len(size.farFieldFirstZero)}`;
  const comp = size.computed === null ? null : len(size.computed);
  let head: string;
  if (comp === null) {
    head = `No verdict: the ${what} could not be measured in this window (${nf})`;
  } else if (kind === 'far-field') {
    head =
      `Diffraction-limited (far field): the ${what} is ${comp}, within ${trimNumber(100 * Math.abs(spotOverFarField! - 1), 2)} % ` +
      `of the far-field value ${len(size.farField)} and ${times(spotOverShadow!)} the geometric shadow's ${len(size.geometric)} (${nf})`;
  } else if (kind === 'diffraction-dominated') {
    head =
      `Diffraction-dominated, not yet far field: the ${what} is ${comp}, ${times(spotOverFarField!)} the far-field value ` +
      `${len(size.farField)}; diffraction alone would spread it to ${times(ratio)} the geometric shadow's ${len(size.geometric)} (${nf})`;
  } else {
    head =
      `Geometric (near field): the ${what} is ${comp}, ${times(spotOverShadow!)} the geometric shadow's ${len(size.geometric)}; ` +
      `the far-field value ${len(size.farField)} would be only ${times(ratio)} the shadow, so diffraction shows as fringes at the edges (${nf})`;
  }
  const tail =
    farFieldFrom === undefined
      ? ''
      : farFieldFrom === null
        ? ' The far-field size did not come within 1 % of the computed one at the distances searched (up to 64 × 2D²/λ).'
        : ` The far-field size agrees with the computed one within 1 % from z = ${len(farFieldFrom)} on.`;
  return {
    axis,
    size,
    fresnelNumber,
    diffractionOverShadow: ratio,
    spotOverFarField,
    spotOverShadow,
    kind,
    ...(farFieldFrom !== undefined ? { farFieldFrom } : {}),
    sentence: `${head}.${tail}`,
  };
}
