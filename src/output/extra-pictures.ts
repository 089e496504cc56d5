// The pictures a case writes beside intensity.png where they help: for a 1-D result the profile as
// a line plot (linear and in decades) with the geometric shadow's edges and the textbook far-field
// curve (profile.png); for a 2-D result whose spot is small in its window, or where the job asks
// for a region (output.zoom), the region drawn again at its own scale (intensity-zoom.png); for a
// smallest-spot search, the spot against the size searched with the optimum and the textbook
// estimate marked (smallest-spot.png).
import { isOneDAperture, separableProfiles } from '../optics/aperture.js';
import { profileIntervals } from '../methods/exact-intervals.js';
import { textbookFarField } from '../analysis/textbook.js';
import { isOneD, xAt } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';
import type { Plan } from '../plan/types.js';
import { renderProfilePng } from './profile-plot.js';
import { renderIntensityPngs } from './picture.js';
import { cropMap, regionBox, spotBox, ZOOM_FRACTION, type ZoomBox } from './zoom.js';
import { renderLinePlot, type LineSeries } from './line-plot.js';
import type { SmallestSpot } from './case-output.js';

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

/** profile.png of a 1-D result, or null for a 2-D one. */
export function profilePicture(plan: Plan, map: IntensityMap, title: string): Buffer | null {
  if (!isOneD(map)) return null;
  const c = plan.case;
  const x = Float64Array.from({ length: map.nx }, (_, i) => xAt(map, i));
  const tb = textbookFarField(c.aperture, c.illumination, c.wavelength, c.distance);
  return renderProfilePng({
    title,
    x,
    intensity: map.intensity,
    axis: 'x',
    edges: shadowEdges(plan),
    ...(tb ? { reference: { label: tb.label, intensity: x.map((v) => tb.at(v, 0)) } } : {}),
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
