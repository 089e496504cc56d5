// Random thin gratings of every profile (sinusoidal amplitude, sinusoidal phase, binary phase,
// blazed, binary amplitude) over the job schema's space — period, duty, count, modulation or depth,
// sometimes a finite length; plane or Gaussian light, sometimes tilted; wavelengths 250 nm – 10 µm;
// distances from a few wavelengths to metres — run through the tool as test/helpers.ts runCase does
// and compared with exact references written for the tests (test/reference/grating-profile-field.ts):
//   (a) every order the order table measures (metrics.orders: fractionOfIncident with a plane wave,
//       fractionOfTransmitted with a Gaussian beam) against the infinite grating's efficiency |c_q|²
//       (over mean |T|² for the latter; Goodman, Introduction to Fourier Optics, §4.4, ch. 7),
//       and the table's own prediction against the same closed form;
//   (b) 1-D cases (no length): the intensity across the window and at the computed peak against the
//       exact 1-D Rayleigh–Sommerfeld field of the finite grating (by linearity), as a fraction of
//       the reference's peak.
// Used by random-grating-profiles.test.ts and random-grating-report.mjs.
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import { isOneD as isOneDGrid, xAt } from '../../src/model/grid.js';
import { ACCURACY_CODES } from '../../src/warnings/catalogue.js';
import { mulberry32, planAndRun, type CaseSpec } from '../helpers.js';
import { efficiency, gratingFieldCost, gratingIntensity, type GratingRefCase, type Profile } from '../reference/grating-profile-field.js';

export const GRATING_PROFILE_SEED = 0x6a7e0f11;
export const GRATING_PROFILE_CASE_COUNT = 60;

/** A case whose plan estimates more work than this is skipped (counted): the file's time guard. */
export const WORK_LIMIT = Number(process.env.SPOTCAST_RANDOM_WORK ?? 2e8);
/** Time the exact field may take per case, µs (estimated from its panels). */
export const REFERENCE_BUDGET_MICROS = Number(process.env.SPOTCAST_REFERENCE_BUDGET ?? 500_000);
export const POINTS = 200;
export const MIN_POINTS = 30;
/** The criteria: an intensity more than this fraction of the peak off, an order more than this absolute. */
export const INTENSITY_TOLERANCE = 0.02;
export const ORDER_TOLERANCE = 0.01;

export interface DrawnGrating {
  index: number;
  spec: CaseSpec & { aperture: Extract<Aperture, { shape: 'grating' }>; illumination: Illumination };
}

const logUniform = (rnd: () => number, lo: number, hi: number) => lo * Math.pow(hi / lo, rnd());
const PROFILES = ['sinusoidal-amplitude', 'sinusoidal-phase', 'binary-phase', 'blazed', 'binary-amplitude'] as const;

function drawProfile(rnd: () => number): Profile {
  const kind = PROFILES[Math.floor(rnd() * PROFILES.length)]!;
  switch (kind) {
    case 'sinusoidal-amplitude':
      return { kind, modulation: rnd() < 0.15 ? 1 : 0.05 + 0.95 * rnd() };
    case 'sinusoidal-phase':
      return { kind, modulation: logUniform(rnd, 0.1, 40) };
    case 'binary-phase':
      return { kind, duty: 0.05 + 0.9 * rnd(), step: (rnd() * 2 - 1) * 2 * Math.PI };
    case 'blazed':
      return { kind, depth: rnd() < 0.2 ? Math.round((rnd() * 2 - 1) * 2) || 1 : (rnd() * 2 - 1) * 2.5 };
    case 'binary-amplitude':
      return { kind, duty: 0.05 + 0.9 * rnd() };
  }
}

/**
 * The distance is drawn in one of three regimes of the lit grating (width W, period d): its far
 * field (about W²/λ and beyond, where the order table measures every order), between the orders'
 * separation (about W·d/λ) and W²/λ, and nearer (from 3λ): so that each part of the tool is reached
 * about as often, rather than as a log-uniform distance over the schema's range would reach them.
 */
