// A thin lens (src/elements/lens.ts) on planner-chosen grids: the focal plane as a Fourier
// transform of the pupil, a focused Gaussian beam, a diverging lens far away, and the Strehl ratio
// of a defocused pupil, against closed forms and a quadrature written here.
import { describe, expect, it } from 'vitest';
import besselj1 from '@stdlib/math-base-special-besselj1';
import type { Aperture } from '../../src/optics/aperture.js';
import { planCase } from '../../src/plan/planner.js';
import { makeCase, mm, nm, runCase, um } from '../helpers.js';
import type { IntensityMap } from '../../src/model/intensity-map.js';

const lam = 633 * nm;
const k = (2 * Math.PI) / lam;

function lens(focal: number, stop: number | null, aberrations: { j: number; rms: number; unit: 'waves' | 'm' }[] = []): Aperture {
  return { shape: 'lens', focal, stop, aberrations, opaque: false } as Aperture;
}

/** Intensity at the sample nearest (x, y). */
function at(c: IntensityMap, x: number, y: number): number {
  const col = Math.round((x - c.x0) / c.dx);
  const row = Math.round((y - c.y0) / c.dy);
  return c.intensity[row * c.nx + col]!;
}

describe('a stop of 25 mm behind a lens of f = 100 mm, the screen at the focus (Airy pattern)', () => {
  const D = 25 * mm;
  const R = D / 2;
  const f = 100 * mm;
  const spec = { wavelength: lam, distance: f, aperture: lens(f, D) };
  const { plan, rec, c, x, y } = runCase(spec);
  // Goodman, Introduction to Fourier Optics, §5.2 (the focal plane as the pupil's Fourier transform,
  // x = λf·f_x) and §4.4 (the circular pupil's transform): I = (πR²/(λf))²·[2J₁(v)/v]², v = kRρ/f.
  const I0 = ((Math.PI * R * R) / (lam * f)) ** 2;
  const airy = (rho: number) => {
    const v = (k * R * rho) / f;
    const j = v === 0 ? 1 : (2 * besselj1(v)) / v;
    return I0 * j * j;
  };
  // Born & Wolf, Principles of Optics, §8.5.2: dark rings at v = 3.8317 and 7.0156.
  const firstZero = (3.8317059702075125 * f) / (k * R);
  const secondZero = (7.015586669815619 * f) / (k * R);

  it('is planned with the lens folded into the chirp, on a small grid', () => {
    expect(plan.method).toBe('fresnel');
    expect(plan.form).toBe('lens-chirp');
    expect(plan.regime).toBe('far-field');
    // Sampling the lens phase itself would take R/(λf) = 197 /mm at the rim: some 10⁵ samples a side.
    expect(plan.x.paddedSamples).toBeLessThanOrEqual(1024);
    expect(plan.y!.paddedSamples).toBeLessThanOrEqual(1024);
    expect(plan.memoryBytes).toBeLessThan(256 * 1024 ** 2);
    // The window holds the Airy pattern's core and rings (several first-zero radii), not the stop.
    expect(plan.x.output.n * plan.x.output.step).toBeGreaterThan(10 * firstZero);
    expect(plan.x.output.n * plan.x.output.step).toBeLessThan(100 * firstZero);
  });

  it('has the peak (πR²/(λf))² within 1 % (Goodman §5.2, §4.4)', () => {
    expect(Math.abs(rec.metrics.peakIntensity - I0) / I0).toBeLessThan(0.01);
    expect(Math.abs(at(c, 0, 0) - I0) / I0).toBeLessThan(0.01);
  });

  it('puts the first dark ring at 1.22 λf/D within 1 % (Born & Wolf §8.5.2)', () => {
    expect(Math.abs(firstZero - (1.21967 * lam * f) / D) / firstZero).toBeLessThan(1e-4);
    expect(Math.abs(rec.metrics.firstMinimum[0]! - firstZero) / firstZero).toBeLessThan(0.01);
    expect(Math.abs(rec.metrics.firstMinimum[1]! - firstZero) / firstZero).toBeLessThan(0.01);
  });

  it('matches the Airy pattern within 1 % of the peak over the central lobes (out to the second dark ring)', () => {
    let worst = 0;
    let n = 0;
    for (let r = 0; r < c.ny; r++) {
      for (let col = 0; col < c.nx; col++) {
        const rho = Math.hypot(x(col), y(r));
        if (rho > secondZero) continue;
        n++;
        worst = Math.max(worst, Math.abs(c.intensity[r * c.nx + col]! - airy(rho)));
      }
    }
    expect(n).toBeGreaterThan(1000);
    expect(worst / I0).toBeLessThan(0.01);
  });

  it('passes the power through the stop, πR² at unit irradiance', () => {
    expect(Math.abs(rec.computed.diagnostics.powerIn - Math.PI * R * R) / (Math.PI * R * R)).toBeLessThan(1e-3);
  });
});

