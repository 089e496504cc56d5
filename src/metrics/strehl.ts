// The Strehl ratio of a lens's focus: the computed peak over the aberration-free peak of the same
// stop and light at the same distance, beside the estimate exp(−(2πσ)²) from the wavefront's RMS σ
// (V. N. Mahajan, JOSA 72, 1258 (1982)), and the verdict: diffraction-limited at a Strehl ratio of
// 0.8 or more (Maréchal's criterion, σ ≤ λ/14; Born & Wolf, Principles of Optics, §9.3).
import { lensOf } from '../elements/registry.js';
import { strehlEstimate } from '../optics/zernike.js';
import type { Plan } from '../plan/types.js';
import { column, metric, type MetricFamily } from './types.js';

/** Maréchal's criterion (Born & Wolf §9.3). */
export const MARECHAL_STREHL = 0.8;

export interface LensStrehl {
  /** Computed peak intensity / the aberration-free peak at the same distance. */
  ratio: number;
  /** exp(−(2πσ)²), σ the RMS wavefront error in waves without piston and tilt. */
  estimate: number;
  rmsWaves: number;
  /** The aberration-free on-axis intensity the ratio is taken against (relative to the incident irradiance). */
  idealPeak: number;
  diffractionLimited: boolean;
}

/**
 * The aberration-free pupil's on-axis intensity at distance z behind a lens of focal length f, for a
 * stop of radius R (Infinity: none) lit by a beam of amplitude e^{−r²/w²} (w = Infinity: a plane
 * wave of unit amplitude), in the Fresnel approximation (Goodman, Introduction to Fourier Optics,
 * §4.2, §5.1): U(0) = (1/(λz))·∫₀^R e^{−ar²} 2πr dr = (π/(λz))·(1 − e^{−aR²})/a with
 * a = 1/w² − iπ(1/z − 1/f)/λ; at z = f and w = ∞ this is πR²/(λf) (Goodman §5.2).
 */
export function idealOnAxisIntensity(lam: number, z: number, focal: number, radius: number, waist: number): number {
  const ar = Number.isFinite(waist) ? 1 / (waist * waist) : 0;
  const ai = (-Math.PI * (1 / z - 1 / focal)) / lam;
  const scale = Math.PI / (lam * z);
  if (!Number.isFinite(radius)) {
    // 1/a, |1/a|² = 1/|a|² (needs a beam: ar > 0).
    return (scale * scale) / (ar * ar + ai * ai);
  }
  const r2 = radius * radius;
  if (ar === 0) {
    // A uniformly lit stop: |(1 − e^{−i·ai·R²})/(i·ai)| = R²·|sin(x)/x|, x = ai·R²/2 (πR²/(λf) at the focus).
    const x = (ai * r2) / 2;
    const sinc = x === 0 ? 1 : Math.sin(x) / x;
    return (scale * r2 * sinc) ** 2;
  }
  const m2 = ar * ar + ai * ai;
  // (1 − e^{−aR²})/a, a = ar + i·ai, without cancellation: 1 − e^{−ar·R²}·e^{−i·ai·R²} with
  // 1 − e^{−u}cos φ = −expm1(−u)·cos φ + 2sin²(φ/2).
  const ph = -ai * r2;
  const e = Math.exp(-ar * r2);
  const nr = -Math.expm1(-ar * r2) * Math.cos(ph) + 2 * Math.sin(ph / 2) ** 2;
  const ni = -e * Math.sin(ph);
  const re = (nr * ar + ni * ai) / m2;
  const im = (ni * ar - nr * ai) / m2;
  return scale * scale * (re * re + im * im);
}

/**
 * The Strehl ratio of a converging lens's focus (the peak here over the aberration-free lens's peak
 * at its focus), when the screen is within its focal depth (the
 * defocus at the lit rim at most a quarter wave: πR²|1/z − 1/f|/λ ≤ π/2); null otherwise and for
 * every other element. R is the stop's radius, or the beam radius where the beam is the narrower.
 */
export function lensStrehl(plan: Plan, peakIntensity: number): LensStrehl | null {
  const c = plan.case;
  const lens = lensOf(c.aperture);
  // (With planes after the lens the screen's distance is not the lens's.)
  if (!lens || lens.focal <= 0 || c.planes) return null;
  // (Under curved light the lens's focus is not at f: no ideal-lens reference here.)
  if (c.source) return null;
  const lam = c.wavelength;
  const z = c.distance;
  const waist = c.illumination.kind === 'gaussian' ? c.illumination.waist : Infinity;
  const radius = lens.stopRadius ?? Infinity;
  const lit = Math.min(radius, waist);
  if (!(((Math.PI * lit * lit * Math.abs(1 / z - 1 / lens.focal)) / lam) <= Math.PI / 2)) return null;
  // Against the aberration-free lens at its own focus, not at this plane: the screen's distance from
  // the focus is a defocus like any other, and against the defocused ideal at the same plane a
  // compensating defocus in the wavefront would score above 1 (common practice: the Strehl ratio is
  // the peak over the diffraction-limited peak; Born & Wolf §9.3).
  const idealPeak = idealOnAxisIntensity(lam, lens.focal, lens.focal, radius, waist);
  const ratio = peakIntensity / idealPeak;
  const rmsWaves = lens.rmsWaves(lam, true);
  return { ratio, estimate: strehlEstimate(rmsWaves), rmsWaves, idealPeak, diffractionLimited: ratio >= MARECHAL_STREHL };
}

export const strehlMetrics: MetricFamily = {
  key: 'strehl',
  quantities: ({ records }) =>
    records.some((r) => r.metrics.strehl)
      ? [
          metric('strehl_ratio', 'Strehl ratio (peak / aberration-free peak)', '1', (s) => s.metrics.strehl?.ratio, { plot: true }),
          metric('strehl_estimate', 'exp(−(2πσ)²) from the wavefront RMS', '1', (s) => s.metrics.strehl?.estimate),
          metric('wavefront_rms_waves', 'wavefront RMS (waves, without piston and tilt)', '1', (s) => s.metrics.strehl?.rmsWaves),
          column('lens_verdict', (s) => (s.metrics.strehl ? (s.metrics.strehl.diffractionLimited ? 'diffraction-limited' : 'aberrated') : undefined)),
        ]
      : [],
};
