// An extended incoherent source (plan/curved-light.ts, run/source-blur.ts): the intensities of its
// points summed, as the centre point's pattern convolved with the source's projection.
import besselj1 from '@stdlib/math-base-special-besselj1';
import { describe, expect, it } from 'vitest';
import { isOneD, xAt } from '../../src/model/grid.js';
import { mm, nm, um } from '../helpers.js';
import { run, sourceCase, valueAt } from './curved-light-helpers.js';

const lam = 633 * nm;
const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));

/** Least-squares fit of A + B·cos(2πx/p) + C·sin(2πx/p) to a 1-D map's samples within |x| ≤ reach. */
function fringeFit(m: { nx: number; dx: number; x0: number; ny: number; dy: number; y0: number; intensity: Float64Array }, p: number, reach: number): { mean: number; cos: number } {
  // Normal equations of the three-term model.
  const M = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
  const v = [0, 0, 0];
  for (let c = 0; c < m.nx; c++) {
    const x = xAt(m, c);
    if (Math.abs(x) > reach) continue;
    const row = [1, Math.cos((2 * Math.PI * x) / p), Math.sin((2 * Math.PI * x) / p)];
    for (let i = 0; i < 3; i++) {
      v[i]! += row[i]! * m.intensity[c]!;
      for (let j = 0; j < 3; j++) M[i]![j]! += row[i]! * row[j]!;
    }
  }
  // Gaussian elimination, 3×3.
  for (let i = 0; i < 3; i++) {
    for (let k = i + 1; k < 3; k++) {
      const f = M[k]![i]! / M[i]![i]!;
      for (let j = i; j < 3; j++) M[k]![j]! -= f * M[i]![j]!;
      v[k]! -= f * v[i]!;
    }
  }
  const x = [0, 0, 0];
  for (let i = 2; i >= 0; i--) {
    let t = v[i]!;
    for (let j = i + 1; j < 3; j++) t -= M[i]![j]! * x[j]!;
    x[i] = t / M[i]![i]!;
  }
  return { mean: x[0]!, cos: x[1]! };
}

