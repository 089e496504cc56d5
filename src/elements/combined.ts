// A combination of openings: the union of some (`add`) less others (`cut`), each placed at an
// offset (`at`): a cross from two rectangles, a slot in a disc, a reticle. Binary, like its parts;
// `opaque: true` makes the whole combination an obstacle.
//
// Cell fractions combine as independent coverage: union 1 − Π(1 − aᵢ), cut ·Π(1 − cⱼ). That is
// exact wherever at most one part's edge crosses a cell (a cell wholly inside a part is 0 or 1 for
// it); only the few cells where two parts' edges cross are approximated (common practice for
// area-sampled masks; the error is below one cell's area per crossing).
import { z } from 'zod';
import { opaque, position } from '../job/quantities.js';
import type { Axis } from '../optics/field.js';
import { geometryFacts, sizeWords, type ApertureFacts } from '../optics/geometry.js';
import { sampleGeometry } from '../optics/mask-cells.js';
import { forPlacedPart, placedHalfExtent } from './placement.js';
import type { ElementKind, ElementSchema, ElementSpec, ResolveContext } from './types.js';

/** A part of a combination (or the element of an array): a binary element and where it sits. */
export interface Placed {
  element: ElementSpec & Record<string, unknown>;
  at: [number, number];
}

export interface Combined {
  shape: 'combined';
  add: Placed[];
  cut: Placed[];
  opaque: boolean;
}

/** The element kinds a combination may hold, as the registry gives them. */
export type PartKind = ElementKind<ElementSpec, ElementSchema, { shape: string; opaque: boolean } & Record<string, unknown>>;

/** Parts are at most this many: each is sampled over its own cells, and facts walk them all. */
export const MAX_PARTS = 1000;

/** A part's mapping: an element's keys with single values (parts are not swept) and `at`. */
export function partSchema(kinds: readonly PartKind[], example = "{shape: rectangle, width: '2 mm', height: '0.1 mm', at: [0, 0]}") {
  const at = z.tuple([position, position], { error: "expected a position [x, y] such as ['0 mm', '0.5 mm']" }).default([0, 0]);
  const options = kinds.map((k) => k.schema.extend({ at }));
  return z.discriminatedUnion('shape', options as unknown as [ElementSchema, ...ElementSchema[]], {
    error: `expected a part such as ${example} (shape: one of ${kinds.map((k) => k.shape).join(', ')})`,
  });
}

export type PartJob = { shape: string; opaque: boolean; at: [number, number] } & Record<string, unknown>;

/** Resolve a part's mapping into its element: every value single (checked at load). */
export function resolvePart(kinds: ReadonlyMap<string, PartKind>, job: PartJob, context: ResolveContext): Placed {
  const kind = kinds.get(job.shape)!;
  const element = kind.resolve(job, (key) => (job[key] as { values: number[] }).values[0]!, context) as ElementSpec & Record<string, unknown>;
  return { element, at: job.at };
}

/** Problems of a part at load: swept values, a 1-D part, an opaque part. */
export function partProblems(kinds: ReadonlyMap<string, PartKind>, job: PartJob): { key: string | (string | number)[]; message: string }[] {
  const out: { key: string | (string | number)[]; message: string }[] = [];
  for (const [key, v] of Object.entries(job)) {
    if (typeof v === 'object' && v !== null && Array.isArray((v as { values?: unknown }).values) && (v as { values: unknown[] }).values.length !== 1) {
      out.push({ key, message: 'expected a single value: the parts of a combination or an array are not swept' });
    }
  }
  if (out.length) return out;
  if (job.opaque) out.push({ key: 'opaque', message: 'expected no opaque parts: list what is taken away under cut, or make the whole combination opaque' });
  const kind = kinds.get(job.shape)!;
  // Facts for the checks: a part's geometry does not depend on the wavelength (only non-binary
  // elements would, and parts are binary); 1 m stands in for it.
  const part = resolvePart(kinds, job, { wavelength: 1 });
  kind.check?.(job, (key, message) => out.push({ key, message }));
  if (out.length === 0 && factsOf(kind, part.element).oneD) out.push({ key: 'length', message: 'expected a length: parts are 2-D openings' });
  return out;
}

export function factsOf(kind: PartKind, s: ElementSpec): ApertureFacts {
  return kind.facts ? kind.facts(s) : geometryFacts(kind.geometry(s), kind.describe(s));
}

export function maskOf(kind: PartKind, s: ElementSpec, xa: Axis, ya: Axis): Float64Array {
  return kind.mask ? kind.mask(s, xa, ya) : sampleGeometry(kind.geometry(s), xa, ya);
}

/** Open area of a mask function over a box, sampled at about 1024 cells on the longer side. */
export function sampledArea(mask: (xa: Axis, ya: Axis) => Float64Array, half: [number, number]): number {
  const step = Math.max(half[0], half[1]) / 512;
  const nx = Math.max(1, Math.ceil((2 * half[0]) / step) + 2);
  const ny = Math.max(1, Math.ceil((2 * half[1]) / step) + 2);
  const m = mask({ n: nx, start: -((nx - 1) / 2) * step, step }, { n: ny, start: -((ny - 1) / 2) * step, step });
  let s = 0;
  for (let i = 0; i < m.length; i++) s += m[i]!;
  return s * step * step;
}

