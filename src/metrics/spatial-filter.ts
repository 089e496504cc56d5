// A spatial filter's pinhole at a converging lens's focus (analysis/spatial-filter.ts): the focal
// spot's measured 1/e² diameter beside 2λf/(πw) (Siegman, Lasers, ch. 17) and 2.44λf/D (Born &
// Wolf, Principles of Optics, §8.5.2), the fraction through pinholes of 1.5× and 2× that diameter
// (common practice), and the pinhole diameters passing the job's fractions (search: {pinhole:
// {passing: [...]}}, else 0.9 and 0.99). Reported for every converging lens whose screen is within
// the focal depth; a job that asks for the answers where they do not apply is told why per case.
import { DEFAULT_PASSING, spatialFilterAnswers, type SpatialFilterAnswers } from '../analysis/spatial-filter.js';
import { lensOf } from '../elements/registry.js';
import { isOneD } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';
import type { CaseSummary } from '../output/case-output.js';
import type { Case, Plan } from '../plan/types.js';
import { metric, type MetricFamily, type Quantity } from './types.js';

/** result.json's metrics.spatialFilter: the answers, or (when the job asked) why there are none. */
export type SpatialFilterResult = ({ answered: true } & SpatialFilterAnswers) | { answered: false; reason: string };

/**
 * Why a case has no focus to put a pinhole in, or null when it has: a converging lens with the
 * screen within its focal depth, the defocus at the lit rim at most a quarter wave,
 * πR²|1/z − 1/f|/λ ≤ π/2 (R the stop's radius or the beam's, the narrower), as for the Strehl ratio
 * (metrics/strehl.ts).
 */
export function notAtFocus(c: Case): string | null {
  const lens = lensOf(c.aperture);
  if (!lens) return 'the element is not a lens';
  if (c.planes) return "planes follow the lens (a pinhole there reports its transmission among the planes' results)";
  if (!(lens.focal > 0)) return 'a diverging lens has no focus';
  const waist = c.illumination.kind === 'gaussian' ? c.illumination.waist : Infinity;
  const lit = Math.min(lens.stopRadius ?? Infinity, waist);
  const defocus = (Math.PI * lit * lit * Math.abs(1 / c.distance - 1 / lens.focal)) / c.wavelength;
  if (!(defocus <= Math.PI / 2)) {
    return `the screen is outside the focal depth (defocus ${(defocus / (2 * Math.PI)).toPrecision(3)} wave at the lit rim, more than a quarter wave)`;
  }
  return null;
}

/**
 * CaseMetrics.spatialFilter: the answers at a converging lens's focus; `answered: false` with the
 * reason where the job asked for them and the case has no focus on the screen; null otherwise.
 */
export function focalPinholes(plan: Plan, map: IntensityMap, centre: [number, number], powerIn: number): SpatialFilterResult | null {
  const c = plan.case;
  const asked = c.analysis.pinholePassing;
  // (A lens is always computed in 2-D; the 1-D test keeps the ring average from a zero pitch.)
  const why = plan.babinet ? 'the element is an obstacle' : isOneD(map) ? 'the result is one-dimensional' : !(powerIn > 0) ? 'no power passes the lens' : c.source ? 'the light is curved (a source at a distance): the focus is not at f' : notAtFocus(c);
  if (why !== null) return asked ? { answered: false, reason: why } : null;
  const lens = lensOf(c.aperture)!;
  const optics = {
    wavelength: c.wavelength,
    focal: lens.focal,
    beamRadius: c.illumination.kind === 'gaussian' ? c.illumination.waist : null,
    stopDiameter: lens.stopRadius === null ? null : 2 * lens.stopRadius,
  };
  return { answered: true, ...spatialFilterAnswers(map, centre, powerIn, optics, asked ?? DEFAULT_PASSING) };
}

function answersOf(s: CaseSummary): SpatialFilterAnswers | undefined {
  const r = s.metrics.spatialFilter;
  return r && r.answered ? r : undefined;
}

/** A fraction in a column header: 0.995 → "99p5" (percent, no dot: headers are field names in the report's plots). */
function percentToken(f: number): string {
  return String(Number((f * 100).toPrecision(6))).replace('.', 'p');
}

export const spatialFilterMetrics: MetricFamily = {
  key: 'spatial-filter',
  quantities: ({ cases, records }) => {
    const answered = records.map(answersOf).filter((a): a is SpatialFilterAnswers => !!a);
    if (!answered.length) return [];
    const q: Quantity[] = [
      metric('focal_spot_e2_diameter_m', 'focal spot 1/e² diameter (azimuthal average)', 'm', (s) => answersOf(s)?.e2Diameter, { plot: true }),
    ];
    if (answered.some((a) => a.gaussianDiameter !== null)) {
      q.push(metric('gaussian_focus_diameter_m', 'Gaussian-beam focus 2λf/(πw)', 'm', (s) => answersOf(s)?.gaussianDiameter));
    }
    if (answered.some((a) => a.airyDiameter !== null)) {
      q.push(metric('airy_zero_diameter_m', 'Airy first-zero diameter 2.44λf/D', 'm', (s) => answersOf(s)?.airyDiameter));
    }
    q.push(
      metric('pinhole_1p5x_fraction', 'fraction through a pinhole 1.5× the 1/e² diameter', '1', (s) => answersOf(s)?.commonPractice.find((p) => p.multiple === 1.5)?.fraction, { plot: true }),
      metric('pinhole_2x_fraction', 'fraction through a pinhole 2× the 1/e² diameter', '1', (s) => answersOf(s)?.commonPractice.find((p) => p.multiple === 2)?.fraction),
    );
    // Every case of a job asks for the same fractions.
    const fractions = cases[0]?.analysis.pinholePassing ?? DEFAULT_PASSING;
    const seen = new Set<string>();
    for (const f of fractions) {
      let header = `pinhole_passing_${percentToken(f)}pct_m`;
      for (let n = 2; seen.has(header); n++) header = `pinhole_passing_${percentToken(f)}pct_${n}_m`;
      seen.add(header);
      q.push(
        metric(header, `pinhole diameter passing ${Number((f * 100).toPrecision(6))} %`, 'm', (s) => answersOf(s)?.passing.find((p) => p.fraction === f)?.diameter, { plot: true }),
      );
    }
    return q;
  },
  definitions: {
    spatialFilter:
      "a converging lens with the screen within its focal depth: e2Diameter, where the intensity averaged around the centre falls to 1/e² of that average's maximum; gaussianDiameter 2λf/(πw) for the lens's Gaussian beam of radius w, unclipped (Siegman, Lasers, ch. 17); airyDiameter 2.44λf/D for a uniformly lit stop (Born & Wolf §8.5.2); commonPractice, the fraction of the power through the lens passing centred pinholes of 1.5× and 2× e2Diameter (the usual choices; clipped: the pinhole reaches past the window, a lower bound); passing, the centred pinhole diameter passing each fraction, read off the encircled energy (status upper-bound: the pinhole reaches past the window; window-holds-less: the window holds less than that fraction, no answer; a wider window, the job's window key, may hold it); answered false with a reason where the job asked and the case has no focus on the screen",
  },
};
