// One FFT grid for several cases of a sweep. A sweep in distance over one aperture with grids the
// planner chooses gives every distance a grid of its own, so each case transforms its source
// again. Where the angular spectrum is valid for a run of the sweep's cases, one grid as fine as
// the finest of theirs and as wide as the widest lets the source's spectrum be computed once
// (plan/share.ts keeps it): every further case costs one inverse transform. The planner shares
// only where that is cheaper than each case's own plan, and only where every case planned on the
// shared grid keeps its method's accuracy rules and gains no warning.
import type { Case, Plan, SharedGrid } from './types.js';
import { planCase, type PlannerOptions } from './planner.js';
import { nextFastFftSize } from '../optics/fft.js';

/** The work of one 2-D transform of np samples, and of the transfer multiply (plan/costs.ts's calibration). */
const fftWork = (np: number) => 1.65 * np * Math.log2(np);
const MULTIPLY_WORK = 10;
/** Work per output sample after the propagation (pictures, metrics): a finer shared grid has more. */
const OUTPUT_WORK = 20;
/** A group shares only when that saves at least this fraction of its members' own work. */
const LEAST_SAVING = 0.1;

/** What must be equal for two cases to share a source: everything but the distance and the window. */
function groupKey(c: Case): string | null {
  if (c.planes?.length || c.spectrum || c.grid?.size || c.grid?.pitch) return null;
  if (c.method !== 'auto' && c.method !== 'angular-spectrum') return null;
  return JSON.stringify([c.aperture, c.illumination, c.wavelength, c.method]);
}

/** A case that could share: its own plan, and the angular spectrum's plan of it on its own grid. */
interface Member {
  index: number;
  own: Plan;
  spectrum: Plan;
}

/** The shared grid of some members: per axis the finest pitch, and spans that hold each one's. */
function gridOf(members: Member[]): { pitch: [number, number]; samples: [number, number]; padded: [number, number] } {
  const axis = (i: 0 | 1) => {
    const a = members.map((m) => (i === 0 ? m.spectrum.x : m.spectrum.y!));
    const pitch = Math.min(...a.map((x) => x.inputPitch));
    // 1e-9 spare: a span equal to a member's own is not lost to rounding.
    const samples = Math.max(...a.map((x) => Math.ceil((x.inputSamples * x.inputPitch) / pitch - 1e-9)));
    const padded = nextFastFftSize(Math.max(samples, ...a.map((x) => Math.ceil((x.paddedSamples * x.inputPitch) / pitch - 1e-9))));
    return { pitch, samples, padded };
  };
  const [x, y] = [axis(0), axis(1)];
  return { pitch: [x.pitch, y.pitch], samples: [x.samples, y.samples], padded: [x.padded, y.padded] };
}

/** Estimated work of the members on one grid: one forward transform, then per case a multiply, an inverse and its outputs. */
function sharedWork(members: Member[]): number {
  const g = gridOf(members);
  const np = g.padded[0] * g.padded[1];
  let outputs = 0;
  for (const m of members) {
    const ox = (m.spectrum.x.output.n * m.spectrum.x.output.step) / g.pitch[0];
    const oy = (m.spectrum.y!.output.n * m.spectrum.y!.output.step) / g.pitch[1];
    outputs += ox * oy;
  }
  return fftWork(np) * (members.length + 1) + MULTIPLY_WORK * np * members.length + OUTPUT_WORK * outputs;
}

const ownWork = (m: Member) => m.own.work;

/** Longest run the partition considers (it costs runs of up to this many members per member). */
const LONGEST_RUN = 32;

/**
 * Runs of members, in order of pitch, that share a grid: the partition of the ordered members
 * into consecutive runs with the least estimated work (a run of one plans on its own), found by
 * dynamic programming over where each run ends. Returns the runs of two or more that save at
 * least LEAST_SAVING of their own work.
 */
