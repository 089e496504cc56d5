// Planes in sequence (plan/sequence.ts, methods/fresnel-planes.ts, optics/sequence.ts) on the grids
// the planner picks, against closed forms written here: a spatial filter (a Gaussian beam focused
// onto a pinhole), a beam through a telescope of two lenses with a pinhole between them (three
// planes), and free space split into two gaps. Random cases with a fixed seed check the planner's
// sampling across the space, and the checks that must warn or refuse do.
import { describe, expect, it } from 'vitest';
import type { Aperture } from '../../src/optics/aperture.js';
import { planCase } from '../../src/plan/planner.js';
import type { Case, PlaneSpec } from '../../src/plan/types.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { testContext } from '../engine.js';
import { makeCase, mm, mulberry32, nm, um, type CaseSpec } from '../helpers.js';
import type { IntensityMap } from '../../src/model/intensity-map.js';
import { validateJob } from '../../src/job/load.js';
import { gaussianThrough } from '../reference/gaussian-beam.js';

const lens = (focal: number, stop: number | null): Aperture => ({ shape: 'lens', focal, stop, aberrations: [], opaque: false }) as Aperture;
const circle = (diameter: number): Aperture => ({ shape: 'circle', diameter, opaque: false }) as Aperture;
const gaussian = (waist: number) => ({ kind: 'gaussian' as const, waist, tilt: [0, 0] as [number, number] });

function run(spec: CaseSpec & { planes: PlaneSpec[] }) {
  const c: Case = { ...makeCase(spec), planes: spec.planes };
  const plan = planCase(c);
  const rec = runPlannedCase(plan, testContext());
  return { plan, rec, codes: rec.warnings.map((w) => w.code) };
}

/** Intensity at the sample nearest (x, y). */
function at(m: IntensityMap, x: number, y: number): number {
  const col = Math.round((x - m.x0) / m.dx);
  const row = Math.round((y - m.y0) / m.dy);
  return m.intensity[row * m.nx + col]!;
}

/** |a|² of a complex number given as [re, im]. */
const abs2 = (a: [number, number]) => a[0] * a[0] + a[1] * a[1];
/** π(1 − e^{−βa²})/β for complex β = br + i·bi: ∫₀^a e^{−βr²} 2πr dr. */
function discIntegral(br: number, bi: number, a: number): [number, number] {
  const a2 = a * a;
  const e = Math.exp(-br * a2);
  const nr = 1 - e * Math.cos(bi * a2);
  const ni = e * Math.sin(bi * a2);
  const m = br * br + bi * bi;
  return [(Math.PI * (nr * br + ni * bi)) / m, (Math.PI * (ni * br - nr * bi)) / m];
}

/**
 * A collimated Gaussian beam of radius w (amplitude e^{−r²/w²}) on a lens of focal length f; a
 * pinhole of radius a at the focus; the screen z₂ behind it. Goodman, Introduction to Fourier
 * Optics, §5.2: the focal field is the pupil's transform times e^{iπr²/(λf)},
 * (πw²/(λf))·e^{−r²/w₀²}·e^{iπr²/(λf)} with w₀ = λf/(πw) (Siegman, Lasers, ch. 17); §4.2: on the axis
 * of the screen U = (1/(λz₂))·∫₀^a U_f(r)·e^{iπr²/(λz₂)} 2πr dr.
 */
function spatialFilter(lam: number, f: number, w: number, a: number, z2: number) {
  const w0 = (lam * f) / (Math.PI * w);
  const amp = (Math.PI * w * w) / (lam * f);
  const I = discIntegral(1 / (w0 * w0), (-Math.PI * (1 / f + 1 / z2)) / lam, a);
  return {
    w0,
    // Siegman ch. 17: the power of a Gaussian of radius w₀ inside radius a.
    transmission: 1 - Math.exp((-2 * a * a) / (w0 * w0)),
    onAxis: (amp / (lam * z2)) ** 2 * abs2(I),
  };
}

