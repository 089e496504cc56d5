// The exact integral for a 1-D aperture from its open intervals: the intervals (an obstacle's
// complement within the beam's reach), the power through them, and the sums onto the window.
import { isOneDAperture, separableProfiles, type Illumination, type Profile } from '../optics/aperture.js';
import { createField, type Field } from '../optics/field.js';
import { erf } from '../optics/special.js';
import { cellsFromIntervals, rsDirect1D, rsPerPeriod1D, type Interval } from '../optics/rayleigh-sommerfeld.js';
import type { Plan } from '../plan/types.js';

/** The open intervals of a 1-D profile, centred on the axis as the masks centre it. */
export function profileIntervals(p: Profile): Interval[] {
  if (p.kind === 'interval') return [{ lo: -p.width / 2, hi: p.width / 2 }];
  if (p.kind === 'periodic') throw new Error('a grating profile has no open intervals (it is not binary): the exact sums do not take it');
  const first = -((p.count - 1) / 2) * p.period;
  const out: Interval[] = [];
  for (let n = 0; n < p.count; n++) out.push({ lo: first + n * p.period - p.width / 2, hi: first + n * p.period + p.width / 2 });
  return out;
}

/** The parts of [−half, half] the (sorted, disjoint) intervals leave open: an obstacle in a beam. */
export function complementWithin(ivs: Interval[], half: number): Interval[] {
  const out: Interval[] = [];
  let at = -half;
  for (const iv of ivs) {
    if (iv.lo > at) out.push({ lo: at, hi: Math.min(iv.lo, half) });
    at = Math.max(at, iv.hi);
    if (at >= half) break;
  }
  if (at < half) out.push({ lo: at, hi: half });
  return out.filter((iv) => iv.hi > iv.lo);
}

/** ∫|U₀|² over open intervals: their length, or under a Gaussian exp(−ξ²/w²) its exact integral. */
function intervalsPower(open: Interval[], ill: Illumination): number {
  if (ill.kind === 'plane') return open.reduce((s, iv) => s + (iv.hi - iv.lo), 0);
  // ∫ e^{−2ξ²/w²} dξ over [lo, hi] = w·√(π/8)·(erf(√2·hi/w) − erf(√2·lo/w)).
  const w = ill.waist;
  return open.reduce((s, iv) => s + w * Math.sqrt(Math.PI / 8) * (erf((Math.SQRT2 * iv.hi) / w) - erf((Math.SQRT2 * iv.lo) / w)), 0);
}

/** A 1-D plan's profile, its open intervals (the beam where an obstacle is not) and the power through them. */
export function openIntervals(plan: Plan, obstructed: boolean): { prof: Profile; open: Interval[]; powerIn: number } {
  const c = plan.case;
  if (!isOneDAperture(c.aperture)) throw new Error('one-d layout for a 2-D aperture');
  const prof = separableProfiles(c.aperture)!.x;
  const open = obstructed ? complementWithin(profileIntervals(prof), plan.x.apertureHalf) : profileIntervals(prof);
  return { prof, open, powerIn: intervalsPower(open, c.illumination) };
}

/** The direct sums over cells with exact edges onto the window. */
export function cellSums1D(plan: Plan, open: Interval[]): Field {
  const c = plan.case;
  const ill = c.illumination;
  const lam = c.wavelength;
  const sinTilt = Math.sin(ill.tilt[0]);
  const f = createField(plan.x.output, null, lam);
  const light = ill.kind === 'gaussian' ? { sinTilt, waist: ill.waist } : { sinTilt };
  const cells = cellsFromIntervals(open, light, lam, plan.x.inputPitch);
  f.data.set(rsDirect1D(cells, lam, c.distance, plan.x.output));
  return f;
}

/** A grating lit by a plane wave: one period's field summed over its periods. */
export function perPeriodSums(plan: Plan, prof: Extract<Profile, { kind: 'grating' }>): Field {
  const c = plan.case;
  const lam = c.wavelength;
  const sinTilt = Math.sin(c.illumination.tilt[0]);
  const out = plan.x.output;
  const f = createField(out, null, lam);
  const first = -((prof.count - 1) / 2) * prof.period - prof.width / 2;
  const periodic = plan.x.periodic!;
  f.data.set(
    rsPerPeriod1D(
      { period: prof.period, count: prof.count, firstOrigin: first, open: [{ lo: 0, hi: prof.width }] },
      { sinTilt },
      lam,
      c.distance,
      { axis: out, p: periodic.p, s: periodic.s },
      plan.x.inputPitch,
    ),
  );
  return f;
}
