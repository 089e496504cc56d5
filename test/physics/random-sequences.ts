// Random planes in sequence for the property test random-sequences.test.ts (its own seed): coaxial
// circular openings and thin lenses, 2–3 planes, under a plane wave or a centred Gaussian beam,
// across the space a user could write: λ 0.3–2 µm, openings 5 µm – 20 mm across, gaps from a few
// hundred wavelengths to metres, pinholes at or near a lens's focus or not, screens from the near
// field to the far field.
//
// The reference is test/reference/coaxial-fresnel.ts (nested Hankel-form Fresnel integrals,
// Goodman, Introduction to Fourier Optics, §4.2), which shares no code with src/. It is paraxial;
// the program's 'spectrum' legs are exact. A draw is kept paraxial where the light lands: each gap's
// angle θ ≈ (light's half-width leaving the plane + at the next)/gap is kept below NA_LIMIT and its
// Fresnel phase error k·z·θ⁴/8 below FRESNEL_PHASE_LIMIT (redrawn otherwise), and the runner checks
// both again before comparing: a case with an exact ('spectrum') leg beyond them is 'no-reference'; a
// 'sum' leg is the same Fresnel integral as the reference, compared, and counted if steep unwarned.
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import type { Case, Plan, PlaneSpec } from '../../src/plan/types.js';
import type { CaseRecord } from '../../src/output/case-output.js';
import { xAt as gridX, yAt as gridY } from '../../src/model/grid.js';
import { planCase } from '../../src/plan/planner.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { testContext } from '../engine.js';
import { makeCase, mulberry32, type CaseSpec } from '../helpers.js';
import { coaxialCost, intensityAtScreen, type CoaxialPlane, type CoaxialSystem } from '../reference/coaxial-fresnel.js';

export const SEQUENCE_SEED = 0x5e9c0a;
export const SEQUENCE_CASE_COUNT = 24;
/** Cases whose plan estimates more work than this are counted, not run. */
export const SEQUENCE_WORK_BOUND = Number(process.env.SPOTCAST_SEQUENCE_WORK ?? 4e8);
/** J₀ evaluations the reference may spend per case (about 0.3 µs each). */
export const REFERENCE_EVALUATIONS = Number(process.env.SPOTCAST_SEQUENCE_REFERENCE ?? 1.5e7);
/** The steepest light kept in a draw and compared (the Fresnel reference's reach). */
export const NA_LIMIT = 0.1;
/** Largest k·z·θ⁴/8 (rad) for a gap: the Fresnel integral's phase error at the light's steepest angle. */
export const FRESNEL_PHASE_LIMIT = 0.2;

const logU = (rnd: () => number, lo: number, hi: number) => lo * Math.pow(hi / lo, rnd());
const MIN_RADIUS = 2.5e-6;
const MAX_RADIUS = 10e-3;
const clampRadius = (r: number) => Math.min(MAX_RADIUS, Math.max(MIN_RADIUS, r));

export interface DrawnSequence {
  index: number;
  /** What was drawn, in words (openings, filter, relay…). */
  kind: string;
  spec: CaseSpec & { planes: PlaneSpec[] };
  system: CoaxialSystem;
  /** Each gap's estimated angle of the light and Fresnel phase error k·z·θ⁴/8. */
  legs: { theta: number; phase: number }[];
}

// --- The light's size, for drawing and for the paraxial estimate --------------------------------
// A Gaussian stand-in by the complex beam parameter (Siegman, Lasers, ch. 17, 20): 1/q = 1/R −
// iλ/(πw²); a gap adds to q, a lens subtracts 1/f from 1/q, an opening narrower than the beam
// narrows it to 0.7 of its radius keeping the curvature (a rough stand-in, for sizes only).
interface Beam {
  w: number;
  /** 1/R (1/m). */
  c: number;
}

