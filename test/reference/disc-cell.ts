// The mean of e^{iφ} over the part of a square cell inside the disc x² + y² ≤ R², written for the
// tests only and sharing no code with src/: (1/cell area)·∫₀^R r dr ∫ e^{iφ(r cos θ, r sin θ)} dθ over
// the arcs of the circle of radius r inside the cell. The arcs come from the circle's crossings with
// the cell's four sides; in r the integral is cut where an arc appears, vanishes or changes sides
// (the sides' distances and the corners' radii) and each piece is integrated by Gauss–Legendre after
// r = a + (b − a)(1 − cos πs)/2, which smooths the square-root ends there (common practice).
import { gaussLegendre } from './quadrature.js';

const GL = gaussLegendre(40);

/** ∫ g over [a, b] by `panels` panels of the 40-point rule. */
function integrate(g: (t: number) => [number, number], a: number, b: number, panels: number): [number, number] {
  let re = 0;
  let im = 0;
  const h = (b - a) / panels;
  for (let p = 0; p < panels; p++) {
    const mid = a + (p + 0.5) * h;
    for (let k = 0; k < GL.x.length; k++) {
      const [gr, gi] = g(mid + 0.5 * h * GL.x[k]!);
      re += 0.5 * h * GL.w[k]! * gr;
      im += 0.5 * h * GL.w[k]! * gi;
    }
  }
  return [re, im];
}

/** (1/(h·hy))·∬_{cell ∩ disc} e^{iφ} for the h × hy cell centred on (xc, yc), as [re, im]. */
export function polarReference(phase: (x: number, y: number) => number, R: number, xc: number, yc: number, h: number, hy = h): [number, number] {
  const [x0, x1, y0, y1] = [xc - h / 2, xc + h / 2, yc - hy / 2, yc + hy / 2];
  const arcs = (r: number): [number, number][] => {
    const angles: number[] = [-Math.PI, Math.PI];
    for (const x of [x0, x1]) if (Math.abs(x) < r) for (const s of [1, -1]) angles.push(Math.atan2(s * Math.sqrt(r * r - x * x), x));
    for (const y of [y0, y1]) if (Math.abs(y) < r) for (const s of [1, -1]) angles.push(Math.atan2(y, s * Math.sqrt(r * r - y * y)));
    angles.sort((a, b) => a - b);
    const out: [number, number][] = [];
    for (let i = 0; i + 1 < angles.length; i++) {
      const m = (angles[i]! + angles[i + 1]!) / 2;
      const x = r * Math.cos(m);
      const y = r * Math.sin(m);
      if (x > x0 && x < x1 && y > y0 && y < y1 && angles[i + 1]! > angles[i]!) out.push([angles[i]!, angles[i + 1]!]);
    }
    return out;
  };
  const cuts = [0, R];
  for (const d of [x0, x1, y0, y1]) if (Math.abs(d) < R) cuts.push(Math.abs(d));
  for (const x of [x0, x1]) for (const y of [y0, y1]) if (Math.hypot(x, y) < R) cuts.push(Math.hypot(x, y));
  cuts.sort((a, b) => a - b);
  let re = 0;
  let im = 0;
  for (let k = 0; k + 1 < cuts.length; k++) {
    const a = cuts[k]!;
    const b = cuts[k + 1]!;
    if (!(b > a)) continue;
    const [pr, pi] = integrate(
      (s) => {
        const r = a + ((b - a) * (1 - Math.cos(Math.PI * s))) / 2;
        const jac = ((b - a) * Math.PI * Math.sin(Math.PI * s)) / 2;
        let ar = 0;
        let ai = 0;
        for (const [t0, t1] of arcs(r)) {
          const [cr, ci] = integrate((t) => {
            const phi = phase(r * Math.cos(t), r * Math.sin(t));
            return [Math.cos(phi), Math.sin(phi)];
          }, t0, t1, 4);
          ar += cr;
          ai += ci;
        }
        return [ar * r * jac, ai * r * jac];
      },
      0,
      1,
      4,
    );
    re += pr;
    im += pi;
  }
  return [re / (h * hy), im / (h * hy)];
}

