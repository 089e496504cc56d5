// Work shared between the cases of a run: a sweep in distance over one aperture propagates the
// same padded source many times, so its spectrum F{U₀} is computed once and kept, and each
// further distance costs one transfer multiply and one inverse transform. The same holds across the
// wavelengths of a spectrum (plan/spectrum.ts) whose lines share one FFT lattice, when the source
// does not depend on the wavelength: only the transfer function does.
import { createHash } from 'node:crypto';
import type { Plan } from './types.js';
import { descriptorOf } from '../methods/registry.js';
import { isBinary } from '../elements/registry.js';

/**
 * Whether the padded source is the same array at every wavelength (optics/source.ts
 * sourceField2D): a binary aperture (its mask is its transmittance; no phase that scales with
 * 1/λ), under light with no tilt (the carrier e^{i2π(αx+βy)/λ} is then 1 and is not applied) and an
 * envelope that is 1 or a Gaussian of a given waist (neither depends on λ), and no curved light
 * stood in for by a flat-light case (its equivalent case is planned apart).
 */
export function sourceIgnoresWavelength(p: Plan): boolean {
  const c = p.case;
  const ill = c.illumination;
  return isBinary(c.aperture) && ill.tilt[0] === 0 && ill.tilt[1] === 0 && (ill.kind === 'plane' || ill.kind === 'gaussian') && !c.source && !p.flatLight;
}

/**
 * What fixes a padded source on an FFT grid: the aperture, the light and the grid, and the
 * wavelength unless the source ignores it (sourceIgnoresWavelength; then whether the plan computes
 * the complement, which decides whether the obstacle or its complement is sampled). Two plans with
 * the same key start from the same spectrum, whatever their distances, windows and methods
 * (the forms whose descriptor says sharesSourceSpectrum: the angular spectrum on its axis-centred
 * grid, Fresnel's transfer function), and whatever their wavelengths when it is left out (each
 * plan's transfer function is made at its own wavelength). Null for plans that do not use one.
 */
export function sourceSpectrumKey(p: Plan): string | null {
  if (p.error || p.spectrum || p.layout !== 'two-d' || !p.y || !descriptorOf(p).sharesSourceSpectrum) return null;
  const c = p.case;
  const axis = (a: Plan['x']) => [a.inputPitch, a.inputSamples, a.paddedSamples];
  if (sourceIgnoresWavelength(p)) return JSON.stringify([c.aperture, c.illumination, 'any wavelength', p.babinet, axis(p.x), axis(p.y)]);
  return JSON.stringify([c.aperture, c.illumination, c.wavelength, axis(p.x), axis(p.y)]);
}

/**
 * Marks the plans whose padded source another plan of the same list shares, and adds the kept
 * spectrum (one padded complex array) to their memory estimate. Returns how many transforms the
 * sharing saves at best (when each key's cases run in one thread, one after another).
 */
export function shareSourceSpectra(plans: Plan[]): number {
  const groups = new Map<string, Plan[]>();
  for (const p of plans) {
    const k = sourceSpectrumKey(p);
    if (k === null) continue;
    const g = groups.get(k);
    if (g) g.push(p);
    else groups.set(k, [p]);
  }
  let saved = 0;
  for (const [k, g] of groups) {
    if (g.length < 2) continue;
    saved += g.length - 1;
    const id = createHash('sha256').update(k).digest('hex').slice(0, 16);
    for (const p of g) {
      if (!p.sharedSpectrum) p.memoryBytes += 16 * p.x.paddedSamples * p.y!.paddedSamples;
      p.sharedSpectrum = { id, cases: g.length };
    }
  }
  return saved;
}
