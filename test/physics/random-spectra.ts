// Random cases of light of several wavelengths (the job's spectrum), run through the tool exactly as
// a job runs them (planCase, which plans every line onto one output grid, then runPlannedCase, which
// adds the lines' intensities with their weights), and compared with the weighted sum of the exact
// scalar references at each line's wavelength (test/reference/reference.ts: the first
// Rayleigh–Sommerfeld solution, Goodman, Introduction to Fourier Optics, §3.5; mutually incoherent
// wavelengths add in intensity, Born & Wolf, Principles of Optics, §7.5.8, from memory).
// Used by random-spectra.test.ts; the cases themselves are random-cases.ts drawCases' with their
// own seed, each given a spectrum about its drawn wavelength.
import type { SpectrumSource } from '../../src/analysis/spectrum.js';
import { isOneD as isOneDGrid, xAt as gridX, yAt as gridY } from '../../src/model/grid.js';
import { descriptorOf } from '../../src/methods/registry.js';
import { planCase } from '../../src/plan/planner.js';
import type { Plan } from '../../src/plan/types.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { ACCURACY_CODES } from '../../src/warnings/catalogue.js';
import { testContext } from '../engine.js';
import { makeCase, mulberry32 } from '../helpers.js';
import { isOneD, referenceIntensity, type RefCase } from '../reference/reference.js';
import { comparisonIndices, describeCase, drawCases, errorClass, type DrawnCase } from './random-cases.js';
import { runInChildProcesses } from './child-cases.js';

/** The seed of this file's draw (random-cases.ts draws the cases, this seed draws their spectra too). */
export const SPECTRA_SEED = 0x5bec7a;
/**
 * The first 24 drawn cases and 15 gratings (they were 40 and 20): one after another the 60 took
 * 47 s, cost spread evenly over them; the 39 kept hold 19 comparisons where 27 were (2-D cases,
 * bands the planner refined and lines apart among them, as the test's guards ask), in about 70 %
 * of the time. With SPOTCAST_RANDOM_REPORT=1 more can be drawn by raising these.
 */
export const SPECTRA_CASE_COUNT = 24;
/** Cases whose plan (all lines together) estimates more work than this are skipped (counted). */
export const SPECTRA_WORK_LIMIT = Number(process.env.SPOTCAST_SPECTRA_WORK ?? 2e8);
/**
 * More lines than this (a band the planner refined) are not compared: each needs its own reference
 * (2-D; 1-D references are cheaper and up to MAX_REFERENCE_LINES_1D are compared).
 */
export const MAX_REFERENCE_LINES = 8;
export const MAX_REFERENCE_LINES_1D = 64;
/** The exact reference's budget per line, µs (estimated from its node count); a case's lines share CASE_BUDGET_MICROS when there are many. */
export const LINE_BUDGET_MICROS = 300_000;
export const CASE_BUDGET_MICROS = 1_500_000;
/** Points compared: 1-D evenly spread; 2-D per central line (row and column through the axis). */
export const POINTS_1D = 80;
export const POINTS_2D_PER_LINE = 15;
/** A case that has not come back in this long counts as timed out (a guard against hanging, not a measurement). */
export const SPECTRA_TIMEOUT_MS = Number(process.env.SPOTCAST_SPECTRA_TIMEOUT_MS ?? 20_000);

export interface SpectrumDraw {
  index: number;
  drawn: DrawnCase;
  spectrum: SpectrumSource;
}

/**
 * The draws: drawCases' cases (seed SPECTRA_SEED), each with a spectrum about its wavelength λ₀: two
 * or three lines within ±20 % of λ₀ with powers from 0.2 to 2, or (one case in four) a flat band of
 * 3 to 5 samples no wider than ±5 % of λ₀. The case's own wavelength is the power-weighted mean, as
 * the job's expansion makes it.
 */
