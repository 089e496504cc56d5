// Random cases over the space the job schema accepts, run through the tool exactly as
// test/helpers.ts runCase does, and compared with the exact references of test/reference/.
// Used by random-cases.test.ts (the property test) and, with SPOTCAST_RANDOM_REPORT=1, to print
// every case (see the test file's header).
import { apertureFacts, describe as describeAperture, type Aperture, type Illumination } from '../../src/optics/aperture.js';
import type { Plan } from '../../src/plan/types.js';
import { isOneD as isOneDGrid, xAt as gridX, yAt as gridY } from '../../src/model/grid.js';
import { ACCURACY_CODES } from '../../src/warnings/catalogue.js';
import { mulberry32, planAndRun, type CaseSpec } from '../helpers.js';
import { isOneD, referenceCost1D, referenceIntensity, type RefCase } from '../reference/reference.js';
import { runInChildProcesses } from './child-cases.js';

/** The seed of the draw; change it to see other cases (the counts in the report are for this one). */
export const SEED = 0x5eed2026;
/** How many cases are drawn. */
export const CASE_COUNT = 200;

/**
 * Warning codes that say the computed values may be off: the catalogue's entries with accuracy: true
 * (src/warnings/catalogue.ts; mark a new code there). A case more than 5 % off the reference passes
 * only if it carries one of these. Codes that speak of physics, of totals or of what was left out
 * (near-wavelength, evanescent, tilt-y-ignored, window-loss, orders-outside, orders-unresolved,
 * detector-outside) do not count.
 */
export const ACCURACY_WARNINGS: readonly string[] = ACCURACY_CODES;

/** Cases whose plan estimates more work than this are skipped (counted): the reports' time guard. */
export const WORK_LIMIT = Number(process.env.SPOTCAST_RANDOM_WORK ?? 4e8);
/**
 * The property test's own bound (its cases carry it as `workLimit`; the reports keep WORK_LIMIT):
 * one after another, the 200 cases took 160 s under WORK_LIMIT, of which the 21 cases of 1.5e8–4e8
 * work units took 80 s (5 of them compared nothing: their reference was over budget). Under this
 * bound all 200 draws are still planned (refusals and the work bound included), and the 104 cases
 * compared (of 116) still take every method in 1-D and 2-D, 2-D exact sums and angular spectra
 * among them.
 */
export const TEST_WORK_LIMIT = Number(process.env.SPOTCAST_RANDOM_WORK ?? 1.5e8);
/** Time the reference may take per case, µs (estimated from its node count). */
export const REFERENCE_BUDGET_MICROS = 600_000;
/** Points compared: 1-D at most this many (evenly spread); 2-D this many per central line. */
export const POINTS_1D = 200;
/** Fewest 1-D points: fewer are taken (down to this) when the exact reference is costly. */
export const MIN_POINTS_1D = 40;
/**
 * A case that has not come back after this long is counted as timed out (a guard against plans
 * or runs that never end; not a measurement: nothing is asserted about it).
 */
export const CASE_TIMEOUT_MS = Number(process.env.SPOTCAST_RANDOM_TIMEOUT_MS ?? 10_000);
export const POINTS_2D_PER_LINE = 21;

export interface DrawnCase {
  index: number;
  spec: CaseSpec;
  /** A work bound of its own (else WORK_LIMIT). */
  workLimit?: number;
}

const logUniform = (rnd: () => number, lo: number, hi: number) => lo * Math.pow(hi / lo, rnd());

/** Two distinct log-uniform sizes in [lo, hi], ascending. */
function twoSizes(rnd: () => number, lo: number, hi: number): [number, number] {
  for (;;) {
    const a = logUniform(rnd, lo, hi);
    const b = logUniform(rnd, lo, hi);
    if (Math.abs(a - b) > 1e-3 * Math.max(a, b)) return a < b ? [a, b] : [b, a];
  }
}

const SHAPES: [string, number][] = [
  ['slit', 0.22],
  ['slits', 0.2],
  ['slit-length', 0.08],
  ['slits-length', 0.08],
  ['circle', 0.15],
  ['rectangle', 0.14],
  ['annulus', 0.13],
];

