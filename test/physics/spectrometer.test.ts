// A grating spectrometer in one job (analysis/spectrometer.ts): slit, collimator, grating, camera,
// pixels. Checked against sources outside the code:
// - the grating's angular power against the Fourier transform of the sampled transmittance summed
//   directly (Goodman, Introduction to Fourier Optics, §4.2–4.4: the far field is the transform of
//   the aperture field at f = (sin θ − sin θ_i)/λ), and each order's power against thin-grating
//   theory, (w/d)²·sinc²(m·w/d) (Goodman §4.4);
// - where a line lands: the grating equation d(sin θ_m − sin θ_i) = mλ and an ideal camera lens,
//   x = f·tan(θ − θ_c) (common practice), read off the computed pixels;
// - the linear dispersion dx/dλ = m·f/(d·cos θ_m) (Hecht, Optics, §10.2.8; Palmer, Diffraction
//   Grating Handbook, ch. 2), read from two computed lines;
// - the slit's image, w·(f_cam/f_col)·(cos θ_i/cos θ_m) (the anamorphic magnification; Palmer,
//   Diffraction Grating Handbook, ch. 2, from memory), where the slit dominates;
// - the diffraction-limited image: the FWHM of sinc², 0.8859·λf/(W cos θ_m) (from memory; the
//   value of x with sinc²(x) = ½ is 0.44295, checked here by bisection);
// - the doublet 589.0 / 589.6 nm (sodium D lines, CRC Handbook of Chemistry and Physics, line
//   tables), λ/Δλ ≈ 982: not resolved on the pixels with 500 periods, resolved with 2000, and the
//   dip at the Rayleigh separation 8/π² (Born & Wolf, Principles of Optics, §7.6.3); not resolved
//   either where the slit or the pixels are too coarse;
// - the pixel integrals against brute-force quadrature over the slit and the pixel (random cases,
//   fixed seed).
import { describe, expect, it } from 'vitest';
import { anglePower, anglePowerOf, cameraAngle, detectorSamples, PIXEL_ACCURACY, SAMPLES_PER_FRINGE, spectrometerSignal, type SpectrometerGrating, type SpectrometerLine, type SpectrometerSetup } from '../../src/analysis/spectrometer.js';
import { RAYLEIGH_DIP } from '../../src/analysis/resolution.js';
import type { GratingProfile } from '../../src/optics/grating-profile.js';
import { mm, mulberry32, nm, um } from '../helpers.js';

const binary = (duty: number): GratingProfile => ({ kind: 'binary-amplitude', duty });
const deg = Math.PI / 180;

function setupOf(s: Partial<SpectrometerSetup> & { centre: SpectrometerSetup['centre'] }): SpectrometerSetup {
  return { slit: 1 * um, collimator: 200 * mm, camera: 200 * mm, pixel: 2 * um, pixels: 512, ...s };
}

/** x with sinc²(x) = ½ (sinc(x) = sin(πx)/(πx)), by bisection. */
function sincHalf(): number {
  let lo = 0.1;
  let hi = 0.9;
  for (let i = 0; i < 100; i++) {
    const m = (lo + hi) / 2;
    const v = (Math.sin(Math.PI * m) / (Math.PI * m)) ** 2;
    if (v > 0.5) lo = m;
    else hi = m;
  }
  return lo;
}

/** The peak (fractional pixel) of the signal near p: the vertex of the parabola through the largest pixel within ±reach and its neighbours. */
function peakNear(signal: Float64Array, p: number, reach: number): number {
  let top = Math.round(p);
  for (let j = Math.round(p - reach); j <= Math.round(p + reach); j++) if (signal[j]! > signal[top]!) top = j;
  const [a, b, c] = [signal[top - 1]!, signal[top]!, signal[top + 1]!];
  return top + (a - c) / (2 * (a - 2 * b + c));
}