function runsOf(members: Member[]): Member[][] {
  const finest = (m: Member) => Math.min(m.spectrum.x.inputPitch, m.spectrum.y!.inputPitch);
  const sorted = [...members].sort((a, b) => finest(a) - finest(b));
  const n = sorted.length;
  const best = new Float64Array(n + 1).fill(Infinity);
  const from = new Int32Array(n + 1);
  best[0] = 0;
  for (let j = 1; j <= n; j++) {
    for (let i = Math.max(0, j - LONGEST_RUN); i < j; i++) {
      const run = sorted.slice(i, j);
      const own = run.reduce((s, m) => s + ownWork(m), 0);
      const shared = run.length > 1 ? sharedWork(run) : Infinity;
      const cost = best[i]! + (shared < (1 - LEAST_SAVING) * own ? shared : own);
      if (cost < best[j]!) {
        best[j] = cost;
        from[j] = i;
      }
    }
  }
  const runs: Member[][] = [];
  for (let j = n; j > 0; j = from[j]!) {
    const run = sorted.slice(from[j]!, j);
    if (run.length > 1 && sharedWork(run) < (1 - LEAST_SAVING) * run.reduce((s, m) => s + ownWork(m), 0)) runs.push(run);
  }
  return runs.reverse();
}

const accuracyCodes = (p: Plan) => new Set(p.warnings.map((w) => w.code));

/**
 * Plans every case; then, among cases with the same aperture, light and wavelength, plans runs of
 * them on one shared angular-spectrum grid where that is cheaper and loses nothing (same method
 * valid, no new warning, within the limits). The returned plans are in the cases' order.
 */
export function planCases(cases: Case[], opts: PlannerOptions = {}): Plan[] {
  return shareGrids(
    cases,
    cases.map((c) => planCase(c, opts)),
    opts,
  );
}

/**
 * shareGrids of planCases, from plans already made (each case's own, in the cases' order, with
 * the same options): the plans with runs of cases put on shared grids (a new array).
 */
export function shareGrids(cases: Case[], own: Plan[], opts: PlannerOptions = {}): Plan[] {
  const plans = [...own];
  const groups = new Map<string, number[]>();
  cases.forEach((c, i) => {
    const k = groupKey(c);
    if (k === null || plans[i]!.error) return;
    const g = groups.get(k);
    if (g) g.push(i);
    else groups.set(k, [i]);
  });
  for (const idx of groups.values()) {
    if (idx.length < 2) continue;
    const members: Member[] = [];
    for (const i of idx) {
      const own = plans[i]!;
      if (own.layout !== 'two-d' || !own.y) continue;
      // Only where the angular spectrum itself is valid and fits; cases that take a closed form
      // (far-field formula, Fresnel) keep it: its result is what a practitioner checks by hand.
      if (own.method !== 'angular-spectrum' && own.method !== 'rayleigh-sommerfeld') continue;
      if (own.method === 'angular-spectrum' && own.form) continue;
      const option = own.options.find((o) => o.method === 'angular-spectrum' && !o.form);
      if (!option?.valid || !option.fits) continue;
      const spectrum = own.method === 'angular-spectrum' ? own : planCase({ ...cases[i]!, method: 'angular-spectrum' }, opts);
      if (spectrum.error || spectrum.layout !== 'two-d' || !spectrum.y || spectrum.form) continue;
      members.push({ index: i, own, spectrum });
    }
    for (const run of runsOf(members)) {
      const g = gridOf(run);
      const sg: SharedGrid = { ...g, cases: run.length, sharedWork: sharedWork(run), soloWork: run.reduce((s, m) => s + ownWork(m), 0) };
      const shared = run.map((m) => planCase(cases[m.index]!, { ...opts, sharedGrid: sg }));
      const keeps = shared.every((p, j) => {
        if (p.error || p.method !== 'angular-spectrum' || p.form) return false;
        if (p.x.paddedSamples !== g.padded[0] || p.y?.paddedSamples !== g.padded[1] || p.x.inputPitch !== g.pitch[0] || p.y.inputPitch !== g.pitch[1]) return false;
        const before = accuracyCodes(run[j]!.own);
        return p.warnings.every((w) => before.has(w.code));
      });
        if (!keeps) continue;
      run.forEach((m, j) => (plans[m.index] = shared[j]!));
    }
  }
  return plans;
}
