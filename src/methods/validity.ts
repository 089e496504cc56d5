// Where each method is valid, where the light lands: the far-field formula by the aperture's own
// quadratic phase, the paraxial forms by the phase the Fresnel kernel drops (plan/paraxial.ts), the
// exact integrals everywhere. Every form of a method shares its method's validity.
import { LIMITS } from '../plan/limits.js';
import { fmt, len, pct } from '../plan/words.js';
import type { Validity, ValidityInputs } from './types.js';
import type { LensParaxial } from '../plan/paraxial.js';

export function farFieldValidity(v: ValidityInputs): Validity {
  const ffOk = v.farFieldError <= LIMITS.farFieldPeakError;
  return {
    valid: ffOk,
    because: `the aperture's own quadratic phase π·N_F = ${fmt(v.farFieldPhase, 2)} rad that it neglects changes the peak by about ${pct(v.farFieldError)} (limit ${pct(LIMITS.farFieldPeakError)}); it is evaluated in direction cosines with the exact kernel, so wide angles are not paraxial`,
    ...(ffOk ? {} : { why: `the aperture's quadratic phase π·N_F = ${fmt(v.farFieldPhase, 2)} rad would change the peak by about ${pct(v.farFieldError)} (limit ${pct(LIMITS.farFieldPeakError)})` }),
  };
}

export function paraxialValidity(v: ValidityInputs): Validity {
  if (v.lens) return lensParaxialValidity(v.lens);
  const g = v.g;
  const paraxial = v.paraxial;
  const paraxialLimit = g.babinet ? LIMITS.paraxialPhaseBabinet : LIMITS.paraxialPhase;
  const parOk = v.paraxialError <= paraxialLimit;
  const where = `at (${len(paraxial.at[0])}${g.oneD ? '' : `, ${len(paraxial.at[1])}`}) it drops ${fmt(paraxial.phase, 2)} rad of phase across the aperture where the light is ${pct(paraxial.weight)} of the peak (weighted ${fmt(v.paraxialError, 2)} rad, limit ${paraxialLimit} rad${g.babinet ? ': behind an obstacle the diffracted light interferes with the free beam, so its error shows linearly' : ''})`;
  return {
    valid: parOk,
    because: `the paraxial approximation holds wherever the light lands (${where})`,
    ...(parOk ? {} : { why: `the paraxial approximation fails where light lands: ${where}` }),
  };
}

export function angularSpectrumValidity(): Validity {
  return { valid: true, because: 'it is exact for scalar waves' };
}

export function rayleighSommerfeldValidity(): Validity {
  return { valid: true, because: 'the Rayleigh–Sommerfeld integral is exact for scalar waves at any distance and angle' };
}

/** A thin lens: the paraxial lens and kernel together, judged by the cone's steepest ray (plan/paraxial.ts). */
function lensParaxialValidity(l: LensParaxial): Validity {
  const ok = l.positionError <= LIMITS.lensParaxialPosition;
  const cone = `NA = ${fmt(l.na, 3)} over the lit ${len(2 * l.radius)}, positions off by about NA²/2 = ${pct(l.positionError)} (limit ${pct(LIMITS.lensParaxialPosition)})`;
  return {
    valid: ok,
    because: `the thin lens's quadratic phase and the Fresnel kernel are paraxial to the same order, so together they give an ideal lens's field (Goodman §5.2): ${cone}; the quadratic phase is ${fmt(l.phase, 2)} rad from a spherical wave at the rim`,
    ...(ok ? {} : { why: `the cone behind the lens is too steep for the paraxial model: ${cone}` }),
  };
}
