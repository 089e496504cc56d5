// Colour scales for intensity pictures: t in [0, 1] -> sRGB [r, g, b] on 0-255.
//
// Values are returned unrounded: the scale is a continuous curve, and rounding
// to 8 bits is left to whoever builds a table from it, at the number of levels
// it actually shows (the case pictures 252, the contact sheet 256, where the
// rounded shoal still never gets darker; finer tables meet 8-bit steps that can
// dip by a few hundredths of L* where one channel falls while the others rise).
//
// Both scales are built in CIELAB rather than in sRGB code values or linear light:
// interpolating L* linearly between anchors makes lightness — the cue the eye
// reads first in a false-colour picture — change evenly within each segment, and
// it makes "L* rises monotonically" a property of the anchors alone (their L*
// only has to increase), instead of something to hope for after a curved mapping.

export type Rgb = [number, number, number];
export type ColourScale = (t: number) => Rgb;

// sRGB transfer curve and primaries, IEC 61966-2-1 (D65 white).
function decodeSrgb(c8: number): number {
  const c = c8 / 255;
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

function encodeSrgb(lin: number): number {
  const v = lin <= 0.0031308 ? 12.92 * lin : 1.055 * lin ** (1 / 2.4) - 0.055;
  return Math.min(255, Math.max(0, v * 255));
}

const WHITE = [0.9505, 1.0, 1.089] as const; // D65 from the IEC 61966-2-1 matrix row sums

// CIELAB, CIE 15 (the exact 6/29 split of the cube-root curve).
const EPS = (6 / 29) ** 3;
const f = (t: number): number => (t > EPS ? Math.cbrt(t) : t / (3 * (6 / 29) ** 2) + 4 / 29);
const fInv = (u: number): number => (u > 6 / 29 ? u ** 3 : 3 * (6 / 29) ** 2 * (u - 4 / 29));

type Lab = [number, number, number];

function srgbToLab([r8, g8, b8]: Rgb): Lab {
  const r = decodeSrgb(r8), g = decodeSrgb(g8), b = decodeSrgb(b8);
  const x = 0.4124 * r + 0.3576 * g + 0.1805 * b;
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
  const fx = f(x / WHITE[0]), fy = f(y / WHITE[1]), fz = f(z / WHITE[2]);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

function labToSrgb([L, a, bb]: Lab): Rgb {
  const fy = (L + 16) / 116;
  const x = WHITE[0] * fInv(fy + a / 500);
  const y = WHITE[1] * fInv(fy);
  const z = WHITE[2] * fInv(fy - bb / 200);
  // Blends between the shoal anchors stay inside the sRGB gamut (checked at 4096
  // steps while designing it); the clamp only absorbs the rounding of the
  // 4-digit matrices at white, which lands a hair above 1.
  const clip = (v: number): number => Math.min(1, Math.max(0, v));
  const r = clip(3.2406 * x - 1.5372 * y - 0.4986 * z);
  const g = clip(-0.9689 * x + 1.8758 * y + 0.0415 * z);
  const b = clip(0.0557 * x - 0.204 * y + 1.057 * z);
  return [encodeSrgb(r), encodeSrgb(g), encodeSrgb(b)];
}

/** Anchors of "shoal": black, deep teal-blue, muted rose, warm sand, cream. */
export const SHOAL_ANCHORS: ReadonlyArray<{ t: number; rgb: Rgb }> = [
  { t: 0.0, rgb: [0, 0, 0] },
  { t: 0.3, rgb: [12, 52, 78] },
  { t: 0.6, rgb: [168, 72, 92] },
  { t: 0.82, rgb: [236, 178, 112] },
  { t: 1.0, rgb: [255, 250, 236] },
];

const SHOAL_LAB = SHOAL_ANCHORS.map((a) => ({ t: a.t, lab: srgbToLab(a.rgb) }));

const clampT = (t: number): number => (Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0);

export const shoal: ColourScale = (tIn) => {
  const t = clampT(tIn);
  let i = 1;
  while (i < SHOAL_LAB.length - 1 && t > SHOAL_LAB[i]!.t) i++;
  const lo = SHOAL_LAB[i - 1]!, hi = SHOAL_LAB[i]!;
  const u = (t - lo.t) / (hi.t - lo.t);
  const lab: Lab = [0, 1, 2].map((k) => lo.lab[k]! + u * (hi.lab[k]! - lo.lab[k]!)) as Lab;
  return labToSrgb(lab);
};

/** Neutral grey with L* = 100·t, so equal steps of t look like equal steps, as in shoal. */
export const gray: ColourScale = (tIn) => {
  // Straight from L* to Y, bypassing the matrices so the three channels are exactly equal.
  const v = encodeSrgb(fInv((100 * clampT(tIn) + 16) / 116));
  return [v, v, v];
};