describe('the grating\'s angular power', () => {
  it('equals the directly summed Fourier transform of the sampled transmittance (Goodman §4.2–4.4)', () => {
    // 7 slits of 1.2 µm at 4 µm, λ = 500 nm: |∫t(ξ)e^{−i2πfξ}dξ|²/(λW) at f = σ/λ, the integral by
    // the midpoint rule on 2 nm cells (exact to about (2 nm · π f)² / 24 relative).
    const lam = 500 * nm;
    const d = 4 * um;
    const N = 7;
    const w = 1.2 * um;
    const h = 2 * nm;
    const W = N * d;
    for (const sigma of [0, 0.031, 0.125, 0.2, -0.37]) {
      const f = sigma / lam;
      let re = 0;
      let im = 0;
      for (let x = -W / 2 + h / 2; x < W / 2; x += h) {
        const k = Math.floor((x + W / 2) / d);
        const local = x - (-W / 2 + (k + 0.5) * d);
        if (Math.abs(local) >= w / 2) continue;
        re += Math.cos(-2 * Math.PI * f * x) * h;
        im += Math.sin(-2 * Math.PI * f * x) * h;
      }
      const direct = (re * re + im * im) / (lam * W);
      const got = anglePower(binary(w / d), d, N, lam, sigma);
      expect(Math.abs(got - direct)).toBeLessThan(2e-4 * Math.max(direct, anglePower(binary(w / d), d, N, lam, 0) * 1e-3));
    }
  });

  it('sends (w/d)²·sinc²(m·w/d) into each order (thin-grating theory, Goodman §4.4)', () => {
    const lam = 600 * nm;
    const d = 10 * um;
    const duty = 0.3;
    const g: SpectrometerGrating = { period: d, count: 400, sinIncidence: 0 };
    // A camera centred on order 2 wide enough for orders 0…4 (±0.12 in sin θ about 0.12).
    const setup = setupOf({ pixels: 4000, pixel: 10 * um, camera: 100 * mm, centre: { wavelength: lam, order: 2 } });
    const r = spectrometerSignal(setup, g, [{ wavelength: lam, weight: 1, profile: binary(duty) }]);
    const sinc = (u: number) => (u === 0 ? 1 : Math.sin(Math.PI * u) / (Math.PI * u));
    const seen = r.lines.map((l) => l.order);
    expect(seen).toEqual(expect.arrayContaining([0, 1, 2, 3, 4]));
    for (const l of r.lines) {
      const expected = duty * duty * sinc(l.order * duty) ** 2;
      expect(Math.abs(l.power - expected)).toBeLessThan(0.005 * duty * duty + 1e-4 * expected);
    }
  });
});

