// Carries out a plan: builds the source field, propagates it with the planned method and layout,
// cuts out the window and measures the numerical diagnostics the validity checks need.
import { apertureFacts, isOneDAperture, isRound, separableProfiles } from '../optics/aperture.js';
import { boundaryRegionsOf, rsBoundary } from '../optics/rs-boundary.js';
import { centredAxis, createField, fftAxis, intensityOf, powerOf, releaseSamples, type Axis, type Field } from '../optics/field.js';
import { propagateFarField, propagateFarFieldSeparable, propagateFresnelDirect } from '../optics/direct.js';
import { complementInPlace, freeField } from '../optics/free.js';
import { carrierFrequencies, sourceField1D, sourceField2D } from '../optics/source.js';
import {
  angularSpectrumTransfer,
  compensateCellResponse,
  padField,
  propagateByTransfer,
  toSpectrum,
  type SourceSpectrum,
  type SpectralReport,
  type TransferSpec,
} from '../optics/spectral.js';
import { propagationPhase, rotate } from '../optics/phase.js';
import { erf } from '../optics/special.js';
import { propagateFresnelSingleFFT } from '../optics/single-fft.js';
import { propagateShiftedSpectrum, restoreCarrier } from '../optics/shifted-spectrum.js';
import { cellsFromIntervals, rsCells2DFromAperture, rsDirect1D, rsDirect2D, rsPerPeriod1D, rsSum2D, type Interval } from '../optics/rayleigh-sommerfeld.js';
import type { Illumination, Profile } from '../optics/aperture.js';
import { LIMITS } from '../plan/limits.js';
import type { AxisPlan, Plan } from '../plan/types.js';

export interface Diagnostics {
  /** Power through the aperture (W per unit incident irradiance; per metre of slit length in 1-D). */
  powerIn: number;
  /** Power of the diffracted (open-part) field inside the window. */
  powerInWindow: number;
  bandLimitLoss?: number;
  evanescentLoss?: number;
  /** Fraction of the power in the outer frame of the padded FFT grid (wrap-around risk). */
  edgeEnergy?: number;
  /** For a shared source (plan.sharedSpectrum): whether its spectrum was computed here or reused. */
  sourceSpectrum?: 'computed' | 'reused';
}

export interface ComputedCase {
  /** |U|² relative to the incident irradiance, row-major [rows][cols]. */
  intensity: Float64Array;
  rows: number;
  cols: number;
  /** [dx, dy]; dy is null for 1-D results (invariant along y). */
  pitch: [number, number | null];
  /** Coordinates of sample [0][0]. */
  origin: [number, number];
  /** [col, row] of the optical axis (x = y = 0), fractional in general. */
  center: [number, number];
  diagnostics: Diagnostics;
}

function sourceAxis(a: AxisPlan, fft: boolean): Axis {
  return fft ? fftAxis(a.inputSamples, a.inputPitch) : centredAxis(a.inputSamples, a.inputPitch);
}

/** Copies the samples of f that fall on the output axes (which lie on f's lattice). */
function cropTo(f: Field, outX: Axis, outY: Axis | null): Field {
  const out = createField(outX, outY, f.wavelength);
  const c0 = Math.round((outX.start - f.x0) / f.dx);
  const r0 = outY ? Math.round((outY.start - f.y0) / f.dy) : 0;
  for (let r = 0; r < out.ny; r++) {
    const src = 2 * ((r + r0) * f.nx + c0);
    out.data.set(f.data.subarray(src, src + 2 * out.nx), 2 * r * out.nx);
  }
  return out;
}

function edgeEnergy(f: Field): number {
  const fx = Math.max(1, Math.floor(f.nx * LIMITS.edgeFrame));
  const fy = f.ny === 1 ? 0 : Math.max(1, Math.floor(f.ny * LIMITS.edgeFrame));
  let edge = 0;
  let total = 0;
  for (let r = 0; r < f.ny; r++) {
    const rowEdge = r < fy || r >= f.ny - fy;
    for (let c = 0; c < f.nx; c++) {
      const i = 2 * (r * f.nx + c);
      const p = f.data[i]! * f.data[i]! + f.data[i + 1]! * f.data[i + 1]!;
      total += p;
      if (rowEdge || c < fx || c >= f.nx - fx) edge += p;
    }
  }
  return total > 0 ? edge / total : 0;
}

