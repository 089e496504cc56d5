// How many periods of a grating take part in resolving two lines, when the light across it is not
// uniform. For N periods lit uniformly the resolving power is λ/Δλ = mN (Born & Wolf, Principles of
// Optics, §8.6.3; Hecht, Optics, §10.2.8): two lines are just resolved when the maximum of one falls
// on the first zero of the other (Rayleigh), where their summed intensity dips to 8/π² of the peaks.
// A beam narrower than the grating (a Gaussian) gives lines of another shape, with no zeros; the
// Rayleigh criterion is then used in its general form, the separation at which two equal lines dip
// to the same 8/π² (Born & Wolf §7.6.3) — the criterion analysis/resolution.ts reads off computed
// profiles. The effective count N_eff is the number of uniformly lit periods that resolve the same
// separation: R = |m|·N_eff. For uniform light it is N exactly.
//
// The line shape. The field leaving the grating in order m is the illumination's amplitude a(x)
// times the order's carrier; its far field in the direction cosine s is the Fourier transform
// A((s − s_m)/λ) of a(x) (Goodman, Introduction to Fourier Optics, §4.2). Two wavelengths λ and
// λ + δλ put order m at direction cosines mδλ/d apart; a separation Δq in spatial frequency is
// resolved when mδλ/d = λΔq, so R = λ/δλ = m/(dΔq) and N_eff = 1/(dΔq). For a(x) = 1 over the N
// periods, A is a sinc of first zero Δq = 1/(Nd): N_eff = N. The illumination here is the one
// optics/source.ts applies: exp(−x²/w²) in the grating's plane (w the beam's 1/e² intensity
// radius there), over the grating's count·period.
import { RAYLEIGH_DIP } from './resolution.js';

export interface IlluminatedPeriods {
  /** The effective number of periods N_eff (R = |m|·N_eff). */
  periods: number;
  /**
   * uniform: a plane wave lights all `count` periods; beam: a Gaussian beam well inside the grating
   * (its edges at least 3 w from the axis: the amplitude there is under e⁻⁹ of the peak);
   * truncated-beam: a Gaussian beam cut by the grating's ends.
   */
  rule: 'uniform' | 'beam' | 'truncated-beam';
  /** How N_eff was found, in words. */
  words: string;
}

/**
 * The separation Δ (in the line's own variable) at which two equal, symmetric lines of intensity
 * `line` (its peak at 0) dip to RAYLEIGH_DIP of their peaks between them. `scale` is about the
 * line's width; the root is bracketed in [scale/20, 20·scale].
 */
export function rayleighSeparation(line: (q: number) => number, scale: number): number {
  const dip = (sep: number) => {
    const sum = (q: number) => line(q - sep / 2) + line(q + sep / 2);
    // The peaks of the sum lie between the midpoint and one line's centre (or beyond it by a little
    // when the lines have side lobes): the highest of 32 samples on [0, sep], refined by golden
    // section between its neighbours.
    const n = 32;
    let best = 0;
    let bestV = sum(0);
    for (let i = 1; i <= n; i++) {
      const v = sum((i * sep) / n);
      if (v > bestV) {
        bestV = v;
        best = i;
      }
    }
    let a = (Math.max(0, best - 1) * sep) / n;
    let b = ((best + 1) * sep) / n;
    const g = (Math.sqrt(5) - 1) / 2;
    for (let k = 0; k < 30; k++) {
      const c = b - g * (b - a);
      const e = a + g * (b - a);
      if (sum(c) >= sum(e)) b = e;
      else a = c;
    }
    const peak = Math.max(bestV, sum((a + b) / 2));
    return sum(0) / peak;
  };
  let lo = scale / 20;
  let hi = scale * 20;
  if (!(dip(lo) > RAYLEIGH_DIP && dip(hi) < RAYLEIGH_DIP)) throw new RangeError('rayleighSeparation: the separation is not bracketed');
  for (let k = 0; k < 44; k++) {
    const mid = Math.sqrt(lo * hi);
    if (dip(mid) > RAYLEIGH_DIP) lo = mid;
    else hi = mid;
  }
  return Math.sqrt(lo * hi);
}

/**
 * Two Gaussian lines exp(−2u²) in u = πwq (a Gaussian beam's far field, untruncated) are just
 * resolved at u-separation GAUSSIAN_RAYLEIGH_U: N_eff = πw/(GAUSSIAN_RAYLEIGH_U·d).
 */
export const GAUSSIAN_RAYLEIGH_U = rayleighSeparation((u) => Math.exp(-2 * u * u), 1);

/** The beam is taken as untruncated when the grating reaches this many waists w from the axis on each side. */
export const UNTRUNCATED_WAISTS = 3;

/**
 * The effective number of periods lit by a plane wave (waist null: all `count` of them) or a
 * Gaussian beam of 1/e² intensity radius `waist` in the grating's plane, centred on the grating.
 */
export function illuminatedPeriods(period: number, count: number, waist: number | null): IlluminatedPeriods {
  if (waist === null) return { periods: count, rule: 'uniform', words: `all ${count} periods, lit uniformly (R = |m|N, Born & Wolf §8.6.3)` };
  const half = (count * period) / 2;
  const rayleigh = 'the count of uniformly lit periods whose lines, like this beam\'s, dip to 8/π² between two lines just resolved (Rayleigh\'s criterion in its general form, Born & Wolf §7.6.3)';
  if (half >= UNTRUNCATED_WAISTS * waist) {
    const periods = (Math.PI * waist) / (GAUSSIAN_RAYLEIGH_U * period);
    return {
      periods,
      rule: 'beam',
      words: `${trim(periods)} periods for a Gaussian beam of 1/e² radius w = ${trim(waist * 1e3)} mm: πw/(${trim(GAUSSIAN_RAYLEIGH_U)}·d), ${rayleigh}; the periods within the 1/e² diameter, 2w/d, would be ${trim((2 * waist) / period)}`,
    };
  }
  // A Gaussian cut by the grating's ends: its transform A(q) = 2∫₀^{L/2} exp(−x²/w²) cos(2πqx) dx
  // by Simpson's rule on 200 intervals (the integrand is smooth and, for the q that matter, spans a
  // few oscillations; the rule's error is far below the bisection's).
  const n = 200;
  const h = half / n;
  const amp = Float64Array.from({ length: n + 1 }, (_, i) => Math.exp(-((i * h) ** 2) / (waist * waist)) * (i === 0 || i === n ? 1 : i % 2 ? 4 : 2));
  const line = (q: number) => {
    let s = 0;
    for (let i = 0; i <= n; i++) s += amp[i]! * Math.cos(2 * Math.PI * q * i * h);
    return s * s;
  };
  let dq: number;
  try {
    dq = rayleighSeparation(line, 1 / Math.min(2 * half, 2 * waist));
  } catch {
    // (Not seen for a Gaussian however cut; a case's files must still be written: the smaller of
    // the untruncated beam's count and the whole grating, said so.)
    const periods = Math.min(count, (Math.PI * waist) / (GAUSSIAN_RAYLEIGH_U * period));
    return { periods, rule: 'truncated-beam', words: `${trim(periods)} periods, the smaller of the beam's and the grating's (the separation at which two lines dip to 8/π² could not be bracketed)` };
  }
  const periods = 1 / (period * dq);
  return {
    periods,
    rule: 'truncated-beam',
    words: `${trim(periods)} of the ${count} periods for a Gaussian beam of 1/e² radius ${trim(waist * 1e3)} mm cut by the grating's ends: ${rayleigh}`,
  };
}

function trim(x: number): string {
  return String(Number(x.toPrecision(4)));
}
