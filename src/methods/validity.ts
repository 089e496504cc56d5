// Where each method is valid, where the light lands: the far-field formula by the aperture's own
// quadratic phase, the paraxial forms by the phase the Fresnel kernel drops (plan/paraxial.ts), the
// exact integrals everywhere. Every form of a method shares its method's validity.
import { LIMITS } from '../plan/limits.js';
import { fmt, len, pct } from '../plan/words.js';
import type { Validity, ValidityInputs } from './types.js';
import type { LensParaxial } from '../plan/paraxial.js';

export function farFieldValidity(v: ValidityInputs): Validity {
  const wavefront = lensWavefrontCross(v);
  const own = lensOwnCross(v);
  const cross = Math.max(wavefront, own);
  const error = Math.max(v.farFieldError, cross);
  const ffOk = error <= LIMITS.farFieldPeakError;
  const withWavefront = cross > v.farFieldError ? `, with the lens's ${wavefront >= own ? 'wavefront error' : 'own quadratic phase'}, whose phase it meets linearly (2·π·N_F·its phase range over the lit pupil)` : '';
  return {
    valid: ffOk,
    because: `the aperture's own quadratic phase π·N_F = ${fmt(v.farFieldPhase, 2)} rad that it neglects changes the peak by about ${pct(error)}${withWavefront} (limit ${pct(LIMITS.farFieldPeakError)}); it is evaluated in direction cosines with the exact kernel, so wide angles are not paraxial`,
    ...(ffOk ? {} : { why: `the aperture's quadratic phase π·N_F = ${fmt(v.farFieldPhase, 2)} rad would change the peak by about ${pct(error)}${withWavefront} (limit ${pct(LIMITS.farFieldPeakError)})` }),
  };
}

/**
 * The far-field formula leaves out the quadratic phase π·r²/(λz) (π·N_F at the lit rim). Against a
 * pupil whose own phase is flat or quadratic that changes the peak by its square (the planner's
 * estimate); against a wavefront error W it enters linearly: |⟨e^{i2πW}(1 + iφ)⟩|² moves by about
 * 2φ·(the range of 2πW), the cross term (found by the random lenses: 0.07 wave RMS of Z22 in a
 * Gaussian beam, π·N_F = 0.023 rad, put the peak 2 % off). The range is bounded by the pupil's
 * steepest local frequency beyond the lens's own (Geometry.phaseFrequency less r/(λ|f|)) across
 * the lit diameter, at most 2π: a loose bound, which only hands such lenses to the Fresnel forms.
 */
/**
 * The lens's own quadratic phase meets the neglected one in the same way: the pattern of a pupil
 * with defocus Ψ = πa²/(λ|f|) over the lit scale a moves linearly with added defocus (its size
 * goes as 1/f + 1/z), so the cross term is bounded as above by 2·π·N_F·min(Ψ, 2π), with
 * Ψ = π·N_F·z/|f| on the same scale as N_F (found by the random lenses: diverging lenses 15–30 |f|
 * behind under the far-field formula were 2.6 % and 6.1 % off at a peak estimate below the 0.2 %
 * limit).
 */
function lensOwnCross(v: ValidityInputs): number {
  if (!v.lens) return 0;
  const own = (v.farFieldPhase * v.g.z) / Math.abs(v.lens.focal);
  return 2 * v.farFieldPhase * Math.min(2 * Math.PI, own);
}

function lensWavefrontCross(v: ValidityInputs): number {
  if (!v.lens || !(v.g.phaseFrequency! > 0)) return 0;
  const reach = Math.max(v.g.aEff[0], v.g.aEff[1]);
  const own = reach / (v.g.lam * Math.abs(v.lens.focal));
  const wavefront = v.g.phaseFrequency! - own;
  if (!(wavefront > 1e-9 * own)) return 0;
  return 2 * v.farFieldPhase * Math.min(2 * Math.PI, 2 * Math.PI * wavefront * 2 * v.lens.radius);
}

export function paraxialValidity(v: ValidityInputs): Validity {
  if (v.lens) return lensParaxialValidity(v.lens);
  const g = v.g;
  const paraxial = v.paraxial;
  const paraxialLimit = g.babinet ? LIMITS.paraxialPhaseBabinet : LIMITS.paraxialWeightedPhase;
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