function pick(rnd: () => number): string {
  let u = rnd();
  for (const [s, w] of SHAPES) {
    if (u < w) return s;
    u -= w;
  }
  return SHAPES[0]![0];
}

/** Half the aperture's largest extent (the scale a Gaussian waist is drawn against). */
function apertureHalf(a: Aperture): number {
  switch (a.shape) {
    case 'circle':
      return a.diameter / 2;
    case 'annulus':
      return a.outer / 2;
    case 'rectangle':
      return Math.max(a.width, a.height) / 2;
    case 'slit':
      return a.width / 2;
    case 'slits':
      return ((a.count - 1) * a.period + a.width) / 2;
    default:
      return apertureFacts(a).halfExtent[0];
  }
}

/** Draws the cases: shapes, sizes, wavelengths, distances and light over the schema's space. */
export function drawCases(seed = SEED, n = CASE_COUNT): DrawnCase[] {
  const rnd = mulberry32(seed);
  const out: DrawnCase[] = [];
  for (let index = 0; index < n; index++) {
    const lam = logUniform(rnd, 250e-9, 10e-6);
    const size = () => logUniform(rnd, lam, 10e-3);
    const shape = pick(rnd);
    const opaque = rnd() < 0.25;
    let aperture: Aperture;
    switch (shape) {
      case 'circle':
        aperture = { shape: 'circle', diameter: size(), opaque };
        break;
      case 'rectangle':
        aperture = { shape: 'rectangle', width: size(), height: size(), opaque };
        break;
      case 'annulus': {
        const [inner, outer] = twoSizes(rnd, lam, 10e-3);
        aperture = { shape: 'annulus', outer, inner, opaque };
        break;
      }
      case 'slit':
      case 'slit-length':
        aperture = { shape: 'slit', width: size(), opaque, ...(shape === 'slit-length' ? { length: size() } : {}) };
        break;
      default: {
        const [width, period] = twoSizes(rnd, lam, 10e-3);
        const count = Math.max(1, Math.min(1000, Math.round(logUniform(rnd, 1, 1000))));
        aperture = { shape: 'slits', count, width, period, opaque, ...(shape === 'slits-length' ? { length: size() } : {}) };
      }
    }
    const z = logUniform(rnd, 2 * lam, 100);
    const tilted = rnd() < 0.2;
    const tilt: [number, number] = [tilted ? ((rnd() * 2 - 1) * 30 * Math.PI) / 180 : 0, 0];
    const illumination: Illumination =
      rnd() < 0.6 ? { kind: 'plane', tilt } : { kind: 'gaussian', waist: apertureHalf(aperture) * logUniform(rnd, 0.2, 5), tilt };
    out.push({ index, spec: { wavelength: lam, distance: z, aperture, illumination } });
  }
  return out;
}

// --- Running and comparing --------------------------------------------------------------------

export type Status = 'compared' | 'refused' | 'too-much-work' | 'threw' | 'no-reference';

export type Status2 = Status | 'timed out';

/** What the report needs of a plan (outcomes cross process boundaries as JSON). */
export interface PlanInfo {
  method: string;
  form?: string;
  layout: string;
  fresnelNumber: number;
  work: number;
}

function planInfo(p: Plan): PlanInfo {
  return { method: p.method, ...(p.form ? { form: p.form } : {}), layout: p.layout, fresnelNumber: p.checks.effectiveFresnelNumber, work: p.work };
}

export interface Outcome {
  drawn: DrawnCase;
  status: Status2;
  oneD: boolean;
  plan?: PlanInfo;
  /** Refusal, exception or missing-reference reason. */
  note?: string;
  codes: string[];
  warned: boolean;
  /** max |I − I_ref| / max I_ref over the compared points. */
  error?: number;
  /** Where the largest difference is. */
  at?: [number, number];
  compared?: number;
  how?: string;
  /** I and I_ref at the worst point, and the reference's peak. */
  values?: { I: number; ref: number; peak: number };
}

