// The extra case pictures (output/extra-pictures.ts): where a 1-D result's shadow edges fall (the
// aperture's edges projected along the light, shifted z·tan θ by a tilt: geometric optics, common
// practice), that 1-D results get a profile plot and 2-D ones none, and that a zoomed picture is
// drawn for a small spot, for a region asked for, and not for a spot that fills its window.
import { describe, expect, it } from 'vitest';
import { planCase } from '../../src/plan/planner.js';
import { airyEncircled, energyPicture, profilePicture, shadowEdges, zoomPicture } from '../../src/output/extra-pictures.js';
import { layoutPicture } from '../../src/output/picture.js';
import { makeCase, runCase } from '../helpers.js';
import { decode } from '../png.js';

const um = 1e-6;

describe('extra pictures', () => {
  it('puts a slit\'s shadow edges at ±w/2, shifted z·tan θ by a tilt; a grating of many slits at its outer edges only', () => {
    const plain = planCase(makeCase({ wavelength: 633e-9, distance: 0.01, aperture: { shape: 'slit', width: 40 * um, opaque: false } }));
    expect(shadowEdges(plain)).toEqual([-20 * um, 20 * um]);
    const tilted = planCase(makeCase({ wavelength: 633e-9, distance: 0.01, aperture: { shape: 'slit', width: 40 * um, opaque: false }, illumination: { kind: 'plane', tilt: [0.01, 0] } }));
    const s = 0.01 * Math.tan(0.01);
    expect(shadowEdges(tilted).map((e) => e - s)).toEqual([expect.closeTo(-20 * um, 15), expect.closeTo(20 * um, 15)]);
    const many = planCase(makeCase({ wavelength: 633e-9, distance: 0.5, aperture: { shape: 'slits', count: 40, width: 5 * um, period: 20 * um, opaque: false } }));
    const e = shadowEdges(many);
    expect(e).toHaveLength(2);
    expect(e[0]).toBeCloseTo(-(39 * 20 * um) / 2 - 2.5 * um, 15);
  });

  it('draws a profile plot for a 1-D map and for a 2-D map\'s row through its peak', () => {
    const plan = planCase(makeCase({ wavelength: 633e-9, distance: 0.05, aperture: { shape: 'slit', width: 40 * um, opaque: false } }));
    const line = { nx: 201, ny: 1, dx: 10 * um, dy: 0, x0: -1e-3, y0: 0, intensity: Float64Array.from({ length: 201 }, (_, i) => Math.exp(-(((i - 100) / 20) ** 2))) };
    const png = profilePicture(plan, line, 'slit');
    expect(png).not.toBeNull();
    expect(decode(png!).width).toBeGreaterThan(400);
    const map = { nx: 4, ny: 4, dx: um, dy: um, x0: 0, y0: 0, intensity: Float64Array.from({ length: 16 }, (_, i) => (i === 9 ? 2 : 1)) };
    expect(profilePicture(plan, map, 'x')).not.toBeNull();
  });

  it('zooms on a small spot, on a region asked for, and not on a spot that fills its window', () => {
    const n = 301;
    const gauss = (w: number) => {
      const x0 = -150 * um;
      const a = new Float64Array(n * n);
      for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) a[r * n + c] = Math.exp((-2 * ((x0 + c * um) ** 2 + (x0 + r * um) ** 2)) / (w * w));
      return { nx: n, ny: n, dx: um, dy: um, x0, y0: x0, intensity: a };
    };
    const plan = planCase(makeCase({ wavelength: 633e-9, distance: 0.05, aperture: { shape: 'circle', diameter: 100 * um, opaque: false } }));
    const small = zoomPicture(plan, gauss(10 * um), 'spot');
    expect(small).not.toBeNull();
    // The zoom shows the box (about 39 samples across), enlarged: whole display pixels per sample.
    const crop = { nx: 39, ny: 39, dx: um, dy: um, x0: 0, y0: 0, intensity: new Float64Array(39 * 39).fill(1) };
    expect(decode(small!).width).toBeGreaterThanOrEqual(layoutPicture({ map: crop, scale: 'shoal' }).width - 40);
    expect(zoomPicture(plan, gauss(100 * um), 'wide')).toBeNull();
    const asked = { ...plan, case: { ...plan.case, output: { ...plan.case.output, zoom: { centre: [50 * um, 0] as [number, number], width: 60 * um } } } };
    expect(zoomPicture(asked, gauss(100 * um), 'asked')).not.toBeNull();
  });
});

describe('encircled-energy plot and its Airy reference', () => {
  it("Rayleigh's 1 − J₀² − J₁²: 83.8 % inside the first dark ring, 91.0 % inside the second (Born & Wolf §8.5.2)", () => {
    const a = 25 * um;
    const lam = 633e-9;
    const z = 1;
    const k = (2 * Math.PI) / lam;
    // v = k·a·sin θ at the zeros of J₁ (3.8317, 7.0156; Abramowitz & Stegun table 9.5).
    const rAt = (v: number) => {
      const s = v / (k * a);
      return (z * s) / Math.sqrt(1 - s * s);
    };
    expect(airyEncircled(a, lam, z, rAt(3.8317))).toBeCloseTo(0.838, 3);
    expect(airyEncircled(a, lam, z, rAt(7.0156))).toBeCloseTo(0.910, 3);
  });

  it('a 50 µm pinhole at 1 m: the computed curve holds 83.8 % within 1.22λz/D to 1 % and the plot is drawn', () => {
    const { plan, rec } = runCase({ wavelength: 633e-9, distance: 1, aperture: { shape: 'circle', diameter: 50 * um, opaque: false } });
    const e = rec.energy!;
    const r1 = (1.22 * 633e-9 * 1) / (50 * um);
    let i = 0;
    while (e.radius[i + 1]! < r1) i++;
    const t = (r1 - e.radius[i]!) / (e.radius[i + 1]! - e.radius[i]!);
    const f = e.fraction[i]! + t * (e.fraction[i + 1]! - e.fraction[i]!);
    expect(Math.abs(f - 0.838)).toBeLessThan(0.01);
    expect(energyPicture(plan, e, false, 'pinhole')).not.toBeNull();
    expect(energyPicture(plan, e, true, 'x')).toBeNull();
  });
});
