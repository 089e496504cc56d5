// Questions that need more propagations than the case itself: from which distance on the far-field
// size can be trusted, and which aperture size gives the smallest spot at a distance. Results that
// depend only on the aperture and the wavelength are cached across the cases of a job, in the
// runner's CaseContext (context.ts), whose engine the extra propagations run on.
import { spotMetrics } from '../analysis/metrics.js';
import { makeVerdict, spotSize, verdictWidth, type Verdict } from '../analysis/verdict.js';
import { elementOf } from '../elements/registry.js';
import { formatLength } from '../job/units.js';
import type { CaseRecord, SmallestSpot } from '../output/case-output.js';
import { farFieldSearch, measureVariant, searchLimits as limitsOf, smallestSpotSizes, smallestSpotVariant } from '../plan/answers.js';
import { planCase, type PlannerOptions } from '../plan/planner.js';
import type { Case } from '../plan/types.js';
import { computeCase } from './compute.js';
import type { CaseContext } from './context.js';

/** The searches' part of a CaseContext: the planner's limits, the cache, the engine. */
export type SearchContext = CaseContext;

// The variants each search plans, and their limits, are described in plan/answers.ts, where the
// planner costs them for the case's memory estimate.
export { SEARCH_MEMORY, SEARCH_OUTPUT } from '../plan/answers.js';

function searchLimits(ctx: SearchContext): PlannerOptions {
  return limitsOf(ctx.maxMemoryBytes);
}

/**
 * The spot size (the verdict's measure) of a variant of a case, fully planned and computed, with
 * the window plan/answers.ts measureVariant gives it.
 */
function measureAt(c: Case, axis: Verdict['axis'], ctx: SearchContext): { computed: number | null; farField: number } {
  const width = verdictWidth(c.aperture, axis)!;
  const plan = planCase(measureVariant(c, axis), searchLimits(ctx));
  // A variant that would need a huge grid is left out of the search rather than run for minutes.
  if (plan.error) return { computed: null, farField: NaN };
  const computed = computeCase(plan, ctx);
  const spot = spotMetrics(computed);
  const s = spotSize(computed, axis, width, c.wavelength, c.distance, [spot.centroid[0], spot.centroid[1] ?? 0], computed.diagnostics.powerIn);
  return { computed: s.computed, farField: s.farField };
}

/**
 * Smallest distance from which the far-field size stays within 1 % of the computed one: a scan in
 * steps of √2 from 1/4 of the far-field distance 2D²/λ up to 64 times it, then bisection (in log z)
 * across the last crossing of the 1 % band. Null when the band is not reached within the scan.
 * Distances whose propagation would exceed SEARCH_MEMORY count as outside the band.
 */
export function farFieldFrom(c0: Case, axis0: Verdict['axis'], ctx: SearchContext): number | null {
  // Rectangles and finite slits: the paraxial field factorises, so each axis behaves as a long slit
  // of that side; searching with the 1-D slit costs a 1-D problem per distance instead of a 2-D one.
  const { c, axis, distances: zs } = farFieldSearch(c0, axis0);
  const key = JSON.stringify(['far-field-from', c.aperture, c.wavelength, axis, c.illumination.tilt]);
  if (ctx.cache.has(key)) return ctx.cache.get(key) as number | null;
  const off = (z: number) => {
    const m = measureAt({ ...c, distance: z }, axis, ctx);
    return m.computed === null ? Infinity : Math.abs(m.computed / m.farField - 1);
  };
  // Below 2D²/λ/4 (N_F > 1/2) the far-field size is far off for uniformly lit apertures; the
  // scan starts there, which spares the costly near-field propagations.
  const err = zs.map(off);
  let last = -1;
  for (let i = 0; i < zs.length; i++) if (err[i]! > 0.01) last = i;
  let result: number | null;
  if (last === zs.length - 1) result = null;
  else if (last < 0) result = zs[0]!;
  else {
    let lo = zs[last]!;
    let hi = zs[last + 1]!;
    for (let it = 0; it < 6; it++) {
      const mid = Math.sqrt(lo * hi);
      if (off(mid) > 0.01) lo = mid;
      else hi = mid;
    }
    result = hi;
  }
  ctx.cache.set(key, result);
  return result;
}