describe('the same lens in a plane wave tilted by 0.5°', () => {
  const D = 25 * mm;
  const R = D / 2;
  const f = 100 * mm;
  const th = (0.5 * Math.PI) / 180;
  const { plan, rec, c, x, y } = runCase({ wavelength: lam, distance: f, aperture: lens(f, D), illumination: { kind: 'plane', tilt: [th, 0] } });
  // Goodman §5.2: the focal plane is the pupil's transform at f_x = x/(λf); the tilt's carrier
  // sin θ/λ moves the Airy pattern to x = f·sin θ (paraxial; f·tan θ differs by fθ³/2 = 0.2 % of an Airy radius).
  const x0 = f * Math.sin(th);
  const I0 = ((Math.PI * R * R) / (lam * f)) ** 2;
  const secondZero = (7.015586669815619 * f) / (k * R);

  it('is planned with the lens folded into the chirp, the tilt as a shift of the output lattice', () => {
    expect(plan.form).toBe('lens-chirp');
    expect(plan.x.paddedSamples).toBeLessThanOrEqual(1024);
  });

  it('puts the peak (πR²/(λf))² at f·sin θ: within a tenth of the output pitch and 1 %', () => {
    expect(Math.abs(rec.metrics.peakPosition[0]! - x0)).toBeLessThan(0.1 * plan.x.output.step);
    expect(Math.abs(rec.metrics.peakIntensity / I0 - 1)).toBeLessThan(0.01);
  });

  it('matches the Airy pattern about f·sin θ within 1 % of the peak out to the second dark ring', () => {
    let worst = 0;
    for (let r = 0; r < c.ny; r++) {
      for (let col = 0; col < c.nx; col++) {
        const rho = Math.hypot(x(col) - x0, y(r));
        if (rho > secondZero) continue;
        const v = (k * R * rho) / f;
        const j = v === 0 ? 1 : (2 * besselj1(v)) / v;
        worst = Math.max(worst, Math.abs(c.intensity[r * c.nx + col]! - I0 * j * j));
      }
    }
    expect(worst / I0).toBeLessThan(0.01);
  });
});

