// Thin gratings beyond binary amplitude: the complex transmittance of one period, the power each
// diffraction order gets, and exact area samples of a finite grating.
//
// Conventions.
// - A grating of `count` periods of length d is centred on x = 0: it covers [−count·d/2, count·d/2]
//   and is opaque outside. Period k (k = 0 … count−1) is centred on c_k = (k − (count−1)/2)·d, the
//   slit centres of the existing binary grating (mask.ts sampleProfile), and covers
//   [c_k − d/2, c_k + d/2]. For an odd count a period is centred on x = 0; for an even count a
//   period boundary is.
// - Each profile is written in the local coordinate s = x − c_k ∈ [−d/2, d/2] (the period's
//   origin is its centre) as T(s):
//     binary-amplitude      T = 1 for |s| < duty·d/2, else 0 (a slit centred in the period);
//     sinusoidal-amplitude  T = ½ + (m/2)·cos(2πs/d);
//     sinusoidal-phase      T = exp(i·(m/2)·sin(2πs/d));
//     binary-phase          T = e^{i·step} for |s| < duty·d/2, else 1;
//     blazed                T = exp(2πi·α·(s/d + ½)): the ramp starts at 0 at the period's left
//                           edge and rises to 2πα at its right edge (a tooth is a period).
// - Order amplitudes are the Fourier coefficients of one period about its centre,
//   c_q = (1/d)∫_{−d/2}^{d/2} T(s)·e^{−2πiqs/d} ds, so that T(s) = Σ_q c_q·e^{+2πiqs/d}: order q
//   leaves along sin θ_q = sin θ_i + qλ/d. Its share of the incident power (thin-element model,
//   before the obliquity factor) is |c_q|² (Goodman, Introduction to Fourier Optics, §4.4).
//
// Cell averages are exact (closed forms, no sub-sampling): a cell [x − Δ/2, x + Δ/2] is clipped to
// the grating, split into at most a partial period at each end and a number of whole periods between
// (whatever the cell width: a coarse grid over a fine grating costs the same), and each partial
// period is integrated in closed form. Cost O(samples), independent of count; for the sinusoidal
// phase profile O(samples × terms of its Jacobi–Anger series), about m/2 + 12·(m/2)^{1/3} + 10 terms.
import { besselJn, besselJnSignificant } from './bessel-jn.js';
import { axisAt, type Axis } from './field.js';
import { sinc } from './grating.js';

export type GratingProfile =
  | { kind: 'binary-amplitude'; duty: number }
  | { kind: 'sinusoidal-amplitude'; modulation: number }
  | { kind: 'sinusoidal-phase'; modulation: number }
  | { kind: 'binary-phase'; duty: number; step: number }
  | { kind: 'blazed'; depth: number };

/**
 * Largest peak-to-peak phase of a sinusoidal phase profile (rad). Its samples cost about m/2 terms
 * each; beyond this the thin-element picture (a phase of thousands of waves imposed in a layer of
 * no thickness) has long stopped describing a real part, and a grid would need ≳ m/2 samples per
 * period anyway.
 */
export const SINUSOIDAL_PHASE_MAX = 1e4;

/** Jacobi–Anger terms below this (relative to the largest possible, 1) are dropped. */
const JACOBI_ANGER_TOL = 1e-17;

/** Largest half-width of the order range significantOrders will search. */
const SIGNIFICANT_ORDERS_MAX = 2_000_000;

function checkProfile(p: GratingProfile): void {
  const bad = (what: string) => {
    throw new RangeError(`grating profile ${p.kind}: ${what}`);
  };
  switch (p.kind) {
    case 'binary-amplitude':
      if (!(p.duty > 0 && p.duty < 1)) bad(`duty must be between 0 and 1 (exclusive), got ${p.duty}`);
      return;
    case 'sinusoidal-amplitude':
      if (!(p.modulation > 0 && p.modulation <= 1)) bad(`modulation must be in (0, 1], got ${p.modulation}`);
      return;
    case 'sinusoidal-phase':
      if (!(p.modulation > 0 && p.modulation <= SINUSOIDAL_PHASE_MAX)) {
        bad(`modulation (peak-to-peak phase, rad) must be in (0, ${SINUSOIDAL_PHASE_MAX}], got ${p.modulation}`);
      }
      return;
    case 'binary-phase':
      if (!(p.duty > 0 && p.duty < 1)) bad(`duty must be between 0 and 1 (exclusive), got ${p.duty}`);
      if (!Number.isFinite(p.step)) bad(`step must be a finite phase (rad), got ${p.step}`);
      return;
    case 'blazed':
      if (!Number.isFinite(p.depth)) bad(`depth must be a finite number of waves, got ${p.depth}`);
      return;
    default: {
      const never: never = p;
      throw new RangeError(`unknown grating profile ${(never as { kind: string }).kind}`);
    }
  }
}