function gap(lam: number, b: Beam, z: number): Beam {
  // q = 1/(c − i·s), s = λ/(πw²); q' = q + z; back to (c', s').
  const s = lam / (Math.PI * b.w * b.w);
  const m = b.c * b.c + s * s;
  const qr = b.c / m + z;
  const qi = s / m;
  const n = qr * qr + qi * qi;
  const s2 = qi / n;
  return { w: Math.sqrt(lam / (Math.PI * s2)), c: qr / n };
}

function through(b: Beam, p: CoaxialPlane): Beam {
  const w = Math.min(b.w, 0.7 * p.radius);
  return { w, c: b.c - (p.focal !== undefined ? 1 / p.focal : 0) };
}

/** Half-width of the light arriving at a plane (1.5 beam radii) and the gap's angle and phase error. */
function legOf(lam: number, out: Beam, z: number): { next: Beam; theta: number; phase: number } {
  const next = gap(lam, out, z);
  const theta = (1.5 * out.w + 1.5 * next.w) / z;
  return { next, theta, phase: ((2 * Math.PI) / lam) * z * theta ** 4 / 8 };
}

const paraxial = (l: { theta: number; phase: number }) => l.theta <= NA_LIMIT && l.phase <= FRESNEL_PHASE_LIMIT;

/** Draws a gap from `lo` to `hi` (log-uniform) that keeps the leg paraxial, or the best of 40 tries. */
function drawGap(rnd: () => number, lam: number, out: Beam, lo: number, hi: number): number {
  let best = { z: hi, score: Infinity };
  for (let t = 0; t < 40; t++) {
    const z = logU(rnd, lo, hi);
    const l = legOf(lam, out, z);
    if (paraxial(l)) return z;
    const score = Math.max(l.theta / NA_LIMIT, l.phase / FRESNEL_PHASE_LIMIT);
    if (score < best.score) best = { z, score };
  }
  return best.z;
}

const circle = (radius: number): Aperture => ({ shape: 'circle', diameter: 2 * radius, opaque: false }) as Aperture;
const lens = (focal: number, radius: number): Aperture => ({ shape: 'lens', focal, stop: 2 * radius, aberrations: [], opaque: false }) as Aperture;
const element = (p: CoaxialPlane) => (p.focal !== undefined ? lens(p.focal, p.radius) : circle(p.radius));

/**
 * Draws the cases: 'openings' (2–3 circular openings), 'filter' (a lens focusing onto a pinhole at
 * or near its focus, sometimes a third plane: a lens or an opening), 'relay' (an opening, then a
 * lens, sometimes a pinhole at or near its focus). Later openings are drawn against the light that
 * reaches them (0.3–4 times its half-width), clamped to 5 µm – 20 mm across.
 */