describe('extended incoherent source', () => {
  // Van Cittert–Zernike (Born & Wolf, Principles of Optics §10.4; Goodman, Statistical Optics): two
  // narrow slits d apart lit by a uniform incoherent slit source of width b at distance s show
  // fringes of visibility |sinc(b·d/(λs))|, sinc x = sin πx/(πx). Past the first zero the fringes
  // come back with the centre dark.
  const d = 0.5 * mm;
  const s = 1;
  const z = 1;
  const twoSlits = { shape: 'slits' as const, count: 2, width: 20 * um, period: d, opaque: false };
  for (const u of [0.25, 0.5, 0.75, 1.4]) {
    it(`two slits 0.5 mm apart, a slit source with b·d/(λs) = ${u}: visibility |sinc| = ${Math.abs(sinc(u)).toFixed(3)} (Born & Wolf §10.4)`, () => {
      const b = (u * lam * s) / d;
      const { rec, plan } = run(sourceCase(twoSlits, z, { kind: 'extended', shape: 'slit', size: [b, b], distance: s, at: [0, 0] }));
      expect(isOneD(rec.computed)).toBe(true);
      expect(plan.reasons.join(' ')).toMatch(/coherent over about λs\/b/);
      // The fringe period on the screen is λz/d (paraxial; the source's curvature leaves it so).
      const p = (lam * z) / d;
      // The fringes' mean and cosine amplitude by least squares over the samples within ±1.5
      // periods (reading single samples between grid points would dull the sharp minima).
      const { mean, cos } = fringeFit(rec.computed, p, 1.5 * p);
      const visibility = Math.abs(cos) / mean;
      // Error budget: the slits' own envelope (sinc², first zero 25 periods out) falls by 0.5 % at
      // 1.5 periods, which the fit averages into the mean; the grids 0.25 %: 0.01 in visibility.
      expect(Math.abs(visibility - Math.abs(sinc(u)))).toBeLessThan(0.01);
      // Contrast reversal past the first zero: the centre is then a minimum.
      expect(cos > 0).toBe(sinc(u) > 0);
    });
  }

  // Van Cittert–Zernike for a uniform circular source of diameter b (Born & Wolf §10.4.2): the
  // degree of coherence of two points d apart is 2J₁(v)/v, v = πbd/(λs) (J₁ by @stdlib), first zero at
  // v = 3.83; the fringes behind the two slits have that visibility (the disc's extent along the
  // slits changes nothing in a pattern invariant along them).
  for (const u of [0.4, 0.9]) {
    it(`two slits lit by a disc source with b·d/(λs) = ${u}: visibility |2J₁(πu)/(πu)| (Born & Wolf §10.4.2)`, () => {
      const b = (u * lam * s) / d;
      const { rec } = run(sourceCase(twoSlits, z, { kind: 'extended', shape: 'disc', size: [b, b], distance: s, at: [0, 0] }));
      const { mean, cos } = fringeFit(rec.computed, (lam * z) / d, 1.5 * (lam * z) / d);
      const x = Math.PI * u;
      expect(Math.abs(Math.abs(cos) / mean - Math.abs((2 * besselj1(x)) / x))).toBeLessThan(0.01);
    });
  }

  it('a rectangular source far larger than the spot: a uniform rectangle b·z/s, its irradiance the power through the pinhole over its area (common practice)', () => {
    const D = 0.5 * mm;
    const [bw, bh] = [30 * mm, 12 * mm];
    const { rec, plan } = run(sourceCase({ shape: 'circle', diameter: D, opaque: false }, 0.5, { kind: 'extended', shape: 'rectangle', size: [bw, bh], distance: 0.5, at: [0, 0] }));
    const expected = (Math.PI * (D / 2) ** 2) / (bw * bh);
    expect(2 * plan.x.windowHalf).toBeGreaterThan(bw);
    expect(2 * plan.y!.windowHalf).toBeGreaterThan(bh);
    // Error budget as for the disc: 3 %.
    expect(Math.abs(valueAt(rec.computed, 0, 0) / expected - 1)).toBeLessThan(0.03);
    expect(Math.abs(valueAt(rec.computed, 0.2 * bw, -0.15 * bh) / expected - 1)).toBeLessThan(0.03);
    // Outside along y (4 mm past the edge, where the spot's tails have faded) but within the
    // width: dark (the kernel is the rectangle, not a square).
    expect(valueAt(rec.computed, 0, bh / 2 + 4 * mm) / expected).toBeLessThan(0.01);
    expect(valueAt(rec.computed, 0.45 * bw, 0) / expected).toBeGreaterThan(0.3);
  });

  it('the convolution equals an explicit sum over 41 narrow off-axis slit sources computed as separate cases (the paraxial shift theorem)', () => {
    const b = 1.5 * mm;
    const src = { kind: 'extended' as const, shape: 'slit' as const, size: [b, b] as [number, number], distance: s, at: [0, 0] as [number, number] };
    const ext = run(sourceCase(twoSlits, z, src)).rec.computed;
    const n = 41;
    const pts = Array.from({ length: n }, (_, j) => -b / 2 + ((j + 0.5) * b) / n);
    // (Each a slit source b/41 wide, a line along the slits like the whole source: its own kernel is
    // under a cell wide, so each is its point's pattern moved by the tilt from its position.)
    const maps = pts.map((xi) => run(sourceCase(twoSlits, z, { kind: 'extended', shape: 'slit', size: [b / n, b / n], distance: s, at: [xi, 0] })).rec.computed);
    let worst = 0;
    let peak = 0;
    // Compared over the central ±4 mm (the points' windows all hold it).
    for (let c = 0; c < ext.nx; c++) {
      const x = xAt(ext, c);
      if (Math.abs(x) > 4 * mm) continue;
      const sum = maps.reduce((t, m) => t + valueAt(m, x, 0), 0) / n;
      worst = Math.max(worst, Math.abs(sum - ext.intensity[c]!));
      peak = Math.max(peak, sum);
    }
    // Error budget: the midpoint rule over 41 points of a source spanning 1.2 fringe periods of
    // shift (error ≈ (Δ/p)²π²/6 of the fringe term, Δ = b/41·z/s: 0.1 %), bilinear reading of each
    // point's map between its samples (0.2 %), the grids 0.25 %: 1 % of the peak.
    expect(worst / peak).toBeLessThan(0.01);
  });

  it('a disc source far larger than the diffraction spot: the pinhole-camera image, a uniform disc b·z/s wide with the power through the pinhole spread over it (common practice)', () => {
    const D = 0.5 * mm;
    const b = 10 * mm;
    const sd = 0.5;
    const zd = 0.5;
    const { rec, plan } = run(sourceCase({ shape: 'circle', diameter: D, opaque: false }, zd, { kind: 'extended', shape: 'disc', size: [b, b], distance: sd, at: [0, 0] }));
    const image = (b * zd) / sd;
    const expected = (Math.PI * (D / 2) ** 2) / (Math.PI * (image / 2) ** 2);
    // The window was widened by the projection: it holds the whole image.
    expect(2 * plan.x.windowHalf).toBeGreaterThan(image);
    // Error budget: the point case's window holds 98 % of its power (limits.ts windowLossTarget), the
    // diffraction spot's tails beyond the image's edge a few tenths of a per cent: 3 %.
    expect(Math.abs(valueAt(rec.computed, 0, 0) / expected - 1)).toBeLessThan(0.03);
    expect(Math.abs(valueAt(rec.computed, 0.15 * image, 0.1 * image) / expected - 1)).toBeLessThan(0.03);
    // Dark well outside the image.
    expect(valueAt(rec.computed, 0.7 * image, 0) / expected).toBeLessThan(0.01);
    // The convolution keeps the power in the window (the kernel's weights sum to 1).
    expect(Math.abs(rec.metrics.powerInWindow / rec.computed.diagnostics.powerInWindow - 1)).toBeLessThan(1e-9);
  });

  it("the convolution's memory counts against the limit: a source whose image needs a huge window is refused, saying why", () => {
    const c = sourceCase({ shape: 'circle', diameter: 0.2 * mm, opaque: false }, 1, { kind: 'extended', shape: 'disc', size: [0.5, 0.5], distance: 0.01, at: [0, 0] });
    expect(() => run(c)).toThrow(/the source's spread widens the window to \d+ × \d+ samples, and the case to about .* over the .* limit/);
  });

  it('a slit source on a 2-D aperture is refused, saying why', () => {
    const c = sourceCase({ shape: 'circle', diameter: 1 * mm, opaque: false }, 1, { kind: 'extended', shape: 'slit', size: [1 * mm, 1 * mm], distance: 1, at: [0, 0] });
    expect(() => run(c)).toThrow(/slit source .* smears a 2-D pattern/);
  });
});
