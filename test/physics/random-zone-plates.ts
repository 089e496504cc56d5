// Random Fresnel zone plates for the property test random-zone-plates.test.ts (its own seed):
// amplitude and binary phase plates of a few to 40 zones, used at or off their design wavelength,
// lit by a plane wave or a Gaussian beam at normal incidence, at distances around and between
// their foci. Only the axis has an exact reference for them (test/reference/rs2d.ts: the first
// Rayleigh–Sommerfeld integral of centred discs with signs, on the axis, in closed form for a plane
// wave and by quadrature under a Gaussian), so each case is compared there.
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import { mulberry32 } from '../helpers.js';
import type { CaseSpec } from '../helpers.js';

export const ZONE_PLATE_SEED = 0x20e2026;
export const ZONE_PLATE_CASE_COUNT = 16;

const logUniform = (rnd: () => number, lo: number, hi: number) => lo * Math.pow(hi / lo, rnd());

export interface DrawnZonePlate {
  index: number;
  spec: CaseSpec & { aperture: Extract<Aperture, { shape: 'zone-plate' }>; window: [number, number] };
}

export function drawZonePlates(seed = ZONE_PLATE_SEED, n = ZONE_PLATE_CASE_COUNT): DrawnZonePlate[] {
  const rnd = mulberry32(seed);
  const out: DrawnZonePlate[] = [];
  for (let index = 0; index < n; index++) {
    const lam = logUniform(rnd, 350e-9, 2e-6);
    const design = rnd() < 0.5 ? lam : lam * logUniform(rnd, 0.8, 1.25);
    const kind: 'amplitude' | 'phase' = rnd() < 0.5 ? 'amplitude' : 'phase';
    const gaussian = rnd() < 0.3;
    // The sampled methods (the phase plate, any plate in a Gaussian beam) cost as the zones squared.
    const zones = 1 + Math.floor(rnd() * (kind === 'phase' || gaussian ? 8 : 40));
    const focal = logUniform(rnd, 1e-3, 0.3);
    const aperture = { shape: 'zone-plate' as const, focal, zones, design, kind, opaque: false as const };
    // Outer radius, and the first focus at this wavelength (f·λ_d/λ, paraxially).
    const R = Math.sqrt(zones * design * focal + (zones * design * 0.5) ** 2);
    const f1 = (focal * design) / lam;
    const z = f1 * logUniform(rnd, 0.15, 3);
    const illumination: Illumination = gaussian ? { kind: 'gaussian', waist: R * logUniform(rnd, 0.4, 3), tilt: [0, 0] } : { kind: 'plane', tilt: [0, 0] };
    // A window of a few focal spots: the axis is all that is compared.
    const spot = Math.max((lam * z) / R, lam);
    out.push({ index, spec: { wavelength: lam, distance: z, aperture, illumination, window: [8 * spot, 8 * spot] } });
  }
  return out;
}
