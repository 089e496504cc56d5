// The mean of a phase factor e^{iφ} over the open part of a cell that a circular stop's rim cuts:
// (1/(Δx·Δy))·∬_{cell ∩ disc} e^{iφ(x, y)} dx dy, the disc x² + y² ≤ R² centred on 0.
//
// Why: a pupil's rim cells used to take the mean of e^{iφ} over the whole cell times the open
// fraction q. The two differ by q(1 − q)·(mean over the open part − mean over the closed part):
// first order in the phase step across the cell. Behind a defocused or strongly aberrated pupil the
// rim's light is a large part of the field (on the axis of a defocused disc, half of it: the
// e^{iqR²} term of (e^{iqR²} − 1)/q), so that left a few per cent of the peak (measured by the
// random lens test, random-lenses.ts).
//
// How: iterated Gauss–Legendre. The outer variable runs along the rim where the rim is the steeper
// curve (y for cells left and right of the centre, x for cells above and below), so that the inner
// limits ±√(R² − v²) are smooth functions of it; the outer interval is cut where those limits meet
// the cell's sides (kinks of the chord ∩ cell) and at 0, and each piece is integrated by panels
// sized for the phase as a whole cell is (zernike.ts cellRuleFor). A piece that reaches near a
// branch point v = ±R of the square root is integrated in t with v = ±(R − t²), where the chord
// t·√(2R − t²) is smooth. The inner integral over the chord ∩ cell takes the same panels.
import { gaussLegendreRule } from './edge-cells.js';

/** Panels per cell side and nodes per panel side (zernike.ts cellRuleFor gives them for a phase). */
export interface CellRule {
  panels: number;
  nodes: number;
}

/** Extra nodes the outer rule takes for the curvature of the chord's ends (a judgement: cheap, rim cells are few). */
const OUTER_EXTRA_NODES = 6;
/** A piece closer than this many of its lengths to v = ±R is integrated in t, v = ±(R − t²). */
const BRANCH_REACH = 4;

/**
 * (1/(|dx|·|dy|))·∬ e^{iφ} over the part inside the disc of radius R of the cell centred on
 * (xc, yc) of sides |dx| × |dy|, as [re, im]. With φ = 0 it is the cell's open fraction. `rule` is
 * the tensor rule that averages e^{iφ} over the whole cell to the wanted accuracy.
 */
export function discCellAverage(
  phase: (x: number, y: number) => number,
  radius: number,
  xc: number,
  yc: number,
  dx: number,
  dy: number,
  rule: CellRule,
): [number, number] {
  const hx = Math.abs(dx) / 2;
  const hy = Math.abs(dy) / 2;
  // Outer variable v along the rim's steeper direction, inner u across it.
  const swap = Math.abs(yc) > Math.abs(xc);
  const [uc, hu, vc, hv] = swap ? [yc, hy, xc, hx] : [xc, hx, yc, hy];
  const f = swap ? (u: number, v: number) => phase(v, u) : phase;
  const R = radius;
  const v0 = Math.max(vc - hv, -R);
  const v1 = Math.min(vc + hv, R);
  if (!(v1 > v0) || !(hu > 0)) return [0, 0];
  const cuts = [v0, v1];
  const inside = (v: number) => v > v0 && v < v1;
  for (const e of [uc - hu, uc + hu]) {
    if (Math.abs(e) >= R) continue;
    const s = Math.sqrt(R * R - e * e);
    if (inside(s)) cuts.push(s);
    if (inside(-s)) cuts.push(-s);
  }
  if (inside(0)) cuts.push(0);
  cuts.sort((a, b) => a - b);

  const inner = gaussLegendreRule(rule.nodes);
  const outer = gaussLegendreRule(rule.nodes + OUTER_EXTRA_NODES);
  const ul = uc - hu;
  const ur = uc + hu;
  let re = 0;
  let im = 0;
  // ∫ e^{iφ(u, v)} du over the chord ∩ cell at v, times the outer weight w.
  const row = (v: number, w: number) => {
    const s = Math.sqrt(Math.max(0, R * R - v * v));
    const lo = Math.max(ul, -s);
    const hi = Math.min(ur, s);
    if (!(hi > lo)) return;
    // Panels in proportion to the chord's share of the cell side (the phase's change along it).
    const panels = Math.max(1, Math.ceil((rule.panels * (hi - lo)) / (2 * hu)));
    const h = (hi - lo) / panels;
    let rr = 0;
    let ii = 0;
    for (let p = 0; p < panels; p++) {
      const mid = lo + (p + 0.5) * h;
      for (let k = 0; k < inner.x.length; k++) {
        const phi = f(mid + 0.5 * h * inner.x[k]!, v);
        rr += inner.w[k]! * Math.cos(phi);
        ii += inner.w[k]! * Math.sin(phi);
      }
    }
    re += w * 0.5 * h * rr;
    im += w * 0.5 * h * ii;
  };
  for (let k = 0; k + 1 < cuts.length; k++) {
    const a = cuts[k]!;
    const b = cuts[k + 1]!;
    const len = b - a;
    if (!(len > 0)) continue;
    const panels = Math.max(1, Math.ceil((rule.panels * len) / (2 * hv)));
    // Near a branch point of √(R² − v²) (closer than four times the piece's length): v = R − t²
    // (or −R + t²), dv = 2t dt, over which the chord is smooth; the phase's change per unit t is
    // at most twice its change per unit v over the piece, so twice the panels. Farther away the
    // plain rule converges as ρ^{−2n}, ρ ≥ 9 + √80 ≈ 18 (the Bernstein ellipse through the branch
    // point): below rounding for n ≥ 8.
    const top = a >= 0 && R - b < BRANCH_REACH * len;
    const bottom = b <= 0 && a + R < BRANCH_REACH * len;
    if (top || bottom) {
      const t0 = Math.sqrt(Math.max(0, top ? R - b : a + R));
      const t1 = Math.sqrt(Math.max(0, top ? R - a : b + R));
      const np = 2 * panels;
      const h = (t1 - t0) / np;
      for (let p = 0; p < np; p++) {
        const mid = t0 + (p + 0.5) * h;
        for (let g = 0; g < outer.x.length; g++) {
          const t = mid + 0.5 * h * outer.x[g]!;
          const v = top ? R - t * t : -R + t * t;
          row(v, 0.5 * h * outer.w[g]! * 2 * t);
        }
      }
      continue;
    }
    const h = len / panels;
    for (let p = 0; p < panels; p++) {
      const mid = a + (p + 0.5) * h;
      for (let g = 0; g < outer.x.length; g++) row(mid + 0.5 * h * outer.x[g]!, 0.5 * h * outer.w[g]!);
    }
  }
  const area = 4 * hu * hv;
  return [re / area, im / area];
}