export function drawGratings(seed = GRATING_PROFILE_SEED, n = GRATING_PROFILE_CASE_COUNT): DrawnGrating[] {
  const rnd = mulberry32(seed);
  const out: DrawnGrating[] = [];
  for (let index = 0; index < n; index++) {
    const lam = logUniform(rnd, 250e-9, 10e-6);
    const profile = drawProfile(rnd);
    const period = logUniform(rnd, 0.8 * lam, Math.min(500e-6, (rnd() < 0.7 ? 60 : 400) * lam));
    const u = rnd();
    const count = Math.max(1, Math.round(u < 0.45 ? logUniform(rnd, 1, 30) : u < 0.85 ? logUniform(rnd, 30, 300) : logUniform(rnd, 300, 3000)));
    const half = (count * period) / 2;
    const plane = rnd() < 0.75;
    const waist = half * logUniform(rnd, 0.2, 5);
    const lit = plane ? 2 * half : Math.min(2 * half, 3 * waist);
    const length = rnd() < 0.2 ? Math.max(lam, lit * logUniform(rnd, 0.05, 2)) : undefined;
    const r = rnd();
    const far = (lit * lit) / lam;
    const separate = (lit * period) / lam;
    const zRaw = r < 0.5 ? far * logUniform(rnd, 0.3, 100) : r < 0.75 ? logUniform(rnd, Math.min(separate, far), far) : logUniform(rnd, 3 * lam, Math.max(4 * lam, separate));
    const z = Math.min(10, Math.max(3 * lam, zRaw));
    const tilted = rnd() < 0.25;
    const tilt: [number, number] = [tilted ? ((rnd() * 2 - 1) * 30 * Math.PI) / 180 : 0, 0];
    const illumination: Illumination = plane ? { kind: 'plane', tilt } : { kind: 'gaussian', waist, tilt };
    const aperture = { shape: 'grating' as const, profile, count, period, opaque: false as const, ...(length ? { length } : {}) };
    out.push({ index, spec: { wavelength: lam, distance: z, aperture, illumination } });
  }
  return out;
}

// --- Running and comparing --------------------------------------------------------------------

export type Status = 'compared' | 'orders only' | 'refused' | 'too-much-work' | 'threw';

export interface OrderError {
  m: number;
  measured: number;
  expected: number;
}

export interface GratingOutcome {
  drawn: DrawnGrating;
  status: Status;
  oneD: boolean;
  method?: string;
  note?: string;
  codes: string[];
  warned: boolean;
  /** Intensity: max |I − I_ref| over the reference's peak, where and the values; null when not compared. */
  error: number | null;
  at?: number;
  values?: { I: number; ref: number; peak: number };
  compared?: number;
  /** Why the intensity was not compared. */
  noIntensity?: string;
  /** Orders the table measured, and the worst |measured − |c_q|²|. */
  ordersMeasured: number;
  worstOrder: OrderError | null;
  /** Largest |table's prediction − |c_q|²/mean|T|²| over its listed orders (the theory code). */
  predictionError: number;
}

/** mean |T|² over a period: the share of the incident power the grating passes. */
function meanTransmission(p: Profile): number {
  return p.kind === 'sinusoidal-amplitude' ? 0.25 + p.modulation ** 2 / 8 : p.kind === 'binary-amplitude' ? p.duty : 1;
}

function evenIndices(n: number, m: number): number[] {
  if (n <= m) return Array.from({ length: n }, (_, i) => i);
  const out = new Set<number>();
  for (let i = 0; i < m; i++) out.add(Math.round((i * (n - 1)) / (m - 1)));
  return [...out];
}

