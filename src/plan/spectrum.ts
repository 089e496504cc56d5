// Planning a case of several wavelengths (the job's spectrum): every line is its own monochromatic
// case, planned as any other, and all of them are delivered onto ONE output grid, so that their
// intensities add sample by sample. The grid holds every line's window at the finest line's pitch;
// each line is then planned again with that grid imposed (Geometry.outputGrid): direct sums
// evaluate at its points, FFT lattices are made as fine as a whole fraction of its pitch so that
// its points are lattice points, and a form whose output cannot be put there is not offered.
// Nothing is interpolated. A band is sampled finely enough that from one sample to the next the
// intensity anywhere on the grid moves by at most half a fringe (more samples than asked, up to
// BAND_SAMPLES_MAX; beyond that a warning says the band shows as separate lines).
import { meanWavelength, ownSamples, spectrumLines, spectrumRange, spectrumWords, type SpectrumLine } from '../analysis/spectrum.js';
import { elementOf, isBinary } from '../elements/registry.js';
import { descriptorOf } from '../methods/registry.js';
import type { Axis } from '../optics/field.js';
import { firstOfEachCode, warning } from '../warnings/catalogue.js';
import { OffGridError, type OutputGrid } from './geometry.js';
import { LIMITS } from './limits.js';
import { shareSourceSpectra } from './share.js';

import type { Case, Plan, Warning } from './types.js';
import { len, seconds } from './words.js';
import { formatLength } from '../job/units.js';

/** A wavelength to five digits: lines of a doublet differ in the fourth. */
const wl = (x: number) => formatLength(x, 5);

/** The most wavelength samples the planner gives a band of its own accord. */
export const BAND_SAMPLES_MAX = 256;
/** Lines planned first to find the common grid (all of them when there are no more than this). */
const SCOUTS = 31;

export interface SpectrumPlan {
  /** The lines computed, with their weights (fractions of the total power, summing to 1). */
  lines: SpectrumLine[];
  /** One monochromatic plan per line, each delivering onto the case's output grid. */
  members: Plan[];
  /** Samples of a band: its own (asked or default), those the rule needs, those computed. */
  samples: { own: number; needed: number | null; used: number };
  /** The light in words. */
  words: string;
}

/** The planner's options a member is planned with (the caller's, with the grid imposed). */
export interface MemberPlanner<O> {
  plan(c: Case, opts: O & { outputGrid?: OutputGrid }): Plan;
  opts: O;
}

/** A member case: the case at one wavelength, its element seen at that wavelength. */
export function memberCase(c: Case, lam: number): Case {
  const { spectrum: _s, ...rest } = c;
  const element = elementOf(c.aperture);
  const aperture = element.atWavelength ? element.atWavelength(c.aperture as never, c.wavelength, lam) : c.aperture;
  // A spectrometer is the whole case's (its detector sums the lines): a line's own plan has none.
  const { spectrometer: _d, ...analysis } = c.analysis;
  return { ...rest, wavelength: lam, aperture: aperture as Case['aperture'], analysis };
}

/** Up to n lines spread over the list, first and last among them. */
function spread<T>(list: T[], n: number): T[] {
  if (list.length <= n) return list;
  return Array.from({ length: n }, (_, i) => list[Math.round((i * (list.length - 1)) / (n - 1))]!);
}

/**
 * The output step a line's plan asks for on one axis: a direct sum's own output step; an FFT
 * lattice's step only as fine as the direct sums' rule would ask (four times the intensity's
 * Nyquist rate λz/(2D), ten samples across the smallest detector, the fewest samples a picture
 * needs): a lattice fine for the source is finer than the intensity needs.
 */
function ownStep(p: Plan, i: 0 | 1): number {
  const a = i === 0 ? p.x : p.y!;
  if (descriptorOf(p).grid === 'direct') return a.output.step;
  const nyquist = (p.case.wavelength * p.case.distance) / (2 * 2 * Math.max(a.apertureHalf, 1e-300));
  const detector = Math.min(Infinity, ...p.case.analysis.detectors.map((d) => d.size / 10));
  const minN = p.y ? LIMITS.minOutput2D : LIMITS.minOutput1D;
  const wanted = Math.min(nyquist / 4, detector, (2 * a.windowHalf) / (minN - 1));
  return Math.max(a.output.step, wanted);
}

/** One axis holding every axis given, at the finest of the steps asked, its points on multiples of the step. */
function unionAxis(axes: Axis[], steps: number[], maxN: number): { axis: Axis; capped: boolean } {
  const lo = Math.min(...axes.map((a) => a.start));
  const hi = Math.max(...axes.map((a) => a.start + (a.n - 1) * a.step));
  let step = Math.min(...steps);
  let capped = false;
  const count = (s: number) => {
    const start = Math.floor(lo / s + 1e-9) * s;
    return { start, n: Math.ceil((hi - start) / s - 1e-9) + 1 };
  };
  let r = count(step);
  if (r.n > maxN) {
    capped = true;
    step = (hi - lo) / (maxN - 3);
    r = count(step);
  }
  return { axis: { n: r.n, start: r.start, step }, capped };
}