export function drawSpectra(seed = SPECTRA_SEED, n = SPECTRA_CASE_COUNT): SpectrumDraw[] {
  const rnd = mulberry32(seed ^ 0x9e3779b9);
  return drawCases(seed, n).map((drawn, index) => {
    const lam0 = drawn.spec.wavelength;
    let spectrum: SpectrumSource;
    if (rnd() < 0.25) {
      const half = lam0 * (0.005 + 0.045 * rnd());
      const centre = lam0 * (1 + 0.1 * (rnd() - 0.5));
      spectrum = { kind: 'band', from: centre - half, to: centre + half, samples: 3 + Math.floor(rnd() * 3) };
    } else {
      const count = rnd() < 0.5 ? 2 : 3;
      const lines = Array.from({ length: count }, () => ({ wavelength: lam0 * (0.8 + 0.4 * rnd()), power: 0.2 + 1.8 * rnd() }));
      lines.sort((a, b) => a.wavelength - b.wavelength);
      spectrum = { kind: 'lines', lines };
    }
    return { index, drawn, spectrum };
  });
}

/**
 * Cases where the light disperses (a grating: sets of 5–60 slits, width 0.3–0.7 of the period,
 * period 3–30 λ₀, 1 mm – 1 m away, plane or Gaussian light, some tilted up to ±10°), in a flat band
 * of 3–5 samples 1–10 % wide, or two or three lines within ±5 %: here the planner refines a band's
 * samples and the lines land apart. Indices follow drawSpectra's (`first` on).
 */
export function drawDispersing(seed = SPECTRA_SEED, n = DISPERSING_CASE_COUNT, first = SPECTRA_CASE_COUNT): SpectrumDraw[] {
  const rnd = mulberry32(seed ^ 0x51ab5);
  const logUniform = (lo: number, hi: number) => lo * Math.pow(hi / lo, rnd());
  return Array.from({ length: n }, (_, k) => {
    const lam0 = logUniform(400e-9, 2e-6);
    const period = lam0 * logUniform(3, 30);
    const count = Math.round(logUniform(5, 60));
    const width = period * (0.3 + 0.4 * rnd());
    const aperture = { shape: 'slits' as const, count, width, period, opaque: false };
    const tilt: [number, number] = [rnd() < 0.25 ? ((rnd() * 2 - 1) * 10 * Math.PI) / 180 : 0, 0];
    const illumination = rnd() < 0.7 ? { kind: 'plane' as const, tilt } : { kind: 'gaussian' as const, waist: (count * period * logUniform(0.3, 2)) / 2, tilt };
    const spec = { wavelength: lam0, distance: logUniform(1e-3, 0.05), aperture, illumination };
    let spectrum: SpectrumSource;
    if (rnd() < 0.5) {
      const half = lam0 * (0.005 + 0.045 * rnd());
      spectrum = { kind: 'band', from: lam0 - half, to: lam0 + half, samples: 3 + Math.floor(rnd() * 3) };
    } else {
      const lines = Array.from({ length: rnd() < 0.5 ? 2 : 3 }, () => ({ wavelength: lam0 * (0.95 + 0.1 * rnd()), power: 0.2 + 1.8 * rnd() }));
      lines.sort((a, b) => a.wavelength - b.wavelength);
      spectrum = { kind: 'lines', lines };
    }
    return { index: first + k, drawn: { index: first + k, spec }, spectrum };
  });
}
/** See SPECTRA_CASE_COUNT. */
export const DISPERSING_CASE_COUNT = 15;

/**
 * The lines the light stands for, worked out here (not by src/analysis/spectrum.ts): lines as given,
 * powers over their total; a flat band of n samples: the midpoints of n equal intervals, 1/n each
 * (the midpoint rule).
 */
export function expectedLines(s: SpectrumSource, samples: number): { wavelength: number; weight: number }[] {
  if (s.kind === 'lines') {
    const total = s.lines.reduce((t, l) => t + l.power, 0);
    return s.lines.map((l) => ({ wavelength: l.wavelength, weight: l.power / total }));
  }
  if (s.kind !== 'band') throw new Error(`no expected lines for a ${s.kind}`);
  const step = (s.to - s.from) / samples;
  return Array.from({ length: samples }, (_, i) => ({ wavelength: s.from + (i + 0.5) * step, weight: 1 / samples }));
}

