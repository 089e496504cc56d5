// The coaxial Fresnel reference (coaxial-fresnel.ts) against closed forms written here.
import { describe, expect, it } from 'vitest';
import { coaxialCost, intensityAtScreen, type CoaxialSystem } from './coaxial-fresnel.js';
import { gaussianThrough, type BeamStep } from './gaussian-beam.js';

/** π(1 − e^{−βa²})/β for complex β = br + i·bi: ∫₀^a e^{−βr²} 2πr dr (elementary). */
function discIntegral(br: number, bi: number, a: number): [number, number] {
  const a2 = a * a;
  const e = Math.exp(-br * a2);
  const nr = 1 - e * Math.cos(bi * a2);
  const ni = e * Math.sin(bi * a2);
  const m = br * br + bi * bi;
  return [(Math.PI * (nr * br + ni * bi)) / m, (Math.PI * (ni * br - nr * bi)) / m];
}

/** The beam's intensity at radius r after the steps: (w₁/w)²·e^{−2r²/w²} (test/reference/gaussian-beam.ts). */
function gaussianAt(lam: number, w1: number, steps: BeamStep[], r: number): number {
  const { onAxis, radius } = gaussianThrough(lam, w1, steps);
  return onAxis * Math.exp((-2 * r * r) / (radius * radius));
}