/** " at (x, y)" for a part off the axis, empty on it. */
export function atWords(at: [number, number]): string {
  if (at[0] === 0 && at[1] === 0) return '';
  const w = (v: number) => (v === 0 ? '0' : `${v < 0 ? '−' : ''}${sizeWords(Math.abs(v))}`);
  return ` at (${w(at[0])}, ${w(at[1])})`;
}

export function makeCombined(kinds: readonly PartKind[]) {
  const byShape = new Map(kinds.map((k) => [k.shape, k]));
  const part = partSchema(kinds);
  const parts = z.array(part, { error: 'expected a list of parts' }).max(MAX_PARTS, { error: `expected at most ${MAX_PARTS} parts` });
  const schema = z.strictObject({
    shape: z.literal('combined'),
    add: parts.min(1, { error: 'expected at least one part to add' }),
    cut: parts.default([]),
    opaque,
  });
  const kindOf = (p: Placed) => byShape.get(p.element.shape)!;

  function mask(s: Combined, xa: Axis, ya: Axis): Float64Array {
    // Coverage products: `keep` = Π(1 − aᵢ) over the added parts, then the cut ones multiply `out`.
    const keep = new Float64Array(xa.n * ya.n).fill(1);
    const visit = (p: Placed, apply: (k: number, v: number) => void) => {
      const kind = kindOf(p);
      forPlacedPart((x, y) => maskOf(kind, p.element, x, y), factsOf(kind, p.element).halfExtent, p.at, xa, ya, (m, c0, r0, nx, ny) => {
        for (let r = 0; r < ny; r++) for (let c = 0; c < nx; c++) apply((r0 + r) * xa.n + c0 + c, m[r * nx + c]!);
      });
    };
    for (const p of s.add) visit(p, (k, v) => (keep[k] = keep[k]! * (1 - v)));
    for (let k = 0; k < keep.length; k++) keep[k] = 1 - keep[k]!;
    for (const p of s.cut) visit(p, (k, v) => (keep[k] = keep[k]! * (1 - v)));
    for (let k = 0; k < keep.length; k++) keep[k] = Math.min(1, Math.max(0, keep[k]!));
    return keep;
  }

  function facts(s: Combined): ApertureFacts {
    let hx = 0;
    let hy = 0;
    let minFeature = Infinity;
    let edges = 0;
    let nearest = Infinity;
    for (const p of s.add) {
      const f = factsOf(kindOf(p), p.element);
      const [px, py] = placedHalfExtent(f, p.at);
      hx = Math.max(hx, px);
      hy = Math.max(hy, py);
      minFeature = Math.min(minFeature, f.minFeature);
      edges += f.edgeMeasure;
      // A lower bound on the distance from the axis to the part's nearest open point.
      nearest = Math.min(nearest, Math.max(0, Math.hypot(p.at[0], p.at[1]) - Math.hypot(f.halfExtent[0], f.halfExtent[1])));
    }
    for (const p of s.cut) {
      const f = factsOf(kindOf(p), p.element);
      minFeature = Math.min(minFeature, f.minFeature);
      edges += f.edgeMeasure;
    }
    const half: [number, number] = [hx, hy];
    const open = sampledArea((x, y) => mask(s, x, y), half);
    return {
      oneD: false,
      separable: false,
      halfExtent: half,
      characteristic: half,
      minFeature,
      openMeasure: open,
      edgeMeasure: edges,
      nearestOpen: nearest,
      exactEdges: false,
    description: describe(s),
    };
  }

  function describe(s: Combined): string {
    const words = (list: Placed[]) => list.map((p) => `${kindOf(p).describe(p.element)}${atWords(p.at)}`).join(' + ');
    return `${s.opaque ? 'opaque ' : ''}combination: ${words(s.add)}${s.cut.length ? ` less ${words(s.cut)}` : ''}`;
  }

  const kind: ElementKind<Combined, typeof schema> = {
    shape: 'combined',
    schema,
    tokens: {},
    check(job, problem) {
      for (const [list, name] of [[job.add, 'add'], [job.cut, 'cut']] as const) {
        list.forEach((p, i) => {
          for (const q of partProblems(byShape, p as PartJob)) problem([name, i, ...(Array.isArray(q.key) ? q.key : [q.key])], q.message);
        });
      }
    },
    resolve: (job, _v, context) => ({
      shape: 'combined',
      add: job.add.map((p) => resolvePart(byShape, p as PartJob, context)),
      cut: job.cut.map((p) => resolvePart(byShape, p as PartJob, context)),
      opaque: job.opaque,
    }),
    geometry: () => ({ kind: 'sampled' }),
    facts,
    mask,
    describe,
  };
  return kind;
}
