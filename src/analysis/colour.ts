// Colour of light as the eye sees it: the CIE 1931 2° colour-matching functions, by the published
// analytic multi-lobe fit of Wyman, Sloan & Shirley ("Simple analytic approximations to the CIE XYZ
// color matching functions", JCGT 2(2), 2013; coefficients from memory, checked against CIE table
// values in test/output/colour.test.ts), tristimulus values of a spectrum, chromaticity, and sRGB
// (IEC 61966-2-1: the XYZ → linear RGB matrix for the D65 white point, then the transfer curve).
// The groundwork of issue 14's colour pictures; no output uses it yet.

/** A piecewise Gaussian: σ1 below the mean, σ2 above (the fit's lobes). */
function lobe(lam: number, mu: number, s1: number, s2: number): number {
  const t = (lam - mu) / (lam < mu ? s1 : s2);
  return Math.exp(-0.5 * t * t);
}

/** x̄, ȳ, z̄ at a wavelength (m), CIE 1931 2° observer (the multi-lobe fit). */
export function colourMatching(wavelength: number): [number, number, number] {
  const l = wavelength * 1e9;
  const x = 1.056 * lobe(l, 599.8, 37.9, 31.0) + 0.362 * lobe(l, 442.0, 16.0, 26.7) - 0.065 * lobe(l, 501.1, 20.4, 26.2);
  const y = 0.821 * lobe(l, 568.8, 46.9, 40.5) + 0.286 * lobe(l, 530.9, 16.3, 31.1);
  const z = 1.217 * lobe(l, 437.0, 11.8, 36.0) + 0.681 * lobe(l, 459.0, 26.0, 13.8);
  return [x, y, z];
}

/** Tristimulus values of lines (wavelength m, power): Σ P·[x̄, ȳ, z̄]. */
export function tristimulus(lines: readonly { wavelength: number; power: number }[]): [number, number, number] {
  let X = 0;
  let Y = 0;
  let Z = 0;
  for (const { wavelength, power } of lines) {
    const [x, y, z] = colourMatching(wavelength);
    X += power * x;
    Y += power * y;
    Z += power * z;
  }
  return [X, Y, Z];
}

/** Chromaticity (x, y) of tristimulus values; null for black. */
export function chromaticity([X, Y, Z]: readonly [number, number, number]): [number, number] | null {
  const s = X + Y + Z;
  return s > 0 ? [X / s, Y / s] : null;
}

/** The sRGB white point, D65 (IEC 61966-2-1), as chromaticity. */
export const SRGB_WHITE: [number, number] = [0.3127, 0.329];

function encode(lin: number): number {
  const v = lin <= 0.0031308 ? 12.92 * lin : 1.055 * lin ** (1 / 2.4) - 0.055;
  return Math.round(255 * Math.min(1, Math.max(0, v)));
}

/**
 * 8-bit sRGB of tristimulus values scaled so that Y = `brightness` (0..1) at most. Colours outside
 * the sRGB gamut (every single line is) are brought in by adding white of the same luminance
 * (D65) until no primary is negative, which keeps the hue and gives up saturation; then scaled
 * down where a primary exceeds 1.
 */
export function srgb8(xyz: readonly [number, number, number], brightness = 1): [number, number, number] {
  const [X0, Y0, Z0] = xyz;
  if (!(Y0 > 0)) return [0, 0, 0];
  const k = brightness / Y0;
  const X = X0 * k;
  const Y = Y0 * k;
  const Z = Z0 * k;
  const lin = (x: number, y: number, z: number): [number, number, number] => [
    3.2406 * x - 1.5372 * y - 0.4986 * z,
    -0.9689 * x + 1.8758 * y + 0.0415 * z,
    0.0557 * x - 0.204 * y + 1.057 * z,
  ];
  let rgb = lin(X, Y, Z);
  const white = lin((SRGB_WHITE[0] / SRGB_WHITE[1]) * Y, Y, ((1 - SRGB_WHITE[0] - SRGB_WHITE[1]) / SRGB_WHITE[1]) * Y);
  const low = Math.min(...rgb);
  if (low < 0) {
    // rgb + t·(white − rgb) ≥ 0 for every primary: the least t.
    let t = 0;
    for (let i = 0; i < 3; i++) if (rgb[i]! < 0) t = Math.max(t, -rgb[i]! / (white[i]! - rgb[i]!));
    rgb = rgb.map((v, i) => v + t * (white[i]! - v)) as [number, number, number];
  }
  const high = Math.max(...rgb);
  if (high > 1) rgb = rgb.map((v) => v / high) as [number, number, number];
  return [encode(rgb[0]), encode(rgb[1]), encode(rgb[2])];
}