/**
 * The aperture size that gives the smallest spot at the case's distance and wavelength: a scan of
 * 9 sizes spaced evenly in log between the bounds, then a golden-section search (in log size) in
 * the bracket around the best, to 0.5 % in size. Beside it, the textbook balance of shadow and
 * far-field spread: D = √(2.44 λz) for a pinhole (shadow D = Airy diameter 2.44λz/D) and
 * w = √(2λz) for a slit (shadow w = 2λz/w), common practice.
 */
export function smallestSpot(c: Case, ctx: SearchContext): SmallestSpot {
  const spec = c.analysis.smallestSpot!;
  const search = elementOf(c.aperture).sizeSearch!;
  const axis: Verdict['axis'] = search.axis;
  const lam = c.wavelength;
  const z = c.distance;
  let evaluations = 0;
  const samples: [number, number][] = [];
  const spotOf = (size: number): number => {
    evaluations++;
    const v = smallestSpotVariant(c, size);
    if (spec.measure === 'energy') return measureAt(v, axis, ctx).computed ?? Infinity;
    const plan = planCase({ ...v, window: undefined, grid: undefined, method: 'auto' }, searchLimits(ctx));
    if (plan.error) return Infinity;
    const m = spotMetrics(computeCase(plan, ctx));
    const w = spec.measure === 'fwhm' ? m.fwhm[0] : m.d4sigma[0];
    return w ?? Infinity;
  };
  const measure = (size: number): number => {
    const v = spotOf(size);
    if (Number.isFinite(v)) samples.push([size, v]);
    return v;
  };
  const [lo, hi] = spec.between;
  const sizes = smallestSpotSizes(spec.between);
  const n = sizes.length;
  const values = sizes.map(measure);
  let best = 0;
  for (let i = 1; i < n; i++) if (values[i]! < values[best]!) best = i;
  let a = Math.log(sizes[Math.max(0, best - 1)]!);
  let b = Math.log(sizes[Math.min(n - 1, best + 1)]!);
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a);
  let x2 = a + g * (b - a);
  let f1 = measure(Math.exp(x1));
  let f2 = measure(Math.exp(x2));
  while (b - a > Math.log(1.005)) {
    if (f1 < f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = measure(Math.exp(x1));
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = measure(Math.exp(x2));
    }
  }
  const bestSize = f1 < f2 ? Math.exp(x1) : Math.exp(x2);
  const bestMeasure = Math.min(f1, f2);
  const textbook = search.textbook(lam, z);
  const inRange = textbook >= lo && textbook <= hi;
  return {
    measure: spec.measure,
    key: `aperture.${search.key}`,
    best: bestSize,
    bestMeasure,
    textbook,
    textbookMeasure: inRange ? measure(textbook) : null,
    method: 'scan of 9 log-spaced sizes, then golden-section search in log size to 0.5 %; each size fully planned and propagated',
    evaluations,
    samples: samples.sort((p, q) => p[0] - q[0]),
  };
}

/**
 * The answers that need extra propagations: from which distance the far-field size holds (added to
 * each verdict) and, when the job asks, the aperture size with the smallest spot.
 */
export function answerQuestions(rec: CaseRecord, ctx: SearchContext): void {
  const c = rec.plan.case;
  if (rec.metrics.verdicts) {
    rec.metrics.verdicts = rec.metrics.verdicts.map((v) => makeVerdict(v.axis, v.size, v.fresnelNumber, farFieldFrom(c, v.axis, ctx)));
  }
  if (c.analysis.smallestSpot) rec.search = smallestSpot(c, ctx);
}

export function searchSentence(s: SmallestSpot): string {
  const what = s.key === 'aperture.diameter' ? 'diameter' : 'width';
  const m = s.measure === 'energy' ? 'spot (radius or half-width holding half the power)' : s.measure === 'fwhm' ? 'FWHM' : 'D4σ width';
  const tb = s.textbookMeasure !== null ? ` (its spot ${formatLength(s.textbookMeasure, 3)})` : ' (outside the range searched)';
  return (
    `Smallest spot: ${what} ${formatLength(s.best, 4)} gives the smallest ${m}, ${formatLength(s.bestMeasure, 3)}; ` +
    `the textbook estimate ${s.key === 'aperture.diameter' ? '√(2.44λz)' : '√(2λz)'} is ${formatLength(s.textbook, 4)}${tb}. ` +
    `Method: ${s.method} (${s.evaluations} propagations).`
  );
}

