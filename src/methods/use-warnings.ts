// Warnings for a method the job asks for where it is not valid: what is off, and what to use.
import { LIMITS } from '../plan/limits.js';
import { advisable } from '../plan/advice.js';
import { warning } from '../warnings/catalogue.js';
import type { Warning } from '../plan/types.js';
import type { UseCheckInputs } from './types.js';

/** Any Fresnel form where the paraxial approximation is off where the light lands. */
export function paraxialUseWarning({ checks, g, options }: UseCheckInputs): Warning | null {
  if (!(checks.paraxialPhaseError > (g.babinet ? LIMITS.paraxialPhaseBabinet : LIMITS.paraxialWeightedPhase))) return null;
  const at = checks.paraxialWorst!;
  return warning('paraxial', { at: [at.at[0], g.oneD ? null : at.at[1]], phase: at.phase, weight: at.weight, weighted: checks.paraxialPhaseError, limit: g.babinet ? LIMITS.paraxialPhaseBabinet : LIMITS.paraxialWeightedPhase, goodmanRatio: checks.goodmanRatio, instead: advisable(options, 'fresnel')?.method ?? null });
}

/** The far-field formula short of the far field. */
export function farFieldUseWarning({ checks, options }: UseCheckInputs): Warning | null {
  if (!(checks.farFieldPeakError > LIMITS.farFieldPeakErrorWarn)) return null;
  return warning('not-far-field', { phase: checks.farFieldPhaseError, fresnelNumber: checks.effectiveFresnelNumber, farFieldDistance: checks.farFieldDistance, peakError: checks.farFieldPeakError, instead: advisable(options, 'fraunhofer')?.method ?? null });
}
