// Closed-form transforms for far-field references (test code only, no code shared with src/):
// F(fx, fy) = ∫∫ t(x, y)·e^{−i2π(fx x + fy y)} dx dy of a rectangle (Goodman, Introduction to Fourier
// Optics, §2.2, the rect pair) and a disc (the Airy amplitude, Born & Wolf §8.5.2), shifted to `at`
// (the shift theorem, Goodman §2.1); and the far-field intensity on a flat screen at distance z,
// I = |F(x/(λr), y/(λr))|²·(z/r)²/(λr)² (Goodman §4.2).
import besselj1 from '@stdlib/math-base-special-besselj1';

export interface Complex {
  re: number;
  im: number;
}

export const sinc = (u: number) => (u === 0 ? 1 : Math.sin(Math.PI * u) / (Math.PI * u));

function shifted(amp: number, at: readonly [number, number], fx: number, fy: number): Complex {
  const ph = -2 * Math.PI * (fx * at[0] + fy * at[1]);
  return { re: amp * Math.cos(ph), im: amp * Math.sin(ph) };
}

/** A w × h rectangle centred at `at`. */
export function rectTransform(w: number, h: number, at: readonly [number, number], fx: number, fy: number): Complex {
  return shifted(w * h * sinc(w * fx) * sinc(h * fy), at, fx, fy);
}

/** A disc of diameter d centred at `at`. */
export function discTransform(d: number, at: readonly [number, number], fx: number, fy: number): Complex {
  const a = d / 2;
  const q = 2 * Math.PI * a * Math.hypot(fx, fy);
  return shifted(Math.PI * a * a * (q === 0 ? 1 : (2 * besselj1(q)) / q), at, fx, fy);
}

/** The far-field intensity at screen point (x, y), distance z, of an aperture whose transform is F. */
export function farFieldIntensity(F: (fx: number, fy: number) => Complex, lam: number, z: number, x: number, y: number): number {
  const r = Math.hypot(x, y, z);
  const f = F(x / (lam * r), y / (lam * r));
  return ((f.re * f.re + f.im * f.im) * (z / r) ** 2) / (lam * r) ** 2;
}