export function runGratingCase(d: DrawnGrating): GratingOutcome {
  const a = d.spec.aperture;
  const oneD = !a.length;
  const base = { drawn: d, oneD, codes: [] as string[], warned: false, error: null, ordersMeasured: 0, worstOrder: null, predictionError: 0 };
  const r = planAndRun(d.spec, { workLimit: WORK_LIMIT, accuracyCodes: ACCURACY_CODES });
  const method = r.plan ? `${r.plan.method}${r.plan.form ? `/${r.plan.form}` : ''}` : undefined;
  if (r.status !== 'ran') return { ...base, ...(method ? { method } : {}), codes: r.codes, warned: r.warned, status: r.status, note: r.note };
  const { rec, codes, warned } = r;
  const done = { ...base, method, codes, warned };

  // (a) The order table against the closed forms.
  let worstOrder: OrderError | null = null;
  let measuredCount = 0;
  let predictionError = 0;
  const mean = meanTransmission(a.profile);
  for (const o of rec.metrics.orders ?? []) {
    const eff = efficiency(a.profile, o.m);
    predictionError = Math.max(predictionError, Math.abs(o.predictedFraction - eff / mean));
    if (o.status !== 'propagating' || o.fractionOfTransmitted === null) continue;
    // A plane wave: the share of the incident power; a Gaussian beam: of the transmitted power.
    const [measured, expected] = o.fractionOfIncident !== null ? [o.fractionOfIncident, eff] : [o.fractionOfTransmitted, eff / mean];
    measuredCount++;
    const err = Math.abs(measured - expected);
    if (!worstOrder || err > Math.abs(worstOrder.measured - worstOrder.expected)) worstOrder = { m: o.m, measured, expected };
  }
  const orders = { ordersMeasured: measuredCount, worstOrder, predictionError };

  // (b) The intensity of 1-D cases against the exact field.
  const c = rec.computed;
  if (!oneD || !isOneDGrid(c)) return { ...done, ...orders, status: 'orders only', noIntensity: 'finite length: no exact 2-D reference here' };
  const ref: GratingRefCase = { wavelength: d.spec.wavelength, distance: d.spec.distance, aperture: a, illumination: d.spec.illumination };
  const sample = evenIndices(c.nx, 5).map((col) => xAt(c, col));
  const perPoint = gratingFieldCost(ref, sample, 5 * REFERENCE_BUDGET_MICROS) / sample.length;
  const n = Math.min(POINTS, Math.floor(REFERENCE_BUDGET_MICROS / Math.max(perPoint, 1e-9)));
  if (n < MIN_POINTS) return { ...done, ...orders, status: 'orders only', noIntensity: `exact field over budget (${(perPoint / 1e3).toFixed(1)} ms a point)` };
  const cols = evenIndices(c.nx, n);
  let top = 0;
  for (let col = 1; col < c.nx; col++) if (c.intensity[col]! > c.intensity[top]!) top = col;
  if (!cols.includes(top)) cols.push(top);
  const xs = cols.map((col) => xAt(c, col));
  const I = gratingIntensity(ref, xs);
  let peak = 0;
  for (const v of I) peak = Math.max(peak, v);
  let worst = -1;
  let wi = 0;
  for (let i = 0; i < cols.length; i++) {
    const diff = Math.abs(c.intensity[cols[i]!]! - I[i]!);
    if (diff > worst) {
      worst = diff;
      wi = i;
    }
  }
  return {
    ...done,
    ...orders,
    status: 'compared',
    error: peak > 0 ? worst / peak : worst > 0 ? Infinity : 0,
    at: xs[wi]!,
    values: { I: c.intensity[cols[wi]!]!, ref: I[wi]!, peak },
    compared: cols.length,
  };
}

// --- Verdicts and words -----------------------------------------------------------------------

/** Off by more than the criteria (intensity 2 % of the peak, an order 1 % absolute). */
export function intensityOff(o: GratingOutcome): boolean {
  return o.error !== null && o.error > INTENSITY_TOLERANCE;
}
export function orderOff(o: GratingOutcome): boolean {
  return o.worstOrder !== null && Math.abs(o.worstOrder.measured - o.worstOrder.expected) > ORDER_TOLERANCE;
}
/** The property fails: a value off by more than the criteria and no accuracy warning. */
export function isFailure(o: GratingOutcome): boolean {
  return (intensityOff(o) || orderOff(o)) && !o.warned;
}

function len(x: number): string {
  const v = Math.abs(x);
  if (v >= 1) return `${+x.toPrecision(4)} m`;
  if (v >= 1e-3) return `${+(x * 1e3).toPrecision(4)} mm`;
  if (v >= 1e-6 || v === 0) return `${+(x * 1e6).toPrecision(4)} µm`;
  return `${+(x * 1e9).toPrecision(4)} nm`;
}

