// Facts of a thin binary amplitude grating (slits of width w at period d) that the planner and the
// order table share: where its orders go and what power thin-element theory gives each.

/** sin(πu)/(πu). */
export function sinc(u: number): number {
  if (Math.abs(u) < 1e-9) return 1;
  const x = Math.PI * u;
  return Math.sin(x) / x;
}

/**
 * Thin binary amplitude grating of slit width w and period d (Goodman, Introduction to Fourier
 * Optics, §4.4): order m carries |c_m|² = (w/d)²·sinc²(m·w/d) of the incident irradiance and
 * Σ_m |c_m|² = w/d, so as a fraction of the power through the slits it is (w/d)·sinc²(m·w/d).
 */
export function thinGratingFraction(width: number, period: number, m: number): number {
  const duty = width / period;
  return duty * sinc(m * duty) ** 2;
}

/**
 * The orders that reach a screen, [lo, hi]: α_m² + β² < 1 with α_m = α + mλ/d (the grating
 * equation d(sin θ_m − sin θ_i) = mλ with a tilt β along the lines). Exactly grazing orders (= 1)
 * are outside this range.
 */
export function landingOrders(sinIncidence: number, sinIncidenceY: number, wavelength: number, period: number): [number, number] {
  const rho = Math.sqrt(Math.max(0, 1 - sinIncidenceY * sinIncidenceY));
  const q = period / wavelength;
  let lo = Math.ceil((-rho - sinIncidence) * q);
  let hi = Math.floor((rho - sinIncidence) * q);
  const lands = (m: number) => Math.abs(sinIncidence + (m * wavelength) / period) < rho;
  while (lo <= hi && !lands(lo)) lo++;
  while (hi >= lo && !lands(hi)) hi--;
  return [lo, hi];
}
