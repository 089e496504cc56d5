// The pictures a case writes beside intensity.png where they help: the profile as a line plot
// (linear and in decades; a 2-D result's row through its peak) with the geometric shadow's edges
// and the textbook far-field curve (profile.png); for a 2-D result whose spot is small in its window, or where the job asks
// for a region (output.zoom), the region drawn again at its own scale (intensity-zoom.png); for a
// smallest-spot search, the spot against the size searched with the optimum and the textbook
// estimate marked (smallest-spot.png).
import { isOneDAperture, separableProfiles } from '../optics/aperture.js';
import { profileIntervals } from '../methods/exact-intervals.js';
import { textbookFarField } from '../analysis/textbook.js';
import { isOneD, xAt, yAt } from '../model/grid.js';
import { apertureFacts } from '../optics/aperture.js';
import { lensOf } from '../elements/registry.js';
import { formatLength } from '../job/units.js';
import type { IntensityMap } from '../model/intensity-map.js';
import type { Plan } from '../plan/types.js';
import { renderProfilePng } from './profile-plot.js';
import { renderIntensityPngs } from './picture.js';
import { cropMap, regionBox, spotBox, ZOOM_FRACTION, type ZoomBox } from './zoom.js';
import { renderLinePlot, type LineSeries } from './line-plot.js';
import type { SmallestSpot } from './case-output.js';
import type { EnergyCurve } from '../analysis/encircled.js';
import besselj0 from '@stdlib/math-base-special-besselj0';
import besselj1 from '@stdlib/math-base-special-besselj1';

/** Shadow edges drawn one by one up to this many; past it only the outermost two. */
const MAX_EDGES = 16;

/**
 * Where the aperture's edges project on the screen along x: straight on, shifted by z·tan θ for a
 * tilted plane wave (the geometric shadow of a 1-D aperture).
 */
export function shadowEdges(plan: Plan): number[] {
  const c = plan.case;
  if (!isOneDAperture(c.aperture)) return [];
  const prof = separableProfiles(c.aperture)?.x;
  if (!prof || prof.kind === 'periodic') return [];
  const shift = c.distance * Math.tan(c.illumination.tilt[0]);
  const ivs = profileIntervals(prof);
  const edges = ivs.flatMap((iv) => [iv.lo + shift, iv.hi + shift]);
  return edges.length <= MAX_EDGES ? edges : [edges[0]!, edges[edges.length - 1]!];
}

/**
 * profile.png: a 1-D result's profile, or a 2-D result's row through its brightest sample, with the
 * geometric shadow's edges along x and the textbook far-field curve along the same row.
 */
export function profilePicture(plan: Plan, map: IntensityMap, title: string): Buffer | null {
  const c = plan.case;
  let row = 0;
  if (!isOneD(map)) {
    // The first sample of the greatest value (row found once, after the search).
    const v = map.intensity;
    let top = -1;
    let at = 0;
    for (let i = 0; i < v.length; i++) {
      const x = v[i]!;
      if (x > top) (top = x), (at = i);
    }
    row = Math.floor(at / map.nx);
  }
  const y = yAt(map, row);
  const x = Float64Array.from({ length: map.nx }, (_, i) => xAt(map, i));
  const tb = textbookFarField(c.aperture, c.illumination, c.wavelength, c.distance);
  let edges = shadowEdges(plan);
  if (!isOneD(map) && !c.planes?.length && !lensOf(c.aperture)) {
    const h = apertureFacts(c.aperture).halfExtent[0];
    const shift = c.distance * Math.tan(c.illumination.tilt[0]);
    edges = [shift - h, shift + h];
  }
  return renderProfilePng({
    title: isOneD(map) ? title : `${title} · row y = ${formatLength(y, 3)}`,
    x,
    intensity: map.intensity.subarray(row * map.nx, (row + 1) * map.nx),
    axis: 'x',
    edges,
    ...(tb ? { reference: { label: tb.label, intensity: x.map((v) => tb.at(v, y)) } } : {}),
    decades: c.output.logDecades,
  });
}

/** The region of a 2-D result's zoomed picture (asked for, or the small spot), or null where none is drawn. */
export function zoomBoxOf(plan: Plan, map: IntensityMap): ZoomBox | null {
  if (isOneD(map)) return null;
  const asked = plan.case.output.zoom;
  const box = asked ? regionBox(map, asked.centre, asked.width) : spotBox(map);
  return box && box.cols[1] - box.cols[0] >= 1 && box.rows[1] - box.rows[0] >= 1 ? box : null;
}

/** Whether the search has a plot: two or more sizes evaluated. */
export function hasSearchPicture(sp: SmallestSpot | undefined): boolean {
  return (sp?.samples?.length ?? 0) >= 2;
}

/** intensity-zoom.png of a 2-D result: the region asked for, or the spot where it is small in its window; else null. */
export function zoomPicture(plan: Plan, map: IntensityMap, title: string): Buffer | null {
  const box = zoomBoxOf(plan, map);
  if (!box) return null;
  const asked = plan.case.output.zoom;
  const what = asked ? 'the region asked for' : `zoomed on the spot (${Math.round(100 * ZOOM_FRACTION)} % of the power)`;
  return renderIntensityPngs({ map: cropMap(map, box), logDecades: plan.case.output.logDecades, title: `${title} · ${what}` }, ['shoal'])[0]!;
}