describe('a spatial filter: a Gaussian beam focused onto a pinhole, the screen behind it', () => {
  const lam = 633 * nm;
  const f = 50 * mm;
  const w = 1 * mm;
  const z2 = 300 * mm;
  for (const d of [20 * um, 30 * um, 40 * um]) {
    it(`a ${d / um} µm pinhole passes 1 − exp(−2a²/w₀²) of the beam, and the screen's axis matches the closed form`, () => {
      const ref = spatialFilter(lam, f, w, d / 2, z2);
      const { plan, rec, codes } = run({ wavelength: lam, distance: z2, aperture: lens(f, 10 * mm), illumination: gaussian(w), planes: [{ after: f, aperture: circle(d) }] });
      expect(plan.error).toBeUndefined();
      expect(plan.form).toBe('planes');
      const planes = rec.metrics.planes!;
      expect(planes).toHaveLength(2);
      expect(planes[0]!.transmission).toBeCloseTo(1, 6);
      expect(Math.abs(planes[1]!.transmission - ref.transmission)).toBeLessThan(0.002);
      const I0 = at(rec.computed, 0, 0);
      expect(Math.abs(I0 - ref.onAxis) / ref.onAxis).toBeLessThan(0.01);
      // Nothing here is outside the paraxial model's reach (NA 0.06, a 20 µm pinhole at 300 mm).
      expect(codes.filter((c) => c !== 'paraxial-lens')).toEqual([]);
    });
  }
});

describe('three planes: a focused Gaussian beam, a pinhole at the focus, a lens imaging the pinhole onto the screen', () => {
  // Goodman, Introduction to Fourier Optics, §5.3: a lens images a plane at z₁ onto z₂ with
  // 1/z₁ + 1/z₂ = 1/f and magnification −z₂/z₁; at 2f to 2f the image of the focal spot is the spot
  // itself, inverted: I(x) = I_focus(−x) with I_focus = (πw²/(λf₁))²·e^{−2r²/w₀²}, w₀ = λf₁/(πw) (§5.2;
  // Siegman ch. 17), while the second lens's stop passes the whole cone.
  const lam = 1064 * nm;
  const f1 = 40 * mm;
  const w = 1.2 * mm;
  for (const f2 of [60 * mm, 150 * mm]) {
    it(`f₂ = ${f2 / mm} mm at 2f₂ behind the pinhole: the screen at 2f₂ shows the focal spot`, () => {
      const w0 = (lam * f1) / (Math.PI * w);
      const peak = ((Math.PI * w * w) / (lam * f1)) ** 2;
      // The cone from the focus reaches 3w·2f₂/f₁ at the second lens: its stop is twice that.
      const stop = 2 * 2 * ((3 * w * 2 * f2) / f1);
      const { plan, rec, codes } = run({
        wavelength: lam,
        distance: 2 * f2,
        aperture: lens(f1, 12 * mm),
        illumination: gaussian(w),
        planes: [
          { after: f1, aperture: circle(8 * w0) },
          { after: 2 * f2, aperture: lens(f2, stop) },
        ],
      });
      expect(plan.error).toBeUndefined();
      expect(rec.metrics.planes).toHaveLength(3);
      expect(rec.metrics.planes![2]!.ofFirst).toBeGreaterThan(0.999);
      expect(Math.abs(at(rec.computed, 0, 0) - peak) / peak).toBeLessThan(0.01);
      const r = w0;
      const ref = peak * Math.exp(-2);
      expect(Math.abs(at(rec.computed, r, 0) - ref) / peak).toBeLessThan(0.01);
      expect(Math.abs(at(rec.computed, 0, -r) - ref) / peak).toBeLessThan(0.01);
      // The image is no wider than a few spots: the window follows the rays back to a point.
      expect(plan.x.windowHalf).toBeLessThan(40 * w0);
      expect(codes.filter((c) => c !== 'paraxial-lens')).toEqual([]);
    });
  }
});

// The Gaussian beam's q parameter through gaps and lenses: test/reference/gaussian-beam.ts.