export type SpectrumStatus = 'compared' | 'refused' | 'too-much-work' | 'too-many-lines' | 'no-reference' | 'threw' | 'timed out';

export interface SpectrumOutcome {
  draw: SpectrumDraw;
  status: SpectrumStatus;
  oneD: boolean;
  note?: string;
  codes: string[];
  warned: boolean;
  methods?: string[];
  lines?: number;
  work?: number;
  /** max |I − Σwᵢ I_ref,ᵢ| / max Σwᵢ I_ref,ᵢ over the compared points. */
  error?: number;
  compared?: number;
  how?: string;
  /** What is wrong with the grids (empty when every member is on the case's one grid). */
  gridProblems?: string[];
  /** Members on an FFT lattice whose steps were checked. */
  fftMembers?: number;
  /** Lines the plan computes that are not the lines the light stands for. */
  lineProblems?: string[];
}

const sameAxis = (a: { n: number; start: number; step: number }, b: { n: number; start: number; step: number }) => a.n === b.n && a.start === b.start && a.step === b.step;

/** One grid: every member's output axes are the case's; an FFT member's output step is a whole number of its lattice steps. */
export function gridProblems(plan: Plan): string[] {
  const out: string[] = [];
  for (const m of plan.spectrum!.members) {
    const at = `at ${(m.case.wavelength * 1e9).toPrecision(5)} nm (${m.method})`;
    if (!sameAxis(m.x.output, plan.x.output)) out.push(`${at}: x output ${JSON.stringify(m.x.output)} is not the case's ${JSON.stringify(plan.x.output)}`);
    if ((m.y === null) !== (plan.y === null) || (m.y && !sameAxis(m.y.output, plan.y!.output))) out.push(`${at}: y output differs from the case's`);
    const kind = descriptorOf(m).grid;
    if (kind === 'direct') continue;
    for (const [name, a] of [['x', m.x], ['y', m.y]] as const) {
      if (!a) continue;
      // The lattice the output is cut from: the source's pitch (transfer forms), or λz/(N·Δx) (one FFT).
      const lattice = kind === 'transfer' ? a.inputPitch : (m.case.wavelength * m.case.distance) / (a.paddedSamples * a.inputPitch);
      const k = a.output.step / lattice;
      if (!(Math.abs(k - Math.round(k)) < 1e-6 && Math.round(k) >= 1)) out.push(`${at}: ${name} output step ${a.output.step} is ${k} lattice steps of ${lattice}, not a whole number`);
      const s = a.output.start / lattice;
      if (!(Math.abs(s - Math.round(s)) < 1e-6)) out.push(`${at}: ${name} output start ${a.output.start} is not a lattice point (${s} steps)`);
    }
  }
  return out;
}

