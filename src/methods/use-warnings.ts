// Warnings for a method the job asks for where it is not valid: what is off, and what to use.
import { LIMITS } from '../plan/limits.js';
import { adviceFor } from '../plan/advice.js';
import { fmt, len, pct } from '../plan/words.js';
import type { Warning } from '../plan/types.js';
import type { UseCheckInputs } from './types.js';

/** Any Fresnel form where the paraxial approximation is off where the light lands. */
export function paraxialUseWarning({ checks, g, options }: UseCheckInputs): Warning | null {
  if (!(checks.paraxialPhaseError > (g.babinet ? LIMITS.paraxialPhaseBabinet : LIMITS.paraxialPhase))) return null;
  const at = checks.paraxialWorst!;
  return {
    code: 'paraxial',
    message: `the Fresnel (paraxial) approximation is off where light lands: at (${len(at.at[0])}${g.oneD ? '' : `, ${len(at.at[1])}`}) it drops ${fmt(at.phase, 2)} rad of phase across the aperture where the light is ${pct(at.weight)} of the peak (weighted ${fmt(checks.paraxialPhaseError, 2)} rad, limit ${g.babinet ? LIMITS.paraxialPhaseBabinet : LIMITS.paraxialPhase} rad; Goodman's sufficient condition ratio ${fmt(checks.goodmanRatio, 2)}): positions and intensities there are off; ${adviceFor(options, 'fresnel')}`,
  };
}

/** The far-field formula short of the far field. */
export function farFieldUseWarning({ checks, options }: UseCheckInputs): Warning | null {
  if (!(checks.farFieldPeakError > LIMITS.farFieldPeakErrorWarn)) return null;
  return {
    code: 'not-far-field',
    message: `the far-field formula neglects the aperture's quadratic phase π·N_F = ${fmt(checks.farFieldPhaseError, 2)} rad here (N_F = ${fmt(checks.effectiveFresnelNumber, 3)}; far field from ${len(checks.farFieldDistance)}), about ${pct(checks.farFieldPeakError)} at the peak: the pattern is not yet the far-field one; ${adviceFor(options, 'fraunhofer')}`,
  };
}