export function evenIndices(n: number, m: number): number[] {
  if (n <= m) return Array.from({ length: n }, (_, i) => i);
  const out = new Set<number>();
  for (let i = 0; i < m; i++) out.add(Math.round((i * (n - 1)) / (m - 1)));
  return [...out];
}

/**
 * The [row, col] samples of a computed map compared with the exact reference: in 1-D `points1D`
 * spread evenly plus the computed peak (the error is relative to the reference's peak, which points
 * spread over a wide window can miss: a narrow central lobe between them inflates every error); in
 * 2-D `points2DPerLine` along the row and the column through the axis (or the map's middle).
 */
export function comparisonIndices(c: { nx: number; ny: number; center: [number, number]; intensity: Float64Array }, oneD: boolean, points1D: number, points2DPerLine: number): [number, number][] {
  const idx: [number, number][] = [];
  if (oneD || c.ny === 1) {
    for (const col of evenIndices(c.nx, points1D)) idx.push([0, col]);
    let top = 0;
    for (let col = 1; col < c.nx; col++) if (c.intensity[col]! > c.intensity[top]!) top = col;
    if (!idx.some(([, col]) => col === top)) idx.push([0, top]);
    return idx;
  }
  const midRow = Math.round(c.center[1]);
  const midCol = Math.round(c.center[0]);
  const row = midRow >= 0 && midRow < c.ny ? midRow : c.ny >> 1;
  const col = midCol >= 0 && midCol < c.nx ? midCol : c.nx >> 1;
  const seen = new Set<string>();
  for (const cc of evenIndices(c.nx, points2DPerLine)) seen.add(`${row},${cc}`);
  for (const rr of evenIndices(c.ny, points2DPerLine)) seen.add(`${rr},${col}`);
  seen.add(`${row},${col}`);
  for (const s of seen) idx.push(s.split(',').map(Number) as [number, number]);
  return idx;
}

/** Plans, runs and compares one case. */
export function runRandomCase(d: DrawnCase, onPlanned?: (p: PlanInfo) => void): Outcome {
  const oneD = isOneD(d.spec.aperture);
  const base = { drawn: d, oneD };
  const r = planAndRun(d.spec, { workLimit: d.workLimit ?? WORK_LIMIT, accuracyCodes: ACCURACY_WARNINGS, ...(onPlanned ? { onPlanned: (p: Plan) => onPlanned(planInfo(p)) } : {}) });
  if (r.status !== 'ran') return { ...base, ...(r.plan ? { plan: planInfo(r.plan) } : {}), codes: r.codes, warned: r.warned, status: r.status, note: r.note };
  const { plan, rec, codes, warned } = r;
  const withPlan = { ...base, plan: planInfo(plan) };
  const c = rec.computed;
  const xAt = (col: number) => gridX(c, col);
  const yAt = (row: number) => gridY(c, row);
  // Points taken from the output grid itself.
  // In 1-D as many points as the exact reference can afford (its cost per point, from a sample of 5).
  let n1D = POINTS_1D;
  if (oneD || c.ny === 1) {
    const sample = evenIndices(c.nx, 5).map((col): [number, number] => [xAt(col), 0]);
    const perPoint = referenceCost1D(d.spec as RefCase, sample) / sample.length;
    n1D = Math.max(MIN_POINTS_1D, Math.min(POINTS_1D, Math.floor(REFERENCE_BUDGET_MICROS / Math.max(perPoint, 1e-9))));
  }
  const idx = comparisonIndices(c, oneD, n1D, POINTS_2D_PER_LINE); // [row, col]
  const pts = idx.map(([r, cc]): [number, number] => [xAt(cc), yAt(r)]);
  const axisIndex = pts.findIndex(([x, y]) => Math.abs(x) <= 1e-9 * c.dx && Math.abs(y) <= 1e-9 * (isOneDGrid(c) ? 1 : c.dy));
  const ref = referenceIntensity(d.spec as RefCase, pts, REFERENCE_BUDGET_MICROS, axisIndex);
  const done = { ...withPlan, codes, warned };
  if (!ref.ok) return { ...done, status: 'no-reference', note: ref.reason };
  // The computed values at the reference's points.
  const used = ref.points.map((p) => idx[pts.indexOf(p)]!);
  let peak = 0;
  let worst = -1;
  let worstAt = 0;
  for (let i = 0; i < used.length; i++) peak = Math.max(peak, ref.intensity[i]!);
  for (let i = 0; i < used.length; i++) {
    const [r, cc] = used[i]!;
    const diff = Math.abs(c.intensity[r * c.nx + cc]! - ref.intensity[i]!);
    if (diff > worst) {
      worst = diff;
      worstAt = i;
    }
  }
  const [wr, wc] = used[worstAt]!;
  return {
    ...done,
    status: 'compared',
    error: peak > 0 ? worst / peak : worst > 0 ? Infinity : 0,
    at: ref.points[worstAt]!,
    compared: used.length,
    how: ref.how,
    values: { I: c.intensity[wr * c.nx + wc]!, ref: ref.intensity[worstAt]!, peak },
  };
}