function checkGrating(period: number, count: number): void {
  if (!(period > 0 && Number.isFinite(period))) throw new RangeError(`grating period must be positive, got ${period}`);
  if (!(Number.isSafeInteger(count) && count >= 1)) throw new RangeError(`grating count must be a whole number ≥ 1, got ${count}`);
}

/** c_q (re, im) of one period about its centre; see the conventions at the top. */
export function orderAmplitude(p: GratingProfile, q: number): [number, number] {
  checkProfile(p);
  if (!Number.isInteger(q)) throw new RangeError(`diffraction order must be a whole number, got ${q}`);
  switch (p.kind) {
    case 'binary-amplitude':
      return [p.duty * sinc(q * p.duty), 0];
    case 'sinusoidal-amplitude':
      return [q === 0 ? 0.5 : Math.abs(q) === 1 ? p.modulation / 4 : 0, 0];
    case 'sinusoidal-phase':
      return [besselJn(q, p.modulation / 2), 0];
    case 'binary-phase': {
      // T = 1 + (e^{iφ} − 1)·[slit]: c_q = δ_q0 + (e^{iφ} − 1)·duty·sinc(q·duty).
      const f = p.duty * sinc(q * p.duty);
      return [(q === 0 ? 1 : 0) + (Math.cos(p.step) - 1) * f, Math.sin(p.step) * f];
    }
    case 'blazed': {
      // (1/d)∫ e^{2πiα(s/d + ½)} e^{−2πiqs/d} ds = e^{iπα}·sinc(q − α).
      const f = sinc(q - p.depth);
      return [Math.cos(Math.PI * p.depth) * f, Math.sin(Math.PI * p.depth) * f];
    }
  }
}

/** |c_q|²: the fraction of the incident power in order q. */
export function orderEfficiency(p: GratingProfile, q: number): number {
  const [re, im] = orderAmplitude(p, q);
  return re * re + im * im;
}

/** Σ_q |c_q|² = the mean of |T|² over a period (Parseval): the power the grating passes. */
export function meanTransmission(p: GratingProfile): number {
  checkProfile(p);
  switch (p.kind) {
    case 'binary-amplitude':
      return p.duty;
    case 'sinusoidal-amplitude':
      // mean of (½ + (m/2)cos)² = ¼ + m²/8.
      return 0.25 + (p.modulation * p.modulation) / 8;
    default:
      return 1; // |T| = 1 everywhere in a period
  }
}

/**
 * |c_q|² as a function of q for a scan over many orders: for the sinusoidal phase profile the Bessel
 * values are computed once (orders past those kept carry less than 1e-40).
 */
function efficiencyScan(p: GratingProfile): (q: number) => number {
  if (p.kind === 'sinusoidal-phase') {
    const j = besselJnSignificant(p.modulation / 2, 1e-20);
    return (q) => {
      const a = Math.abs(q);
      return a < j.length ? j[a]! * j[a]! : 0;
    };
  }
  return (q) => orderEfficiency(p, q);
}

/** A compensated running sum (Neumaier): adds and removes many small terms without drift. */
class RunningSum {
  private s = 0;
  private c = 0;
  add(v: number): void {
    const t = this.s + v;
    this.c += Math.abs(this.s) >= Math.abs(v) ? this.s - t + v : v - t + this.s;
    this.s = t;
  }
  get value(): number {
    return this.s + this.c;
  }
}

/**
 * The smallest range of orders [qLo, qHi] whose efficiencies add up to at least (1 − tol) of
 * meanTransmission (tol is a fraction of the transmitted power, 1e-12 ≤ tol < ½). Among ranges of
 * that width the one with the most power is returned; equal ones (to 1e-15 of the total) go to the
 * one most nearly centred on the profile's centre of power (0, or α for a blazed profile), then to
 * the lower qLo.
 */
