// Propagation by a transfer function on a padded FFT grid (the angular spectrum, Fresnel's transfer
// function), and the source spectrum a sweep in distance keeps between its cases (plan/share.ts).
import type { Engine } from '../optics/engine.js';
import { createField, fftAxis, type Axis, type Field } from '../optics/field.js';
import { sourceField2D } from '../optics/source.js';
import { padField, propagateByTransfer, toSpectrum, type SpectralReport, type TransferSpec } from '../optics/spectral.js';
import type { Plan } from '../plan/types.js';
import { cropTo, edgeEnergy, sourceAxis } from './grid-steps.js';
import type { FieldStep, KeptSpectrum, Propagated, PropagationInputs, SpectrumKeeper } from './types.js';

/** The form's transfer function for a padded grid at distance z. */
export type TransferOf = (grid: Field, z: number) => TransferSpec;

/** A holder with nothing kept; the runner makes one per thread (src/run/context.ts). */
export function newSpectrumKeeper(): SpectrumKeeper {
  return { kept: null };
}

function cutOut(grid: Field, report: SpectralReport, outX: Axis, outY: Axis | null): FieldStep {
  return { field: cropTo(grid, outX, outY), report, edge: edgeEnergy(grid) };
}

/**
 * Propagates a source on its padded grid and cuts out the window. With `keep`, the source's
 * spectrum is kept (a copy) in `spectra` for the next cases of the sweep.
 */
export function propagateOnGrid(
  engine: Engine,
  src: Field,
  plan: Plan,
  transfer: TransferOf,
  padded: [number, number],
  outX: Axis,
  outY: Axis | null,
  carrier: [number, number],
  keep?: { key: string; powerIn: number; spectra: SpectrumKeeper },
): FieldStep {
  const grid = padField(src, padded[0], padded[1], engine);
  const comp = { carrier };
  const spec = transfer(grid, plan.case.distance);
  if (!keep) {
    const out = cutOut(grid, propagateByTransfer(engine, grid, spec, comp), outX, outY);
    // Nothing refers to the padded grid any more: the next case of its size may have it.
    engine.release(grid.data);
    return out;
  }
  const totalPower = toSpectrum(engine, grid);
  const kept: KeptSpectrum = { key: keep.key, spectrum: { data: grid.data.slice(), totalPower }, powerIn: keep.powerIn };
  keep.spectra.kept = kept;
  // The grid holds the spectrum now: it is read and overwritten in one pass, and kept as the
  // grid the sweep's next distance writes into.
  const out = cutOut(grid, propagateByTransfer(engine, grid, spec, comp, { data: grid.data, totalPower }), outX, outY);
  kept.work = grid.data;
  return out;
}

/**
 * The same from a kept spectrum: no source, no forward transform. The padded grid of the previous
 * distance is written over (every sample of it is), which spares allocating and zeroing one.
 */
function propagateKept(engine: Engine, k: KeptSpectrum, plan: Plan, transfer: TransferOf, outX: Axis, outY: Axis | null, carrier: [number, number]): FieldStep {
  const xa = fftAxis(plan.x.paddedSamples, plan.x.inputPitch);
  const ya = fftAxis(plan.y!.paddedSamples, plan.y!.inputPitch);
  const grid =
    k.work?.length === 2 * xa.n * ya.n
      ? { data: k.work, nx: xa.n, ny: ya.n, dx: xa.step, dy: ya.step, x0: xa.start, y0: ya.start, wavelength: plan.case.wavelength }
      : createField(xa, ya, plan.case.wavelength, engine.allocate);
  k.work = grid.data;
  return cutOut(grid, propagateByTransfer(engine, grid, transfer(grid, plan.case.distance), { carrier }, k.spectrum), outX, outY);
}

/** A 2-D grid: from the kept spectrum when it is this plan's shared source, else from the source. */
export function transferOnGrid2D(plan: Plan, run: PropagationInputs, transfer: TransferOf): Propagated {
  const c = plan.case;
  const outX = plan.x.output;
  const outY = plan.y ? plan.y.output : null;
  const spectra = run.spectra;
  const kept = spectra.kept;
  const reused = !!plan.sharedSpectrum && kept?.key === plan.sharedSpectrum.id;
  let powerIn: number;
  let result: FieldStep;
  if (reused) {
    powerIn = kept!.powerIn;
    result = propagateKept(run.engine, kept!, plan, transfer, outX, outY, run.carrier);
  } else {
    // A kept spectrum of another shared source is of no further use: let it go before allocating.
    // (Unshared cases, such as a search's extra propagations, leave it for the sweep's next case.)
    if (plan.sharedSpectrum) spectra.kept = null;
    const { field: src, power } = sourceField2D(c.aperture, c.illumination, sourceAxis(plan.x, true), sourceAxis(plan.y!, true), c.wavelength, { sampleCarrier: true, obstructed: run.obstructed });
    powerIn = power;
    const padded: [number, number] = [plan.x.paddedSamples, plan.y!.paddedSamples];
    const keep = plan.sharedSpectrum ? { key: plan.sharedSpectrum.id, powerIn, spectra } : undefined;
    result = propagateOnGrid(run.engine, src, plan, transfer, padded, outX, outY, run.carrier, keep);
  }
  return { ...result, powerIn, ...(plan.sharedSpectrum ? { sourceSpectrum: reused ? 'reused' : 'computed' } : {}) };
}