// --- Classes and words ------------------------------------------------------------------------

export type ErrorClass = 'within 2 %' | '2–5 %' | 'over 5 %';

export function errorClass(e: number): ErrorClass {
  return e <= 0.02 ? 'within 2 %' : e <= 0.05 ? '2–5 %' : 'over 5 %';
}

/** A case fails the property: more than 5 % off and no accuracy warning. */
export function isFailure(o: Outcome): boolean {
  return o.status === 'compared' && o.error! > 0.05 && !o.warned;
}

function len(x: number): string {
  const a = Math.abs(x);
  if (a >= 1) return `${+x.toPrecision(4)} m`;
  if (a >= 1e-3) return `${+(x * 1e3).toPrecision(4)} mm`;
  if (a >= 1e-6 || a === 0) return `${+(x * 1e6).toPrecision(4)} µm`;
  return `${+(x * 1e9).toPrecision(4)} nm`;
}

function deg(r: number): string {
  return `${+((r * 180) / Math.PI).toPrecision(4)}°`;
}

/** The job in one line, in the units people read. */
export function describeCase(s: CaseSpec): string {
  const a = s.aperture;
  const o = a.opaque ? 'opaque ' : '';
  let ap: string;
  switch (a.shape) {
    case 'circle':
      ap = `${o}circle D ${len(a.diameter)}`;
      break;
    case 'annulus':
      ap = `${o}annulus outer ${len(a.outer)} inner ${len(a.inner)}`;
      break;
    case 'rectangle':
      ap = `${o}rectangle ${len(a.width)} × ${len(a.height)}`;
      break;
    case 'slit':
      ap = `${o}slit width ${len(a.width)}${a.length ? ` length ${len(a.length)}` : ''}`;
      break;
    case 'slits':
      ap = `${o}slits ${a.count} × width ${len(a.width)} period ${len(a.period)}${a.length ? ` length ${len(a.length)}` : ''}`;
      break;
    default:
      ap = describeAperture(a);
  }
  const ill = s.illumination!;
  const tilt = ill.tilt[0] !== 0 ? ` tilt ${deg(ill.tilt[0])}` : '';
  const light = ill.kind === 'plane' ? `plane${tilt}` : `gaussian w ${len(ill.waist)}${tilt}`;
  return `λ ${len(s.wavelength)}, z ${len(s.distance)}, ${ap}, ${light}`;
}

/** One line per case: job, plan, outcome; and the exact spec (SI) for reproduction. */
export function describeOutcome(o: Outcome, withSpec = true): string {
  const p = o.plan;
  const method = p ? `${p.method}${p.form ? `/${p.form}` : ''} ${p.layout}, N_F ${p.fresnelNumber.toPrecision(3)}` : 'no plan';
  const where = o.at ? (o.oneD ? ` at x = ${len(o.at[0])}` : ` at (${len(o.at[0])}, ${len(o.at[1])})`) : '';
  const result =
    o.status === 'compared'
      ? `error ${(100 * o.error!).toPrecision(3)} %${where} (I ${o.values!.I.toPrecision(4)} vs ref ${o.values!.ref.toPrecision(4)}, ref peak ${o.values!.peak.toPrecision(4)}; ${o.compared} points, ${o.how})`
      : `${o.status}${o.note ? `: ${o.note}` : ''}`;
  const warn = o.codes.length ? `warnings [${o.codes.join(', ')}]` : 'no warnings';
  const spec = withSpec ? ` spec=${JSON.stringify(o.drawn.spec)}` : '';
  return `#${o.drawn.index} ${describeCase(o.drawn.spec)} | ${method} | ${result} | ${warn}${spec}`;
}