export function significantOrders(p: GratingProfile, tol: number): [number, number] {
  checkProfile(p);
  if (!(tol >= 1e-12 && tol < 0.5)) throw new RangeError(`significantOrders: tol must be in [1e-12, 0.5), got ${tol}`);
  const eff = efficiencyScan(p);
  const total = meanTransmission(p);
  const target = (1 - tol) * total;
  const centre = p.kind === 'blazed' ? p.depth : 0;
  const c0 = Math.round(centre);
  // 1. The smallest range symmetric about c0 that holds the target: Q.
  const sym = new RunningSum();
  sym.add(eff(c0));
  let Q = 0;
  while (sym.value < target) {
    Q++;
    if (Q > SIGNIFICANT_ORDERS_MAX) {
      throw new RangeError(
        `significantOrders: holding all but ${tol} of the power of this ${describeProfile(p)} takes more than ` +
          `${SIGNIFICANT_ORDERS_MAX} orders on each side (its orders fall off as 1/q²); ask for a larger tolerance`,
      );
    }
    sym.add(eff(c0 - Q));
    sym.add(eff(c0 + Q));
  }
  // 2. The smallest range overall. Outside [c0 − Q, c0 + Q] lies at most tol of the power, less than
  // the target, so every range that holds the target meets [c0 − Q, c0 + Q]; being no wider than
  // 2Q + 1, it lies within [c0 − 3Q, c0 + 3Q]. Two pointers over that span find the least width.
  const lo0 = c0 - 3 * Q;
  const hi0 = c0 + 3 * Q;
  let width = 2 * Q + 1;
  {
    const run = new RunningSum();
    let lo = lo0;
    for (let hi = lo0; hi <= hi0; hi++) {
      run.add(eff(hi));
      while (lo < hi && run.value - eff(lo) >= target) {
        run.add(-eff(lo));
        lo++;
      }
      if (run.value >= target) width = Math.min(width, hi - lo + 1);
    }
  }
  // 3. Of the ranges of that width, the one with the most power (ties as documented).
  const run = new RunningSum();
  for (let q = lo0; q < lo0 + width; q++) run.add(eff(q));
  let best: [number, number] = [lo0, lo0 + width - 1];
  let bestPower = run.value;
  const offCentre = (lo: number) => Math.abs(lo + (lo + width - 1) - 2 * centre);
  for (let lo = lo0 + 1; lo + width - 1 <= hi0; lo++) {
    run.add(eff(lo + width - 1));
    run.add(-eff(lo - 1));
    const power = run.value;
    const tie = Math.abs(power - bestPower) <= 1e-15 * total;
    if ((!tie && power > bestPower) || (tie && offCentre(lo) < offCentre(best[0]))) {
      best = [lo, lo + width - 1];
      bestPower = Math.max(power, bestPower);
    }
  }
  return best;
}

/**
 * One period's integrals: `piece` adds ∫_{x0}^{x1} T(x − c) dx (signed, so that a piece reaching a
 * rounding error past its period still adds up right) into acc[0] (re) and acc[1] (im); x0 and x1
 * lie in the period centred on c. `whole` is ∫ over a whole period = d·c_0.
 */
interface PeriodIntegrals {
  piece(c: number, x0: number, x1: number, acc: Float64Array): void;
  /** The same for a whole grid cell inside one period (x1 − x0 = cellWidth up to rounding), faster. */
  cell(c: number, x0: number, x1: number, acc: Float64Array): void;
  whole: [number, number];
}

/** Length of [a0, a1] ∩ [b0, b1] (0 if they do not meet): the same arithmetic as mask.ts. */
function overlap(a0: number, a1: number, b0: number, b1: number): number {
  return Math.max(0, Math.min(a1, b1) - Math.max(a0, b0));
}