export function drawSequences(seed = SEQUENCE_SEED, n = SEQUENCE_CASE_COUNT): DrawnSequence[] {
  const rnd = mulberry32(seed);
  const out: DrawnSequence[] = [];
  for (let index = 0; index < n; index++) {
    const lam = logU(rnd, 0.3e-6, 2e-6);
    const gaussian = rnd() < 0.5;
    const u = rnd();
    const kind = u < 0.45 ? 'openings' : u < 0.8 ? 'filter' : 'relay';
    const planes: CoaxialPlane[] = [];
    const gaps: number[] = [];
    const three = rnd() < 0.5;
    let w = Infinity;
    // The first plane.
    if (kind === 'filter') {
      w = gaussian ? logU(rnd, 0.2e-3, 3e-3) : Infinity;
      const radius = gaussian ? w * logU(rnd, 1.5, 4) : logU(rnd, 0.3e-3, MAX_RADIUS);
      // f-number at least 5 (NA ≤ 0.1 for the cone).
      const focal = Math.max(radius / NA_LIMIT, logU(rnd, 5e-3, 0.5));
      planes.push({ radius, focal });
    } else {
      const radius = logU(rnd, MIN_RADIUS, MAX_RADIUS);
      w = gaussian ? radius * logU(rnd, 0.3, 3) : Infinity;
      planes.push({ radius });
    }
    let beam = through({ w: Number.isFinite(w) ? w : planes[0]!.radius, c: 0 }, planes[0]!);
    const legs: { theta: number; phase: number }[] = [];
    const addGap = (z: number) => {
      const l = legOf(lam, beam, z);
      legs.push({ theta: l.theta, phase: l.phase });
      gaps.push(z);
      return l.next;
    };
    const nearFocus = (f: number) => (rnd() < 0.5 ? f : f * (1 + (rnd() < 0.5 ? -1 : 1) * logU(rnd, 1e-3, 0.1)));
    const nPlanes = three ? 3 : 2;
    for (let k = 1; k < nPlanes; k++) {
      const prev = planes[k - 1]!;
      let z: number;
      if (prev.focal !== undefined && prev.focal > 0 && rnd() < 0.8) z = nearFocus(prev.focal);
      else z = drawGap(rnd, lam, beam, 300 * lam, 2);
      const arriving = addGap(z);
      const h = 1.5 * arriving.w;
      let p: CoaxialPlane;
      if (kind === 'relay' && k === 1) {
        const radius = clampRadius(h * logU(rnd, 0.5, 3));
        p = { radius, focal: Math.max(radius / NA_LIMIT, logU(rnd, 10e-3, 0.5)) };
      } else if (kind === 'filter' && k === 2 && rnd() < 0.6) {
        const radius = clampRadius(h * logU(rnd, 1.2, 3));
        p = { radius, focal: Math.max(radius / NA_LIMIT, logU(rnd, 10e-3, 0.5)) };
      } else p = { radius: clampRadius(h * logU(rnd, 0.3, 4)) };
      planes.push(p);
      beam = through(arriving, p);
    }
    // The screen: near a last lens's focus, or anywhere from a few hundred wavelengths to metres.
    const last = planes[planes.length - 1]!;
    const zs = last.focal !== undefined && last.focal > 0 && rnd() < 0.5 ? nearFocus(last.focal) : drawGap(rnd, lam, beam, 300 * lam, 2);
    addGap(zs);
    const illumination: Illumination = Number.isFinite(w) ? { kind: 'gaussian', waist: w, tilt: [0, 0] } : { kind: 'plane', tilt: [0, 0] };
    const spec = {
      wavelength: lam,
      distance: zs,
      aperture: element(planes[0]!),
      illumination,
      planes: planes.slice(1).map((p, i) => ({ after: gaps[i]!, aperture: element(p) })),
    };
    out.push({ index, kind, spec, system: { lam, w, planes, gaps }, legs });
  }
  return out;
}

// --- Running and comparing ----------------------------------------------------------------------

export interface SequenceOutcome {
  d: DrawnSequence;
  status: 'compared' | 'refused' | 'too-much-work' | 'no-reference' | 'threw';
  note?: string;
  /** The legs' forms ('sum', 'spectrum'). */
  forms?: string;
  codes: string[];
  warned: boolean;
  /** max |I − I_ref| over the compared points / the reference's largest value there. */
  error?: number;
  compared?: number;
  values?: { I: number; ref: number; peak: number; rho: number };
  /** A 'sum' leg steeper than the Fresnel limits above, without a 'planes-paraxial' warning. */
  steepSums?: boolean;
}

/** Points along the middle row: the centre, then 1, 2, 4, … samples out, then evenly over the row. */
function rowPoints(nx: number, col0: number): number[] {
  const cols = new Set<number>([col0]);
  for (let s = 1; s < nx; s *= 2) for (const c of [col0 + s, col0 - s]) if (c >= 0 && c < nx) cols.add(c);
  for (let i = 0; i < 9; i++) cols.add(Math.round((i * (nx - 1)) / 8));
  return [...cols];
}