describe('where lines land, and how wide they are', () => {
  const lam = 550 * nm;
  const d = 1e-3 / 600;
  const g: SpectrometerGrating = { period: d, count: 6000, sinIncidence: Math.sin(12 * deg) };

  it('lands each line where the grating equation and x = f·tan(θ − θ_c) put it (common practice)', () => {
    const setup = setupOf({ slit: 2 * um, pixel: 1 * um, pixels: 4000, camera: 250 * mm, centre: { wavelength: lam, order: 1 } });
    const lines = [545, 550, 553.3].map((w) => ({ wavelength: w * nm, weight: 1 / 3, profile: binary(0.5) }));
    const r = spectrometerSignal(setup, g, lines);
    const betaC = Math.asin(Math.sin(12 * deg) + lam / d);
    for (const l of lines) {
      const beta = Math.asin(Math.sin(12 * deg) + l.wavelength / d);
      const x = 250 * mm * Math.tan(beta - betaC);
      const p = x / setup.pixel + (setup.pixels - 1) / 2;
      expect(Math.abs(peakNear(r.signal, p, 12) - p)).toBeLessThan(0.05);
    }
  });

  it('spreads them by m·f/(d·cos θ_m) per unit wavelength (Hecht §10.2.8)', () => {
    const f2 = 300 * mm;
    const setup = setupOf({ slit: 2 * um, pixel: 1 * um, pixels: 6000, camera: f2, centre: { wavelength: lam, order: 2 } });
    const dl = 0.5 * nm;
    const lines = [lam - dl / 2, lam + dl / 2].map((w) => ({ wavelength: w, weight: 0.5, profile: binary(0.4) }));
    const r = spectrometerSignal(setup, g, lines);
    const at = r.lines.filter((l) => l.order === 2).map((l) => peakNear(r.signal, l.pixel, 12));
    const measured = ((at[1]! - at[0]!) * setup.pixel) / dl;
    const beta = Math.asin(Math.sin(12 * deg) + (2 * lam) / d);
    const expected = (2 * f2) / (d * Math.cos(beta));
    expect(Math.abs(measured / expected - 1)).toBeLessThan(2e-3);
    expect(Math.abs(1 / r.reciprocalDispersion / expected - 1)).toBeLessThan(1e-3);
  });

  it('images a wide slit at w·(f_cam/f_col)·(cos θ_i/cos θ_m) (Palmer ch. 2, from memory)', () => {
    const setup = setupOf({ slit: 150 * um, collimator: 100 * mm, camera: 300 * mm, pixel: 5 * um, pixels: 2000, centre: { wavelength: lam, order: 1 } });
    const r = spectrometerSignal(setup, g, [{ wavelength: lam, weight: 1, profile: binary(0.5) }]);
    const beta = Math.asin(Math.sin(12 * deg) + lam / d);
    const expected = (150 * um * 3 * Math.cos(12 * deg)) / Math.cos(beta);
    const l = r.lines.find((x) => x.order === 1)!;
    expect(Math.abs(l.slitImage / expected - 1)).toBeLessThan(1e-9);
    // The computed image: the slit's rectangle softened by a diffraction width 40× narrower.
    expect(l.diffractionWidth).toBeLessThan(expected / 30);
    expect(Math.abs(l.imageFwhm! / expected - 1)).toBeLessThan(0.01);
  });

  it('images a narrow slit at the sinc² FWHM 2·0.44295·λf/(W cos θ_m) (from memory; bisection here)', () => {
    const setup = setupOf({ slit: 0.2 * um, camera: 500 * mm, pixel: 1 * um, pixels: 1000, centre: { wavelength: lam, order: -1 } });
    const narrow: SpectrometerGrating = { ...g, count: 1500 };
    const r = spectrometerSignal(setup, narrow, [{ wavelength: lam, weight: 1, profile: binary(0.5) }]);
    const beta = Math.asin(Math.sin(12 * deg) - lam / d);
    const expected = (2 * sincHalf() * lam * 500 * mm) / (1500 * d * Math.cos(beta));
    const l = r.lines.find((x) => x.order === -1)!;
    expect(Math.abs(l.imageFwhm! / expected - 1)).toBeLessThan(0.005);
    expect(Math.abs(l.diffractionWidth / expected - 1)).toBeLessThan(1e-3);
  });
});

describe('the sodium doublet on the detector (589.0 / 589.6 nm, λ/Δλ ≈ 982)', () => {
  const d = 1e-3 / 300;
  const doublet = (profile: GratingProfile): SpectrometerLine[] => [589.0, 589.6].map((w) => ({ wavelength: w * nm, weight: 0.5, profile }));
  const run = (count: number, s: Partial<SpectrometerSetup>) => {
    const setup = setupOf({ slit: 0.5 * um, camera: 500 * mm, pixel: 1 * um, pixels: 2000, centre: { wavelength: 589.3 * nm, order: 1 }, ...s });
    const r = spectrometerSignal(setup, { period: d, count, sinIncidence: Math.sin(5 * deg) }, doublet({ kind: 'blazed', depth: 1 }));
    return r.pairs.find((p) => p.order === 1);
  };

  it('is not resolved by 500 periods and is by 2000 (R = mN against 982)', () => {
    const few = run(500, {});
    const many = run(2000, {});
    expect(few && many).toBeTruthy();
    expect(few!.resolved).toBe(false);
    expect(many!.resolved).toBe(true);
    expect(many!.dip!).toBeLessThan(0.3);
  });

  it('dips to 8/π² at the Rayleigh separation, N = λ/Δλ (Born & Wolf §7.6.3)', () => {
    // Equal lines of equal weight: N = λ_mean/Δλ periods put each line's first zero on the other.
    const N = Math.round(589.3 / 0.6);
    const p = run(N, { pixel: 0.5 * um, pixels: 4000 })!;
    expect(Math.abs(p.dip! / RAYLEIGH_DIP - 1)).toBeLessThan(0.03);
  });

  it('is not resolved where the slit or the pixels are too coarse, even with 2000 periods', () => {
    // Slit bandpass w·d·cos θ_i/(m·f_col) of 1.2 nm, twice the separation.
    const wide = (1.2 * nm * 200 * mm) / (d * Math.cos(5 * deg));
    const slitLimited = run(2000, { slit: wide })!;
    expect(slitLimited.resolved).toBe(false);
    // Pixels 0.6 nm wide at this dispersion, m·f/(d·cos θ_m): the two lines one pixel apart.
    const beta = Math.asin(Math.sin(5 * deg) + (589.3 * nm) / d);
    const pixel = (0.6 * nm * 500 * mm) / (d * Math.cos(beta));
    const r = run(2000, { pixel, pixels: 64 })!;
    expect(r.dip).toBeNull();
    expect(r.resolved).toBe(false);
  });
});