function periodIntegrals(p: GratingProfile, d: number, cellWidth: number): PeriodIntegrals {
  const same = (pi: Omit<PeriodIntegrals, 'cell'>): PeriodIntegrals => ({ ...pi, cell: pi.piece });
  switch (p.kind) {
    case 'binary-amplitude': {
      const e = (p.duty * d) / 2;
      return same({
        // In absolute coordinates, as mask.ts does, so that the two agree to rounding.
        piece: (c, x0, x1, acc) => void (acc[0]! += overlap(x0, x1, c - e, c + e)),
        whole: [p.duty * d, 0],
      });
    }
    case 'binary-phase': {
      const e = (p.duty * d) / 2;
      const cr = Math.cos(p.step) - 1;
      const ci = Math.sin(p.step);
      return same({
        // T = 1 + (e^{iφ} − 1)·[slit].
        piece: (c, x0, x1, acc) => {
          const o = overlap(x0, x1, c - e, c + e);
          acc[0]! += x1 - x0 + cr * o;
          acc[1]! += ci * o;
        },
        whole: [d + cr * p.duty * d, ci * p.duty * d],
      });
    }
    case 'sinusoidal-amplitude': {
      const m = p.modulation;
      return same({
        // ∫ ½ + (m/2)cos(2πs/d) ds = ½Δ + (m/2)(d/π)·cos(π(s0 + s1)/d)·sin(πΔ/d): the difference of
        // sines written as a product, free of cancellation for thin pieces.
        piece: (c, x0, x1, acc) => {
          const s0 = x0 - c;
          const s1 = x1 - c;
          acc[0]! += 0.5 * (x1 - x0) + ((m / 2) * d * Math.cos((Math.PI * (s0 + s1)) / d) * Math.sin((Math.PI * (s1 - s0)) / d)) / Math.PI;
        },
        whole: [d / 2, 0],
      });
    }
    case 'blazed': {
      const k = (2 * Math.PI * p.depth) / d;
      return same({
        // ∫ e^{ik(s + d/2)} ds over [s0, s1] = Δ·sinc(αΔ/d)·e^{ik((s0 + s1)/2 + d/2)}.
        piece: (c, x0, x1, acc) => {
          const s0 = x0 - c;
          const s1 = x1 - c;
          const delta = x1 - x0;
          const mag = delta * sinc((p.depth * delta) / d);
          const ph = k * ((s0 + s1) / 2 + d / 2);
          acc[0]! += mag * Math.cos(ph);
          acc[1]! += mag * Math.sin(ph);
        },
        whole: [d * Math.cos(Math.PI * p.depth) * sinc(p.depth), d * Math.sin(Math.PI * p.depth) * sinc(p.depth)],
      });
    }
    case 'sinusoidal-phase': {
      // Jacobi–Anger: exp(i a sin u) = Σ_q J_q(a) e^{iqu}, u = 2πs/d (A&S 9.1.41). Term by term,
      // ∫_{s0}^{s1} e^{iqu} ds = Δ·sinc(qΔ/d)·e^{iqū}, ū = π(s0 + s1)/d; with J_{−q} = (−1)^q J_q the
      // ±q pair gives 2J_q·sinc·cos qū (q even, real) or 2i·J_q·sinc·sin qū (q odd). Terms stop
      // where |J_q| < 1e-17; the rest add up to less than a few times that.
      const j = besselJnSignificant(p.modulation / 2, JACOBI_ANGER_TOL);
      const nq = j.length;
      // w_q = 2·J_q·sinc(qΔ/d) (w_0 = J_0), then Σ w_q·(cos qū | i·sin qū). A whole grid cell has
      // Δ = the grid step, the same for all: its weights are computed once (most cells of a fine grid
      // lie inside one period), the pieces cut at period boundaries get their own.
      const weights = (delta: number, w: Float64Array) => {
        w[0] = j[0]!;
        const beta = (Math.PI * delta) / d;
        for (let q = 1; q < nq; q++) {
          const qb = q * beta;
          w[q] = 2 * j[q]! * (qb === 0 ? 1 : Math.sin(qb) / qb);
        }
        return w;
      };
      const cellW = weights(cellWidth, new Float64Array(nq));
      const pieceW = new Float64Array(nq);
      const add = (c: number, x0: number, x1: number, delta: number, w: Float64Array, acc: Float64Array) => {
        const ub = (Math.PI * (x0 - c + (x1 - c))) / d;
        const cu = Math.cos(ub);
        const su = Math.sin(ub);
        let re = w[0]!;
        let im = 0;
        // cos qū, sin qū by rotation: an error of about q ulp, far below the terms' own size.
        let cq = 1;
        let sq = 0;
        for (let q = 1; q < nq; q++) {
          const t = cq * cu - sq * su;
          sq = sq * cu + cq * su;
          cq = t;
          if (q % 2 === 0) re += w[q]! * cq;
          else im += w[q]! * sq;
        }
        acc[0]! += delta * re;
        acc[1]! += delta * im;
      };
      return {
        piece: (c, x0, x1, acc) => add(c, x0, x1, x1 - x0, weights(x1 - x0, pieceW), acc),
        cell: (c, x0, x1, acc) => add(c, x0, x1, cellWidth, cellW, acc),
        whole: [d * j[0]!, 0],
      };
    }
  }
}

/**
 * Exact cell averages of the finite grating's transmittance (count periods of `period`, centred on
 * 0, opaque outside) on `axis`: sample j holds (1/step)·∫ t(x) dx over [x_j − step/2, x_j + step/2],
 * interleaved (re, im). Writes into `out` when given (length ≥ 2·axis.n).
 */