/**
 * The longest wavelength step at which the band's discrete samples still add up to its continuous
 * spread. The intensity at a point moves through one fringe when the wavelength changes by λ²/ΔL,
 * ΔL the spread of path lengths from the lit aperture to that point (the exact distances, so the
 * near field's Fresnel zones and the far field's D·sin θ alike; for a grating's order of resolving
 * power mN it is λ/(mN), its resolution element); half of that at the shortest wavelength, over
 * every point of the output grid (the spread is largest at its corners), is the step. (Measured on
 * a 0.5 mm square at 10 mm in 450–650 nm: a quarter fringe asked 149 samples; 32 were already within
 * 0.06 % of the peak of them, 16 within 0.3 %, 8 off by 3.7 %.)
 */
function wavelengthStep(scouts: Plan[], grid: OutputGrid): number {
  const first = scouts[0]!;
  const lam = first.case.wavelength;
  const z = first.case.distance;
  let spread = 0;
  for (const p of [first, scouts[scouts.length - 1]!]) {
    const a = [p.x.apertureHalf, p.y?.apertureHalf ?? 0];
    const ends = (i: 0 | 1) => {
      const ax = grid[i];
      return ax ? [ax.start, ax.start + (ax.n - 1) * ax.step] : [0];
    };
    for (const x of ends(0)) {
      for (const y of ends(1)) {
        const far = Math.hypot(z, Math.abs(x) + a[0]!, Math.abs(y) + a[1]!);
        const near = Math.hypot(z, Math.max(0, Math.abs(x) - a[0]!), Math.max(0, Math.abs(y) - a[1]!));
        spread = Math.max(spread, far - near);
      }
    }
  }
  return spread > 0 ? (lam * lam) / (2 * spread) : Infinity;
}

/** The first warning of each code among the members', in order. */
function memberWarnings(members: Plan[]): Warning[] {
  return firstOfEachCode(...members.map((m) => m.warnings));
}

/**
 * Plans a case of several wavelengths. `planner.plan` is the monochromatic planner (planCase),
 * passed in so that this module holds no planner of its own.
 */
