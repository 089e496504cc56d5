// A polygonal opening (or, opaque, a polygonal stop): any simple polygon given by its vertices in
// order, either orientation, convex or not. Each cell gets its exact open area (optics/polygon.ts).
import { z } from 'zod';
import { opaque, position } from '../job/quantities.js';
import type { ApertureFacts } from '../optics/geometry.js';
import { sizeWords } from '../optics/geometry.js';
import { MAX_POLYGON_VERTICES, polygonCellFractions, polygonFacts, polygonProblem, type Vertex } from '../optics/polygon.js';
import type { ElementKind } from './types.js';

export interface Polygon {
  shape: 'polygon';
  vertices: Vertex[];
  opaque: boolean;
}

const vertexMsg = "expected a vertex [x, y] such as ['1 mm', '-0.5 mm']";
const schema = z.strictObject({
  shape: z.literal('polygon'),
  vertices: z
    .array(z.tuple([position, position], { error: vertexMsg }), { error: "expected a list of vertices [[x, y], ...] such as [['0 mm', '0 mm'], ['1 mm', '0 mm'], ['0 mm', '1 mm']]" })
    .min(3, { error: 'expected at least 3 vertices' })
    .max(MAX_POLYGON_VERTICES, { error: `expected at most ${MAX_POLYGON_VERTICES} vertices` }),
  opaque,
});

/** Distance from the axis to the nearest open point: 0 inside, else to the nearest edge. */
function nearestOpen(v: readonly Vertex[]): number {
  let inside = false;
  let best = Infinity;
  for (let i = 0, j = v.length - 1; i < v.length; j = i++) {
    const [x1, y1] = v[j]!;
    const [x2, y2] = v[i]!;
    if (y1 > 0 !== y2 > 0 && 0 < x1 + ((0 - y1) * (x2 - x1)) / (y2 - y1)) inside = !inside;
    const dx = x2 - x1;
    const dy = y2 - y1;
    const t = Math.max(0, Math.min(1, -(x1 * dx + y1 * dy) / (dx * dx + dy * dy)));
    best = Math.min(best, Math.hypot(x1 + t * dx, y1 + t * dy));
  }
  return inside ? 0 : best;
}

function facts(s: Polygon): ApertureFacts {
  const f = polygonFacts(s.vertices);
  return {
    oneD: false,
    separable: false,
    halfExtent: f.halfExtent,
    characteristic: f.halfExtent,
    minFeature: f.minFeature,
    openMeasure: f.area,
    edgeMeasure: f.perimeter,
    nearestOpen: nearestOpen(s.vertices),
    exactEdges: false,
    description: describe(s),
  };
}

function describe(s: Polygon): string {
  const f = polygonFacts(s.vertices);
  return `${s.opaque ? 'opaque ' : ''}polygon of ${s.vertices.length} vertices, ${sizeWords(f.box.x1 - f.box.x0)} × ${sizeWords(f.box.y1 - f.box.y0)}`;
}

export const polygon: ElementKind<Polygon, typeof schema> = {
  shape: 'polygon',
  schema,
  tokens: {},
  check(job, problem) {
    const why = polygonProblem(job.vertices);
    if (why) problem('vertices', `expected a simple polygon: ${why}`);
  },
  resolve: (job) => ({ shape: 'polygon', vertices: job.vertices, opaque: job.opaque }),
  geometry: () => ({ kind: 'sampled' }),
  facts,
  mask: (s, xa, ya) => polygonCellFractions(s.vertices, xa, ya),
  describe,
};