interface Propagated {
  field: Field;
  report?: SpectralReport;
  edge?: number;
}

/**
 * The spectrum of the last shared source this thread computed (plans with sharedSpectrum): the
 * next case of the same sweep starts from it instead of building and transforming the source.
 */
let kept: { key: string; spectrum: SourceSpectrum; powerIn: number; work?: Float64Array } | null = null;

/** Lets go of the kept spectrum (at the end of a run, so that a library caller gets the memory back). */
export function releaseKeptSpectrum(): void {
  kept = null;
}

function transferFor(plan: Plan, grid: Field): TransferSpec {
  const z = plan.case.distance;
  return plan.method === 'angular-spectrum' ? angularSpectrumTransfer(grid, z) : { kind: 'fresnel', z, wavelength: grid.wavelength };
}

function cutOut(grid: Field, report: SpectralReport, outX: Axis, outY: Axis | null): Propagated {
  return { field: cropTo(grid, outX, outY), report, edge: edgeEnergy(grid) };
}

/**
 * Propagates a source with an FFT method on its padded grid and cuts out the window. With `keep`,
 * the source's spectrum is kept (a copy) for the next cases of the sweep.
 */
function propagateOnGrid(
  src: Field,
  plan: Plan,
  padded: [number, number],
  outX: Axis,
  outY: Axis | null,
  carrier: [number, number],
  keep?: { key: string; powerIn: number },
): Propagated {
  const grid = padField(src, padded[0], padded[1]);
  const comp = { carrier };
  const spec = transferFor(plan, grid);
  if (!keep) {
    const out = cutOut(grid, propagateByTransfer(grid, spec, comp), outX, outY);
    // Nothing refers to the padded grid any more: the next case of its size may have it.
    releaseSamples(grid.data);
    return out;
  }
  const totalPower = toSpectrum(grid);
  kept = { key: keep.key, spectrum: { data: grid.data.slice(), totalPower }, powerIn: keep.powerIn };
  // The grid holds the spectrum now: it is read and overwritten in one pass, and kept as the
  // grid the sweep's next distance writes into.
  const out = cutOut(grid, propagateByTransfer(grid, spec, comp, { data: grid.data, totalPower }), outX, outY);
  kept.work = grid.data;
  return out;
}

/**
 * The same from a kept spectrum: no source, no forward transform. The padded grid of the previous
 * distance is written over (every sample of it is), which spares allocating and zeroing one.
 */
function propagateKept(plan: Plan, outX: Axis, outY: Axis | null, carrier: [number, number]): Propagated {
  const k = kept!;
  const xa = fftAxis(plan.x.paddedSamples, plan.x.inputPitch);
  const ya = fftAxis(plan.y!.paddedSamples, plan.y!.inputPitch);
  const grid =
    k.work?.length === 2 * xa.n * ya.n
      ? { data: k.work, nx: xa.n, ny: ya.n, dx: xa.step, dy: ya.step, x0: xa.start, y0: ya.start, wavelength: plan.case.wavelength }
      : createField(xa, ya, plan.case.wavelength);
  k.work = grid.data;
  return cutOut(grid, propagateByTransfer(grid, transferFor(plan, grid), { carrier }, k.spectrum), outX, outY);
}

/**
 * The single-FFT form: the (cell-corrected) aperture samples are zero-padded onto the FFT grid,
 * the tilt carrier multiplied in, and the window cut out of the output lattice.
 */
function propagateSingleFft(src: Field, plan: Plan, padded: [number, number], outX: Axis, outY: Axis | null, carrier: [number, number]): Propagated {
  compensateCellResponse(src);
  const grid = padField(src, padded[0], padded[1]);
  multiplyCarrier(grid, carrier);
  const out = propagateFresnelSingleFFT(grid, plan.case.distance);
  return { field: cropTo(out, outX, outY) };
}

