// The lens checks the random lenses (random-lenses.test.ts) led to, each where it should fire and
// where it should not: a tilt's landing point under the lens-chirp form, the off-axis terms in
// lens-spherical, the far-field formula against a wavefront error, and the pupil's own diffraction
// spread in the cone's NA.
import { describe, expect, it } from 'vitest';
import type { Aperture } from '../../src/optics/aperture.js';
import { planCase } from '../../src/plan/planner.js';
import { WARNING_CATALOGUE } from '../../src/warnings/catalogue.js';
import { makeCase, mm, nm, um } from '../helpers.js';

const lam = 633 * nm;
const deg = Math.PI / 180;

function lens(focal: number, stop: number | null, aberrations: { j: number; rms: number; unit: 'waves' | 'm' }[] = []): Aperture {
  return { shape: 'lens', focal, stop, aberrations, opaque: false } as Aperture;
}
const codes = (p: ReturnType<typeof planCase>) => p.warnings.map((w) => w.code);

describe("a tilted beam through the lens-chirp form: z·sin θ against the chief ray's z·tan θ", () => {
  // 25 mm stop, f = 100 mm: 2kR(tan θ − sin θ) ≈ kRθ³ is 0.082 rad at 0.5° (the spot moves by
  // fθ³/2 = 33 nm, 1.3 % of λf/(2R) = 2.5 µm: about 2 % of the peak on the Airy core's flank) and
  // 0.0053 rad at 0.2°.
  const at = (tilt: number) => planCase(makeCase({ wavelength: lam, distance: 0.1, aperture: lens(0.1, 25 * mm), illumination: { kind: 'plane', tilt: [tilt * deg, 0] } }));
  it('warns (an accuracy warning) at 0.5°, saying how much phase the paraxial kernel drops there', () => {
    const p = at(0.5);
    expect(p.form).toBe('lens-chirp');
    const w = p.warnings.find((x) => x.code === 'paraxial');
    expect(w).toBeDefined();
    expect(WARNING_CATALOGUE.paraxial.accuracy).toBe(true);
    expect(w!.message).toMatch(/drops 0\.08\d* rad/);
  });
  it('is quiet at 0.2° and at normal incidence', () => {
    expect(codes(at(0.2))).not.toContain('paraxial');
    expect(codes(at(0))).not.toContain('paraxial');
  });
});

describe('lens-spherical counts a tilt, and says the values may be off against an ideal lens', () => {
  // 2 mm stop, f = 100 mm, by the angular spectrum: kR⁴/(8f³) = 1.2e-6 rad on the axis; at 3° the
  // dropped phase across the pupil seen from f·tan θ is about kR·tan³θ + kR³·tan θ/f² = 1.43 + 0.05
  // rad (the focus moved from f·sin θ, and blurred).
  const p = (tilt: number) => planCase(makeCase({ wavelength: lam, distance: 0.1, aperture: lens(0.1, 2 * mm), illumination: { kind: 'plane', tilt: [tilt * deg, 0] }, method: 'angular-spectrum' }));
  it('fires for the tilted lens, not for the same lens at normal incidence', () => {
    expect(codes(p(3))).toContain('lens-spherical');
    expect(codes(p(0))).not.toContain('lens-spherical');
  });
  it('is an accuracy warning', () => {
    expect(WARNING_CATALOGUE['lens-spherical'].accuracy).toBe(true);
  });
});

describe('the far-field formula against a lens with a wavefront error', () => {
  // A weak lens (R²/(λf) = 0.07) in a Gaussian beam of 56.5 µm at 9.31 µm: π·N_F = 0.023 rad.
  const spec = (ab: { j: number; rms: number; unit: 'waves' | 'm' }[]) => ({
    wavelength: 9.31 * um,
    distance: 46.4 * mm,
    aperture: lens(46.4 * mm, 345 * um, ab),
    illumination: { kind: 'gaussian' as const, waist: 56.5 * um, tilt: [0, 0] as [number, number] },
  });
  it('is chosen for the lens without one', () => {
    expect(planCase(makeCase(spec([]))).method).toBe('fraunhofer');
  });
  it('is not valid with 0.07 wave of Z22 (it met the quadratic phase linearly: 2 % off), and says why', () => {
    const p = planCase(makeCase(spec([{ j: 22, rms: -0.07, unit: 'waves' }])));
    expect(p.method).toBe('fresnel');
    const ff = p.options.find((o) => o.method === 'fraunhofer')!;
    expect(ff.valid).toBe(false);
    expect(ff.why).toMatch(/wavefront error/);
  });
});

describe("the cone's NA counts the lit pupil's own diffraction spread", () => {
  // A Gaussian beam of 0.5 µm at 826 nm spreads over λ/(πw) = 0.53 rad whatever the lens does.
  it('makes the Fresnel forms invalid for a beam narrower than the wavelength', () => {
    const p = planCase(makeCase({ wavelength: 826 * nm, distance: 18.7 * mm, aperture: lens(-1.53 * mm, null), illumination: { kind: 'gaussian', waist: 0.5 * um, tilt: [0, 0] } }));
    const fresnel = p.options.filter((o) => o.method === 'fresnel');
    expect(fresnel.length).toBeGreaterThan(0);
    for (const o of fresnel) expect(o.valid).toBe(false);
  });
  it('leaves a millimetre beam paraxial', () => {
    const p = planCase(makeCase({ wavelength: lam, distance: 0.1, aperture: lens(0.1, null), illumination: { kind: 'gaussian', waist: 1 * mm, tilt: [0, 0] } }));
    expect(p.method).toBe('fresnel');
  });
});