describe('a beam expander (lens, pinhole, lens) seen in the near field of its output', () => {
  // Where the expanded beam barely spreads, the last gap is carried by the angular spectrum (the
  // Fresnel sums would need its whole width at the pitch of the window's reach). Random cases with
  // a fixed seed, against the q-parameter above; the pinhole is wide enough (8 focal radii) to pass
  // the beam whole.
  const rnd = mulberry32(7031);
  const pick = (lo: number, hi: number) => lo * (hi / lo) ** rnd();
  const cases = Array.from({ length: 6 }, () => {
    const lam = pick(400 * nm, 1.6 * um);
    const f1 = pick(10 * mm, 100 * mm);
    const f2 = f1 * pick(1.5, 8);
    const w = pick(0.3 * mm, 2 * mm);
    return { lam, f1, f2, w, defocus: pick(0.97, 1.03), z: f2 * pick(0.05, 20) };
  });
  for (const [i, p] of cases.entries()) {
    it(`case ${i}: λ ${(p.lam / nm).toFixed(0)} nm, f₁ ${(p.f1 / mm).toFixed(1)} mm, f₂ ${(p.f2 / mm).toFixed(1)} mm, w ${(p.w / mm).toFixed(2)} mm, screen ${(p.z / mm).toFixed(0)} mm`, () => {
      const w0 = (p.lam * p.f1) / (Math.PI * p.w);
      const gap2 = p.f2 * p.defocus;
      const { plan, rec, codes } = run({
        wavelength: p.lam,
        distance: p.z,
        aperture: lens(p.f1, 10 * p.w),
        illumination: gaussian(p.w),
        planes: [
          { after: p.f1, aperture: circle(16 * w0) },
          { after: gap2, aperture: lens(p.f2, (12 * p.w * p.f2) / p.f1) },
        ],
      });
      expect(plan.error).toBeUndefined();
      const ref = gaussianThrough(p.lam, p.w, [{ lens: p.f1 }, { gap: p.f1 }, { gap: gap2 }, { lens: p.f2 }, { gap: p.z }]);
      const I0 = at(rec.computed, 0, 0);
      if (process.env.SPOTCAST_SHOW) console.log(i, plan.sequence!.legs.map((l) => l.form).join(','), (I0 / ref.onAxis - 1).toExponential(2), codes.join(','));
      expect(codes.filter((c) => c !== 'paraxial-lens')).toEqual([]);
      expect(Math.abs(I0 - ref.onAxis) / ref.onAxis).toBeLessThan(0.01);
      // At one beam radius along each axis, e^{-2} of the axis.
      expect(Math.abs(at(rec.computed, ref.radius, 0) - ref.onAxis * Math.exp(-2)) / ref.onAxis).toBeLessThan(0.01);
      expect(Math.abs(at(rec.computed, 0, ref.radius) - ref.onAxis * Math.exp(-2)) / ref.onAxis).toBeLessThan(0.01);
    });
  }
  it('the near-field gap of a wide beam is carried by the angular spectrum, not a huge sum', () => {
    const lam = 633 * nm;
    const w0 = (lam * 50 * mm) / (Math.PI * 1 * mm);
    const c: Case = {
      ...makeCase({ wavelength: lam, distance: 100 * mm, aperture: lens(50 * mm, 12 * mm), illumination: gaussian(1 * mm) }),
      planes: [
        { after: 50 * mm, aperture: circle(8 * w0) },
        { after: 120 * mm, aperture: lens(120 * mm, 40 * mm) },
      ],
    };
    const plan = planCase(c);
    expect(plan.error).toBeUndefined();
    // The focus onto the pinhole is a sum (the lens's curvature folded in, never sampled).
    expect(plan.sequence!.legs.map((l) => l.form)[0]).toBe('sum');
    expect(plan.sequence!.legs.map((l) => l.form)[2]).toBe('spectrum');
    expect(plan.work).toBeLessThan(1e9);
  });
});

