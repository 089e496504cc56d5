// The intensity on the optical axis against distance, densely: a sweep computes a handful of
// distances, but the axial intensity of an aperture oscillates (a circle's between 0 and 4 times
// the incident, with zeros at N_F = 2, 4, …) far faster than a log sweep samples it. On the axis
// the exact first Rayleigh–Sommerfeld integral is cheap: one boundary integral per distance for
// apertures of discs and rectangles lit by a plane wave at normal incidence (optics/rs-boundary.ts),
// one sum over cells per distance for the 1-D ones, so hundreds of distances cost less than a case.
// Other light (tilted, Gaussian) and other elements give null: the report then shows the cases alone.
import { isOneDAperture, separableProfiles, type Aperture, type Illumination } from '../optics/aperture.js';
import { boundaryRegionsOf, rsBoundary } from '../optics/rs-boundary.js';
import { cellsFromIntervals, rsDirect1D, rsMaxCell } from '../optics/rayleigh-sommerfeld.js';
import { profileIntervals } from '../methods/exact-intervals.js';

/** Intensities relative to the incident irradiance at each distance, or null where no exact form is at hand. */
export interface OnAxisCurve {
  z: Float64Array;
  intensity: Float64Array;
  /** How they were computed, in words. */
  how: string;
}

const AXIS = { n: 1, start: 0, step: 1 };

/** Distances from lo to hi, log-spaced, n of them. */
export function logDistances(lo: number, hi: number, n: number): Float64Array {
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) z[i] = n === 1 ? lo : lo * Math.pow(hi / lo, i / (n - 1));
  return z;
}

/** The exact axial intensity at the distances, where the aperture and light allow it cheaply. */
export function onAxisCurve(aperture: Aperture, light: Illumination, wavelength: number, distances: Float64Array): OnAxisCurve | null {
  if (light.kind !== 'plane' || light.tilt[0] !== 0 || light.tilt[1] !== 0) return null;
  const intensity = new Float64Array(distances.length);
  if (isOneDAperture(aperture)) {
    const prof = separableProfiles(aperture)?.x;
    if (!prof || prof.kind === 'periodic') return null;
    const open = profileIntervals(prof);
    for (let i = 0; i < distances.length; i++) {
      const z = distances[i]!;
      const cells = cellsFromIntervals(open, { sinTilt: 0 }, wavelength, rsMaxCell(wavelength, z));
      const u = rsDirect1D(cells, wavelength, z, AXIS);
      let re = u[0]!;
      let im = u[1]!;
      // An obstacle: the free wave e^{ikz} less the openings' field (Babinet).
      if (aperture.opaque) {
        const k = (2 * Math.PI) / wavelength;
        re = Math.cos(k * z) - re;
        im = Math.sin(k * z) - im;
      }
      intensity[i] = re * re + im * im;
    }
    return { z: distances, intensity, how: 'exact 1-D Rayleigh–Sommerfeld sums on the axis' };
  }
  // Discs and annuli centred on the axis: the closed form, U = e^{ikz}·[1 if open] − Σ ±(z/R)e^{ikR}
  // (what the boundary integral gives on the axis, Heurtley 1973), at no cost.
  const rings = aperture.shape === 'circle' ? [aperture.diameter / 2] : aperture.shape === 'annulus' ? [aperture.outer / 2, aperture.inner / 2] : null;
  if (rings) {
    const k = (2 * Math.PI) / wavelength;
    for (let i = 0; i < distances.length; i++) {
      const z = distances[i]!;
      // Open circle: e^{ikz} − (z/R)e^{ikR}; annulus: (z/R_in)e^{ikR_in} − (z/R_out)e^{ikR_out}; opaque: the free wave less these.
      let re = 0;
      let im = 0;
      rings.forEach((a, j) => {
        const R = Math.hypot(z, a);
        const sign = j === 0 ? -1 : 1;
        re += (sign * z * Math.cos(k * R)) / R;
        im += (sign * z * Math.sin(k * R)) / R;
      });
      if (rings.length === 1) {
        re += Math.cos(k * z);
        im += Math.sin(k * z);
      }
      if (aperture.opaque) {
        re = Math.cos(k * z) - re;
        im = Math.sin(k * z) - im;
      }
      intensity[i] = re * re + im * im;
    }
    return { z: distances, intensity, how: 'exact Rayleigh–Sommerfeld field on the axis (closed form for a centred disc or annulus)' };
  }
  const regions = boundaryRegionsOf(aperture);
  if (!regions) return null;
  for (let i = 0; i < distances.length; i++) {
    const f = rsBoundary(regions, wavelength, distances[i]!, AXIS, AXIS);
    intensity[i] = f.data[0]! ** 2 + f.data[1]! ** 2;
  }
  return { z: distances, intensity, how: 'exact Rayleigh–Sommerfeld integral along the aperture boundary, on the axis' };
}