describe('the same lens with the screen near the focus (three focal depths beyond it)', () => {
  const D = 25 * mm;
  const R = D / 2;
  const f = 100 * mm;
  // The quarter-wave focal depth 2λ(f/D)² = 20 µm (Born & Wolf §8.8, from memory).
  const z = f + 3 * 2 * lam * (f / D) ** 2;
  const { plan, c } = runCase({ wavelength: lam, distance: z, aperture: lens(f, D) });
  // On the axis, the Fresnel integral of the uniformly lit stop with the residual chirp
  // (Goodman §4.2, §5.1): (1/(λz))·∫₀^R e^{iπr²(1/z − 1/f)/λ}2πr dr, by Simpson's rule here.
  const onAxis = (() => {
    const n = 20000;
    const q = (Math.PI * (1 / z - 1 / f)) / lam;
    let re = 0;
    let im = 0;
    for (let i = 0; i <= n; i++) {
      const r = (R * i) / n;
      const wt = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
      re += wt * Math.cos(q * r * r) * 2 * Math.PI * r;
      im += wt * Math.sin(q * r * r) * 2 * Math.PI * r;
    }
    const h = R / n / 3;
    return ((re * h) ** 2 + (im * h) ** 2) / (lam * z) ** 2;
  })();

  it('samples only the residual chirp: a small grid still', () => {
    expect(plan.form).toBe('lens-chirp');
    expect(plan.x.paddedSamples).toBeLessThanOrEqual(1024);
  });

  it('has the on-axis intensity of the defocused pupil within 1 % (about 0.25 of the focal peak here)', () => {
    const I0 = ((Math.PI * R * R) / (lam * f)) ** 2;
    expect(onAxis / I0).toBeLessThan(0.5);
    expect(Math.abs(at(c, 0, 0) / onAxis - 1)).toBeLessThan(0.01);
  });
});

describe('a Gaussian beam through an unbounded lens', () => {
  // A fast beam (NA ≈ 2w/f = 0.06): sampling the lens phase out to 3w would take 1.8 µm samples.
  const w = 3 * mm;
  const f = 100 * mm;
  const { plan, c, x, y } = runCase({ wavelength: lam, distance: f, aperture: lens(f, null), illumination: { kind: 'gaussian', waist: w, tilt: [0, 0] } });
  // Siegman, Lasers, ch. 17: the focused waist λf/(πw) (z_R = πw²/λ = 45 m ≫ f, so the exact
  // ABCD radius at z = f differs from it by (f/z_R)²/2 = 3e-6).
  const w0 = (lam * f) / (Math.PI * w);

  it('is planned with the lens folded into the chirp', () => {
    expect(plan.form).toBe('lens-chirp');
    expect(plan.x.paddedSamples).toBeLessThanOrEqual(2048);
  });

  it('has its 1/e² radius λf/(πw) at the focus within 1 % (second moments: w = 2σ)', () => {
    let s = 0;
    let sx = 0;
    let sy = 0;
    for (let r = 0; r < c.ny; r++) {
      for (let col = 0; col < c.nx; col++) {
        const i = c.intensity[r * c.nx + col]!;
        s += i;
        sx += i * x(col) ** 2;
        sy += i * y(r) ** 2;
      }
    }
    const wx = 2 * Math.sqrt(sx / s);
    const wy = 2 * Math.sqrt(sy / s);
    expect(Math.abs(wx - w0) / w0).toBeLessThan(0.01);
    expect(Math.abs(wy - w0) / w0).toBeLessThan(0.01);
  });

  it('has the peak (w/w₀)² of unit incident irradiance within 1 % (the power πw²/2 in a spot of radius w₀)', () => {
    const peak = (w / w0) ** 2;
    expect(Math.abs(at(c, 0, 0) - peak) / peak).toBeLessThan(0.01);
  });
});