/** Plans, runs and compares one case. */
export function runSpectrumDraw(d: SpectrumDraw): SpectrumOutcome {
  const spec = d.drawn.spec;
  const oneD = isOneD(spec.aperture);
  const own = expectedLines(d.spectrum, d.spectrum.kind === 'band' ? d.spectrum.samples : 0);
  const mean = own.reduce((t, l) => t + l.weight * l.wavelength, 0);
  const base = { draw: d, oneD };
  let plan: Plan;
  try {
    plan = planCase({ ...makeCase({ ...spec, wavelength: mean }), spectrum: d.spectrum });
  } catch (e) {
    return { ...base, status: 'threw', note: `planCase: ${(e as Error).message}`, codes: [], warned: false };
  }
  const planCodes = plan.warnings.map((w) => w.code);
  const warnedBy = (codes: string[]) => codes.some((c) => (ACCURACY_CODES as readonly string[]).includes(c));
  const info = { codes: planCodes, warned: warnedBy(planCodes), work: plan.work };
  if (plan.error) return { ...base, ...info, status: 'refused', note: plan.error };
  const sp = plan.spectrum!;
  const methods = [...new Set(sp.members.map((m) => (m.form ? `${m.method}/${m.form}` : m.method)))];
  const withPlan = { ...base, ...info, methods, lines: sp.lines.length };
  if (plan.work > SPECTRA_WORK_LIMIT) return { ...withPlan, status: 'too-much-work', note: `work ${plan.work.toExponential(2)}` };
  // The lines computed are the light's: as given, or the band's midpoints at the samples used.
  const lines = expectedLines(d.spectrum, sp.samples.used);
  const lineProblems: string[] = [];
  if (sp.lines.length !== lines.length) lineProblems.push(`${sp.lines.length} lines planned, ${lines.length} expected`);
  else
    sp.lines.forEach((l, i) => {
      if (Math.abs(l.wavelength - lines[i]!.wavelength) > 1e-12 * lines[i]!.wavelength || Math.abs(l.weight - lines[i]!.weight) > 1e-12) {
        lineProblems.push(`line ${i}: ${l.wavelength} m × ${l.weight}, expected ${lines[i]!.wavelength} m × ${lines[i]!.weight}`);
      }
    });
  if (sp.members.length !== sp.lines.length) lineProblems.push(`${sp.members.length} member plans for ${sp.lines.length} lines`);
  const grids = gridProblems(plan);
  const fftMembers = sp.members.filter((m) => descriptorOf(m).grid !== 'direct').length;
  if (lines.length > (oneD ? MAX_REFERENCE_LINES_1D : MAX_REFERENCE_LINES)) return { ...withPlan, status: 'too-many-lines', note: `${lines.length} lines`, gridProblems: grids, fftMembers, lineProblems };
  let rec;
  try {
    rec = runPlannedCase(plan, testContext());
  } catch (e) {
    return { ...withPlan, status: 'threw', note: `runPlannedCase: ${(e as Error).message}` };
  }
  const codes = rec.warnings.map((w) => w.code);
  const done = { ...withPlan, codes, warned: warnedBy(codes), gridProblems: grids, fftMembers, lineProblems };
  const c = rec.computed;
  const idx = comparisonIndices(c, oneD, POINTS_1D, POINTS_2D_PER_LINE);
  const pts = idx.map(([r, cc]): [number, number] => [gridX(c, cc), gridY(c, r)]);
  const axisIndex = pts.findIndex(([x, y]) => Math.abs(x) <= 1e-9 * c.dx && Math.abs(y) <= 1e-9 * (isOneDGrid(c) ? 1 : c.dy));
  // Σ wᵢ·I_ref(λᵢ) at the points every line's reference reached.
  const sum = new Map<number, number>();
  const reached = new Map<number, number>();
  const hows = new Set<string>();
  for (const l of lines) {
    const budget = Math.min(LINE_BUDGET_MICROS, CASE_BUDGET_MICROS / lines.length);
    const ref = referenceIntensity({ ...(spec as RefCase), wavelength: l.wavelength }, pts, budget, axisIndex);
    if (!ref.ok) return { ...done, status: 'no-reference', note: `at ${(l.wavelength * 1e9).toPrecision(5)} nm: ${ref.reason}` };
    hows.add(ref.how);
    ref.points.forEach((p, i) => {
      const k = pts.indexOf(p);
      sum.set(k, (sum.get(k) ?? 0) + l.weight * ref.intensity[i]!);
      reached.set(k, (reached.get(k) ?? 0) + 1);
    });
  }
  const used = [...reached].filter(([, n]) => n === lines.length).map(([k]) => k);
  if (used.length === 0) return { ...done, status: 'no-reference', note: 'no point reached by every line’s reference' };
  let peak = 0;
  let worst = 0;
  for (const k of used) {
    peak = Math.max(peak, sum.get(k)!);
    const [r, cc] = idx[k]!;
    worst = Math.max(worst, Math.abs(c.intensity[r * c.nx + cc]! - sum.get(k)!));
  }
  return { ...done, status: 'compared', error: peak > 0 ? worst / peak : worst > 0 ? Infinity : 0, compared: used.length, how: [...hows].join(' + ') };
}

/** A case fails the property: more than 5 % off and no accuracy warning. */
export function isSpectrumFailure(o: SpectrumOutcome): boolean {
  return o.status === 'compared' && o.error! > 0.05 && !o.warned;
}

