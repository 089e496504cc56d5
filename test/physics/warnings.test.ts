// Each validity warning fires where its condition holds and stays quiet where it does not
// (DESIGN.md §3: the tool warns instead of silently returning an aliased or truncated result).
import { describe, expect, it } from 'vitest';
import { planCase } from '../../src/plan/planner.js';
import { makeCase, mm, nm, runCase, um, type CaseSpec } from '../helpers.js';
import type { SpectrumSource } from '../../src/analysis/spectrum.js';
import { ACCURACY_CODES } from '../../src/warnings/catalogue.js';

const lam = 633 * nm;
const circle = (D: number, opaque = false) => ({ shape: 'circle' as const, diameter: D, opaque });
const slit = (w: number) => ({ shape: 'slit' as const, width: w, opaque: false });

function codes(s: CaseSpec): string[] {
  return runCase(s).codes;
}

/** A case the planner handles without any warning, to contrast with each firing case. */
const quietFarField: CaseSpec = { wavelength: lam, distance: 1, aperture: slit(100 * um) };

describe('warnings', () => {
  it('the contrast cases are quiet', () => {
    expect(codes(quietFarField)).toEqual([]);
    expect(codes({ wavelength: lam, distance: 0.1, aperture: slit(1 * mm) })).toEqual([]);
  });

  it('near-wavelength: a 2 µm slit at 633 nm (features under 4λ; common practice: scalar theory needs features ≫ λ)', () => {
    expect(codes({ wavelength: lam, distance: 0.01, aperture: slit(2 * um) })).toContain('near-wavelength');
    expect(codes({ wavelength: lam, distance: 0.01, aperture: slit(20 * um) })).not.toContain('near-wavelength');
  });

  it('little-light: a narrow beam centred on an annulus\'s obscuration passes only its far tail (Siegman ch. 17: the Gaussian beam power beyond r is e^{−2r²/w²})', () => {
    const ann = { shape: 'annulus' as const, outer: 40 * um, inner: 24 * um, opaque: false };
    expect(codes({ wavelength: lam, distance: 0.1, aperture: ann, illumination: { kind: 'gaussian', waist: 2 * um, tilt: [0, 0] } })).toContain('little-light');
    expect(codes({ wavelength: lam, distance: 0.1, aperture: ann, illumination: { kind: 'gaussian', waist: 20 * um, tilt: [0, 0] } })).not.toContain('little-light');
  });

  it('near-wavelength: a screen closer than a wavelength (common practice: the real screen\'s near field is not scalar)', () => {
    expect(codes({ wavelength: lam, distance: 0.5 * lam, aperture: slit(20 * um) })).toContain('near-wavelength');
    expect(codes({ wavelength: lam, distance: 3 * lam, aperture: slit(20 * um) })).not.toContain('near-wavelength');
  });

  it('undersampled-feature and coarse-sampling: a given pitch of a third of the slit width', () => {
    const c = codes({ ...quietFarField, grid: { pitch: 100 * um / 3 } });
    expect(c).toContain('undersampled-feature');
    expect(c).toContain('coarse-sampling');
    // A given pitch finer than the planner's own is fine.
    const fine = planCase(makeCase(quietFarField)).x.inputPitch / 2;
    expect(codes({ ...quietFarField, grid: { pitch: fine } })).toEqual([]);
  });

  it("curved-light-paraxial: a point source 5 mm before a 2 mm hole (kρ⁴/(8s³) ≈ 25 rad across it, the binomial expansion's next term; common practice); quiet 500 mm away", () => {
    const hole = circle(2 * mm);
    const point = (s: number) => ({ ...makeCase({ wavelength: lam, distance: 0.1, aperture: hole }), source: { kind: 'point' as const, distance: s, at: [0, 0] as [number, number] } });
    expect(planCase(point(5 * mm)).warnings.map((w) => w.code)).toContain('curved-light-paraxial');
    expect(planCase(point(500 * mm)).warnings.map((w) => w.code)).not.toContain('curved-light-paraxial');
    // The screen leg in the real geometry: a source far away, the screen 3 mm behind a 4 mm hole.
    const close = { ...makeCase({ wavelength: lam, distance: 3 * mm, aperture: circle(4 * mm) }), source: { kind: 'point' as const, distance: 1, at: [0, 0] as [number, number] } };
    expect(planCase(close).warnings.map((w) => w.code)).toContain('curved-light-paraxial');
    // Points at infinity ±20° apart through a 2 mm hole: each is the centre's pattern moved, which
    // drops kR·(tan θ − sin θ) ≈ 300 rad across the hole (plan/paraxial.ts lensTiltPhase); ±1 mrad is quiet.
    const stars = (angle: number) => ({ ...makeCase({ wavelength: lam, distance: 0.05, aperture: hole }), source: { kind: 'points' as const, distance: null, points: [{ at: [-angle, 0] as [number, number], power: 1 }, { at: [angle, 0] as [number, number], power: 1 }] } });
    expect(planCase(stars(0.35)).warnings.map((w) => w.code)).toContain('curved-light-paraxial');
    expect(planCase(stars(0.001)).warnings.map((w) => w.code)).not.toContain('curved-light-paraxial');
  });

  it('paraxial: Fresnel forced close to a wide aperture; auto takes the angular spectrum and is quiet', () => {
    const near: CaseSpec = { wavelength: lam, distance: 2 * mm, aperture: slit(1 * mm) };
    expect(codes({ ...near, method: 'fresnel' })).toContain('paraxial');
    const auto = runCase(near);
    expect(auto.plan.method).toBe('angular-spectrum');
    expect(auto.codes).not.toContain('paraxial');
  });

  it('not-far-field: the far-field formula forced at N_F ≈ 2', () => {
    const z = (0.5 * mm) ** 2 / (2 * lam);
    expect(codes({ wavelength: lam, distance: z, aperture: slit(1 * mm), method: 'fraunhofer' })).toContain('not-far-field');
    expect(codes({ ...quietFarField, method: 'fraunhofer' })).not.toContain('not-far-field');
  });

  it('window-loss: a window that cuts the far-field pattern to its central lobe', () => {
    const lobe = (2 * lam * 1) / (100 * um);
    expect(codes({ ...quietFarField, window: [lobe, lobe] })).toContain('window-loss');
  });

  it('edge-energy and band-limit: the angular spectrum forced on a grid far too small for the far field', () => {
    const c = codes({ wavelength: lam, distance: 1, aperture: slit(100 * um), method: 'angular-spectrum', grid: { size: 256 } });
    expect(c).toContain('band-limit');
    expect(c).toContain('edge-energy');
  });

  it('evanescent: a sub-wavelength slit by the angular spectrum', () => {
    const c = codes({ wavelength: lam, distance: 5 * um, aperture: slit(0.3 * um), method: 'angular-spectrum' });
    expect(c).toContain('evanescent');
    expect(c).toContain('near-wavelength');
  });

  it('transfer-undersampled: the Fresnel transfer function on a fine grid far from the aperture (Voelz)', () => {
    const c = codes({ wavelength: lam, distance: 1, aperture: slit(100 * um), method: 'fresnel', grid: { size: 4096, pitch: 1 * um } });
    expect(c).toContain('transfer-undersampled');
  });

  it('output-undersampled: a wide window over a large aperture (a check made before computing)', () => {
    // A 20 mm aperture sampled for a 0.5 m window needs more than the largest single FFT, so the
    // direct sums are planned, and their 2049 output samples over 0.5 m (0.24 mm) are far coarser
    // than the intensity's Nyquist pitch λz/(2D) = 16 µm. Planning only: computing it would take hours.
    const big = { maxMemoryBytes: 1e15 };
    const spec = { wavelength: lam, distance: 1, window: [0.5, 0.5] as [number, number], method: 'fresnel' as const };
    const plan = planCase(makeCase({ ...spec, aperture: circle(20 * mm) }), big);
    expect(plan.form).toBe('direct');
    expect(plan.warnings.map((w) => w.code)).toContain('output-undersampled');
    // A 2 mm aperture fits the single FFT, whose output lattice is fine enough.
    const ok = planCase(makeCase({ ...spec, aperture: circle(2 * mm) }), big);
    expect(ok.form).toBe('single-fft');
    expect(ok.warnings).toEqual([]);
  });

  it('grid-too-small: a given grid that does not cover the aperture', () => {
    const c = codes({ wavelength: lam, distance: 0.1, aperture: slit(1 * mm), method: 'angular-spectrum', grid: { size: 256, pitch: 2 * um } });
    expect(c).toContain('grid-too-small');
  });

  it('power-excess: the far-field formula on an aliased (too coarse) source', () => {
    const c = codes({ wavelength: lam, distance: 1, aperture: { shape: 'slits', count: 20, width: 5 * um, period: 10 * um, opaque: false }, grid: { pitch: 4 * um } });
    expect(c).toContain('power-excess');
  });

  it('tilt-y-ignored: a tilt along the lines of a 1-D slit', () => {
    expect(codes({ ...quietFarField, illumination: { kind: 'plane', tilt: [0, 0.01] } })).toContain('tilt-y-ignored');
  });
});