describe('a tilted collimated beam through two wide openings, seen in the near field', () => {
  // Both gaps are carried by the angular spectrum (the beam barely spreads), the tilt as the
  // carrier kept out of the samples. Against the q-parameter above over the whole distance, the
  // beam's centre at z·tan θ (a plane wave's direction; Goodman §3.10).
  const lam = 633 * nm;
  const w = 1 * mm;
  for (const [tx, ty] of [[0.004, 0], [0.02, -0.01]] as const) {
    it(`tilt (${tx}, ${ty}) rad: the beam lands at z·tan θ with the Gaussian's axis and radius`, () => {
      const z1 = 150 * mm;
      const z2 = 250 * mm;
      const { plan, rec, codes } = run({
        wavelength: lam,
        distance: z2,
        aperture: circle(12 * w),
        illumination: { kind: 'gaussian', waist: w, tilt: [tx, ty] },
        planes: [{ after: z1, aperture: circle(30 * mm) }],
      });
      expect(plan.error).toBeUndefined();
      expect(plan.sequence!.legs.map((l) => l.form)).toEqual(['spectrum', 'spectrum']);
      expect(codes).toEqual([]);
      const ref = gaussianThrough(lam, w, [{ gap: z1 + z2 }]);
      const cx = (z1 + z2) * Math.tan(tx);
      // The y tilt's direction cosine is sin θy; the landing point along y is z·β/γ.
      const a = Math.sin(tx);
      const b = Math.sin(ty);
      const g = Math.sqrt(1 - a * a - b * b);
      const [x0, y0] = [((z1 + z2) * a) / g, ((z1 + z2) * b) / g];
      expect(Math.abs(x0 - cx)).toBeLessThan(1e-3 * w + Math.abs(cx) * 1e-3);
      const I0 = at(rec.computed, x0, y0);
      expect(Math.abs(I0 - ref.onAxis) / ref.onAxis).toBeLessThan(0.01);
      expect(Math.abs(at(rec.computed, x0 + ref.radius, y0) - ref.onAxis * Math.exp(-2)) / ref.onAxis).toBeLessThan(0.01);
      expect(Math.abs(at(rec.computed, x0, y0 - ref.radius) - ref.onAxis * Math.exp(-2)) / ref.onAxis).toBeLessThan(0.01);
    });
  }
});

describe('a hard-edged opening in a wide beam, seen in the near field through an empty plane', () => {
  // Goodman §4.2: on the axis of a disc of radius a lit by e^{−r²/w²}, U = (1/(λz))·∫₀^a e^{−r²/w²}
  // e^{iπr²/(λz)} 2πr dr (z = z₁ + z₂: the empty plane changes nothing). At Fresnel numbers of
  // 8–13 the axis swings through its near-field extremes (N_F = 13.2 near a maximum of 4 sin²(πN_F/2),
  // 10.5 between, 7.9 near a minimum); both gaps are carried by the angular spectrum from the
  // opening's light, sampled for its edges' spread. (The empty plane at 100 mm rather than 50 mm:
  // with it at 50 mm the planner needed 3–20·10⁹ operations a case, here 1.2–2.2·10⁹, at the same
  // kind of Fresnel numbers.)
  const lam = 633 * nm;
  const a = 1 * mm;
  const w = 6 * mm;
  const z1 = 100 * mm;
  for (const z2 of [20 * mm, 50 * mm, 100 * mm]) {
    it(`z₁ = ${z1 / mm} mm, z₂ = ${z2 / mm} mm: the axis matches the Fresnel integral over the disc`, () => {
      const z = z1 + z2;
      const ref = abs2(discIntegral(1 / (w * w), (-Math.PI) / (lam * z), a)) / (lam * z) ** 2;
      const { plan, rec, codes } = run({ wavelength: lam, distance: z2, aperture: circle(2 * a), illumination: gaussian(w), planes: [{ after: z1, aperture: circle(40 * mm) }] });
      expect(plan.error).toBeUndefined();
      expect(plan.sequence!.legs.some((l) => l.form === 'spectrum')).toBe(true);
      expect(codes).toEqual([]);
      if (process.env.SPOTCAST_SHOW) console.log(z2, plan.sequence!.legs.map((l) => l.form).join(','), at(rec.computed, 0, 0) / ref - 1, plan.work);
      expect(Math.abs(at(rec.computed, 0, 0) - ref)).toBeLessThan(0.01 * Math.max(ref, 1));
    });
  }
});

