// Fresnel zone plates on planner-chosen grids, plane wave at normal incidence, against published
// results and the exact on-axis field of discs:
// - zone radii r_n² = nλf + (nλ/2)² (Attwood, Soft X-Rays and EUV Radiation, ch. 9), so that the
//   path from the edge of zone n to the focus is f + nλ/2;
// - on the axis at z = f each zone adds amplitude 2 (relative to the unit plane wave) with the sign
//   of its Fresnel half-period zone (Hecht, Optics, §10.3.5 "The Fresnel zone plate"; Born & Wolf,
//   Principles of Optics, §8.2): the amplitude plate's N/2 open zones give I = N², the binary phase
//   plate's N zones, all brought in phase, I = (2N)²;
// - first-order efficiency 1/π² (amplitude) and 4/π² (binary phase) (Attwood ch. 9): the on-axis
//   peak over an ideal thin lens's of the same aperture, (πR²/(λf))² (Born & Wolf §8.8, the
//   focal-point intensity of a converging spherical wave, from memory);
// - foci at f = r₁²/λ, f/3, f/5, … (Hecht §10.3.5), the even orders absent for the 50 % zones
//   (Attwood ch. 9).
// The exact on-axis reference is test/reference/rs2d.ts axisIntensity (the first Rayleigh–
// Sommerfeld integral of discs on the axis, in closed form), its discs built here from the radii.
import { describe, expect, it } from 'vitest';
import { parseJobText, JobError } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';
import { describe as describeAperture, type Aperture } from '../../src/optics/aperture.js';
import { apertureMask, apertureTransmittance, isBinary } from '../../src/elements/registry.js';
import { axisIntensity } from '../reference/rs2d.js';
import { boundaryRegionsOf, costRsBoundary, rsBoundaryWithStats } from '../../src/optics/rs-boundary.js';
import { makeCase, mm, nm, runCase, um } from '../helpers.js';
import { planCase } from '../../src/plan/planner.js';

const lam = 633 * nm;

type Kind = 'amplitude' | 'phase';
const plate = (focal: number, zones: number, kind: Kind, design = lam): Aperture => ({ shape: 'zone-plate', focal, zones, design, kind, opaque: false });

/** r_n from Attwood's formula, written here apart from the element's code. */
const radius = (n: number, f: number, l = lam) => Math.sqrt(n * l * f + (n * l * 0.5) ** 2);

/**
 * The plate as discs with signs whose sum is its transmittance: t = Σ_n s_n·(disc r_n − disc r_{n−1}),
 * s_n = 1 for open (odd) zones and, in the phase plate, −1 for the even ones; disc r_n's weight is
 * s_n − s_{n+1} (s beyond the last zone 0), a weight of ±2 given as two discs.
 */
function discsOf(f: number, N: number, kind: Kind, l = lam): { radius: number; sign: 1 | -1 }[] {
  const s = (n: number) => (n > N ? 0 : n % 2 === 1 ? 1 : kind === 'phase' ? -1 : 0);
  const out: { radius: number; sign: 1 | -1 }[] = [];
  for (let n = 1; n <= N; n++) {
    const w = s(n) - s(n + 1);
    for (let i = 0; i < Math.abs(w); i++) out.push({ radius: radius(n, f, l), sign: w > 0 ? 1 : -1 });
  }
  return out;
}

/** The computed intensity on the axis (the window is centred on it, with a sample there). */
function onAxis(aperture: Aperture, z: number, window = 40 * um) {
  const run = runCase({ wavelength: lam, distance: z, aperture, window: [window, window] });
  const { c } = run;
  const col = Math.round(c.center[0]);
  const row = Math.round(c.center[1]);
  // The axis must be a sample, not between two.
  expect(Math.abs(c.center[0] - col) + Math.abs(c.center[1] - row)).toBeLessThan(1e-9);
  const I = c.intensity[row * c.nx + col]!;
  if (process.env.SPOTCAST_SHOW) console.log(`${describeAperture(aperture)} z=${z}: I=${I} by ${run.plan.method} ${run.plan.form ?? ''} work ${run.plan.work.toExponential(2)} ${run.codes.join(' ')}`);
  return { ...run, I };
}

