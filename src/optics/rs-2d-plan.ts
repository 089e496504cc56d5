// Sampling of the exact 2-D sums for a case, as the planner needs it: the pitch and edge nodes
// that meet an accuracy target at the least work, the path the sums will take, and their cost.
import type { Aperture, Illumination } from './aperture.js';
import { geometryOf, separableProfiles } from '../elements/registry.js';
import type { Axis } from './field.js';
import { rsCellCount2D } from './rs-2d-cells.js';
import { rsSum2DChoice, type RsCellSummary, type RsSum2DChoice, type RsSum2DOptions } from './rs-2d-paths.js';
import { RS2D_BOX_PAIR_WORK, RS2D_GAUSSIAN_BOX_PAIR_WORK, rs2DEdgePairWork } from './rs-cost.js';
import { rs2DCurvatureError, rs2DEdgeError, rs2DEdgeNodesFor, rs2DEnvelopeError, rs2DPitch, RS2D_TARGET_SHARE, type Rs2DPitch } from './rs-2d-rule.js';
import { directionCosines } from './source.js';

export interface Rs2DSampling {
  pitch: number;
  edgeNodes: number;
  /** sin θ of the steepest ray from the lit aperture to the window (the rule's sinMax). */
  sinMax: number;
  /** The coarsest pitch the rule allows, and what set it. */
  rule: Rs2DPitch;
  /** Predicted errors at the chosen pitch (fractions of the peak intensity). */
  predicted: { curvature: number; edge: number; envelope: number; total: number };
  cells: RsCellSummary;
  choice: RsSum2DChoice;
}

/**
 * Where light leaves the aperture, as seen from the axis: the aperture's half-extent (per axis),
 * cut to three waists for a Gaussian beam (beyond, the light is below 1.2e-4 of its peak amplitude,
 * and the rule's errors are relative to the light where it is).
 */
function litHalfExtent(a: Aperture, ill: Illumination): [number, number] {
  const sep = separableProfiles(a);
  let hx: number;
  let hy: number;
  if (sep) {
    const half = (p: NonNullable<typeof sep.y>) => (p.kind === 'interval' ? p.width / 2 : p.kind === 'periodic' ? (p.count * p.period) / 2 : ((p.count - 1) * p.period + p.width) / 2);
    hx = half(sep.x);
    hy = sep.y ? half(sep.y) : Infinity;
  } else {
    const g = geometryOf(a);
    const r = g.kind === 'rings' ? g.outer : 0;
    hx = r;
    hy = r;
  }
  if (ill.kind === 'gaussian') {
    hx = Math.min(hx, 3 * ill.waist);
    hy = Math.min(hy, 3 * ill.waist);
  }
  return [hx, hy];
}

/** sin θ of the steepest ray from a lit point of the aperture to a point of the window. */
export function rs2DSinMax(a: Aperture, ill: Illumination, z: number, outX: Axis, outY: Axis): number {
  const [hx, hy] = litHalfExtent(a, ill);
  const far = (ax: Axis) => Math.max(Math.abs(ax.start), Math.abs(ax.start + (ax.n - 1) * ax.step));
  const rx = far(outX) + hx;
  const ry = far(outY) + hy;
  const reach = Math.hypot(rx, ry);
  return reach / Math.hypot(reach, z);
}

/**
 * The pitch and edge nodes for the exact 2-D sums of this case at accuracy `target` (a fraction of
 * the peak intensity) that cost the least: from the coarsest pitch the rule allows down to a
 * quarter of it (finer cells need fewer edge nodes, which pays where edge cells are most of the
 * work: small apertures far away), each costed by rs-2d-paths.ts on the cells it would have. A
 * finer pitch doubles the boxes, so the search stops once the boxes cost as much as the edge cells.
 */
export function rs2DSampling(
  a: Aperture,
  ill: Illumination,
  wavelength: number,
  z: number,
  outX: Axis,
  outY: Axis,
  target: number,
  opts: { offset?: [number, number]; path?: RsSum2DOptions['path'] } = {},
): Rs2DSampling {
  const [alpha, beta] = directionCosines(ill);
  const sinTilt = Math.hypot(alpha, beta);
  const waist = ill.kind === 'gaussian' ? ill.waist : undefined;
  const edgeCells = separableProfiles(a) === null;
  const sinMax = rs2DSinMax(a, ill, z, outX, outY);
  const rule = rs2DPitch(wavelength, z, sinMax, target, { waist, sinTilt, edgeCells });
  const slope = Math.min(2, sinMax + sinTilt);
  let best: Rs2DSampling | null = null;
  for (let j = 0; j <= 4; j++) {
    const pitch = rule.pitch * 2 ** (-j / 2);
    const m = edgeCells ? (j === 0 ? rule.edgeNodes : rs2DEdgeNodesFor(pitch, wavelength, slope, RS2D_TARGET_SHARE.edge * target)) : rule.edgeNodes;
    const cells = rsCellCount2D(a, ill, wavelength, pitch, { edgeNodes: m, offset: opts.offset });
    const choice = rsSum2DChoice(cells, z, outX, outY, { path: opts.path });
    const boxWork = cells.box * (cells.gaussian ? RS2D_GAUSSIAN_BOX_PAIR_WORK : RS2D_BOX_PAIR_WORK);
    const edgeWork = cells.edge * rs2DEdgePairWork(m);
    if (best && choice.work >= best.choice.work) {
      if (boxWork >= edgeWork) break;
      continue;
    }
    const predicted = {
      curvature: rs2DCurvatureError(pitch, wavelength, z),
      edge: edgeCells ? rs2DEdgeError((Math.PI * pitch * slope) / wavelength, m) : 0,
      envelope: waist !== undefined ? rs2DEnvelopeError(pitch, waist) : 0,
      total: 0,
    };
    predicted.total = predicted.curvature + predicted.edge + predicted.envelope;
    best = { pitch, edgeNodes: m, sinMax, rule, predicted, cells, choice };
    if (boxWork >= edgeWork) break;
  }
  return best!;
}

