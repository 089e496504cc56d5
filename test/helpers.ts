// Shared helpers for tests: cases built like the job expander builds them, with nothing but the
// physics given (the planner chooses grids unless a test says otherwise).
import { farFieldIntensity, type Complex } from './reference/far-field.js';
import { testContext } from './engine.js';
import type { Aperture, Illumination } from '../src/optics/aperture.js';
import type { Case, Plan } from '../src/plan/types.js';
import type { CaseRecord } from '../src/output/case-output.js';
import { xAt, yAt } from '../src/model/grid.js';
import { planCase } from '../src/plan/planner.js';
import { parseJobText } from '../src/job/load.js';
import { runPlannedCase } from '../src/run/run-case.js';
import type { RunReporter } from '../src/run/progress.js';

export interface CaseSpec {
  wavelength: number;
  distance: number;
  aperture: Aperture;
  illumination?: Illumination;
  method?: Case['method'];
  grid?: Case['grid'];
  window?: [number, number];
  analysis?: Case['analysis'];
}

export function makeCase(s: CaseSpec): Case {
  return {
    job: 'test',
    index: 0,
    id: 'case',
    wavelength: s.wavelength,
    distance: s.distance,
    aperture: s.aperture,
    illumination: s.illumination ?? { kind: 'plane', tilt: [0, 0] },
    ...(s.grid ? { grid: s.grid } : {}),
    ...(s.window ? { window: s.window } : {}),
    method: s.method ?? 'auto',
    swept: {},
    output: { npy: 'float64', logDecades: 5 },
    analysis: s.analysis ?? { detectors: [] },
  };
}

export function runCase(s: CaseSpec) {
  const plan = planCase(makeCase(s));
  const rec = runPlannedCase(plan, testContext());
  const c = rec.computed;
  const x = (col: number) => xAt(c, col);
  const y = (row: number) => yAt(c, row);
  return { plan, rec, c, x, y, codes: rec.warnings.map((w) => w.code) };
}

/**
 * Runs a case and compares its whole window with a far-field reference (test/reference/far-field.ts):
 * the worst |I − I_ref| relative to the reference's peak.
 */
/**
 * A property test's case planned and run on the test engine, or where it stopped: planning threw,
 * the plan was refused, its work is over the test's bound, or running threw; with the warnings so
 * far and whether one of them is an accuracy warning. `onPlanned` sees every plan that is not refused.
 */
export type PlannedRun =
  | { status: 'threw' | 'refused' | 'too-much-work'; note: string; plan: Plan | null; codes: string[]; warned: boolean }
  | { status: 'ran'; plan: Plan; rec: CaseRecord; codes: string[]; warned: boolean };

export function planAndRun(
  s: CaseSpec,
  o: { workLimit: number; accuracyCodes: readonly string[]; workDigits?: number; onPlanned?: (plan: Plan) => void },
): PlannedRun {
  let plan: Plan;
  try {
    plan = planCase(makeCase(s));
  } catch (e) {
    return { status: 'threw', note: `planCase: ${(e as Error).message}`, plan: null, codes: [], warned: false };
  }
  const warnedBy = (codes: string[]) => codes.some((c) => o.accuracyCodes.includes(c));
  const planCodes = plan.warnings.map((w) => w.code);
  const planned = { plan, codes: planCodes, warned: warnedBy(planCodes) };
  if (plan.error) return { ...planned, status: 'refused', note: plan.error };
  o.onPlanned?.(plan);
  if (plan.work > o.workLimit) return { ...planned, status: 'too-much-work', note: `work ${plan.work.toExponential(o.workDigits ?? 2)}` };
  let rec: CaseRecord;
  try {
    rec = runPlannedCase(plan, testContext());
  } catch (e) {
    return { ...planned, status: 'threw', note: `runPlannedCase: ${(e as Error).message}` };
  }
  const codes = rec.warnings.map((w) => w.code);
  return { status: 'ran', plan, rec, codes, warned: warnedBy(codes) };
}

export function runAgainstFarField(s: CaseSpec, F: (fx: number, fy: number) => Complex) {
  const run = runCase(s);
  const { c, x, y } = run;
  const ref = new Float64Array(c.ny * c.nx);
  for (let r = 0; r < c.ny; r++) for (let col = 0; col < c.nx; col++) ref[r * c.nx + col] = farFieldIntensity(F, s.wavelength, s.distance, x(col), y(r));
  const error = maxDiffOverPeak(c.intensity, ref);
  if (process.env.SPOTCAST_SHOW) console.log(`${s.aperture.shape} z=${s.distance}: worst ${error.toExponential(2)} of the peak, ${c.ny}×${c.nx}, ${run.plan.method}`);
  let peak = 0;
  for (const v of ref) peak = Math.max(peak, v);
  return { ...run, error, peak };
}

/** Largest |a_i − b_i| over the largest |b_i|: a difference relative to the reference's peak. */
export function maxDiffOverPeak(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  let peak = 0;
  for (let i = 0; i < a.length; i++) {
    m = Math.max(m, Math.abs(a[i]! - b[i]!));
    peak = Math.max(peak, Math.abs(b[i]!));
  }
  return m / peak;
}

export const um = 1e-6;
export const mm = 1e-3;
export const nm = 1e-9;

/** A reporter that keeps what a run says: its notes (failures as "FAILED id: error") and the cases it computed. */
export function recorder() {
  const notes: string[] = [];
  const computed: string[] = [];
  const reporter: RunReporter = {
    jobStart() {},
    caseStart() {},
    caseDone: (id) => void computed.push(id),
    caseFailed: (id, error) => void notes.push(`FAILED ${id}: ${error}`),
    note: (line) => void notes.push(line),
    jobEnd() {},
  };
  return { notes, computed, reporter };
}

/** mulberry32: a tiny 32-bit PRNG (public domain, common practice for reproducible test draws). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** The load problems of a job text ([] when it loads): path and message of each. */
export function loadProblems(text: string): { path: string; message: string }[] {
  try {
    parseJobText(text);
    return [];
  } catch (e) {
    return ((e as { problems?: { path: string; message: string }[] }).problems ?? [{ path: '', message: String(e) }]) as { path: string; message: string }[];
  }
}
