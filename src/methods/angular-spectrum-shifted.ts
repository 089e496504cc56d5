// The angular spectrum in the frame of a tilted beam (src/optics/shifted-spectrum.ts): the carrier
// taken out of the source, the grid shifted to where the beam lands.
import { fftAxis } from '../optics/field.js';
import { edgeSpectrumTail, gaussianSpectrumTail, shiftedGridFor, propagateShiftedSpectrum, restoreCarrier } from '../optics/shifted-spectrum.js';
import { axisPlan, windowOn } from '../plan/axis-plans.js';
import { costFft } from '../plan/costs.js';
import { featureSamples, oversampling, type Geometry } from '../plan/geometry.js';
import { illuminatedEdgeWeight } from '../plan/light.js';
import { LIMITS } from '../plan/limits.js';
import type { Case, Layout, Plan } from '../plan/types.js';
import { bandLimitChecks } from './angular-spectrum.js';
import type { MethodDescriptor, Sampling, Propagated, PropagationInputs } from './types.js';
import { angularSpectrumValidity } from './validity.js';
import { separableProfiles } from '../optics/aperture.js';
import { sourceField1D, sourceField2D } from '../optics/source.js';
import { padField } from '../optics/spectral.js';
import { cropTo, sourceAxis } from './grid-steps.js';

export const angularSpectrumShifted: MethodDescriptor = {
  id: 'angular-spectrum-shifted',
  method: 'angular-spectrum',
  form: 'shifted',
  grid: 'transfer',
  // Its propagation (propagateShiftedSpectrum) transforms the source each time: no spectrum is kept.
  sharesSourceSpectrum: false,
  apertureCells: false,
  binaryOnly: false,
  closedForm: false,
  validity: angularSpectrumValidity,
  sample: shiftedSampling,
  words: { method: 'angular spectrum', form: 'in the tilted beam\'s frame, the grid shifted to where it lands' },
  checks: bandLimitChecks,
  propagate: propagateShifted,
};

/**
 * The angular spectrum in the frame of a tilted beam (src/optics/shifted-spectrum.ts): the carrier
 * is taken out of the source and the grid shifted to where the beam lands, so the grid is as large
 * as the beam, not as the span from the aperture to the window, and its pitch resolves the
 * envelope, not the carrier. For one tilted beam (a plain aperture); a grating's orders go in many
 * directions at once.
 */
function shiftedSampling(g: Geometry, c: Case): Sampling | null {
  const layout: Layout = g.oneD ? 'one-d' : 'two-d';
  const tilted = g.carrier[0] !== 0 || (!g.oneD && g.carrier[1] !== 0);
  if (!tilted || g.model.propagating.length !== 1 || c.grid?.size) return null;
  const lam = g.lam;
  const carrier: [number, number] = [g.carrier[0], g.oneD ? 0 : g.carrier[1]];
  const feature = g.facts.minFeature / featureSamples(g, false);
  const beamPitch = Number.isFinite(g.waist) ? g.waist / 8 : Infinity;
  const maxPitch: [number, number] = [Math.min(feature, beamPitch), Math.min(feature, beamPitch)];
  let grid;
  try {
    grid = shiftedGridFor({
      wavelength: lam,
      z: g.z,
      carrier,
      centre: [g.centre[0], g.oneD ? 0 : g.centre[1]],
      footprint: [g.aEff[0], g.oneD ? 0 : g.aEff[1]],
      window: [g.windowHalf[0], g.oneD ? 0 : g.windowHalf[1]],
      oneD: g.oneD,
      samplesPerPeriod: oversampling(g, false),
      maxPitch,
      ...(c.grid?.pitch ? { pitch: [c.grid.pitch, c.grid.pitch] as [number, number] } : {}),
      tail: Number.isFinite(g.waist) && illuminatedEdgeWeight(g.facts, g.waist, g.oneD) < 1e-4 ? gaussianSpectrumTail(g.waist) : edgeSpectrumTail(g.model.beamEdgesPerPower),
      target: LIMITS.bandLimitTarget,
      maxSamples: g.oneD ? 1 << 24 : 1 << 16,
    });
  } catch {
    return null;
  }
  const axes = (g.oneD ? [0] : [0, 1]).map((i) => {
    const p = grid.pitch[i]!;
    const padded = grid.samples[i]!;
    // The illuminated aperture and two samples to spare (it is padded into the grid, which is what is transformed).
    const n = Math.min(padded, Math.ceil((2 * g.aEff[i]!) / p) + 2);
    // The output lattice is the grid's own, shifted by the centre.
    const lattice = fftAxis(padded, p);
    const output = windowOn({ n: lattice.n, start: lattice.start + grid.centre[i]!, step: p }, g.centre[i]!, g.windowHalf[i]!);
    const rule = { pitch: p, required: Math.min(p, maxPitch[i]!), rule: `the tilted beam's envelope, sampled in its own frame (the carrier taken out)` };
    return axisPlan(g, i, rule, n, padded, output);
  });
  const cost = costFft(axes, layout);
  // Measured peaks ran 1–4 % above costFft's figure on 5-smooth grids (189–201 MB against 193 MB
  // for a 1152² grid, test/plan/memory-estimate.test.ts): one more padded complex array is counted
  // for the frame's own tables and tapers, so that the guard errs on the safe side.
  const np = axes.reduce((q, a) => q * a.paddedSamples, 1);
  return { axes, layout, memory: cost.memory + 16 * np, work: cost.work, shifted: { centre: grid.centre, taper: grid.taper, bandTaper: grid.bandTaper } };
}

/**
 * The envelope without its carrier, padded, shifted to where the beam lands; the carrier goes back
 * only where the free wave must interfere (Babinet).
 */
function propagateShifted(plan: Plan, run: PropagationInputs): Propagated {
  const c = plan.case;
  const lam = c.wavelength;
  const z = c.distance;
  const ill = c.illumination;
  const carrier = run.carrier;
  const obstructed = run.obstructed;
  const outX = plan.x.output;
  const outY = plan.y ? plan.y.output : null;
  const sh = plan.shifted!;
  const oneD = plan.layout === 'one-d';
  const prof = oneD ? separableProfiles(c.aperture)!.x : null;
  const src = prof
    ? sourceField1D(prof, ill, sourceAxis(plan.x, true), lam, 0, { sampleCarrier: false, obstructed })
    : sourceField2D(c.aperture, ill, sourceAxis(plan.x, true), sourceAxis(plan.y!, true), lam, { sampleCarrier: false, obstructed });
  const powerIn = src.power;
  const grid = padField(src.field, plan.x.paddedSamples, oneD ? 1 : plan.y!.paddedSamples, run.engine);
  const res = propagateShiftedSpectrum(run.engine, grid, z, [carrier[0], oneD ? 0 : carrier[1]], sh.centre, { taper: sh.taper, bandTaper: sh.bandTaper, inPlace: true });
  const out = cropTo(res.field, outX, outY);
  run.engine.release(grid.data);
  if (plan.babinet) restoreCarrier(out, [carrier[0], oneD ? 0 : carrier[1]]);
  return { field: out, report: { bandLimitLoss: res.report.bandLimitLoss, evanescentLoss: res.report.evanescentLoss, bandLimit: [Infinity, Infinity] }, powerIn };
}
