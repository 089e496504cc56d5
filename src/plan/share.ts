// Work shared between the cases of a run: a sweep in distance over one aperture propagates the
// same padded source many times, so its spectrum F{U₀} is computed once and kept, and each
// further distance costs one transfer multiply and one inverse transform.
import { createHash } from 'node:crypto';
import type { Plan } from './types.js';
import { descriptorOf } from '../methods/registry.js';

/**
 * What fixes a padded source on an FFT grid: the aperture, the light and the grid. Two plans with
 * the same key start from the same spectrum, whatever their distances, windows and methods
 * (the forms whose descriptor says sharesSourceSpectrum: the angular spectrum on its axis-centred
 * grid, Fresnel's transfer function). Null for plans that do not use one.
 */
export function sourceSpectrumKey(p: Plan): string | null {
  if (p.error || p.spectrum || p.layout !== 'two-d' || !p.y || !descriptorOf(p).sharesSourceSpectrum) return null;
  const c = p.case;
  const axis = (a: Plan['x']) => [a.inputPitch, a.inputSamples, a.paddedSamples];
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
