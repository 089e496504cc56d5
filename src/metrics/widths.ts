// Spot widths per axis (FWHM, 1/e², D4σ, first minimum): computed by spotMetrics
// (analysis/metrics.ts) from the profiles through the peak and the second moments.
import { metric, type MetricFamily } from './types.js';

export const widthMetrics: MetricFamily = {
  key: 'widths',
  quantities: () => [
    metric('fwhm_x_m', 'FWHM x', 'm', (s) => s.metrics.fwhm[0], { plot: true }),
    metric('fwhm_y_m', 'FWHM y', 'm', (s) => s.metrics.fwhm[1], { plot: true }),
    metric('e2_width_x_m', '1/e² full width x', 'm', (s) => s.metrics.e2Width[0]),
    metric('e2_width_y_m', '1/e² full width y', 'm', (s) => s.metrics.e2Width[1]),
    metric('d4sigma_x_m', 'D4σ width x', 'm', (s) => s.metrics.d4sigma[0], { plot: true }),
    metric('d4sigma_y_m', 'D4σ width y', 'm', (s) => s.metrics.d4sigma[1], { plot: true }),
    metric('d4sigma_window_change_x', 'D4σ x: fall with the window cut to 80 %', '1', (s) => s.metrics.d4sigmaWindowChange?.[0]),
    metric('d4sigma_window_change_y', 'D4σ y: fall with the window cut to 80 %', '1', (s) => s.metrics.d4sigmaWindowChange?.[1]),
    metric('first_min_x_m', 'first minimum x', 'm', (s) => s.metrics.firstMinimum[0]),
    metric('first_min_y_m', 'first minimum y', 'm', (s) => s.metrics.firstMinimum[1]),
  ],
  definitions: {
    fwhm:
      'full width at half maximum of the profile through the peak, per axis: the distance between the outermost half-maximum crossings, i.e. the width of the spot envelope (at Fresnel numbers of a few the fringes near the peak are narrower); null when the profile does not fall to half within the window',
    e2Width: 'full width between the outermost crossings of peak/e² on the profile through the peak',
    d4sigma: 'second-moment (D4σ) width about the centroid over the window (ISO 11146 definition)',
    d4sigmaWindowChange:
      '1 − D4σ over the central 80 % of the window (per axis) / D4σ over the whole window: near 0 where the light lies well inside the window; hard-edged apertures send wings (sinc², Airy) whose second moment grows with the window, so where this is more than a few per cent D4σ describes the window as much as the spot: read the FWHM or the encircled-energy widths instead',
  },
};
