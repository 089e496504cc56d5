// The MTF of a lens's focus (analysis/mtf.ts): for a converging lens with the screen within its
// focal depth (the condition the Strehl ratio is given under, metrics/strehl.ts), the MTF at half the
// cut-off and the frequency where it falls to 50 %, beside the diffraction-limited curve of a
// uniformly lit circular stop (Goodman, Introduction to Fourier Optics, §6.3). The whole curve goes
// to mtf.csv and mtf.png in the case folder (output/case-output.ts).
import { mtfOf, type MtfResult, type MtfTransform } from '../analysis/mtf.js';
import { lensOf } from '../elements/registry.js';
import type { IntensityMap } from '../model/intensity-map.js';
import type { Plan } from '../plan/types.js';
import { lensStrehl } from './strehl.js';
import { column, metric, type MetricFamily } from './types.js';

/**
 * The MTF of the computed PSF when the case is a converging lens with the screen within its focal
 * depth (the same condition as lensStrehl's: it is asked, so that the two can never disagree); null
 * otherwise. `totalPower` is the power through the pupil (the PSF's whole power), null if unknown.
 */
export function lensMtf(plan: Plan, map: IntensityMap, totalPower: number | null, fft: MtfTransform): MtfResult | null {
  const c = plan.case;
  const lens = lensOf(c.aperture);
  if (!lens || !lensStrehl(plan, 0)) return null;
  const beam = c.illumination.kind === 'gaussian' ? 2 * c.illumination.waist : null;
  return mtfOf(
    map,
    {
      wavelength: c.wavelength,
      distance: c.distance,
      stopDiameter: lens.stopRadius === null ? null : 2 * lens.stopRadius,
      beamDiameter: beam,
      totalPower,
    },
    fft,
  );
}

const perMm = (v: number | null | undefined) => (v === null || v === undefined ? v : v / 1e3);

export const mtfMetrics: MetricFamily = {
  key: 'mtf',
  quantities: ({ records }) =>
    records.some((r) => r.metrics.mtf)
      ? [
          metric('mtf_half_cutoff', 'MTF at half the cut-off frequency (ring average)', '1', (s) => s.metrics.mtf?.atHalfCutoff, { plot: true }),
          metric('mtf50_normalised', 'frequency where the MTF falls to 50 % / cut-off', '1', (s) => s.metrics.mtf?.mtf50Normalised, { plot: true }),
          column('mtf50_cycles_per_mm', (s) => perMm(s.metrics.mtf?.mtf50)),
          column('mtf_cutoff_cycles_per_mm', (s) => perMm(s.metrics.mtf?.cutoff)),
          column('mtf_approximate', (s) => (s.metrics.mtf ? (s.metrics.mtf.approximate ? 'yes' : 'no') : undefined)),
        ]
      : [],
  definitions: {
    mtf:
      'Lens cases with the screen within the focal depth: the modulation transfer function, |OTF|, the OTF being the 2-D Fourier ' +
      "transform of the computed intensity (the PSF) divided by the PSF's whole power (the power through the pupil; the window's own " +
      'power where that is larger), so 1 at zero frequency. Frequencies in cycles per metre (mtf.csv: cycles/mm). cutoff: the ' +
      'incoherent cut-off D/(λz) of the circular stop (cutoffKind "stop"), or for a Gaussian beam without a stop a nominal 2w/(λz), ' +
      'where its MTF exp(−(λzν)²/(2w²)) is e^−2: no sharp cut-off (cutoffKind "beam"). atHalfCutoff: the ring-averaged MTF at ' +
      'cutoff/2 (diffraction-limited circular stop: 0.391). mtf50: the lowest frequency where the ring average falls to 0.5. ' +
      'windowFraction: the share of the whole power inside the window; approximate is true when it is under 0.995 or the PSF is ' +
      'under-sampled (approximateWhy says which); below resolvedFrom the missing wings show. The curve: mtf.csv and mtf.png.',
  },
};