function spectrumWordsOf(s: SpectrumSource): string {
  const nm = (m: number) => `${(m * 1e9).toPrecision(4)} nm`;
  if (s.kind === 'lines') return s.lines.map((l) => `${nm(l.wavelength)}×${l.power.toPrecision(3)}`).join(' + ');
  if (s.kind === 'band') return `band ${nm(s.from)}–${nm(s.to)} in ${s.samples}`;
  return s.kind;
}

/** One line per case: job, spectrum, plan, outcome; and the exact spec for reproduction. */
export function describeSpectrumOutcome(o: SpectrumOutcome): string {
  const result =
    o.status === 'compared'
      ? `error ${(100 * o.error!).toPrecision(3)} % (${o.compared} points, ${o.how})`
      : `${o.status}${o.note ? `: ${o.note}` : ''}`;
  const plan = o.methods ? `${o.methods.join(', ')}; ${o.lines} lines, work ${o.work!.toExponential(2)}` : 'no plan';
  return `#${o.draw.index} ${describeCase(o.draw.drawn.spec)}; ${spectrumWordsOf(o.draw.spectrum)} | ${plan} | ${result} | ${o.codes.length ? `warnings [${o.codes.join(', ')}]` : 'no warnings'} spec=${JSON.stringify({ ...o.draw.drawn.spec, spectrum: o.draw.spectrum })}`;
}

/** The class counts: kind × (status or error class, warned or not). */
export function spectrumCountTable(outcomes: SpectrumOutcome[]): string {
  const key = (o: SpectrumOutcome): string => {
    if (o.status !== 'compared') return o.status;
    const cl = errorClass(o.error!);
    return `${cl} / ${o.warned ? 'warned' : cl === 'over 5 %' ? 'NOT WARNED' : 'not warned'}`;
  };
  const cols = ['within 2 % / warned', 'within 2 % / not warned', '2–5 % / warned', '2–5 % / not warned', 'over 5 % / warned', 'over 5 % / NOT WARNED', 'no-reference', 'refused', 'too-much-work', 'too-many-lines', 'threw', 'timed out'];
  const w = Math.max(...cols.map((s) => s.length));
  const count = (k: string, f: (o: SpectrumOutcome) => boolean) => outcomes.filter((o) => f(o) && (k === '' || key(o) === k)).length;
  const row = (label: string, k: string) => {
    const a = count(k, (o) => o.oneD);
    const b = count(k, (o) => !o.oneD);
    return `${label.padEnd(w)}  ${String(a).padStart(5)} ${String(b).padStart(5)}  ${String(a + b).padStart(5)}`;
  };
  const lines = [`${'class'.padEnd(w)}    1-D   2-D  total`, ...cols.map((k) => row(k, k)), row('all cases', '')];
  const hows = new Map<string, number>();
  for (const o of outcomes) if (o.how) hows.set(o.how, (hows.get(o.how) ?? 0) + 1);
  lines.push('references used: ' + [...hows].map(([h, n]) => `${n} × ${h}`).join('; '));
  return lines.join('\n');
}

/** A draw that threw in its worker, as an outcome. */
export function threwSpectrum(d: SpectrumDraw, note: string): SpectrumOutcome {
  return { draw: d, status: 'threw', oneD: false, codes: [], warned: false, note };
}

/** Runs the draws in child processes (child-cases.ts), as random-cases.ts runInChildren does: two, as the machine has two cores (it was one). */
export async function runSpectraInChildren(draws: SpectrumDraw[], workers = 2, timeoutMs = SPECTRA_TIMEOUT_MS): Promise<SpectrumOutcome[]> {
  return runInChildProcesses<SpectrumDraw, SpectrumOutcome>(draws, {
    module: '/test/physics/random-spectra.ts',
    run: 'runSpectrumDraw',
    threw: 'threwSpectrum',
    workers,
    timeoutMs,
    lost: (d, { dead }) => ({ draw: d, status: dead ? 'threw' : 'timed out', oneD: isOneD(d.drawn.spec.aperture), codes: [], warned: false, note: dead ? 'the worker process died' : `no answer within ${timeoutMs / 1000} s` }),
  });
}