export function runSequence(d: DrawnSequence, accuracyCodes: readonly string[]): SequenceOutcome {
  const base = { d, codes: [] as string[], warned: false };
  const warnedBy = (codes: string[]) => codes.some((c) => accuracyCodes.includes(c));
  const c0: Case = { ...makeCase(d.spec), planes: d.spec.planes };
  let plan: Plan;
  try {
    plan = planCase(c0);
  } catch (e) {
    return { ...base, status: 'threw', note: `planCase: ${(e as Error).message}` };
  }
  const planCodes = plan.warnings.map((w) => w.code);
  const forms = plan.sequence?.legs.map((l) => l.form).join(',') ?? '';
  const planned = { ...base, forms, codes: planCodes, warned: warnedBy(planCodes) };
  if (plan.error) return { ...planned, status: 'refused', note: plan.error };
  if (plan.work > SEQUENCE_WORK_BOUND) return { ...planned, status: 'too-much-work', note: `work ${plan.work.toExponential(2)}` };
  let rec: CaseRecord;
  try {
    rec = runPlannedCase(plan, testContext());
  } catch (e) {
    return { ...planned, status: 'threw', note: `runPlannedCase: ${(e as Error).message}` };
  }
  const codes = rec.warnings.map((w) => w.code);
  const done = { ...base, forms, codes, warned: warnedBy(codes) };
  // A 'spectrum' leg is exact: where the light is steep for the Fresnel integral, the reference is
  // no reference for it. A 'sum' leg is the Fresnel integral itself, as the reference: compared
  // either way, and counted when it is steep without a 'planes-paraxial' warning (the program's own
  // estimate decides that warning; ours is a rough stand-in, so it is a count, not a failure).
  const legForms = plan.sequence?.legs.map((l) => l.form) ?? [];
  const beyond = d.legs.findIndex((l, i) => !paraxial(l) && legForms[i] !== 'sum');
  if (beyond >= 0) {
    const l = d.legs[beyond]!;
    return { ...done, status: 'no-reference', note: `gap ${beyond + 1} (${legForms[beyond]}) is beyond the Fresnel reference (θ ≈ ${l.theta.toPrecision(2)}, k·z·θ⁴/8 ≈ ${l.phase.toPrecision(2)} rad)` };
  }
  const steepSums = d.legs.some((l) => !paraxial(l)) && !codes.includes('planes-paraxial');
  const c = rec.computed;
  const col0 = Math.round((0 - c.x0) / c.dx);
  const row0 = Math.round((0 - c.y0) / c.dy);
  if (col0 < 0 || col0 >= c.nx || row0 < 0 || row0 >= c.ny) return { ...done, status: 'no-reference', note: 'the axis is outside the window' };
  let top = 0;
  for (let i = 1; i < c.intensity.length; i++) if (c.intensity[i]! > c.intensity[top]!) top = i;
  const pts: [number, number][] = [[Math.floor(top / c.nx), top % c.nx], ...rowPoints(c.nx, col0).map((cc) => [row0, cc] as [number, number])];
  const rho = pts.map(([r, cc]) => Math.hypot(gridX(c, cc), gridY(c, r)));
  const cost = coaxialCost(d.system, Math.max(...rho), rho.length);
  if (cost > REFERENCE_EVALUATIONS) return { ...done, status: 'no-reference', note: `the reference would need ${cost.toExponential(1)} evaluations` };
  const ref = intensityAtScreen(d.system, rho);
  let peak = 0;
  for (const v of ref) peak = Math.max(peak, v);
  let worst = -1;
  let at = 0;
  for (let i = 0; i < pts.length; i++) {
    const [r, cc] = pts[i]!;
    const diff = Math.abs(c.intensity[r * c.nx + cc]! - ref[i]!);
    if (diff > worst) {
      worst = diff;
      at = i;
    }
  }
  const [wr, wc] = pts[at]!;
  return {
    ...done,
    status: 'compared',
    error: peak > 0 ? worst / peak : Infinity,
    compared: pts.length,
    values: { I: c.intensity[wr * c.nx + wc]!, ref: ref[at]!, peak, rho: rho[at]! },
    ...(steepSums ? { steepSums } : {}),
  };
}

