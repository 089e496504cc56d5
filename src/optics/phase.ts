// Phase helpers that stay accurate when the phase is millions of radians.

/** k·z reduced modulo 2π without losing digits: 2π·frac(z/λ). */
export function propagationPhase(z: number, wavelength: number): number {
  const cycles = z / wavelength;
  return 2 * Math.PI * (cycles - Math.floor(cycles));
}

/** Multiplies the complex number at data[i], data[i+1] by exp(iφ)·s. */
export function rotate(data: Float64Array, i: number, phi: number, s = 1): void {
  const c = s * Math.cos(phi);
  const sn = s * Math.sin(phi);
  const re = data[i]!;
  const im = data[i + 1]!;
  data[i] = re * c - im * sn;
  data[i + 1] = re * sn + im * c;
}