/**
 * Each pixel's signal by brute force: K slit points × Q points across each pixel, midpoint rule,
 * the angular power evaluated directly at each (an incoherent sum over the slit, Born & Wolf §10.4;
 * the pixel's integral of the power per unit length, ds/dx = cos θ/(f(1 + (x/f)²))).
 */
function bruteForce(setup: SpectrometerSetup, g: SpectrometerGrating, profile: GratingProfile, lam: number, K: number, Q: number): { brute: Float64Array; top: number } {
  const betaC = cameraAngle(setup, g);
  const alpha = Math.asin(g.sinIncidence);
  const power = anglePowerOf(profile, g.period, g.count, lam);
  let top = 0;
  const brute = new Float64Array(setup.pixels);
  for (let j = 0; j < setup.pixels; j++) {
    let sum = 0;
    for (let k = 0; k < K; k++) {
      const u = -setup.slit / 2 + ((k + 0.5) * setup.slit) / K;
      const sa = Math.sin(alpha - Math.atan(u / setup.collimator));
      for (let q = 0; q < Q; q++) {
        const x = (j - setup.pixels / 2 + (q + 0.5) / Q) * setup.pixel;
        const b = betaC + Math.atan(x / setup.camera);
        const dsdx = Math.cos(b) / setup.camera / (1 + (x / setup.camera) ** 2);
        sum += power(Math.sin(b) - sa) * dsdx * (setup.pixel / Q);
      }
    }
    brute[j] = sum / K;
    top = Math.max(top, brute[j]!);
  }
  return { brute, top };
}

describe('a slit a tenth as wide as the collimator is long', () => {
  it('is summed as the brute force sums it (its incidences are not even in sin θ)', () => {
    // 3 mm at 30 mm and 30° incidence: sin(30° − atan(u/f)) bends by 1.5 % across the slit.
    const lam = 600 * nm;
    const setup: SpectrometerSetup = { slit: 3 * mm, collimator: 30 * mm, camera: 100 * mm, pixel: 400 * um, pixels: 40, centre: { wavelength: lam, order: 1 } };
    const g: SpectrometerGrating = { period: 5 * um, count: 30, sinIncidence: 0.5 };
    const r = spectrometerSignal(setup, g, [{ wavelength: lam, weight: 1, profile: binary(0.5) }]);
    const { brute, top } = bruteForce(setup, g, binary(0.5), lam, 2048, 16);
    for (let j = 0; j < setup.pixels; j++) expect(Math.abs(r.signal[j]! - brute[j]!)).toBeLessThan(0.005 * top);
  });
});

describe('the pixel integrals against brute-force quadrature (random cases, fixed seed)', () => {
  const random = mulberry32(20261203);
  const cases = Array.from({ length: 12 }, (_, i) => i);

  it.each(cases)('case %i: each pixel within 1/200 of the brightest pixel of its quadrature', () => {
    const d = (1 + 9 * random()) * um;
    const count = Math.round(20 + 300 * random());
    const lam = (400 + 400 * random()) * nm;
    const m = random() < 0.5 ? 1 : -1;
    // An incidence within ±20° whose order m leaves (drawn again until it does).
    let sinI = Math.sin((random() - 0.5) * 40 * deg);
    while (!(Math.abs(sinI + (m * lam) / d) < 0.95)) sinI = Math.sin((random() - 0.5) * 40 * deg);
    const setup: SpectrometerSetup = {
      slit: (1 + 60 * random()) * um,
      collimator: (50 + 200 * random()) * mm,
      camera: (50 + 200 * random()) * mm,
      pixel: (2 + 20 * random()) * um,
      pixels: 40,
      centre: { wavelength: lam, order: m },
    };
    const profile: GratingProfile = random() < 0.5 ? binary(0.2 + 0.6 * random()) : { kind: 'sinusoidal-phase', modulation: 1 + 4 * random() };
    const g: SpectrometerGrating = { period: d, count, sinIncidence: sinI };
    const r = spectrometerSignal(setup, g, [{ wavelength: lam, weight: 1, profile }]);
    // Brute force: 256 slit points × 32 points per pixel.
    const { brute, top } = bruteForce(setup, g, profile, lam, 256, 32);
    for (let j = 0; j < setup.pixels; j++) expect(Math.abs(r.signal[j]! - brute[j]!)).toBeLessThan(0.005 * top);
  });
});