function multiplyCarrier(f: Field, carrier: [number, number]): void {
  if (carrier[0] === 0 && carrier[1] === 0) return;
  for (let r = 0; r < f.ny; r++) {
    const y = f.ny === 1 ? 0 : f.y0 + r * f.dy;
    for (let c = 0; c < f.nx; c++) {
      rotate(f.data, 2 * (r * f.nx + c), 2 * Math.PI * (carrier[0] * (f.x0 + c * f.dx) + carrier[1] * y));
    }
  }
}

function propagate1D(src: Field, plan: Plan, axis: AxisPlan, carrier: number): Propagated {
  const z = plan.case.distance;
  if (plan.method === 'angular-spectrum' || plan.form === 'transfer-function') {
    return propagateOnGrid(src, plan, [axis.paddedSamples, 1], axis.output, null, [carrier, 0]);
  }
  if (plan.form === 'single-fft') return propagateSingleFft(src, plan, [axis.paddedSamples, 1], axis.output, null, [carrier, 0]);
  if (plan.method === 'fresnel') {
    compensateCellResponse(src);
    return { field: propagateFresnelDirect(src, z, axis.output, null, [carrier, 0]) };
  }
  return { field: propagateFarField(src, z, axis.output, null, [carrier, 0]) };
}

/** The open intervals of a 1-D profile, centred on the axis as the masks centre it. */
export function profileIntervals(p: Profile): Interval[] {
  if (p.kind === 'interval') return [{ lo: -p.width / 2, hi: p.width / 2 }];
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


/**
 * The exact integral for a 1-D aperture: a grating lit by a plane wave as one period's field
 * summed over its periods, anything else by the direct sums over cells with exact edges.
 */
function propagateExact1D(plan: Plan, prof: Profile, ill: Illumination, open: Interval[]): Field {
  const c = plan.case;
  const lam = c.wavelength;
  const sinTilt = Math.sin(ill.tilt[0]);
  const maxCell = plan.x.inputPitch;
  const out = plan.x.output;
  const f = createField(out, null, lam);
  if (plan.form === 'per-period' && prof.kind === 'grating') {
    const first = -((prof.count - 1) / 2) * prof.period - prof.width / 2;
    const periodic = plan.x.periodic!;
    f.data.set(
      rsPerPeriod1D(
        { period: prof.period, count: prof.count, firstOrigin: first, open: [{ lo: 0, hi: prof.width }] },
        { sinTilt },
        lam,
        c.distance,
        { axis: out, p: periodic.p, s: periodic.s },
        maxCell,
      ),
    );
    return f;
  }
  const light = ill.kind === 'gaussian' ? { sinTilt, waist: ill.waist } : { sinTilt };
  const cells = cellsFromIntervals(open, light, lam, maxCell);
  f.data.set(rsDirect1D(cells, lam, c.distance, out));
  return f;
}

export function computeCase(plan: Plan): ComputedCase {
  if (plan.error) throw new Error(plan.error);
  const c = plan.case;
  const lam = c.wavelength;
  const z = c.distance;
  const ill = c.illumination;
  const fft = plan.method === 'angular-spectrum' || plan.form === 'transfer-function';
  const carrier = carrierFrequencies(ill, lam);
  const outX = plan.x.output;
  const outY = plan.y ? plan.y.output : null;
  // An obstacle in a Gaussian beam (not Babinet: see the planner) is the beam where it is not.
  const obstructed = c.aperture.opaque && !plan.babinet;
  const opts = { sampleCarrier: fft, obstructed };
  let result: Propagated;
  let powerIn: number;
  let reused = false;

  if (plan.form === 'shifted') {
    // The angular spectrum in the tilted beam's frame: envelope without its carrier, padded, shifted
    // to where the beam lands; the carrier goes back only where the free wave must interfere.
    const sh = plan.shifted!;
    const oneD = plan.layout === 'one-d';
    const prof = oneD ? separableProfiles(c.aperture)!.x : null;
    const src = prof
      ? sourceField1D(prof, ill, sourceAxis(plan.x, true), lam, 0, { sampleCarrier: false, obstructed })
      : sourceField2D(c.aperture, ill, sourceAxis(plan.x, true), sourceAxis(plan.y!, true), lam, { sampleCarrier: false, obstructed });
    powerIn = src.power;
    const grid = padField(src.field, plan.x.paddedSamples, oneD ? 1 : plan.y!.paddedSamples);
    const res = propagateShiftedSpectrum(grid, z, [carrier[0], oneD ? 0 : carrier[1]], sh.centre, { taper: sh.taper, bandTaper: sh.bandTaper, inPlace: true });
    const out = cropTo(res.field, outX, outY);
    releaseSamples(grid.data);
    if (plan.babinet) restoreCarrier(out, [carrier[0], oneD ? 0 : carrier[1]]);
    result = { field: out, report: { bandLimitLoss: res.report.bandLimitLoss, evanescentLoss: res.report.evanescentLoss, bandLimit: [Infinity, Infinity] } };
  } else if (plan.method === 'rayleigh-sommerfeld' && plan.layout === 'one-d') {
    if (!isOneDAperture(c.aperture)) throw new Error('one-d layout for a 2-D aperture');
    const prof = separableProfiles(c.aperture)!.x;
    const open = obstructed ? complementWithin(profileIntervals(prof), plan.x.apertureHalf) : profileIntervals(prof);
    powerIn = intervalsPower(open, ill);
    result = { field: propagateExact1D(plan, prof, ill, open) };
  } else if (plan.form === 'boundary') {
    // The exact integral along the aperture's boundary. For an obstacle, its hole's (Babinet below,
    // with the free wave e^{ikz} exact at normal incidence), so that the window's power is the
    // diffracted light's as for every other method.
    powerIn = apertureFacts(c.aperture).openMeasure;
    result = { field: rsBoundary(boundaryRegionsOf({ ...c.aperture, opaque: false })!, lam, z, outX, outY!) };
  } else if (plan.method === 'rayleigh-sommerfeld' && plan.exact2D) {
    // Boxes and exact edge cells (for an obstacle in a plane wave: its hole, for Babinet below).
    const cells = rsCells2DFromAperture(c.aperture, ill, lam, plan.x.inputPitch, { edgeNodes: plan.exact2D.edgeNodes });
    powerIn = cells.power;
    result = { field: rsSum2D(cells, lam, z, outX, outY!).field };
  } else if (plan.method === 'rayleigh-sommerfeld') {
    const { field: src, power } = sourceField2D(c.aperture, ill, sourceAxis(plan.x, false), sourceAxis(plan.y!, false), lam, { sampleCarrier: false, obstructed });
    powerIn = power;
    const k = (2 * Math.PI) / lam;
    result = { field: rsDirect2D(src, z, outX, outY!, [k * carrier[0] * lam, k * carrier[1] * lam]) };
  } else if (plan.layout === 'one-d') {
    if (!isOneDAperture(c.aperture)) throw new Error('one-d layout for a 2-D aperture');
    const prof = separableProfiles(c.aperture)!.x;
    const src = sourceField1D(prof, ill, sourceAxis(plan.x, fft), lam, carrier[0], opts);
    powerIn = src.power;
    result = propagate1D(src.field, plan, plan.x, carrier[0]);
  } else if (plan.layout === 'separable') {
    const prof = separableProfiles(c.aperture)!;
    const yPlan = plan.y!;
    const sx = sourceField1D(prof.x, ill, sourceAxis(plan.x, fft), lam, carrier[0], opts);
    const sy = sourceField1D(prof.y!, ill, sourceAxis(yPlan, fft), lam, carrier[1], opts);
    powerIn = sx.power * sy.power;
    if (plan.method === 'fraunhofer') {
      result = { field: propagateFarFieldSeparable(sx.field, sy.field, z, outX, outY!, carrier) };
    } else {
      // Paraxial propagation factorises: U(x,y) = Ux(x)·Uy(y)·e^{−ikz} (each 1-D factor carries e^{ikz}).
      const px = propagate1D(sx.field, plan, plan.x, carrier[0]);
      const py = propagate1D(sy.field, plan, yPlan, carrier[1]);
      const f = createField(outX, outY, lam);
      const kz = propagationPhase(z, lam);
      for (let r = 0; r < f.ny; r++) {
        const ar = py.field.data[2 * r]!;
        const ai = py.field.data[2 * r + 1]!;
        for (let col = 0; col < f.nx; col++) {
          const br = px.field.data[2 * col]!;
          const bi = px.field.data[2 * col + 1]!;
          const i = 2 * (r * f.nx + col);
          f.data[i] = ar * br - ai * bi;
          f.data[i + 1] = ar * bi + ai * br;
          rotate(f.data, i, -kz);
        }
      }
      const loss = (a?: number, b?: number) => (a === undefined ? undefined : 1 - (1 - a) * (1 - (b ?? 0)));
      const merged: SpectralReport | undefined = px.report
        ? {
            bandLimitLoss: loss(px.report.bandLimitLoss, py.report?.bandLimitLoss)!,
            evanescentLoss: loss(px.report.evanescentLoss, py.report?.evanescentLoss)!,
            bandLimit: [px.report.bandLimit[0], py.report?.bandLimit[0] ?? Infinity],
          }
        : undefined;
      result = {
        field: f,
        ...(merged ? { report: merged } : {}),
        ...(px.edge !== undefined ? { edge: Math.max(px.edge, py.edge ?? 0) } : {}),
      };
    }
  } else if ((reused = fft && !!plan.sharedSpectrum && kept?.key === plan.sharedSpectrum.id)) {
    powerIn = kept!.powerIn;
    result = propagateKept(plan, outX, outY, carrier);
  } else {
    // A kept spectrum of another shared source is of no further use: let it go before allocating.
    // (Unshared cases, such as a search's extra propagations, leave it for the sweep's next case.)
    if (plan.sharedSpectrum) kept = null;
    const { field: src, power } = sourceField2D(c.aperture, ill, sourceAxis(plan.x, fft), sourceAxis(plan.y!, fft), lam, opts);
    powerIn = power;
    const padded: [number, number] = [plan.x.paddedSamples, plan.y!.paddedSamples];
    const keep = plan.sharedSpectrum ? { key: plan.sharedSpectrum.id, powerIn } : undefined;
    if (fft) result = propagateOnGrid(src, plan, padded, outX, outY, carrier, keep);
    else if (plan.form === 'single-fft') result = propagateSingleFft(src, plan, padded, outX, outY, carrier);
    else if (plan.method === 'fresnel') {
      compensateCellResponse(src);
      result = { field: propagateFresnelDirect(src, z, outX, outY, carrier) };
    } else {
      // A centred round aperture in an untilted beam has a radially symmetric spectrum.
      const radial = isRound(c.aperture) && ill.tilt[0] === 0 && ill.tilt[1] === 0;
      result = { field: propagateFarField(src, z, outX, outY, carrier, { radial }) };
    }
  }

  const field = result.field;
  const powerInWindow = powerOf(field);
  if (plan.babinet) complementInPlace(field, freeField(ill, z, outX, outY, lam));
  const intensity = intensityOf(field);
  const diagnostics: Diagnostics = { powerIn, powerInWindow };
  if (result.report) {
    diagnostics.bandLimitLoss = result.report.bandLimitLoss;
    diagnostics.evanescentLoss = result.report.evanescentLoss;
  }
  if (result.edge !== undefined) diagnostics.edgeEnergy = result.edge;
  if (plan.sharedSpectrum && fft && plan.layout === 'two-d') diagnostics.sourceSpectrum = reused ? 'reused' : 'computed';
  return {
    intensity,
    rows: field.ny,
    cols: field.nx,
    pitch: [field.dx, outY ? field.dy : null],
    origin: [field.x0, field.y0],
    center: [-field.x0 / field.dx, outY ? -field.y0 / field.dy : 0],
    diagnostics,
  };
}