/** smallest-spot.png: the spot of every size the search evaluated, the optimum and the textbook size marked; null with fewer than two. */
export function searchPicture(sp: SmallestSpot, title: string): Buffer | null {
  if (!hasSearchPicture(sp)) return null;
  const pts = sp.samples!;
  const all = [...pts.map((p) => p[0]), sp.textbook];
  const reach = Math.max(...all);
  const [f, unit] = reach >= 1e-3 ? [1e3, 'mm'] : [1e6, 'µm'];
  const spots = pts.map((p) => p[1]);
  const sReach = Math.max(...spots);
  const [g, sUnit] = sReach >= 1e-3 ? [1e3, 'mm'] : [1e6, 'µm'];
  const lo = Math.min(...all) * f;
  const hi = reach * f;
  const yTop = sReach * g * 1.1;
  const marker = (x: number, label: string, colour: [number, number, number], dashed: boolean): LineSeries => ({ label, x: [x * f, x * f], y: [0, yTop], colour, dashed, width: 1 });
  const what = sp.key === 'aperture.diameter' ? 'diameter' : 'width';
  return renderLinePlot({
    title: `smallest spot · ${title}`,
    xLabel: `aperture ${what} (${unit})`,
    yLabel: `spot (${sp.measure === 'energy' ? 'radius or half-width holding half the power' : sp.measure === 'fwhm' ? 'FWHM' : 'D4σ width'}, ${sUnit})`,
    xRange: [lo - 0.02 * (hi - lo), hi + 0.02 * (hi - lo)],
    yRange: [0, yTop],
    series: [
      marker(sp.best, `optimum ${+(sp.best * f).toPrecision(4)} ${unit}`, [140, 210, 120], false),
      marker(sp.textbook, `textbook ${sp.key === 'aperture.diameter' ? 'sqrt(2.44 λz)' : 'sqrt(2 λz)'} ${+(sp.textbook * f).toPrecision(4)} ${unit}`, [110, 190, 240], true),
      { label: 'computed spot', x: pts.map((p) => p[0] * f), y: pts.map((p) => p[1] * g), colour: [240, 160, 80], width: 2 },
    ],
  });
}

/**
 * The Airy pattern's encircled energy, the fraction of its power within radius r on the screen:
 * 1 − J₀²(v) − J₁²(v), v = k·a·sin θ, sin θ = r/√(r² + z²) (Rayleigh's formula; Born & Wolf,
 * Principles of Optics, §8.5.2), for a disc of radius a in plane light at normal incidence.
 */
export function airyEncircled(a: number, wavelength: number, z: number, r: number): number {
  const v = ((2 * Math.PI) / wavelength) * a * (r / Math.hypot(r, z));
  // (@stdlib's J₀ and J₁, rational approximations: the curve's 400 points took a Miller recurrence
  // of |v| terms each.)
  const j0 = besselj0(v);
  const j1 = besselj1(v);
  return 1 - j0 * j0 - j1 * j1;
}

/** Whether a case has an encircled-energy plot: a 2-D result with a curve of two points or more. */
export function hasEnergyPicture(energy: EnergyCurve | null, oneD: boolean): energy is EnergyCurve {
  return !!energy && !oneD && energy.radius.length >= 2;
}

/** encircled-energy.png: the curve, with the Airy pattern's beside it for a plainly lit circle; null for a 1-D result or no curve. */
export function energyPicture(plan: Plan, energy: EnergyCurve | null, oneD: boolean, title: string): Buffer | null {
  if (!hasEnergyPicture(energy, oneD)) return null;
  const c = plan.case;
  const rMax = energy.radius[energy.radius.length - 1]!;
  const [f, unit] = rMax >= 1e-3 ? [1e3, 'mm'] : [1e6, 'µm'];
  const r = Array.from(energy.radius, (v) => v * f);
  const series: LineSeries[] = [];
  const plainCircle = c.aperture.shape === 'circle' && !c.aperture.opaque && c.illumination.kind === 'plane' && c.illumination.tilt[0] === 0 && c.illumination.tilt[1] === 0;
  if (plainCircle && c.aperture.shape === 'circle') {
    const a = c.aperture.diameter / 2;
    series.push({ label: 'Airy pattern (far field)', x: r, y: Array.from(energy.radius, (v) => airyEncircled(a, c.wavelength, c.distance, v)), colour: [110, 190, 240], dashed: true, width: 4 });
  }
  series.push({ label: 'computed', x: r, y: Array.from(energy.fraction), colour: [240, 160, 80], width: 2 });
  return renderLinePlot({
    title: `encircled energy · ${title}`,
    xLabel: `radius about the centroid (${unit})`,
    yLabel: 'fraction of the power through the aperture',
    xRange: [0, rMax * f],
    yRange: [0, 1.05],
    series,
  });
}
