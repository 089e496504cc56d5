// The plan in words, for `spotcast plan` and the console.
import { describe } from '../optics/aperture.js';
import { formatAngle, formatLength, trimNumber } from '../job/units.js';
import { bytes, methodWords } from './planner.js';
import type { Plan } from './types.js';
import { sourceWords } from './curved-light.js';

const len = (x: number) => formatLength(x, 4);

export function illuminationWords(p: Plan): string {
  const ill = p.case.illumination;
  // Curved light: the source itself (the flat light standing in for it is in the reasons).
  if (p.case.source) return `${sourceWords(p.case.source, p.case.wavelength)}, irradiance 1 at the aperture's centre`;
  const tilt =
    ill.tilt[0] === 0 && ill.tilt[1] === 0
      ? 'normal incidence'
      : `tilted ${formatAngle(ill.tilt[0])} in x, ${formatAngle(ill.tilt[1])} in y`;
  return ill.kind === 'plane'
    ? `plane wave, unit irradiance, ${tilt}`
    : `Gaussian beam, waist radius ${len(ill.waist)} at the aperture, peak irradiance 1, ${tilt}`;
}

export function formatPlan(p: Plan): string {
  const c = p.case;
  const lines: string[] = [];
  lines.push(`case ${c.id}`);
  lines.push(`  aperture     ${describe(c.aperture)}${p.babinet ? ' (computed by Babinet: free beam minus the complementary hole)' : ''}`);
  lines.push(`  light        λ = ${len(c.wavelength)}, ${illuminationWords(p)}`);
  lines.push(`  distance     ${len(c.distance)}`);
  lines.push(`  regime       ${p.regime}, N_F = ${trimNumber(p.checks.effectiveFresnelNumber, 4)}`);
  lines.push(`  method       ${methodWords(p.method, p.form)}, ${p.layout === 'one-d' ? '1-D (invariant along y)' : p.layout === 'separable' ? 'separable (two 1-D problems)' : '2-D grid'}`);
  for (const [name, a] of p.y ? ([['x', p.x], ['y', p.y]] as const) : ([['x', p.x]] as const)) {
    const input =
      p.method === 'rayleigh-sommerfeld' && p.layout === 'one-d'
        ? p.form === 'per-period'
          ? `one period in ${a.inputSamples} cell${a.inputSamples === 1 ? '' : 's'} of at most ${len(a.inputPitch)} (edges exact), summed over the periods`
          : `${a.inputSamples} cells of at most ${len(a.inputPitch)} over the open intervals (edges exact)`
        : `${a.inputSamples}${a.paddedSamples !== a.inputSamples ? ` (padded ${a.paddedSamples})` : ''} samples at ${len(a.inputPitch)}`;
    lines.push(`  grid ${name}       ${input}; window ${len(2 * a.windowHalf)}${a.windowCentre !== 0 ? ` centred at ${len(a.windowCentre)}` : ''} as ${a.output.n} samples at ${len(a.output.step)}`);
  }
  const fftGrid = p.x.paddedSamples !== p.x.inputSamples && p.layout === 'two-d';
  lines.push(
    `  memory       about ${bytes(p.memoryBytes)} at peak` +
      (fftGrid ? ` (source, padded grid, the FFT's working copy${p.sharedSpectrum ? ', the kept source spectrum' : ''}, window)` : ''),
  );
  if (p.sharedSpectrum) {
    lines.push(`  shared       the source's spectrum is computed once for the ${p.sharedSpectrum.cases} cases on this grid (source ${p.sharedSpectrum.id})`);
  }
  lines.push('  why');
  for (const r of p.reasons) lines.push(`    - ${r}`);
  lines.push('  checks');
  const k = p.checks;
  lines.push(
    `    paraxial error where the light lands ${trimNumber(k.paraxialPhaseError, 3)} rad (weighted by the light; ` +
      (k.paraxialWorst ? `largest at ${len(k.paraxialWorst.at[0])}${p.y ? `, ${len(k.paraxialWorst.at[1])}` : ''}: ${trimNumber(k.paraxialWorst.phase, 3)} rad where the light is ${trimNumber(100 * k.paraxialWorst.weight, 3)} % of the peak` : '') +
      `); Goodman ratio over the window ${trimNumber(k.goodmanRatio, 3)}`,
  );
  lines.push(`    far-field neglected phase π·N_F ${trimNumber(k.farFieldPhaseError, 3)} rad; far field from ${len(k.farFieldDistance)}`);
  lines.push(
    `    smallest feature ${trimNumber(k.featureOverWavelength, 4)} λ` +
      (p.method === 'rayleigh-sommerfeld' && p.layout === 'one-d' ? ' (cells end on the edges)' : `, ${trimNumber(k.samplesPerFeature, 3)} samples across it`),
  );
  if (k.evanescentFraction !== undefined && k.evanescentFraction >= 1e-4) lines.push(`    evanescent (never reaches the screen) about ${trimNumber(100 * k.evanescentFraction, 2)} % of the power through the aperture`);
  lines.push(`    estimated power outside the window ${trimNumber(100 * k.windowLossEstimate, 2)} %`);
  if (k.bandLimit) lines.push(`    band limit ${k.bandLimit.filter((b) => b !== null).map((b) => `${trimNumber(b! * 1e-3, 4)} /mm`).join(', ')}`);
  if (k.transferSampling !== undefined) lines.push(`    transfer-function sampling Δx/(λz/L) = ${trimNumber(k.transferSampling, 3)} (≥ 1 needed)`);
  if (p.warnings.length === 0 && !p.error) lines.push('  warnings     none before computing');
  for (const w of p.warnings) lines.push(`  warning      [${w.code}] ${w.message}`);
  if (p.error) lines.push(`  CANNOT RUN   ${p.error}`);
  return lines.join('\n');
}