export function gratingCellAverages(p: GratingProfile, period: number, count: number, axis: Axis, out?: Float64Array): Float64Array {
  checkProfile(p);
  checkGrating(period, count);
  if (!(axis.step > 0 && Number.isFinite(axis.step))) throw new RangeError(`axis step must be positive, got ${axis.step}`);
  const n = axis.n;
  const res = out ?? new Float64Array(2 * n);
  if (res.length < 2 * n) throw new RangeError(`output holds ${res.length} numbers, ${2 * n} needed`);
  const d = period;
  const { piece, cell, whole } = periodIntegrals(p, d, axis.step);
  const left = -(count * d) / 2;
  const right = (count * d) / 2;
  // The period centres exactly as mask.ts computes the slit centres.
  const first = -((count - 1) / 2) * d;
  const half = axis.step / 2;
  const acc = new Float64Array(2);
  for (let jx = 0; jx < n; jx++) {
    const x = axisAt(axis, jx);
    const a = Math.max(x - half, left);
    const b = Math.min(x + half, right);
    if (!(b > a)) {
      res[2 * jx] = 0;
      res[2 * jx + 1] = 0;
      continue;
    }
    // The periods holding the cell's ends (a right end on a boundary belongs to the period before).
    const na = Math.min(count - 1, Math.max(0, Math.floor((a - left) / d)));
    const nb = Math.max(na, Math.min(count - 1, Math.ceil((b - left) / d) - 1));
    acc[0] = 0;
    acc[1] = 0;
    if (na === nb) {
      if (a === x - half && b === x + half) cell(first + na * d, a, b, acc);
      else piece(first + na * d, a, b, acc);
    } else {
      const ca = first + na * d;
      const cb = first + nb * d;
      piece(ca, a, ca + d / 2, acc);
      const between = nb - na - 1;
      acc[0]! += between * whole[0];
      acc[1]! += between * whole[1];
      piece(cb, cb - d / 2, b, acc);
    }
    res[2 * jx] = acc[0]! / axis.step;
    res[2 * jx + 1] = acc[1]! / axis.step;
  }
  return res;
}

/**
 * The largest local spatial frequency (1/m) the profile imposes on a beam, for the planner. Phase
 * profiles: (1/2π)·max|dφ/dx| — sinusoidal phase (m/2)/d, blazed |α|/d. Amplitude profiles: the
 * highest harmonic with power — 1/d for the sinusoid. Binary profiles (amplitude or phase) have no
 * gradient between their edges; their fundamental 1/d is returned, and the harmonics of their edges
 * are the business of profileMinFeature and significantOrders.
 */
export function localFrequencyMax(p: GratingProfile, period: number): number {
  checkProfile(p);
  checkGrating(period, 1);
  switch (p.kind) {
    case 'sinusoidal-phase':
      return p.modulation / 2 / period;
    case 'blazed':
      return Math.abs(p.depth) / period;
    default:
      return 1 / period;
  }
}

/**
 * The smallest feature (m) of the profile. Binary profiles: the narrower of the two parts of a
 * period, min(duty, 1 − duty)·d. Smooth profiles: half a cycle of their fastest local oscillation,
 * 1/(2·f) with f the local frequency but never more than half a period — the amplitude sinusoid
 * d/2, the sinusoidal phase min(d/2, d/m), the blazed ramp min(d/2, d/(2|α|)).
 */
export function profileMinFeature(p: GratingProfile, period: number): number {
  checkProfile(p);
  checkGrating(period, 1);
  switch (p.kind) {
    case 'binary-amplitude':
    case 'binary-phase':
      return Math.min(p.duty, 1 - p.duty) * period;
    case 'sinusoidal-amplitude':
      return period / 2;
    case 'sinusoidal-phase':
      return Math.min(period / 2, period / p.modulation);
    case 'blazed':
      return p.depth === 0 ? period / 2 : Math.min(period / 2, period / (2 * Math.abs(p.depth)));
  }
}

/** A number for words: 4 significant digits, no trailing zeros. */
function fmt(v: number): string {
  return String(Number(v.toPrecision(4)));
}

/** Words for a report, e.g. "sinusoidal phase grating, modulation 2.4 rad peak to peak". */
export function describeProfile(p: GratingProfile): string {
  switch (p.kind) {
    case 'binary-amplitude':
      return `binary amplitude grating, open fraction ${fmt(p.duty)}`;
    case 'sinusoidal-amplitude':
      return `sinusoidal amplitude grating, modulation ${fmt(p.modulation)}`;
    case 'sinusoidal-phase':
      return `sinusoidal phase grating, modulation ${fmt(p.modulation)} rad peak to peak`;
    case 'binary-phase':
      return `binary phase grating, step ${fmt(p.step)} rad over ${fmt(p.duty)} of each period`;
    case 'blazed':
      return `blazed grating, depth ${fmt(p.depth)} ${Math.abs(p.depth) === 1 ? 'wave' : 'waves'}`;
  }
}