// Amplitude plates go to the boundary form of the exact integral (cheap: one contour per zone edge);
// the phase plate to a sampled method, whose cost grows as N², so it has fewer zones.
const A = { f: 100 * mm, N: 40 };
const P = { f: 50 * mm, N: 10 };

describe('amplitude zone plate on the axis at z = f', () => {
  const r = onAxis(plate(A.f, A.N, 'amplitude'), A.f);
  it('is computed by the exact integral along its boundary', () => {
    expect(r.plan.method).toBe('rayleigh-sommerfeld');
    expect(r.plan.form).toBe('boundary');
  });
  it('has I = N² within 1 % (N/2 open zones of amplitude 2 each: Hecht §10.3.5)', () => {
    expect(Math.abs(r.I / A.N ** 2 - 1)).toBeLessThan(0.01);
  });
  it('matches the exact on-axis integral of its discs within 1e-4 (relative)', () => {
    const ref = axisIntensity(lam, A.f, discsOf(A.f, A.N, 'amplitude'), false);
    expect(Math.abs(r.I / ref - 1)).toBeLessThan(1e-4);
  });
  it('has first-order efficiency 1/π² ≈ 10.1 % within 1 % absolute (Attwood ch. 9)', () => {
    const R = radius(A.N, A.f);
    const lens = ((Math.PI * R * R) / (lam * A.f)) ** 2;
    expect(Math.abs(r.I / lens - 1 / Math.PI ** 2)).toBeLessThan(0.01);
  });
  it('passes the exact area of its open zones', () => {
    let open = 0;
    for (let n = 1; n <= A.N; n += 2) open += Math.PI * (radius(n, A.f) ** 2 - radius(n - 1, A.f) ** 2);
    expect(Math.abs(r.rec.metrics.powerThroughAperture! / open - 1)).toBeLessThan(1e-9);
  });
});

describe('binary phase zone plate on the axis at z = f', () => {
  const r = onAxis(plate(P.f, P.N, 'phase'), P.f);
  it('is not computed by a form that needs a binary aperture (boundary, exact edge cells)', () => {
    expect(r.plan.form).not.toBe('boundary');
    expect(r.plan.exact2D).toBeUndefined();
  });
  it('has I = (2N)² within 1 % (every zone brought in phase: Hecht §10.3.5)', () => {
    expect(Math.abs(r.I / (2 * P.N) ** 2 - 1)).toBeLessThan(0.01);
  });
  it('matches the exact on-axis integral of its discs (weights ±2) within 1 %', () => {
    const ref = axisIntensity(lam, P.f, discsOf(P.f, P.N, 'phase'), false);
    expect(Math.abs(r.I / ref - 1)).toBeLessThan(0.01);
  });
  it('has first-order efficiency 4/π² ≈ 40.5 % within 1 % absolute (Attwood ch. 9)', () => {
    const R = radius(P.N, P.f);
    const lens = ((Math.PI * R * R) / (lam * P.f)) ** 2;
    expect(Math.abs(r.I / lens - 4 / Math.PI ** 2)).toBeLessThan(0.01);
  });
  it('passes all the light on its disc (a pure phase element inside the stop)', () => {
    const R = radius(P.N, P.f);
    expect(Math.abs(r.rec.metrics.powerThroughAperture! / (Math.PI * R * R) - 1)).toBeLessThan(1e-9);
  });
});

