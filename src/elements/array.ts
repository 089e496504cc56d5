// An array of one element: count copies on a rectangular or hexagonal lattice of the given pitch,
// centred on the axis (pinhole arrays, lenslet-like hole patterns). The copies must not overlap,
// so the mask is the sum of their exact masks, each sampled only over its own cells.
import { z } from 'zod';
import { sweepLength } from '../job/quantities.js';
import type { Axis } from '../optics/field.js';
import { sizeWords, type ApertureFacts } from '../optics/geometry.js';
import { factsOf, maskOf, partProblems, partSchema, resolvePart, type PartJob, type PartKind, type Placed } from './combined.js';
import { forPlacedPart } from './placement.js';
import type { ElementKind } from './types.js';

export interface ElementArray {
  shape: 'array';
  of: Placed;
  pitch: number;
  count: [number, number];
  layout: 'rectangular' | 'hexagonal';
  opaque: boolean;
}

/** Copies in one array: each is sampled over its own cells, so the cost grows with the count. */
export const MAX_COPIES = 1_000_000;

/** The copies' centres: rows along y; hexagonal rows at √3/2 of the pitch, every other one shifted by half a pitch. */
export function latticePoints(s: Pick<ElementArray, 'pitch' | 'count' | 'layout'>): [number, number][] {
  const [nx, ny] = s.count;
  const hex = s.layout === 'hexagonal';
  const py = hex ? (s.pitch * Math.sqrt(3)) / 2 : s.pitch;
  const out: [number, number][] = [];
  for (let j = 0; j < ny; j++) {
    const shift = hex && ny > 1 ? (j % 2 === 0 ? -0.25 : 0.25) * s.pitch : 0;
    for (let i = 0; i < nx; i++) out.push([(i - (nx - 1) / 2) * s.pitch + shift, (j - (ny - 1) / 2) * py]);
  }
  return out;
}

export function makeArray(kinds: readonly PartKind[]) {
  const byShape = new Map(kinds.map((k) => [k.shape, k]));
  const countMsg = `expected a whole number of copies per axis, 1 to ${MAX_COPIES}, or [nx, ny]`;
  const one = z.number({ error: countMsg }).int({ error: countMsg }).min(1, { error: countMsg }).max(MAX_COPIES, { error: countMsg });
  const schema = z.strictObject({
    shape: z.literal('array'),
    of: partSchema(kinds, "{shape: circle, diameter: '20 um'}"),
    pitch: sweepLength(),
    count: z.union([z.tuple([one, one]), one.transform((n): [number, number] => [n, n])], { error: countMsg }),
    layout: z.enum(['rectangular', 'hexagonal'], { error: "expected 'rectangular' or 'hexagonal'" }).default('rectangular'),
    opaque: z.literal(false, { error: 'expected no opaque arrays (an array of stops is not supported)' }).default(false),
  });
  const kindOf = (p: Placed) => byShape.get(p.element.shape)!;

  function mask(s: ElementArray, xa: Axis, ya: Axis): Float64Array {
    const out = new Float64Array(xa.n * ya.n);
    const kind = kindOf(s.of);
    const half = factsOf(kind, s.of.element).halfExtent;
    for (const [x, y] of latticePoints(s)) {
      const at: [number, number] = [x + s.of.at[0], y + s.of.at[1]];
      forPlacedPart((a, b) => maskOf(kind, s.of.element, a, b), half, at, xa, ya, (m, c0, r0, nx, ny) => {
        for (let r = 0; r < ny; r++) for (let c = 0; c < nx; c++) out[(r0 + r) * xa.n + c0 + c] += m[r * nx + c]!;
      });
    }
    for (let k = 0; k < out.length; k++) if (out[k]! > 1) out[k] = 1;
    return out;
  }

  function facts(s: ElementArray): ApertureFacts {
    const f = factsOf(kindOf(s.of), s.of.element);
    const pts = latticePoints(s);
    let hx = 0;
    let hy = 0;
    let nearest = Infinity;
    for (const [x, y] of pts) {
      const cx = x + s.of.at[0];
      const cy = y + s.of.at[1];
      hx = Math.max(hx, Math.abs(cx) + f.halfExtent[0]);
      hy = Math.max(hy, Math.abs(cy) + f.halfExtent[1]);
      const d = Math.hypot(cx, cy);
      nearest = Math.min(nearest, d === 0 ? f.nearestOpen : Math.max(0, d - Math.hypot(f.halfExtent[0], f.halfExtent[1])));
    }
    const n = pts.length;
    const hex = s.layout === 'hexagonal';
    const py = hex ? (s.pitch * Math.sqrt(3)) / 2 : s.pitch;
    // The narrowest bar between neighbours: along a row at the pitch; to the next row at the row
    // spacing, or (hexagonal: the next row is shifted by half a pitch) beside it, whichever is wider.
    const gapX = s.count[0] > 1 ? s.pitch - 2 * f.halfExtent[0] : Infinity;
    const rowGap = py - 2 * f.halfExtent[1];
    const gapY = s.count[1] > 1 ? (hex ? Math.max(rowGap, s.pitch / 2 - 2 * f.halfExtent[0]) : rowGap) : Infinity;
    const half: [number, number] = [hx, hy];
    return {
      oneD: false,
      separable: false,
      halfExtent: half,
      characteristic: half,
      minFeature: Math.min(f.minFeature, gapX, gapY),
      openMeasure: n * f.openMeasure,
      edgeMeasure: n * f.edgeMeasure,
      nearestOpen: nearest,
      exactEdges: false,
    description: describe(s),
    };
  }

  function describe(s: ElementArray): string {
    return `${s.layout} array of ${s.count[0]} × ${s.count[1]} (${kindOf(s.of).describe(s.of.element)}), pitch ${sizeWords(s.pitch)}`;
  }

  const kind: ElementKind<ElementArray, typeof schema> = {
    shape: 'array',
    schema,
    tokens: { pitch: 'pitch' },
    check(job, problem) {
      const part = job.of as PartJob;
      const problems = partProblems(byShape, part);
      for (const q of problems) problem(['of', ...(Array.isArray(q.key) ? q.key : [q.key])], q.message);
      if (problems.length) return;
      if (job.count[0] * job.count[1] > MAX_COPIES) problem('count', `expected at most ${MAX_COPIES} copies in all (these make ${job.count[0] * job.count[1]})`);
      const placed = resolvePart(byShape, part, { wavelength: 1 });
      const f = factsOf(byShape.get(part.shape)!, placed.element);
      const hex = job.layout === 'hexagonal';
      for (const p of job.pitch.values) {
        const py = hex ? (p * Math.sqrt(3)) / 2 : p;
        // Hexagonal neighbours also sit at 60°, a full pitch away: the row spacing is what can be too small.
        if ((job.count[0] > 1 && 2 * f.halfExtent[0] >= p) || (job.count[1] > 1 && 2 * f.halfExtent[1] >= py && !hex) || (hex && job.count[1] > 1 && Math.hypot(f.halfExtent[0], f.halfExtent[1]) * 2 >= p)) {
          problem('pitch', `expected a pitch larger than the element (${sizeWords(2 * Math.max(f.halfExtent[0], f.halfExtent[1]))} across): the copies would overlap`);
          break;
        }
      }
    },
    resolve: (job, v, context) => ({
      shape: 'array',
      of: resolvePart(byShape, job.of as PartJob, context),
      pitch: v('pitch'),
      count: job.count,
      layout: job.layout,
      opaque: false,
    }),
    geometry: () => ({ kind: 'sampled' }),
    facts,
    mask,
    describe,
  };
  return kind;
}