export function planSpectrum<O extends object>(c: Case, planner: MemberPlanner<O>): Plan {
  const source = c.spectrum!;
  const own = ownSamples(source);
  const ownLines = spectrumLines(source);
  // 1. The scouts: lines planned on their own, to find the grid that holds them all.
  const scouts = spread(ownLines, SCOUTS).map((l) => planner.plan(memberCase(c, l.wavelength), planner.opts));
  const failed = scouts.find((p) => p.error);
  const oneD = scouts[0]!.y === null;
  const maxN = oneD ? LIMITS.maxOutput1D : LIMITS.maxOutput2D;
  const ux = unionAxis(scouts.map((p) => p.x.output), scouts.map((p) => ownStep(p, 0)), maxN);
  const uy = oneD ? null : unionAxis(scouts.map((p) => p.y!.output), scouts.map((p) => ownStep(p, 1)), maxN);
  const grid: OutputGrid = [ux.axis, uy ? uy.axis : null];
  const reasons: string[] = [];
  const warnings: Warning[] = [];

  // 2. A band's samples: as many as asked, more where the light moves faster than a pixel per sample.
  let lines = ownLines;
  let needed: number | null = null;
  if (source.kind !== 'lines') {
    const [lo, hi] = spectrumRange(source);
    const step = wavelengthStep(scouts, grid);
    needed = Number.isFinite(step) ? Math.ceil((hi - lo) / step) : 1;
    const used = Math.max(own, Math.min(needed, BAND_SAMPLES_MAX));
    if (used !== own) lines = spectrumLines(source, used);
    if (needed > used) {
      warnings.push(warning('spectrum-sampled-coarsely', { samples: used, needed, step: (hi - lo) / used }));
    }
  }

  // 3. Every line on the common grid.
  const members: Plan[] = [];
  let offGrid: { lam: number; why: string } | null = null;
  for (const l of lines) {
    try {
      members.push(planner.plan(memberCase(c, l.wavelength), { ...planner.opts, outputGrid: grid }));
    } catch (e) {
      if (!(e instanceof OffGridError)) throw e;
      offGrid = { lam: l.wavelength, why: e.message };
      break;
    }
  }
  const mid = members[Math.floor(members.length / 2)] ?? scouts[Math.floor(scouts.length / 2)]!;
  const used = lines.length;
  const words = spectrumWords(source, source.kind === 'lines' ? own : used);
  reasons.push(
    `light: ${words}, mean wavelength ${wl(meanWavelength(lines))}; each wavelength is computed on its own and the intensities are added with their powers (the lines are mutually incoherent), relative to the total incident irradiance.`,
  );
  if (needed !== null) {
    reasons.push(
      needed > own
        ? `${used} wavelength samples (${own} asked): from one sample to the next the intensity anywhere on the grid moves by at most half a fringe (λ²/ΔL, ΔL the spread of path lengths from the lit aperture)${needed > used ? ` only with ${needed}` : ''}.`
        : `${used} wavelength samples: from one to the next the intensity anywhere on the grid moves by less than half a fringe (λ²/ΔL, ΔL the spread of path lengths from the lit aperture; ${needed} would do).`,
    );
  }
  reasons.push(
    `one output grid for every wavelength: ${ux.axis.n}${uy ? ` × ${uy.axis.n}` : ''} samples at ${len(ux.axis.step)}${uy && uy.axis.step !== ux.axis.step ? ` × ${len(uy.axis.step)}` : ''}, holding every wavelength's window at the finest wavelength's pitch${ux.capped || uy?.capped ? ' (coarser: the sample count is capped)' : ''}; each method evaluates its field at these points (direct sums there, FFT lattices planned through them), nothing is interpolated.`,
  );
  const methods = new Map<string, number>();
  for (const m of members) {
    const key = m.form ? `${m.method} (${m.form})` : m.method;
    methods.set(key, (methods.get(key) ?? 0) + 1);
  }
  if (methods.size) reasons.push(`methods: ${[...methods].map(([k, n]) => `${k} for ${n} of ${members.length}`).join(', ')}.`);
  // Lines on one FFT lattice whose source ignores the wavelength start from one spectrum: it is
  // computed once and kept (run/spectrum-case.ts lets it go when the case ends).
  const savedTransforms = shareSourceSpectra(members);
  if (savedTransforms > 0) {
    const sharing = members.filter((m) => m.sharedSpectrum).length;
    reasons.push(
      `the source's spectrum is shared across the wavelengths: ${sharing} of the ${members.length} wavelengths propagate the same padded source on one FFT lattice (a binary aperture under untilted light is the same at every wavelength), so its forward transform is computed once and kept, and each further wavelength costs a transfer multiply at its own wavelength and one inverse transform (${savedTransforms} forward transform${savedTransforms === 1 ? '' : 's'} fewer).`,
    );
  }
  reasons.push(...mid.reasons.map((r) => `at ${wl(mid.case.wavelength)}: ${r}`));
  if (!elementOf(c.aperture).atWavelength && !isBinary(c.aperture)) reasons.push('the element is taken as it is at every wavelength (its transmittance, phase included, is not rescaled with the wavelength).');

  let error: string | undefined;
  const maxWork = (planner.opts as { maxWork?: number }).maxWork ?? 3600 * LIMITS.workPerSecond; // (planner.ts DEFAULT_MAX_WORK)
  // A shared source spectrum spares every line of its group but the first its forward transform:
  // half of costFft's two transforms (plan/costs.ts).
  const seen = new Set<string>();
  let spared = 0;
  for (const m of members) {
    if (!m.sharedSpectrum) continue;
    if (seen.has(m.sharedSpectrum.id)) {
      const np = m.x.paddedSamples * (m.y ? m.y.paddedSamples : 1);
      spared += 1.65 * np * Math.log2(np);
    } else seen.add(m.sharedSpectrum.id);
  }
  const total = Math.max(0, members.reduce((t, m) => t + m.work, 0) - spared);
  if (failed?.error) error = `at ${wl(failed.case.wavelength)}: ${failed.error}`;
  else if (offGrid) error = `at ${wl(offGrid.lam)}: no method can deliver this wavelength's field onto the grid the other wavelengths share (${offGrid.why}); give the spectrum fewer or closer wavelengths, or compute the lines as a wavelength sweep`;
  else {
    const bad = members.find((m) => m.error);
    if (bad) error = `at ${wl(bad.case.wavelength)}: ${bad.error}`;
    else if (total > maxWork) {
      error = `the ${members.length} wavelengths together need about ${seconds(total)} of computing (over the ${seconds(maxWork)} limit): give fewer lines or band samples, a narrower band, a smaller window, or raise the limit (--accept-large)`;
    }
  }
  warnings.push(...memberWarnings(members.length ? members : scouts));
  const work = total;
  // The largest line (its memory counts a kept source spectrum when it shares one) and the four
  // maps the lines are added into (intensity, X, Y, Z).
  // With output.lineMaps each line's map is kept until the case is written.
  const accumulators = (4 + (c.output.lineMaps ? lines.length : 0)) * 8 * ux.axis.n * (uy ? uy.axis.n : 1);
  const memory = Math.max(0, ...members.map((m) => m.memoryBytes)) + accumulators;
  if (!error && members.length) reasons.push(`about ${seconds(work)} for the ${members.length} wavelengths together.`);
  // A member's reasons and options are the mid line's in the case's reasons; the record keeps the rest.
  const slim = members.map((m) => ({ ...m, reasons: [], options: [] }));
  const spectrum: SpectrumPlan = { lines, members: slim, samples: { own, needed, used }, words };
  return {
    ...mid,
    case: c,
    x: { ...mid.x, output: ux.axis },
    y: mid.y ? { ...mid.y, output: uy!.axis } : null,
    reasons,
    warnings,
    memoryBytes: memory,
    work,
    spectrum,
    ...(error ? { error } : {}),
  };
}