describe('the phase plate is never planned with a form that needs a binary aperture', () => {
  // The boundary form and the exact edge cells take open/closed apertures only; the area-sampled
  // cells and every sampled method take the complex transmittance (optics/source.ts). Plans only.
  const lights = [
    { kind: 'plane', tilt: [0, 0] },
    { kind: 'plane', tilt: [0.05, 0] },
    { kind: 'gaussian', waist: 0.4 * mm, tilt: [0, 0] },
  ] as const;
  for (const method of ['auto', 'rayleigh-sommerfeld'] as const) {
    it(`method ${method}: at 0.1 f to 30 f, plane, tilted and Gaussian light`, () => {
      for (const z of [0.1, 0.5, 1, 3, 30].map((k) => k * P.f)) {
        for (const illumination of lights) {
          const plan = planCase(makeCase({ wavelength: lam, distance: z, aperture: plate(P.f, P.N, 'phase'), illumination: { ...illumination, tilt: [...illumination.tilt] }, method, window: [100 * um, 100 * um] }));
          const where = `z = ${z}, ${illumination.kind} ${illumination.tilt[0]}: ${plan.method} ${plan.form ?? ''}`;
          expect(plan.form, where).not.toBe('boundary');
          expect(plan.exact2D, where).toBeUndefined();
          if (method === 'rayleigh-sommerfeld') expect(plan.form, where).toBe('direct');
        }
      }
    });
  }
});

describe('the foci along the axis (amplitude plate)', () => {
  const f1 = radius(1, A.f) ** 2 / lam; // the first focus f = r₁²/λ (Hecht §10.3.5), = f + λ/4 here
  // The depth of focus ±2(Δr)²/λ, Δr the outermost zone width (Attwood ch. 9, from memory; the
  // samples below show it: the intensity is 80 % of the peak at ±DOF).
  const dr = radius(A.N, A.f) - radius(A.N - 1, A.f);
  const dof = (2 * dr * dr) / lam;
  const zs = [-3, -2, -1, 0, 1, 2, 3].map((j) => f1 + j * dof);
  const I = zs.map((z) => onAxis(plate(A.f, A.N, 'amplitude'), z).I);
  it('peaks at f = r₁²/λ within the depth of focus', () => {
    const j = I.indexOf(Math.max(...I));
    expect(j).toBe(3);
    // The vertex of the parabola through the three samples about the largest.
    const [a, b, c] = [I[j - 1]!, I[j]!, I[j + 1]!];
    const peak = zs[j]! + (dof * (a - c)) / (2 * (a - 2 * b + c));
    expect(Math.abs(peak - f1)).toBeLessThan(dof);
    // And falls off on both sides (a focus, not a plateau).
    expect(I[0]!).toBeLessThan(0.8 * I[3]!);
    expect(I[6]!).toBeLessThan(0.8 * I[3]!);
  });
  it('has a third-order focus at f/3: an on-axis maximum there, of about N² again', () => {
    // Each open zone spans three half-period zones as seen from f/3; two of them cancel, so the
    // same N/2 zones add 2 each (the zone construction of Hecht §10.3.5, carried to f/3 here).
    const f3 = f1 / 3;
    // At f/3 the axial scale is 9× shorter (the depth of focus of an aperture of radius R focusing at
    // F goes as λF²/R²: common practice).
    const d3 = dof / 9;
    const at = [-1, 0, 1].map((j) => onAxis(plate(A.f, A.N, 'amplitude'), f3 + j * 3 * d3).I);
    expect(at[1]!).toBeGreaterThan(at[0]!);
    expect(at[1]!).toBeGreaterThan(at[2]!);
    expect(Math.abs(at[1]! / A.N ** 2 - 1)).toBeLessThan(0.03);
  });
  it('has no second-order focus: the axis is dark at f/2 (50 % zones, Attwood ch. 9)', () => {
    expect(onAxis(plate(A.f, A.N, 'amplitude'), f1 / 2).I).toBeLessThan(1e-3 * A.N ** 2);
  });
});