/** The class counts as a small table: kind × (status or error class, warned or not). */
export function countTable(outcomes: Outcome[]): string {
  const kinds = ['1-D', '2-D'] as const;
  const cols = [
    'within 2 % / warned',
    'within 2 % / not warned',
    '2–5 % / warned',
    '2–5 % / not warned',
    'over 5 % / warned',
    'over 5 % / NOT WARNED',
    'no reference',
    'refused',
    'too much work',
    'threw',
    'timed out',
  ];
  const key = (o: Outcome): string => {
    if (o.status === 'compared') {
      const cl = errorClass(o.error!);
      return `${cl} / ${o.warned ? 'warned' : cl === 'over 5 %' ? 'NOT WARNED' : 'not warned'}`;
    }
    return o.status === 'no-reference' ? 'no reference' : o.status === 'too-much-work' ? 'too much work' : o.status;
  };
  const lines: string[] = [];
  const w = Math.max(...cols.map((c) => c.length));
  lines.push(`${'class'.padEnd(w)}  ${kinds.map((k) => k.padStart(5)).join(' ')}  total`);
  for (const col of cols) {
    const n = kinds.map((k) => outcomes.filter((o) => (o.oneD ? '1-D' : '2-D') === k && key(o) === col).length);
    lines.push(`${col.padEnd(w)}  ${n.map((v) => String(v).padStart(5)).join(' ')}  ${String(n[0]! + n[1]!).padStart(5)}`);
  }
  const n = kinds.map((k) => outcomes.filter((o) => (o.oneD ? '1-D' : '2-D') === k).length);
  lines.push(`${'all cases'.padEnd(w)}  ${n.map((v) => String(v).padStart(5)).join(' ')}  ${String(outcomes.length).padStart(5)}`);
  const hows = new Map<string, number>();
  for (const o of outcomes) if (o.how) hows.set(o.how, (hows.get(o.how) ?? 0) + 1);
  lines.push('references used: ' + [...hows].map(([h, c]) => `${c} × ${h}`).join('; '));
  return lines.join('\n');
}

// --- Running in child processes ---------------------------------------------------------------

/** A case that threw in its worker, as an outcome. */
export function threwOutcome(d: DrawnCase, note: string): Outcome {
  return { drawn: d, status: 'threw', oneD: false, codes: [], warned: false, note };
}

/**
 * The cases in child processes (child-cases.ts): a case that has not come back after `timeoutMs`
 * is counted as timed out (or threw, if its process died), with its plan if it got that far.
 */
export async function runInChildren(
  drawn: DrawnCase[],
  opts: { workers?: number; timeoutMs?: number; onOutcome?: (o: Outcome, elapsedMs: number) => void } = {},
): Promise<Outcome[]> {
  const timeoutMs = opts.timeoutMs ?? CASE_TIMEOUT_MS;
  return runInChildProcesses<DrawnCase, Outcome, PlanInfo>(drawn, {
    module: '/test/physics/random-cases.ts',
    run: 'runRandomCase',
    threw: 'threwOutcome',
    workers: opts.workers ?? 2,
    timeoutMs,
    ...(opts.onOutcome ? { onOutcome: opts.onOutcome } : {}),
    lost: (d, { dead, side: planned }) => ({
      drawn: d,
      status: dead ? 'threw' : 'timed out',
      oneD: isOneD(d.spec.aperture),
      ...(planned ? { plan: planned } : {}),
      codes: [],
      warned: false,
      note: dead ? 'the worker process died' : `no answer within ${timeoutMs / 1000} s (${planned ? 'planned; the run or the reference did not end' : 'planCase did not return'})`,
    }),
  });
}
