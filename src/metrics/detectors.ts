// The job's detectors: each reads the power on a pinhole or square at a point, as a fraction of
// the power through the aperture or, behind an opaque obstacle, of what it would receive with
// nothing in the way.
import { detectorAreaInWindow, detectorPower, type DetectorSpec } from '../analysis/encircled.js';
import { isOneD } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';
import type { Axis } from '../optics/field.js';
import { intensityMapOf } from '../optics/field.js';
import { freeField } from '../optics/free.js';
import type { DetectorResult } from '../output/case-output.js';
import type { Plan, Warning } from '../plan/types.js';
import { warning, type DetectorOutsideDetails } from '../warnings/catalogue.js';
import { column, metric, type MetricFamily, type Quantity } from './types.js';

/**
 * The job's detectors. With an aperture, each reads a fraction of the power through it; behind an
 * opaque obstacle (Babinet), a fraction of what it would receive with nothing in the way. A
 * detector partly outside the window reads the part inside (a lower bound, with a warning); one
 * wholly outside reads null (never a silent 0).
 */
export function readDetectors(plan: Plan, map: IntensityMap, centre: [number, number], reference: number | null): { results: DetectorResult[]; warnings: Warning[] } {
  const results: DetectorResult[] = [];
  const outside: DetectorOutsideDetails[] = [];
  plan.case.analysis.detectors.forEach((det, i) => {
    const at = det.at ?? centre;
    const spec: DetectorSpec = { kind: det.kind, size: det.size, at };
    const areaInWindow = detectorAreaInWindow(map, spec, at);
    const ref = reference ?? unobstructedDetectorPower(plan, map, spec, at);
    const power = areaInWindow > 0 ? detectorPower(map, spec, at) : null;
    results.push({
      kind: det.kind,
      size: det.size,
      at,
      fraction: power === null || !(ref > 0) ? null : power / ref,
      reference: reference !== null ? 'power-through-aperture' : 'unobstructed-beam',
      referencePower: ref,
      areaInWindow,
    });
    if (areaInWindow < 1 - 1e-9) outside.push({ kind: det.kind, number: i + 1, size: det.size, at, inside: areaInWindow });
  });
  const warnings: Warning[] = [];
  if (outside.length) {
    warnings.push(
      warning('detector-outside', {
        detectors: outside,
        window: {
          size: [2 * plan.x.windowHalf, plan.y ? 2 * plan.y.windowHalf : null],
          centre: [plan.x.windowCentre, plan.y ? plan.y.windowCentre : null],
        },
        windowGiven: !!plan.case.window,
      }),
    );
  }
  return { results, warnings };
}

/**
 * The power a detector would receive with nothing in the way: the unobstructed beam (plane wave
 * or Gaussian, in closed form, optics/free.ts) sampled on the map's lattice around the detector,
 * including any part outside the window, and integrated with the same sub-cell coverage as the
 * reading (so that for a plane wave it is the detector's area × 1 as that coverage counts it).
 */
export function unobstructedDetectorPower(plan: Plan, map: IntensityMap, d: DetectorSpec, at: [number, number]): number {
  const c = plan.case;
  const half = d.size / 2;
  const lattice = (origin: number, step: number, centre: number): Axis => {
    const first = Math.floor((centre - half - origin) / step) - 1;
    const last = Math.ceil((centre + half - origin) / step) + 1;
    return { n: last - first + 1, start: origin + first * step, step };
  };
  const xs = lattice(map.x0, map.dx, at[0]);
  const ys = isOneD(map) ? null : lattice(map.y0, map.dy, at[1]);
  const free = freeField(c.illumination, c.distance, xs, ys, c.wavelength);
  // freeField's grid is the lattice's (1-D: ny = 1, dy = 0, y0 = 0, the map's convention too).
  return detectorPower(intensityMapOf(free), d, at);
}

export const detectorMetrics: MetricFamily = {
  key: 'detectors',
  quantities: ({ cases, records }) => {
    const detectors = cases[0]?.analysis.detectors ?? [];
    // A detector's fraction is of the power through the aperture, or behind an obstacle of what it
    // would receive unobstructed (metrics.detectors[i].reference); the label says which.
    const behind = records.some((r) => r.metrics.detectors.some((d) => d.reference === 'unobstructed-beam'));
    const mixed = behind && records.some((r) => r.metrics.detectors.some((d) => d.reference === 'power-through-aperture'));
    const of = mixed ? ' (see result.json for its reference)' : behind ? ' (of the unobstructed beam on it)' : '';
    return detectors.flatMap((d, i): Quantity[] => [
      metric(`detector${i + 1}_fraction`, `fraction on ${d.kind} ${i + 1}${of}`, '1', (s) => s.metrics.detectors[i]?.fraction, { plot: true }),
      column(`detector${i + 1}_area_in_window`, (s) => s.metrics.detectors[i]?.areaInWindow),
    ]);
  },
  definitions: {
    detectors:
      'fraction: power on the part of the detector inside the window over the reference power named by reference (power-through-aperture, or unobstructed-beam: what the detector would receive with nothing in the way); areaInWindow below 1 makes it a lower bound; null when the detector is wholly outside the window',
  },
};