describe('the masks and transmittances: exact zone areas per cell', () => {
  // A grid with cells about a third of the outermost zone, offset from the axis by a fraction of a
  // cell so that edges cut cells every way.
  const f = 20 * mm;
  const N = 12;
  const R = radius(N, f);
  const step = (R - radius(N - 1, f)) / 3.3;
  const n = 2 * Math.ceil(R / step) + 3;
  const axis = { n, start: -((n - 1) / 2) * step + 0.37 * step, step };
  const zoneArea = (k: number) => Math.PI * (radius(k, f) ** 2 - radius(k - 1, f) ** 2);
  let oddArea = 0;
  let evenArea = 0;
  for (let k = 1; k <= N; k++) (k % 2 === 1 ? (oddArea += zoneArea(k)) : (evenArea += zoneArea(k)));
  /** The fraction of a cell in the odd and the even zones by 48 × 48 point samples (error ~1/48 of a cell across an edge). */
  function sampled(x: number, y: number): [number, number] {
    let o = 0;
    let e = 0;
    const m = 48;
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < m; j++) {
        const r = Math.hypot(x + ((i + 0.5) / m - 0.5) * step, y + ((j + 0.5) / m - 0.5) * step);
        let k = 1;
        while (k <= N && radius(k, f) < r) k++;
        if (k <= N) (k % 2 === 1 ? o++ : e++);
      }
    }
    return [o / (m * m), e / (m * m)];
  }
  it('amplitude: binary, the mask holds the open zones\' exact area, cell by cell as point sampling says', () => {
    const a = plate(f, N, 'amplitude');
    expect(isBinary(a)).toBe(true);
    expect(apertureTransmittance(a, axis, axis, lam)).toBeNull();
    const mask = apertureMask(a, axis, axis);
    let sum = 0;
    for (const v of mask) sum += v;
    expect(Math.abs((sum * step * step) / oddArea - 1)).toBeLessThan(1e-9);
    let worst = 0;
    let partial = 0;
    for (let k = 0; k < mask.length; k += 11) {
      const [o] = sampled(axis.start + (k % n) * step, axis.start + Math.floor(k / n) * step);
      worst = Math.max(worst, Math.abs(mask[k]! - o));
      if (mask[k]! > 0 && mask[k]! < 1) partial++;
    }
    expect(partial).toBeGreaterThan(100);
    expect(worst).toBeLessThan(0.03);
  });
  it('phase: not binary, t = odd − even fraction and |t|² = the fraction inside r_N, exactly in sum', () => {
    const a = plate(f, N, 'phase');
    expect(isBinary(a)).toBe(false);
    const c = apertureTransmittance(a, axis, axis, lam)!;
    let st = 0;
    let sw = 0;
    let si = 0;
    for (let k = 0; k < c.weight.length; k++) {
      st += c.t[2 * k]!;
      si += Math.abs(c.t[2 * k + 1]!);
      sw += c.weight[k]!;
    }
    expect(si).toBe(0);
    expect(Math.abs((st * step * step) / (oddArea - evenArea) - 1)).toBeLessThan(1e-8);
    expect(Math.abs((sw * step * step) / (Math.PI * R * R) - 1)).toBeLessThan(1e-9);
    let worst = 0;
    let partial = 0;
    for (let k = 0; k < c.weight.length; k += 11) {
      const [o, e] = sampled(axis.start + (k % n) * step, axis.start + Math.floor(k / n) * step);
      worst = Math.max(worst, Math.abs(c.t[2 * k]! - (o - e)), Math.abs(c.weight[k]! - (o + e)));
      if (Math.abs(c.t[2 * k]!) < 1 && c.weight[k]! > 0) partial++;
    }
    expect(partial).toBeGreaterThan(100);
    expect(worst).toBeLessThan(0.03);
  });
});

