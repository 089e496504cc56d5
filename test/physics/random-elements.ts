// Random polygons, combinations and arrays over the job schema's space, for the property test
// random-elements.test.ts: the same runner and comparison as random-cases.ts, drawing the element
// kinds that have an exact reference (test/reference/reference.ts placedRects: rectilinear
// polygons, combinations of rectangles, arrays of rectangles, anywhere off the axis).
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import { mulberry32 } from '../helpers.js';
import type { DrawnCase } from './random-cases.js';

export const ELEMENT_SEED = 0xe1e2026;
/**
 * 70 cases (it was 100), under a work bound of their own, ELEMENT_WORK_LIMIT = 3e8 (the random
 * cases' was 4e8): one after another the 100 cases took 34 s, and 70 of them under this bound take
 * about two thirds of that, with 17 compared (polygons on far-field, Fresnel and angular-spectrum
 * paths, arrays on Fresnel and angular-spectrum ones) where 22 were: the first 70 draws hold every
 * kind (20 combinations, 11 of them with a window cut out; 24 L-shaped polygons; 15
 * rectangular and 11 hexagonal arrays).
 */
export const ELEMENT_CASE_COUNT = 70;
export const ELEMENT_WORK_LIMIT = Number(process.env.SPOTCAST_RANDOM_WORK ?? 3e8);

const logUniform = (rnd: () => number, lo: number, hi: number) => lo * Math.pow(hi / lo, rnd());
const rect = (width: number, height: number) => ({ shape: 'rectangle' as const, width, height, opaque: false });

/** An L: a w × h box less its upper-right corner (cw × ch), turned by a quarter turn q times, shifted. */
function lShape(w: number, h: number, cw: number, ch: number, q: number, dx: number, dy: number): [number, number][] {
  const pts: [number, number][] = [[0, 0], [w, 0], [w, h - ch], [w - cw, h - ch], [w - cw, h], [0, h]];
  return pts.map(([x, y]) => {
    let u = x - w / 2;
    let v = y - h / 2;
    for (let i = 0; i < q; i++) [u, v] = [-v, u];
    return [u + dx, v + dy];
  });
}

export function drawElementCases(seed = ELEMENT_SEED, n = ELEMENT_CASE_COUNT): DrawnCase[] {
  const rnd = mulberry32(seed);
  const out: DrawnCase[] = [];
  for (let index = 0; index < n; index++) {
    const lam = logUniform(rnd, 250e-9, 10e-6);
    // Sizes up to 300 µm: most 2-D near fields of larger openings are beyond the test's work bound.
    const size = () => logUniform(rnd, 2 * lam, Math.max(4 * lam, 300e-6));
    const kind = rnd();
    const opaque = rnd() < 0.25;
    let aperture: Aperture;
    let half: number;
    if (kind < 0.4) {
      // Two or three rectangles side by side along x with gaps, one of them perhaps with a window cut out.
      const count = rnd() < 0.5 ? 2 : 3;
      const sizes = Array.from({ length: count }, () => [size(), size()] as [number, number]);
      const gaps = Array.from({ length: count - 1 }, () => logUniform(rnd, lam, Math.max(2 * lam, 300e-6)));
      const total = sizes.reduce((s, [w]) => s + w, 0) + gaps.reduce((s, g) => s + g, 0);
      let x = -total / 2 + (rnd() - 0.5) * total;
      const y0 = (rnd() - 0.5) * Math.max(...sizes.map(([, h]) => h));
      const add = sizes.map(([w, h], i) => {
        const at: [number, number] = [x + w / 2, y0 + (rnd() - 0.5) * h];
        x += w + (gaps[i] ?? 0);
        return { element: rect(w, h), at };
      });
      const cut = [];
      if (rnd() < 0.5) {
        const host = add[0]!;
        const [w, h] = [host.element.width * logUniform(rnd, 0.2, 0.7), host.element.height * logUniform(rnd, 0.2, 0.7)];
        const at: [number, number] = [host.at[0] + (rnd() - 0.5) * (host.element.width - w) * 0.9, host.at[1] + (rnd() - 0.5) * (host.element.height - h) * 0.9];
        cut.push({ element: rect(w, h), at });
      }
      aperture = { shape: 'combined', add, cut, opaque };
      half = total / 2 + Math.abs(x);
    } else if (kind < 0.7) {
      const w = size();
      const h = size();
      const q = Math.floor(rnd() * 4);
      const dx = (rnd() - 0.5) * w;
      const dy = (rnd() - 0.5) * h;
      aperture = { shape: 'polygon', vertices: lShape(w, h, w * logUniform(rnd, 0.2, 0.8), h * logUniform(rnd, 0.2, 0.8), q, dx, dy), opaque };
      half = Math.max(w, h);
    } else {
      const w = size();
      const h = size();
      const hex = rnd() < 0.4;
      const across = hex ? Math.hypot(w, h) : Math.max(w, h);
      const pitch = across * logUniform(rnd, 1.1, 4);
      const count: [number, number] = [1 + Math.floor(rnd() * 4), 1 + Math.floor(rnd() * 4)];
      aperture = { shape: 'array', of: { element: rect(w, h), at: [0, 0] }, pitch, count, layout: hex ? 'hexagonal' : 'rectangular', opaque: false };
      half = (Math.max(...count) * pitch) / 2;
    }
    const z = logUniform(rnd, 2 * lam, 100);
    const tilted = rnd() < 0.2;
    const tilt: [number, number] = [tilted ? ((rnd() * 2 - 1) * 30 * Math.PI) / 180 : 0, 0];
    const illumination: Illumination = rnd() < 0.6 ? { kind: 'plane', tilt } : { kind: 'gaussian', waist: half * logUniform(rnd, 0.2, 5), tilt };
    out.push({ index, spec: { wavelength: lam, distance: z, aperture, illumination } });
  }
  return out;
}