function profileWords(p: Profile): string {
  switch (p.kind) {
    case 'sinusoidal-amplitude':
      return `sin-amp m ${p.modulation.toPrecision(3)}`;
    case 'sinusoidal-phase':
      return `sin-phase ${p.modulation.toPrecision(3)} rad`;
    case 'binary-phase':
      return `bin-phase D ${p.duty.toPrecision(3)} φ ${p.step.toPrecision(3)}`;
    case 'blazed':
      return `blazed ${p.depth.toPrecision(3)} waves`;
    case 'binary-amplitude':
      return `bin-amp D ${p.duty.toPrecision(3)}`;
  }
}

export function describeOutcome(o: GratingOutcome, withSpec = true): string {
  const s = o.drawn.spec;
  const a = s.aperture;
  const ill = s.illumination;
  const tilt = ill.tilt[0] ? ` tilt ${((ill.tilt[0] * 180) / Math.PI).toPrecision(3)}°` : '';
  const light = ill.kind === 'plane' ? `plane${tilt}` : `gauss w ${len(ill.waist)}${tilt}`;
  const head = `#${o.drawn.index} λ ${len(s.wavelength)} z ${len(s.distance)} ${profileWords(a.profile)} d ${len(a.period)} ×${a.count}${a.length ? ` L ${len(a.length)}` : ''} ${light}`;
  const intensity =
    o.error !== null
      ? `I err ${(100 * o.error).toPrecision(3)} % at ${len(o.at!)} (${o.values!.I.toPrecision(4)} vs ${o.values!.ref.toPrecision(4)}, peak ${o.values!.peak.toPrecision(4)}; ${o.compared} pts)`
      : `I not compared${o.noIntensity ? ` (${o.noIntensity})` : ''}`;
  const w = o.worstOrder;
  const ord = w ? `orders ${o.ordersMeasured}, worst m=${w.m} ${(100 * w.measured).toPrecision(4)} % vs ${(100 * w.expected).toPrecision(4)} %` : `orders 0 measured`;
  const res = o.status === 'compared' || o.status === 'orders only' ? `${intensity}; ${ord}` : `${o.status}${o.note ? `: ${o.note}` : ''}`;
  return `${head} | ${o.method ?? 'no plan'} | ${res} | ${o.codes.length ? o.codes.join(',') : 'no warnings'}${withSpec ? ` spec=${JSON.stringify(s)}` : ''}`;
}

export function summary(outcomes: GratingOutcome[]): string {
  const count = (f: (o: GratingOutcome) => boolean) => outcomes.filter(f).length;
  const compared = outcomes.filter((o) => o.error !== null);
  const withOrders = outcomes.filter((o) => o.worstOrder !== null);
  const worstI = compared.filter((o) => !o.warned).reduce((m, o) => Math.max(m, o.error!), 0);
  const worstO = withOrders.filter((o) => !o.warned).reduce((m, o) => Math.max(m, Math.abs(o.worstOrder!.measured - o.worstOrder!.expected)), 0);
  const worstP = outcomes.reduce((m, o) => Math.max(m, o.predictionError), 0);
  return [
    `cases ${outcomes.length}: intensity compared ${compared.length} (warned ${count((o) => o.error !== null && o.warned)}), orders measured in ${withOrders.length} (warned ${count((o) => o.worstOrder !== null && o.warned)}), ` +
      `orders only ${count((o) => o.status === 'orders only')}, refused ${count((o) => o.status === 'refused')}, too much work ${count((o) => o.status === 'too-much-work')}, threw ${count((o) => o.status === 'threw')}`,
    `intensity off > 2 %: ${count(intensityOff)} (unwarned ${count((o) => intensityOff(o) && !o.warned)}); order off > 1 %: ${count(orderOff)} (unwarned ${count((o) => orderOff(o) && !o.warned)})`,
    `worst unwarned: intensity ${(100 * worstI).toPrecision(3)} % of the peak, order ${(100 * worstO).toPrecision(3)} % absolute; table's prediction vs closed form ${worstP.toExponential(2)}`,
  ].join('\n');
}