describe('the boundary form\'s cost for plates of many zones', () => {
  // The planner costs the contours of at most 64 of the discs, at fewer output radii when there
  // are many (rs-boundary.ts costRsBoundary): the estimate must still follow the walk it stands for.
  for (const [zones, half, n, radial] of [[200, 2 * mm, 21, 'never'], [1000, 20 * um, 101, 'auto']] as const) {
    it(`${zones} zones, ${radial === 'never' ? 'every output point integrated' : 'the radial table'}: estimated evaluations within 3 % of those made`, () => {
      const regions = boundaryRegionsOf(plate(A.f, zones, 'amplitude'))!;
      // r_1 … r_{N−1}: the last zone of an even count is closed, as is everything beyond it.
      expect(regions.length).toBe(zones - 1);
      const axis = { n, start: -half, step: (2 * half) / (n - 1) };
      const est = costRsBoundary(regions, lam, A.f, axis, axis, { radial });
      const made = rsBoundaryWithStats(regions, lam, A.f, axis, axis, { radial }).stats;
      expect(made.radial).toBe(radial === 'auto');
      expect(Math.abs(est.evaluations / made.evaluations - 1)).toBeLessThan(0.03);
    });
  }
});

describe('zone plate jobs: keys and load-time errors', () => {
  const HEAD = 'name: zp\nwavelength: 633 nm\ndistance: 100 mm\n';
  const load = (aperture: string) => parseJobText(`${HEAD}aperture: ${aperture}\n`, 'job.yaml');
  function problems(aperture: string) {
    try {
      load(aperture);
    } catch (e) {
      expect(e).toBeInstanceOf(JobError);
      return (e as JobError).problems;
    }
    throw new Error(`expected ${aperture} to be refused`);
  }
  it('loads, sweeps focal length and zone count, and defaults to an amplitude plate', () => {
    const job = load("{shape: zone-plate, focal: ['50 mm', '100 mm'], zones: [20, 40], design: 633 nm}");
    const cases = expandJob(job.spec);
    expect(cases.length).toBe(4);
    expect(cases.map((c) => c.id)).toEqual(expect.arrayContaining([expect.stringContaining('zones-40')]));
    const a = cases[0]!.aperture as Extract<Aperture, { shape: 'zone-plate' }>;
    expect(a.kind).toBe('amplitude');
    expect(a.design).toBeCloseTo(633e-9, 15);
  });
  it('without a design wavelength, designs the plate for each case\'s wavelength', () => {
    const job = load('{shape: zone-plate, focal: 100 mm, zones: 20}');
    const a = expandJob(job.spec)[0]!.aperture as Extract<Aperture, { shape: 'zone-plate' }>;
    expect(a.design).toBe(job.spec.wavelength!.values[0]);
  });
  for (const [what, aperture, path] of [
    ['no zones', '{shape: zone-plate, focal: 100 mm, zones: 0, design: 633 nm}', 'aperture.zones'],
    ['a fraction of a zone', '{shape: zone-plate, focal: 100 mm, zones: 2.5, design: 633 nm}', 'aperture.zones'],
    ['too many zones', '{shape: zone-plate, focal: 100 mm, zones: 10001, design: 633 nm}', 'aperture.zones'],
    ['a negative focal length', "{shape: zone-plate, focal: '-100 mm', zones: 40, design: 633 nm}", 'aperture.focal'],
    ['a zero focal length', "{shape: zone-plate, focal: '0 mm', zones: 40, design: 633 nm}", 'aperture.focal'],
    ['no focal length', '{shape: zone-plate, zones: 40, design: 633 nm}', 'aperture.focal'],
    ['a design wavelength out of range', '{shape: zone-plate, focal: 100 mm, zones: 40, design: 5 mm}', 'aperture.design'],
    ['an unknown kind', '{shape: zone-plate, focal: 100 mm, zones: 40, design: 633 nm, kind: blazed}', 'aperture.kind'],
    ['an opaque plate', '{shape: zone-plate, focal: 100 mm, zones: 40, design: 633 nm, opaque: true}', 'aperture.opaque'],
  ] as const) {
    it(`refuses ${what}, naming ${path}`, () => {
      const ps = problems(aperture);
      expect(ps.map((p) => p.path), JSON.stringify(ps)).toContain(path);
      expect(ps.find((p) => p.path === path)!.line).toBeGreaterThan(0);
    });
  }
});