function len(x: number): string {
  const a = Math.abs(x);
  if (a >= 1) return `${+x.toPrecision(3)} m`;
  if (a >= 1e-3) return `${+(x * 1e3).toPrecision(3)} mm`;
  if (a >= 1e-6 || a === 0) return `${+(x * 1e6).toPrecision(3)} µm`;
  return `${+(x * 1e9).toPrecision(3)} nm`;
}

export function describeSequence(d: DrawnSequence): string {
  const s = d.system;
  const light = Number.isFinite(s.w) ? `Gaussian w ${len(s.w)}` : 'plane';
  const planes = s.planes.map((p, i) => `${p.focal !== undefined ? `lens f ${len(p.focal)} ⌀${len(2 * p.radius)}` : `⌀${len(2 * p.radius)}`} –${len(s.gaps[i]!)}→`).join(' ');
  return `#${d.index} ${d.kind}: λ ${len(s.lam)}, ${light}; ${planes} screen`;
}

export function describeSequenceOutcome(o: SequenceOutcome): string {
  const head = describeSequence(o.d);
  const codes = o.codes.length ? ` [${o.codes.join(' ')}]` : '';
  const forms = o.forms ? ` ${o.forms}` : '';
  if (o.status !== 'compared') return `${head}: ${o.status}${forms} (${(o.note ?? '').slice(0, 200)})${codes}`;
  const v = o.values!;
  const steep = o.steepSums ? ` (steep sum legs unwarned: θ ${o.d.legs.map((l) => l.theta.toPrecision(2)).join('/')}, k·z·θ⁴/8 ${o.d.legs.map((l) => l.phase.toPrecision(2)).join('/')} rad)` : '';
  return `${head}:${forms}, ${o.compared} pts, error ${(o.error! * 100).toPrecision(3)} % of ${v.peak.toPrecision(4)} (I ${v.I.toPrecision(5)} ref ${v.ref.toPrecision(5)} at ρ ${len(v.rho)})${codes}${steep}`;
}

export function isSequenceFailure(o: SequenceOutcome, tolerance = 0.02): boolean {
  return o.status === 'compared' && !(o.error! <= tolerance) && !o.warned;
}

export function sequenceCounts(outcomes: SequenceOutcome[]): string {
  const n = (f: (o: SequenceOutcome) => boolean) => outcomes.filter(f).length;
  const cmp = (o: SequenceOutcome) => o.status === 'compared';
  const worst = (list: SequenceOutcome[]) => list.reduce((m, o) => Math.max(m, o.error!), 0);
  const unwarned = outcomes.filter((o) => cmp(o) && !o.warned);
  const warned = outcomes.filter((o) => cmp(o) && o.warned);
  return [
    `compared ${n(cmp)} (unwarned ${unwarned.length}, worst ${(worst(unwarned) * 100).toPrecision(3)} %; warned ${warned.length}, worst ${(worst(warned) * 100).toPrecision(3)} %)`,
    `refused ${n((o) => o.status === 'refused')}, too much work ${n((o) => o.status === 'too-much-work')}, no reference ${n((o) => o.status === 'no-reference')}, threw ${n((o) => o.status === 'threw')}`,
    `unwarned over 2 %: ${n((o) => isSequenceFailure(o, 0.02))}; over 5 %: ${n((o) => isSequenceFailure(o, 0.05))}`,
    `compared with a sum leg steeper than the Fresnel limits here and no 'planes-paraxial': ${n((o) => cmp(o) && o.steepSums === true)}`,
  ].join('\n');
}