describe('a diverging lens far away spreads as geometric optics says', () => {
  // Far away: z = 20|f|, where holding the spread beam at the lens phase's pitch would take a grid of
  // 8192 a side; folded into the chirp, 2048.
  const w = 0.14 * mm;
  const f = -10 * mm;
  const z = 200 * mm;
  const { plan, c, x, y } = runCase({ wavelength: lam, distance: z, aperture: lens(f, null), illumination: { kind: 'gaussian', waist: w, tilt: [0, 0] } });
  // Geometric optics: rays from the virtual focus |f| before the lens, so the beam's radius grows
  // as w·(1 + z/|f|) (common practice); Siegman, Lasers, ch. 20 (ABCD law) adds the diffraction,
  // w(z)² = w²(1 + z/|f|)² + (λz/(πw))² for a waist at the lens with z_R ≫ |f|, z.
  const m = 1 + z / Math.abs(f);
  const geometric = w * m;
  const abcd = Math.sqrt(geometric ** 2 + ((lam * z) / (Math.PI * w)) ** 2);

  it('is planned with the lens folded into the chirp', () => {
    expect(plan.form).toBe('lens-chirp');
    expect(plan.x.paddedSamples).toBeLessThanOrEqual(2048);
  });

  it('has the radius w·(1 + z/|f|) within 1 %, and the ABCD radius within 0.3 %', () => {
    // Diffraction adds (λz/(πw))² to the square: 0.5 % here beyond the geometric radius.
    let s = 0;
    let sx = 0;
    for (let r = 0; r < c.ny; r++) {
      for (let col = 0; col < c.nx; col++) {
        const i = c.intensity[r * c.nx + col]!;
        s += i;
        sx += i * x(col) ** 2 + i * y(r) ** 2;
      }
    }
    // Two axes: Σ(x² + y²) = 2σ², w = 2σ.
    const wz = 2 * Math.sqrt(sx / s / 2);
    expect(Math.abs(wz - geometric) / geometric).toBeLessThan(0.01);
    expect(Math.abs(wz - abcd) / abcd).toBeLessThan(0.003);
  });

  it('has the irradiance on the axis fall as 1/(1 + z/|f|)² (the power spread over the cone, common practice)', () => {
    const peak = (w / abcd) ** 2;
    expect(Math.abs(at(c, 0, 0) - peak) / peak).toBeLessThan(0.01);
  });
});

describe('defocus Z4 of 0.05 wave RMS on the stop: the Strehl ratio', () => {
  const D = 10 * mm;
  const R = D / 2;
  const f = 250 * mm;
  const sigma = 0.05;
  const clean = runCase({ wavelength: lam, distance: f, aperture: lens(f, D) });
  const blurred = runCase({ wavelength: lam, distance: f, aperture: lens(f, D, [{ j: 4, rms: sigma, unit: 'waves' }]) });
  // The reference, independent of src: |⟨e^{i2πW}⟩|² over the unit disc with Noll's
  // Z4 = √3(2ρ² − 1) (Noll, JOSA 66, 207 (1976)), the mean 2∫₀¹ e^{i2πσZ4(ρ)} ρ dρ by the composite
  // Simpson rule on 20 000 intervals (its error ~1e-15 for this smooth integrand).
  const exact = (() => {
    const n = 20000;
    let re = 0;
    let im = 0;
    for (let i = 0; i <= n; i++) {
      const rho = i / n;
      const wgt = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
      const phi = 2 * Math.PI * sigma * Math.sqrt(3) * (2 * rho * rho - 1);
      re += wgt * Math.cos(phi) * rho;
      im += wgt * Math.sin(phi) * rho;
    }
    const h = 1 / n;
    re *= (2 * h) / 3;
    im *= (2 * h) / 3;
    return re * re + im * im;
  })();

  it('plans both with the lens folded into the chirp', () => {
    expect(clean.plan.form).toBe('lens-chirp');
    expect(blurred.plan.form).toBe('lens-chirp');
  });

  it('has the on-axis peak ratio |⟨e^{i2πW}⟩|² within 1 % (the quadrature above)', () => {
    const s = at(blurred.c, 0, 0) / at(clean.c, 0, 0);
    expect(Math.abs(s - exact) / exact).toBeLessThan(0.01);
  });

  it('is near exp(−(2πσ)²) within 1 % (Mahajan, JOSA 72, 1258 (1982))', () => {
    const s = at(blurred.c, 0, 0) / at(clean.c, 0, 0);
    const mahajan = Math.exp(-((2 * Math.PI * sigma) ** 2));
    expect(Math.abs(s - mahajan) / mahajan).toBeLessThan(0.01);
  });

  it('the aberration-free peak is (πR²/(λf))² within 1 % (Goodman §5.2)', () => {
    const I0 = ((Math.PI * R * R) / (lam * f)) ** 2;
    expect(Math.abs(at(clean.c, 0, 0) - I0) / I0).toBeLessThan(0.01);
  });
});