describe('an opaque disc in a Gaussian beam, seen in its near field (the bright spot on the axis)', () => {
  // The beam reaches the disc as (Goodman §4.2, the Gaussian integral) U₂(r) = C·e^{−βr²} with
  // a = 1/w² − iπ/(λz₁), C = π/(iλz₁a), β = −iπ/(λz₁) + (π/(λz₁))²/a; behind the disc of radius b, on
  // the axis U₃ = (1/(iλz₂))·C·(π/γ − ∫₀^b e^{−γr²} 2πr dr) with γ = β − iπ/(λz₂).
  const lam = 633 * nm;
  const w = 2 * mm;
  const b = 0.5 * mm;
  const z1 = 100 * mm;
  type C = [number, number];
  const mul = (p: C, q: C): C => [p[0] * q[0] - p[1] * q[1], p[0] * q[1] + p[1] * q[0]];
  const div = (p: C, q: C): C => {
    const m = q[0] * q[0] + q[1] * q[1];
    return [(p[0] * q[0] + p[1] * q[1]) / m, (p[1] * q[0] - p[0] * q[1]) / m];
  };
  // (The disc's Fresnel numbers b²/(λz₂) 6.1 and 3.3: the screen at 65 and 120 mm, where 50 mm
  // needed twice the work for the same kind of case.)
  for (const z2 of [65 * mm, 120 * mm]) {
    it(`z₂ = ${z2 / mm} mm: the axis matches the Gaussian integral less the disc's`, () => {
      const a: C = [1 / (w * w), -Math.PI / (lam * z1)];
      const cC = div([Math.PI, 0], mul([0, lam * z1], a));
      const k1 = (Math.PI / (lam * z1)) ** 2;
      const beta: C = [0, -Math.PI / (lam * z1)];
      const bq = div([k1, 0], a);
      const gamma: C = [beta[0] + bq[0], beta[1] + bq[1] - Math.PI / (lam * z2)];
      const whole = div([Math.PI, 0], gamma);
      const disc = discIntegral(gamma[0], gamma[1], b);
      const u3 = div(mul(cC, [whole[0] - disc[0], whole[1] - disc[1]]), [0, lam * z2]);
      const ref = abs2(u3);
      const obstacle = { shape: 'circle', diameter: 2 * b, opaque: true } as unknown as Aperture;
      const { plan, rec, codes } = run({ wavelength: lam, distance: z2, aperture: circle(20 * w), illumination: gaussian(w), planes: [{ after: z1, aperture: obstacle }] });
      expect(plan.error).toBeUndefined();
      expect(codes).toEqual([]);
      if (process.env.SPOTCAST_SHOW) console.log(z2, plan.sequence!.legs.map((l) => l.form).join(','), at(rec.computed, 0, 0) / ref - 1);
      expect(Math.abs(at(rec.computed, 0, 0) - ref) / ref).toBeLessThan(0.01);
    });
  }
});

describe('free space split in two: a pinhole, a wide opening, the screen', () => {
  // Goodman §4.2 / Born & Wolf §8.8: on the axis of a circular opening of radius a in a plane wave,
  // I = 4 sin²(πa²/(2λz)); with nothing in the way the second plane changes nothing (z = z₁ + z₂).
  // (Gaps where the light is wide and barely spreads cost this form's direct sums dearly: the
  // cases here keep the second gap long against the first, and the screen's window to the central
  // lobes, whose light lost outside is then warned. The 0.2 mm opening at N_F = 0.072, 3 + 250 mm,
  // takes half the work of 5 + 200 mm at N_F = 0.089.)
  const lam = 550 * nm;
  for (const [a, z1, z2] of [[0.1 * mm, 3 * mm, 250 * mm], [0.2 * mm, 10 * mm, 500 * mm]] as const) {
    it(`a = ${a / mm} mm, z₁ = ${z1 / mm} mm, z₂ = ${z2 / mm} mm: the on-axis intensity of one gap of ${(z1 + z2) / mm} mm`, () => {
      const ref = 4 * Math.sin((Math.PI * a * a) / (2 * lam * (z1 + z2))) ** 2;
      const window: [number, number] = [6 * mm, 6 * mm];
      const { plan, rec, codes } = run({ wavelength: lam, distance: z2, window, aperture: circle(2 * a), planes: [{ after: z1, aperture: circle(20 * mm) }] });
      expect(plan.error).toBeUndefined();
      expect(codes.filter((c) => c !== 'window-loss')).toEqual([]);
      // The axis is the far-field pattern's peak here.
      expect(Math.abs(at(rec.computed, 0, 0) - ref) / ref).toBeLessThan(0.01);
    });
  }
});