describe('random setups across the schema\'s ranges (fixed seed)', () => {
  // Log-uniform over wide ranges: wavelength 200 nm – 2 µm, period 1.05 λ – 1 mm, 1 – 200 000
  // periods, slit 10 nm – 5 mm, focal lengths 1 mm – 10 m, pixels 0.1 µm – 1 mm, 2 – 20 000 of
  // them, orders ±1…±3, incidence within ±46°. Setups the planner refuses (the order does not
  // leave) and those needing over 100 000 samples (to keep the test fast) are drawn again.
  const random = mulberry32(4242);
  const logU = (a: number, b: number) => Math.exp(Math.log(a) + random() * (Math.log(b) - Math.log(a)));
  it('conserve power, keep their stated pixel accuracy, and give no negative order power (where lines land is checked above and by brute force)', () => {
    let checked = 0;
    let orders = 0;
    while (checked < 30) {
      const lam = logU(200e-9, 2e-6);
      const d = logU(lam * 1.05, 1e-3);
      const count = Math.round(logU(1, 200000));
      const setup: SpectrometerSetup = { slit: logU(1e-8, 5e-3), collimator: logU(1e-3, 10), camera: logU(1e-3, 10), pixel: logU(1e-7, 1e-3), pixels: Math.round(logU(2, 20000)), centre: { wavelength: lam * logU(0.9, 1.1), order: (random() < 0.5 ? -1 : 1) * Math.ceil(random() * 3) } };
      const g: SpectrometerGrating = { period: d, count, sinIncidence: Math.sin((random() - 0.5) * 1.6) };
      const profile: GratingProfile = random() < 0.5 ? binary(0.1 + 0.8 * random()) : { kind: 'blazed', depth: 2 * random() };
      if (!(Math.abs(g.sinIncidence + (setup.centre.order * setup.centre.wavelength) / d) < 1)) continue;
      if (detectorSamples(setup, g, lam) > 100_000) continue;
      checked++;
      const r = spectrometerSignal(setup, g, [{ wavelength: lam, weight: 1, profile }]);
      let total = 0;
      let top = 0;
      for (const v of r.signal) {
        expect(Number.isFinite(v) && v >= 0).toBe(true);
        total += v;
        top = Math.max(top, v);
      }
      // The stated accuracy (PIXEL_ACCURACY of the brightest pixel) against four times the samples.
      const fine = spectrometerSignal(setup, g, [{ wavelength: lam, weight: 1, profile }], { samplesPerFringe: 4 * SAMPLES_PER_FRINGE });
      for (let j = 0; j < setup.pixels; j++) expect(Math.abs(r.signal[j]! - fine.signal[j]!)).toBeLessThanOrEqual(PIXEL_ACCURACY * top);
      // The fraction of the light on the grating that it passes: the open duty (binary), all (phase).
      const passed = profile.kind === 'binary-amplitude' ? profile.duty : 1;
      expect(total).toBeLessThanOrEqual(passed * (1 + 1e-6));
      for (const l of r.lines) {
        orders++;
        expect(l.power).toBeGreaterThanOrEqual(0);
        expect(l.power).toBeLessThanOrEqual(passed * (1 + 1e-6));
      }
    }
    // (Orders must have landed in most of them, or the per-order checks tested little.)
    expect(orders).toBeGreaterThan(15);
  });
});