describe('memory guard', () => {
  it('refuses a case whose grid cannot fit, with the estimate and how to lower it', () => {
    // A Gaussian beam (the exact boundary form, which would take a plane wave, does not apply).
    const plan = planCase(makeCase({ wavelength: lam, distance: 5 * mm, aperture: circle(20 * mm), illumination: { kind: 'gaussian', waist: 8 * mm, tilt: [0, 0] } }), { maxMemoryBytes: 2 * 1024 ** 3 });
    expect(plan.error).toMatch(/needs about [\d.]+ (GiB|TiB)/);
    expect(plan.error).toMatch(/smaller window|coarser grid\.pitch|--max-memory/);
  });
});

describe('spectrum-sampled-coarsely and the spectrum\'s total work', () => {
  // Light of several wavelengths (plan/spectrum.ts): a band is computed at discrete samples, refined
  // up to 256 by the planner; where the pattern moves faster than that the case says so.
  const spectrumCase = (s: CaseSpec, spectrum: SpectrumSource) => ({ ...makeCase(s), spectrum });
  const grating = { shape: 'slits' as const, count: 100, width: 2 * um, period: 4 * um, opaque: false };
  const visible: SpectrumSource = { kind: 'band', from: 400 * nm, to: 700 * nm, samples: 31 };

  it('fires for a 400–700 nm band through a 100-period grating: more samples needed than the 256 given', () => {
    const plan = planCase(spectrumCase({ wavelength: 550 * nm, distance: 1, aperture: grating }, visible));
    expect(plan.error).toBeUndefined();
    const w = plan.warnings.find((x) => x.code === 'spectrum-sampled-coarsely');
    expect(w).toBeDefined();
    expect(ACCURACY_CODES).toContain('spectrum-sampled-coarsely');
    const s = plan.spectrum!.samples;
    expect(s.used).toBe(256);
    expect(s.needed!).toBeGreaterThan(256);
    // A grating of N periods resolves λ/(mN) in order m (Born & Wolf, Principles of Optics, §8.6.3):
    // the first order alone spreads the band over N·Δλ/λ ≈ 43–75 resolution elements, each of which
    // the samples must step through; the count needed is at least that.
    expect(s.needed!).toBeGreaterThan((100 * 300) / 700);
    expect(w!.message).toMatch(/computed at 256 wavelengths/);
    expect(w!.message).toContain(`it would take ${s.needed}`);
  });

  it('is quiet for a narrow band (1 nm) through the same grating, and for a wide band through a single slit', () => {
    const narrow = planCase(spectrumCase({ wavelength: 589.5 * nm, distance: 1, aperture: grating }, { kind: 'band', from: 589 * nm, to: 590 * nm, samples: 3 }));
    expect(narrow.error).toBeUndefined();
    expect(narrow.warnings.map((x) => x.code)).not.toContain('spectrum-sampled-coarsely');
    expect(narrow.spectrum!.samples.needed!).toBeLessThanOrEqual(256);
    const single = planCase(spectrumCase({ wavelength: 550 * nm, distance: 1, aperture: slit(100 * um) }, visible));
    expect(single.error).toBeUndefined();
    expect(single.warnings.map((x) => x.code)).not.toContain('spectrum-sampled-coarsely');
    expect(single.spectrum!.samples.used).toBe(31);
  });

  it('refuses a spectrum whose wavelengths together need more work than the limit, saying how many; a line over it alone is named', () => {
    const lines: SpectrumSource = { kind: 'lines', lines: [500, 550, 600].map((l) => ({ wavelength: l * nm, power: 1 })) };
    const s = { wavelength: 550 * nm, distance: 1, aperture: slit(100 * um) };
    const free = planCase(spectrumCase(s, lines));
    expect(free.error).toBeUndefined();
    const each = free.spectrum!.members.map((m) => m.work);
    expect(free.work).toBeCloseTo(each.reduce((t, x) => t + x, 0), 6);
    // Every line fits the limit alone, the three together do not.
    const together = planCase(spectrumCase(s, lines), { maxWork: 1.5 * Math.max(...each) });
    expect(together.error).toMatch(/^the 3 wavelengths together need about .* of computing \(over the .* limit\)/);
    expect(together.error).toMatch(/fewer lines or band samples/);
    // A limit under one line's own work: the first line is named.
    const alone = planCase(spectrumCase(s, lines), { maxWork: 0.5 * Math.min(...each) });
    expect(alone.error).toMatch(/^at 500(\.0*)? nm: /);
  });
});