describe('the angular spectrum samples the lens phase itself (a slow lens: 1 mm stop, f = 50 mm)', () => {
  const D = 1 * mm;
  const R = D / 2;
  const f = 50 * mm;
  const { plan, rec, c } = runCase({ wavelength: lam, distance: f, aperture: lens(f, D), method: 'angular-spectrum' });
  const I0 = ((Math.PI * R * R) / (lam * f)) ** 2;

  it("takes its pitch from the lens's local frequency R/(λf) at the rim (4 samples a period)", () => {
    expect(plan.method).toBe('angular-spectrum');
    expect(plan.x.inputPitch).toBeLessThanOrEqual((lam * f) / (4 * R) * (1 + 1e-9));
  });

  it('has the Airy peak (πR²/(λf))² and first zero 1.22λf/D within 1 % (Goodman §5.2; Born & Wolf §8.5.2)', () => {
    // Exact propagation of the quadratic phase: kR⁴/(8f³) = 6e-4 rad from a spherical wave here.
    expect(Math.abs(at(c, 0, 0) / I0 - 1)).toBeLessThan(0.01);
    const zero = (1.21967 * lam * f) / D;
    expect(Math.abs(rec.metrics.firstMinimum[0]! / zero - 1)).toBeLessThan(0.01);
  });

  it('with 0.05 wave RMS of Z4 (given as a path, 31.65 nm) has the on-axis ratio |⟨e^{i2πW}⟩|² within 1 %', () => {
    const blurred = runCase({ wavelength: lam, distance: f, aperture: lens(f, D, [{ j: 4, rms: 0.05 * lam, unit: 'm' }]), method: 'angular-spectrum' });
    expect(blurred.plan.x.inputPitch).toBe(plan.x.inputPitch);
    // The pupil integral for Z4 = √3(2ρ² − 1): the closed form sinc²(πW₂₀), W₂₀ = 2√3σ the
    // peak-to-valley defocus in waves (Born & Wolf §8.8, from memory; the quadrature above agrees).
    const w20 = 2 * Math.sqrt(3) * 0.05;
    const ref = (Math.sin(Math.PI * w20) / (Math.PI * w20)) ** 2;
    expect(Math.abs(at(blurred.c, 0, 0) / at(c, 0, 0) / ref - 1)).toBeLessThan(0.01);
  });
});

describe('the exact forms and Babinet are never planned for a lens', () => {
  it('offers neither the boundary form nor exact edge cells', () => {
    const p = planCase(makeCase({ wavelength: lam, distance: 1, aperture: lens(1, 1 * mm), method: 'rayleigh-sommerfeld' }));
    expect(p.babinet).toBe(false);
    expect(p.exact2D).toBeUndefined();
    expect(p.form).not.toBe('boundary');
  });
  it('warns that a non-paraxial method shows the quadratic phase\'s spherical aberration, and not where it is small', () => {
    const fast = planCase(makeCase({ wavelength: lam, distance: 10 * mm, aperture: lens(10 * mm, 2 * mm), method: 'angular-spectrum' }));
    // kR⁴/(8f³) = 9.9e6 · 1e-12 / 8e-6 = 1.2 rad.
    expect(fast.warnings.map((w) => w.code)).toContain('lens-spherical');
    const slow = planCase(makeCase({ wavelength: lam, distance: 50 * mm, aperture: lens(50 * mm, 1 * mm), method: 'angular-spectrum' }));
    expect(slow.warnings.map((w) => w.code)).not.toContain('lens-spherical');
  });

  it('refuses a Fresnel form beyond the paraxial cone (NA²/2 over 1 %), saying why', () => {
    const p = planCase(makeCase({ wavelength: lam, distance: 20 * mm, aperture: lens(20 * mm, 10 * mm) }));
    const fresnel = p.options.filter((o) => o.method === 'fresnel');
    expect(fresnel.length).toBeGreaterThan(0);
    for (const o of fresnel) {
      expect(o.valid).toBe(false);
      expect(o.why).toMatch(/NA = 0\.25/);
    }
  });
});

void um;