describe('the coaxial Fresnel reference against closed forms', () => {
  it('one opening in a plane wave: on the axis 4 sin²(πa²/(2λz)) (Goodman, Introduction to Fourier Optics, §4.2; Born & Wolf §8.8), to 1e-9', () => {
    const lam = 633e-9;
    for (const [a, z] of [[0.5e-3, 0.1], [0.5e-3, 0.0213], [50e-6, 1.0], [2e-3, 0.35]] as const) {
      const s: CoaxialSystem = { lam, w: Infinity, planes: [{ radius: a }], gaps: [z] };
      const ref = 4 * Math.sin((Math.PI * a * a) / (2 * lam * z)) ** 2;
      expect(Math.abs(intensityAtScreen(s, [0])[0]! - ref)).toBeLessThan(1e-9 * Math.max(1, ref));
    }
  });

  it('one opening in a plane wave, far field: the Airy pattern (Born & Wolf §8.5.2) off the axis, to 1e-3 of its peak', () => {
    // z = 400·a²/λ: the Fresnel integral approaches the Fraunhofer pattern, (πa²/(λz))²[2J₁(v)/v]²;
    // the residual chirp e^{iπρ²/(λz)} ≤ π/400 rad moves it by well under 1e-3 of the peak.
    const lam = 500e-9;
    const a = 100e-6;
    const z = (400 * a * a) / lam;
    const s: CoaxialSystem = { lam, w: Infinity, planes: [{ radius: a }], gaps: [z] };
    const peak = ((Math.PI * a * a) / (lam * z)) ** 2;
    // The first zero at v = 3.8317 (Abramowitz & Stegun table 9.5), the half peak near v = 1.6163 (from memory).
    const rZero = (3.8317 * lam * z) / (2 * Math.PI * a);
    const [I0, Iz] = intensityAtScreen(s, [0, rZero]);
    expect(Math.abs(I0! - peak) / peak).toBeLessThan(1e-3);
    expect(Iz! / peak).toBeLessThan(1e-3);
  });

  it('a Gaussian beam through two and three empty planes, with lenses, matches the q-parameter across the beam, to 1e-8 of its peak', () => {
    const lam = 1064e-9;
    const w = 0.5e-3;
    // Openings of 8 beam radii (w = 0.54 mm at 0.3 mm) are empty (e^{−128} of the intensity clipped).
    const free: CoaxialSystem = { lam, w, planes: [{ radius: 8 * w }, { radius: 5e-3 }], gaps: [0.3, 0.5] };
    const peak = gaussianAt(lam, w, [{ gap: 0.8 }], 0);
    const rs = [0, 0.2e-3, 0.7e-3, 1.5e-3];
    const got = intensityAtScreen(free, rs);
    rs.forEach((r, i) => expect(Math.abs(got[i]! - gaussianAt(lam, w, [{ gap: 0.8 }], r)) / peak).toBeLessThan(1e-8));
    // A lens focusing onto a wide opening near the focus, a second lens, the screen.
    const steps = [{ lens: 0.1 }, { gap: 0.1 }, { gap: 0.25 }, { lens: 0.2 }, { gap: 0.4 }];
    const relay: CoaxialSystem = { lam, w, planes: [{ radius: 8 * w, focal: 0.1 }, { radius: 0.4e-3 }, { radius: 8e-3, focal: 0.2 }], gaps: [0.1, 0.25, 0.4] };
    const top = gaussianAt(lam, w, steps, 0);
    const radii = [0, 0.3e-3, 1e-3];
    const out = intensityAtScreen(relay, radii);
    radii.forEach((r, i) => expect(Math.abs(out[i]! - gaussianAt(lam, w, steps, r)) / top).toBeLessThan(1e-8));
  });

  it('a Gaussian beam carried through an empty plane onto a disc: the disc integral on the axis (Goodman §4.2), to 1e-8', () => {
    // The first plane (6 beam radii, e^{−72} of the intensity clipped) passes the beam whole; at the disc, in the e^{+iπr²/(λz)}
    // convention of the Fresnel integral, the beam is e^{−ρ²/(w²(1 + iζ))}/(1 + iζ), ζ = z₁/z_R,
    // z_R = πw²/λ (the Gaussian integral done by hand; Siegman, Lasers, ch. 17 in the other sign
    // convention); on the screen's axis U = (1/(1 + iζ))/(iλz₂)·∫₀^a e^{−βρ²} 2πρ dρ with
    // β = 1/(w²(1 + iζ)) − iπ/(λz₂).
    const lam = 633e-9;
    const a = 1e-3;
    const w = 2e-3;
    // z₁ = 0.8 m (ζ = 0.04): the same kind of beam at the disc as at 0.2 m (ζ = 0.01), but the
    // first plane's chirp over its 12 mm is a quarter as fast, so the nested sums take 4·10⁶ J₀
    // evaluations instead of 4·10⁷ (coaxialCost), with the same 1e-8 asked.
    const z1 = 0.8;
    for (const z2 of [0.02, 0.15]) {
      const zeta = z1 / ((Math.PI * w * w) / lam);
      const d = w * w * (1 + zeta * zeta);
      const I = discIntegral(1 / d, -zeta / d - Math.PI / (lam * z2), a);
      const ref = (1 / (1 + zeta * zeta) / (lam * z2) ** 2) * (I[0] ** 2 + I[1] ** 2);
      const s: CoaxialSystem = { lam, w, planes: [{ radius: 6 * w }, { radius: a }], gaps: [z1, z2] };
      const got = intensityAtScreen(s, [0])[0]!;
      if (process.env.SPOTCAST_SHOW) console.log(z2, got / ref - 1, coaxialCost(s, 0, 1));
      expect(Math.abs(got - ref) / ref).toBeLessThan(1e-8);
    }
  });

  it('a spatial filter (a lens focusing a Gaussian beam onto a pinhole): the screen axis matches the closed form of planes.test.ts (Goodman §5.2, §4.2)', () => {
    const lam = 633e-9;
    const f = 0.05;
    const w = 1e-3;
    const z2 = 0.3;
    for (const a of [10e-6, 15e-6, 20e-6]) {
      const w0 = (lam * f) / (Math.PI * w);
      const amp = (Math.PI * w * w) / (lam * f);
      const I = discIntegral(1 / (w0 * w0), (-Math.PI * (1 / f + 1 / z2)) / lam, a);
      const ref = (amp / (lam * z2)) ** 2 * (I[0] ** 2 + I[1] ** 2);
      const s: CoaxialSystem = { lam, w, planes: [{ radius: 5e-3, focal: f }, { radius: a }], gaps: [f, z2] };
      expect(Math.abs(intensityAtScreen(s, [0])[0]! - ref) / ref).toBeLessThan(1e-8);
      expect(coaxialCost(s, 0, 1)).toBeGreaterThan(0);
    }
  });
});
