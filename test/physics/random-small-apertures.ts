// Random apertures a few wavelengths wide at a few to a few hundred wavelengths (its own seed), for
// the property test random-small-apertures.test.ts: where light spreads over wide angles, the
// paraxial (Fresnel) forms are only as good as the planner's paraxial check (src/plan/paraxial.ts),
// and the exact Rayleigh–Sommerfeld references of test/reference/ (the 1-D integral by quadrature
// with @stdlib's J₁, Y₁; in 2-D the boundary form for plane waves at normal incidence) say how
// good. Slits, equal slits and opaque strips in 1-D, discs and squares in 2-D, plane or Gaussian
// light, sometimes tilted in x. Run and compared as random-cases.ts runs its cases, in process.
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import { mulberry32, type CaseSpec } from '../helpers.js';
import { runRandomCase, type DrawnCase, type Outcome } from './random-cases.js';

export const SMALL_SEED = 0x5a11a9;
export const SMALL_CASE_COUNT = 90;
/** The property's tolerance: an unwarned intensity more than this fraction of the peak off fails. */
export const SMALL_TOLERANCE = 0.02;

const logUniform = (rnd: () => number, lo: number, hi: number) => lo * Math.pow(hi / lo, rnd());

/**
 * Wavelengths 0.3–10 µm; openings 1.5–15 λ wide (a tenth of the 1-D cases up to 40 λ); distances
 * 3–400 λ (log-uniform, so the tens of λ where the paraxial forms start to be chosen are well
 * covered); a quarter of the cases in a Gaussian beam 1–5 openings wide, a third tilted up to 25°.
 */
export function drawSmallApertures(seed = SMALL_SEED, n = SMALL_CASE_COUNT): DrawnCase[] {
  const rnd = mulberry32(seed);
  const out: DrawnCase[] = [];
  for (let index = 0; index < n; index++) {
    const lam = logUniform(rnd, 0.3e-6, 10e-6);
    const oneD = rnd() < 0.7;
    const width = lam * (oneD && rnd() < 0.1 ? logUniform(rnd, 15, 40) : logUniform(rnd, 1.5, 15));
    const z = lam * logUniform(rnd, 3, 400);
    let aperture: Aperture;
    const u = rnd();
    if (oneD) {
      if (u < 0.5) aperture = { shape: 'slit', width, opaque: false } as Aperture;
      else if (u < 0.8) {
        const count = 2 + Math.floor(rnd() * 4);
        aperture = { shape: 'slits', count, width, period: width * logUniform(rnd, 1.3, 4), opaque: false } as Aperture;
      } else aperture = { shape: 'slit', width, opaque: true } as Aperture;
    } else if (u < 0.6) aperture = { shape: 'circle', diameter: width, opaque: false } as Aperture;
    else aperture = { shape: 'rectangle', width, height: width * logUniform(rnd, 0.5, 2), opaque: false } as Aperture;
    const gaussian = rnd() < 0.25;
    const tilt: [number, number] = [rnd() < 1 / 3 ? ((rnd() * 2 - 1) * 25 * Math.PI) / 180 : 0, 0];
    const illumination: Illumination = gaussian ? { kind: 'gaussian', waist: width * logUniform(rnd, 1, 5), tilt } : { kind: 'plane', tilt };
    const spec: CaseSpec = { wavelength: lam, distance: z, aperture, illumination };
    out.push({ index, spec });
  }
  return out;
}

export function runSmallAperture(d: DrawnCase): Outcome {
  return runRandomCase(d);
}

/** Off by more than the tolerance without a warning that the computed values may be off. */
export function isSmallFailure(o: Outcome, tolerance = SMALL_TOLERANCE): boolean {
  return o.status === 'compared' && !(o.error! <= tolerance) && !o.warned;
}

/** Paraxial forms among the compared cases (the ones the property is about). */
export function isParaxialForm(o: Outcome): boolean {
  return o.plan?.method === 'fresnel';
}
