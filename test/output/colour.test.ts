// Colour (analysis/colour.ts) against the CIE 1931 2° observer's tabulated colour-matching
// functions (CIE 15; the values below from memory, 4 decimals as tabulated) and the sRGB standard
// (IEC 61966-2-1). The fit is the published multi-lobe approximation of Wyman, Sloan & Shirley
// (JCGT 2(2), 2013), good to a few hundredths of the functions' peaks.
import { describe, expect, it } from 'vitest';
import { chromaticity, colourMatching, srgb8, tristimulus } from '../../src/analysis/colour.js';

const nm = 1e-9;
// λ (nm): x̄, ȳ, z̄ (CIE 1931 2°, from memory).
const TABLE: [number, number, number, number][] = [
  [450, 0.3362, 0.038, 1.7721],
  [500, 0.0049, 0.323, 0.272],
  [520, 0.0633, 0.71, 0.0782],
  [555, 0.5121, 1.0, 0.0057],
  [600, 1.0622, 0.631, 0.0008],
  [650, 0.2835, 0.107, 0.0],
];

describe('CIE 1931 colour-matching functions (multi-lobe fit)', () => {
  it.each(TABLE)('at %i nm within 0.015 of the table (its peaks are 1.06, 1.00, 1.77)', (l, x, y, z) => {
    const [fx, fy, fz] = colourMatching(l * nm);
    expect(Math.abs(fx - x)).toBeLessThan(0.015);
    expect(Math.abs(fy - y)).toBeLessThan(0.015);
    expect(Math.abs(fz - z)).toBeLessThan(0.015);
  });

  it("a single line's chromaticity is the spectral locus's within 0.015 (520 nm: x 0.0743, y 0.8338; 600 nm: x 0.6270, y 0.3725)", () => {
    for (const [l, x, y] of [
      [520, 0.0743, 0.8338],
      [600, 0.627, 0.3725],
    ] as const) {
      const c = chromaticity(tristimulus([{ wavelength: l * nm, power: 1 }]))!;
      expect(Math.abs(c[0] - x)).toBeLessThan(0.015);
      expect(Math.abs(c[1] - y)).toBeLessThan(0.015);
    }
  });

  it('a flat spectrum is near the equal-energy white x = y = 1/3 (the functions integrate alike, CIE 15) and renders near white', () => {
    const flat = Array.from({ length: 401 }, (_, i) => ({ wavelength: (380 + i) * nm, power: 1 }));
    const xyz = tristimulus(flat);
    const c = chromaticity(xyz)!;
    expect(Math.abs(c[0] - 1 / 3)).toBeLessThan(0.005);
    expect(Math.abs(c[1] - 1 / 3)).toBeLessThan(0.005);
    const [r, g, b] = srgb8(xyz, 0.8);
    // Equal-energy white is a little warmer than sRGB's D65 white: red highest, every channel
    // within 15 % of the others (251, 226, 221 here).
    expect(r).toBeGreaterThanOrEqual(Math.max(g, b));
    expect(Math.min(r, g, b) / Math.max(r, g, b)).toBeGreaterThan(0.85);
  });

  it('renders lines in their hue: red at 650 nm, green at 530 nm, blue at 460 nm (sRGB primaries)', () => {
    const hue = (l: number) => srgb8(tristimulus([{ wavelength: l * nm, power: 1 }]), 0.3);
    const [r1, g1, b1] = hue(650);
    expect(r1).toBeGreaterThan(Math.max(g1, b1));
    const [r2, g2, b2] = hue(530);
    expect(g2).toBeGreaterThan(Math.max(r2, b2));
    const [r3, g3, b3] = hue(460);
    expect(b3).toBeGreaterThan(Math.max(r3, g3));
    expect(srgb8([0, 0, 0])).toEqual([0, 0, 0]);
  });
});