describe('random spatial filters (fixed seed): matched to the closed forms, or warned', () => {
  const rnd = mulberry32(20261203);
  const pick = (lo: number, hi: number) => lo * (hi / lo) ** rnd();
  const cases = Array.from({ length: 10 }, () => {
    const lam = pick(350 * nm, 2 * um);
    const f = pick(5 * mm, 500 * mm);
    const w = pick(0.2 * mm, 5 * mm);
    const w0 = (lam * f) / (Math.PI * w);
    return { lam, f, w, a: pick(0.5, 3) * w0, z2: pick(0.5, 50) * f };
  });
  for (const [i, p] of cases.entries()) {
    it(`case ${i}: λ ${(p.lam / nm).toFixed(0)} nm, f ${(p.f / mm).toFixed(1)} mm, w ${(p.w / mm).toFixed(2)} mm, pinhole ${(2 * p.a / um).toFixed(1)} µm, screen ${(p.z2 / mm).toFixed(0)} mm`, () => {
      const ref = spatialFilter(p.lam, p.f, p.w, p.a, p.z2);
      const { plan, rec, codes } = run({ wavelength: p.lam, distance: p.z2, aperture: lens(p.f, 8 * p.w), illumination: gaussian(p.w), planes: [{ after: p.f, aperture: circle(2 * p.a) }] });
      expect(plan.error).toBeUndefined();
      const accuracy = codes.filter((c) => c !== 'paraxial-lens');
      const I0 = at(rec.computed, 0, 0);
      const off = Math.abs(I0 - ref.onAxis) / ref.onAxis;
      const tOff = Math.abs(rec.metrics.planes![1]!.transmission - ref.transmission);
      if (process.env.SPOTCAST_SHOW) console.log(i, off.toExponential(2), tOff.toExponential(2), codes.join(','));
      if (accuracy.length === 0) {
        expect(off).toBeLessThan(0.01);
        expect(tOff).toBeLessThan(0.002);
      } else expect(accuracy.some((c) => c === 'planes-paraxial' || c === 'near-wavelength')).toBe(true);
    });
  }
});

describe('what planes in sequence warn about or refuse', () => {
  it('a gap too short for the Fresnel approximation is warned', () => {
    // A 3 µm pinhole lit by a focused beam sends light out to about 0.2 rad; 0.5 mm on the
    // paraxial phase varies across it by far more than the 0.1 rad limit.
    const { codes } = run({ wavelength: 633 * nm, distance: 0.2 * mm, aperture: lens(10 * mm, 4 * mm), illumination: gaussian(1 * mm), planes: [{ after: 10 * mm, aperture: circle(3 * um) }] });
    expect(codes).toContain('planes-paraxial');
  });
  it('a screen window too narrow for the light is warned as light lost', () => {
    const { codes } = run({ wavelength: 633 * nm, distance: 300 * mm, window: [2 * mm, 2 * mm], aperture: lens(50 * mm, 10 * mm), illumination: gaussian(1 * mm), planes: [{ after: 50 * mm, aperture: circle(30 * um) }] });
    expect(codes).toContain('window-loss');
  });
  it('an infinitely long slit in a sequence is refused with why', () => {
    const slit = { shape: 'slit', width: 10 * um, opaque: false } as unknown as Aperture;
    const c: Case = { ...makeCase({ wavelength: 633 * nm, distance: 0.1, aperture: lens(50 * mm, 10 * mm), illumination: gaussian(1 * mm) }), planes: [{ after: 50 * mm, aperture: slit }] };
    expect(planCase(c).error).toMatch(/infinitely long/);
  });
  it('a job with planes refuses a grid, another method and an image in a later plane, naming the key', () => {
    const base = {
      name: 'p',
      wavelength: '633 nm',
      distance: '100 mm',
      aperture: { shape: 'lens', focal_length: '50 mm', stop: '10 mm' },
      planes: [{ after: '50 mm', element: { shape: 'circle', diameter: '20 um' } }],
    };
    expect(() => validateJob({ ...base, grid: { size: 256 } })).toThrow(/grid/);
    expect(() => validateJob({ ...base, method: 'rayleigh-sommerfeld' })).toThrow(/method/);
    expect(() => validateJob({ ...base, planes: [{ after: '50 mm', element: { shape: 'image', file: 'x.png', pitch: '1 um' } }] })).toThrow(/planes\[0\]\.element/);
    expect(() => validateJob({ ...base, planes: [{ after: '50 mm' }] })).toThrow(/planes\[0\]\.element/);
    expect(() => validateJob(base)).not.toThrow();
    // A lens in a later plane (no file named) is taken, with its swept keys.
    const relay = { ...base, planes: [...base.planes, { after: '200 mm', element: { shape: 'lens', focal_length: ['100 mm', '150 mm'], stop: '25 mm' } }] };
    expect(validateJob(relay).spec.planes).toHaveLength(2);
  });
});
