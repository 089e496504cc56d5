// The job-file schema: the job's keys, assembled from the quantities (quantities.ts) and the
// elements' own keys (src/elements/). Every number has physical bounds checked at load time, so
// that nothing absurd reaches the planner or an allocation: a refusal names the key and the range
// expected.
import { z } from 'zod';
import { isFastFftSize } from '../optics/fft.js';
import type { UnitKind } from './units.js';
import { ELEMENTS, SHAPE_NAMES, elementOf } from '../elements/registry.js';
import {
  DESCRIPTION_MAX,
  DETECTOR_COUNT_MAX,
  TILT_MAX,
  WAVELENGTH,
  mappingError,
  positiveLength,
  quantity,
  position,
  sweepLength,
  type SweepValues,
} from './quantities.js';
import { orderAnswerKeys } from './order-keys.js';

export {
  DESCRIPTION_MAX,
  DETECTOR_COUNT_MAX,
  LENGTH_MAX,
  LENGTH_MIN,
  MAX_SWEEP_COUNT,
  POSITION_MAX,
  RANGE_KEYS,
  SLIT_COUNT_MAX,
  TILT_MAX,
  WAVELENGTH_MAX,
  WAVELENGTH_MIN,
  WAVELENGTH_USUAL_MAX,
  WAVELENGTH_USUAL_MIN,
  type SweepValues,
} from './quantities.js';

export { SHAPE_NAMES, type ShapeName } from '../elements/registry.js';
/** Each element kind's job keys, for "did you mean" and the bare-number warning. */
export const APERTURE_KEYS: Record<string, string[]> = Object.fromEntries(ELEMENTS.map((e) => [e.shape, Object.keys(e.schema.shape)]));

type ElementSchema = (typeof ELEMENTS)[number]['schema'];
const aperture = z.discriminatedUnion(
  'shape',
  ELEMENTS.map((e) => e.schema) as unknown as [ElementSchema, ...ElementSchema[]],
  { error: `expected a mapping such as {shape: circle, diameter: '50 um'} (shape: one of ${SHAPE_NAMES.join(', ')})` },
);

const angle = quantity('angle', { absBelow: TILT_MAX, range: 'an angle between -90° and 90° (not including them)' });
const tilt = z
  .tuple([angle, angle], { error: "expected two angles [x, y] such as ['2 deg', 0]" })
  .default([0, 0]);

const illuminationKinds = {
  plane: { kind: z.literal('plane'), tilt },
  gaussian: { kind: z.literal('gaussian'), waist: sweepLength(), tilt },
} as const;
export type IlluminationKind = keyof typeof illuminationKinds;
export const ILLUMINATION_KINDS = Object.keys(illuminationKinds) as IlluminationKind[];
export const ILLUMINATION_KEYS: Record<IlluminationKind, string[]> = Object.fromEntries(
  Object.entries(illuminationKinds).map(([k, v]) => [k, Object.keys(v)]),
) as Record<IlluminationKind, string[]>;

const illumination = z.discriminatedUnion(
  'kind',
  [z.strictObject(illuminationKinds.plane), z.strictObject(illuminationKinds.gaussian)],
  { error: `expected a mapping such as {kind: plane} (kind: one of ${ILLUMINATION_KINDS.join(', ')})` },
);

// Grid sizes: sizes the FFT kernels take (no prime factor but 2, 3 and 5: 1000, 1080, 1024, …)
// from 16 to 2^16 per axis for 2-D grids (2^32 complex samples would be 64 GiB) and 2^24 for 1-D
// ones (256 MiB); the planner holds a 2-D grid to 2^16 and refuses what its memory estimate cannot
// hold. The check here keeps the number itself sane.
const gridSizeMsg = 'expected a whole number of samples from 16 to 65536 (2-D) or 2^24 (1-D) with no prime factor but 2, 3 and 5 (such as 1000, 1024 or 1080)';
const gridSize = z
  .number({ error: gridSizeMsg })
  .int({ error: gridSizeMsg })
  .min(16, { error: gridSizeMsg })
  .max(1 << 24, { error: gridSizeMsg })
  .refine((n) => isFastFftSize(n), { error: gridSizeMsg });

const gridShape = { size: gridSize.optional(), pitch: positiveLength().optional() };
const gridError = mappingError("expected a mapping such as {size: 1024, pitch: '1 um'}");
export const GRID_KEYS = Object.keys(gridShape);

const windowMsg = "expected a width such as '5 mm' or [width, height]";
const windowSize = z.union([
  z
    .tuple([positiveLength(), positiveLength()], { error: windowMsg })
    .transform(([w, h]): [number, number] => [w, h]),
  positiveLength().transform((w): [number, number] => [w, w]),
], { error: windowMsg });

export const METHODS = ['auto', 'angular-spectrum', 'fresnel', 'fraunhofer', 'rayleigh-sommerfeld'] as const;
export type MethodRequest = (typeof METHODS)[number];

const outputShape = {
  npy: z.enum(['float64', 'float32'], { error: "expected 'float64' or 'float32'" }).default('float64'),
  logDecades: z
    .number({ error: 'expected a number of decades from 1 to 12' })
    .min(1, { error: 'expected a number of decades from 1 to 12' })
    .max(12, { error: 'expected a number of decades from 1 to 12' })
    .default(5),
  // The region of the zoomed picture (intensity-zoom.png): by default the box holding 99 % of the
  // power where the spot is small in its window.
  zoom: z
    .strictObject(
      {
        centre: z.tuple([position, position], { error: "expected a position [x, y] such as ['0 mm', '1.5 mm']" }),
        width: positiveLength(),
      },
      { error: mappingError("expected a mapping such as {centre: ['0 mm', '0 mm'], width: '200 um'}") },
    )
    .optional(),
};
export const OUTPUT_KEYS = Object.keys(outputShape);

const nameMsg = 'expected a name of letters, digits, - and _ (at most 64 characters), such as pinhole-50um';

const detectorShape = {
  kind: z.enum(['pinhole', 'square'], { error: "expected 'pinhole' (a disc) or 'square' (a pixel)" }),
  size: positiveLength(),
  at: z
    .tuple([position, position], { error: "expected a position [x, y] such as ['0 mm', '1.5 mm']" })
    .optional(),
};
export const DETECTOR_KEYS = Object.keys(detectorShape);
const detectorOne = z.strictObject(detectorShape, {
  error: mappingError("expected a mapping such as {kind: pinhole, size: '20 um'}"),
});
const detectors = z.union([
  z.array(detectorOne).min(1).max(DETECTOR_COUNT_MAX, { error: `expected at most ${DETECTOR_COUNT_MAX} detectors` }),
  detectorOne.transform((d) => [d]),
], {
  error: "expected a detector {kind: pinhole | square, size, at} or a list of them",
});

const SEARCH_MEASURES = ['energy', 'fwhm', 'd4sigma'] as const;
const smallestSpotShape = {
  between: z.tuple([positiveLength(), positiveLength()], { error: "expected two sizes [smallest, largest] such as ['10 um', '300 um']" }),
  measure: z
    .enum(SEARCH_MEASURES, { error: `expected one of ${SEARCH_MEASURES.join(', ')}` })
    .default('energy'),
};
export const SMALLEST_SPOT_KEYS = Object.keys(smallestSpotShape);

// search: {pinhole: {passing: [0.95, 0.995]}}: the pinhole diameters passing these fractions at a
// converging lens's focus (metrics/spatial-filter.ts); fractions strictly between 0 and 1, sorted,
// repeats dropped.
export const PASSING_COUNT_MAX = 16;
const passingMsg = `expected a fraction between 0 and 1 (not including them) such as 0.95, or a list of at most ${PASSING_COUNT_MAX} of them`;
const passingFraction = z.number({ error: passingMsg }).gt(0, { error: passingMsg }).lt(1, { error: passingMsg });
const pinholeShape = {
  passing: z
    .union([z.array(passingFraction, { error: passingMsg }).min(1, { error: passingMsg }).max(PASSING_COUNT_MAX, { error: passingMsg }), passingFraction.transform((f) => [f])], { error: passingMsg })
    .transform((fs) => [...new Set(fs)].sort((a, b) => a - b)),
};
export const PINHOLE_SEARCH_KEYS = Object.keys(pinholeShape);
/** Why the job's element cannot take search.pinhole (it needs a converging lens's focus), or null. */
function pinholeSearchProblem(a: { shape: string } & Record<string, unknown>): string | null {
  if (!elementOf(a).focusing) return `expected a lens (shape: lens): the pinhole answers are read at a converging lens's focus, not behind a ${a.shape}`;
  const focal = a.focal_length as SweepValues | undefined;
  if (focal && !focal.values.some((f) => f > 0)) return 'expected a converging lens (a positive focal_length): a diverging lens has no focus to put a pinhole in';
  return null;
}

const searchShape = {
  'smallest-spot': z
    .strictObject(smallestSpotShape, {
      error: mappingError("expected a mapping such as {between: ['10 um', '300 um']}"),
    })
    .optional(),
  pinhole: z.strictObject(pinholeShape, { error: mappingError('expected a mapping such as {passing: [0.95, 0.995]}') }).optional(),
};
export const SEARCH_KEYS = Object.keys(searchShape);

const ordersShape = { overlap: positiveLength().optional(), ...orderAnswerKeys };

/**
 * Planes after the first (the job's aperture): each an element at a distance (`after`) behind the
 * previous plane. The light is propagated plane to plane (src/plan/sequence.ts); `distance` is then
 * from the last plane to the screen.
 */
export const MAX_PLANES = 6;
const planeShape = { after: sweepLength(), element: aperture };
export const PLANE_KEYS = Object.keys(planeShape);
const planeOne = z.strictObject(planeShape, {
  error: mappingError("expected a mapping such as {after: '100 mm', element: {shape: circle, diameter: '20 um'}}"),
});
const planes = z
  .array(planeOne, { error: "expected a list of planes, each {after: '100 mm', element: {...}}" })
  .min(1, { error: 'expected at least one plane after the first (or leave planes out)' })
  .max(MAX_PLANES, { error: `expected at most ${MAX_PLANES} planes after the first` });
export const ORDERS_KEYS = Object.keys(ordersShape);

const descriptionMsg = `expected a line of text (at most ${DESCRIPTION_MAX} characters, no control characters)`;

const jobShape = {
  name: z
    .string({ error: nameMsg })
    .regex(/^[A-Za-z0-9_-]{1,64}$/, { error: nameMsg }),
  description: z
    .string({ error: descriptionMsg })
    .max(DESCRIPTION_MAX, { error: descriptionMsg })
    // Control characters (ESC, BEL, NUL...) have no place in a description and could rewrite a
    // terminal that shows it; tabs and line breaks are text.
    .refine((t) => !/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/.test(t), { error: descriptionMsg })
    .optional(),
  wavelength: sweepLength(WAVELENGTH),
  distance: sweepLength(),
  aperture,
  planes: planes.optional(),
  illumination: illumination.default({ kind: 'plane', tilt: [0, 0] }),
  grid: z.strictObject(gridShape, { error: gridError }).optional(),
  window: windowSize.optional(),
  method: z.enum(METHODS, { error: `expected one of ${METHODS.join(', ')}` }).default('auto'),
  output: z
    .strictObject(outputShape, { error: mappingError("expected a mapping such as {npy: float32, logDecades: 5}") })
    .default({ npy: 'float64', logDecades: 5 }),
  detector: detectors.optional(),
  search: z.strictObject(searchShape, { error: mappingError("expected a mapping such as {smallest-spot: {between: ['10 um', '300 um']}}") }).optional(),
  orders: z.strictObject(ordersShape, { error: mappingError("expected a mapping such as {overlap: '0.5 mm'}") }).optional(),
};
export const JOB_KEYS = Object.keys(jobShape);

export const jobSchema = z.strictObject(jobShape).superRefine((job, ctx) => {
  const a = job.aperture;
  // The tilts are the incident direction's cosines α = sin θx, β = sin θy (optics/source.ts): both
  // under 90° is not enough, the direction must exist (α² + β² < 1), or no light reaches the screen.
  const [tx, ty] = job.illumination.tilt;
  const s2 = Math.sin(tx) ** 2 + Math.sin(ty) ** 2;
  if (!(s2 < 1)) {
    ctx.addIssue({
      code: 'custom',
      path: ['illumination', 'tilt'],
      message: `expected tilts [θx, θy] that make one direction, sin²θx + sin²θy < 1 (these make ${Number(s2.toPrecision(4))}): together they point past the aperture plane`,
    });
  }
  const spot = job.search?.['smallest-spot'];
  const element = elementOf(a);
  if (spot) {
    const search = element.sizeSearch;
    const job = a as unknown as Record<string, unknown> & { shape: string; opaque: boolean };
    if (!search || (search.applies && !search.applies(job))) {
      ctx.addIssue({
        code: 'custom',
        path: ['search', 'smallest-spot'],
        message: `expected ${searchableWords()}: the search varies the diameter or the width, not the sizes of a ${a.shape}`,
      });
    } else if ((job[search.key] as SweepValues).values.length > 1) {
      ctx.addIssue({
        code: 'custom',
        path: ['search', 'smallest-spot'],
        message: `expected a single aperture size: the search chooses the ${search.key} itself, so it cannot also be swept`,
      });
    }
    if (!(spot.between[0] < spot.between[1])) {
      ctx.addIssue({ code: 'custom', path: ['search', 'smallest-spot', 'between'], message: 'expected [smallest, largest] with smallest < largest' });
    }
  }
  const pinholeProblem = job.search?.pinhole ? pinholeSearchProblem(a as unknown as { shape: string } & Record<string, unknown>) : null;
  if (pinholeProblem) ctx.addIssue({ code: 'custom', path: ['search', 'pinhole'], message: pinholeProblem });
  // (Both searches are optional keys, so an empty mapping would ask for nothing.)
  if (job.search && SEARCH_KEYS.every((k) => !(job.search as Record<string, unknown>)[k])) ctx.addIssue({ code: 'custom', path: ['search'], message: `expected ${SEARCH_KEYS.join(' or ')} in the search mapping` });
  element.check?.(a as unknown as Record<string, unknown> & { shape: string; opaque: boolean }, (key, message) => ctx.addIssue({ code: 'custom', path: ['aperture', ...(Array.isArray(key) ? key : [key])], message }), { illumination: job.illumination.kind });
  if (job.planes) checkPlanes(job, (path, message) => ctx.addIssue({ code: 'custom', path, message }));
});

/** What a job with planes in sequence cannot also ask for, and what a later plane cannot hold. */
interface PlanesJob {
  planes?: { after: SweepValues; element: { shape: string } }[];
  grid?: unknown;
  method: string;
  search?: { 'smallest-spot'?: unknown };
}
function checkPlanes(job: PlanesJob, problem: (path: (string | number)[], message: string) => void): void {
  const planes = job.planes!;
  if (job.grid) problem(['grid'], 'expected no grid with planes: the planner samples each plane for the light that reaches it');
  if (job.method !== 'auto' && job.method !== 'fresnel') problem(['method'], 'expected auto or fresnel with planes: the light is carried from plane to plane by the Fresnel integral');
  if (job.search?.['smallest-spot']) problem(['search', 'smallest-spot'], 'expected no smallest-spot search with planes: it varies a single aperture');
  planes.forEach((p, i) => {
    const e = elementOf(p.element);
    // (The loader reads the files the first plane's element names; a later plane's are not read.)
    const files = (e.files as { named(job: unknown): unknown[] } | undefined)?.named(p.element) ?? [];
    if (files.length) problem(['planes', i, 'element', 'shape'], `expected an element without files in a later plane: this ${p.element.shape} reads a file, which only the first plane (aperture) may`);
    e.check?.(p.element as unknown as Record<string, unknown> & { shape: string; opaque: boolean }, (key, message) => problem(['planes', i, 'element', ...(Array.isArray(key) ? key : [key])], message), {
      // A later plane is lit by the light from the one before, not by the job's illumination:
      // bounded, so an unbounded lens there is fine.
      illumination: 'gaussian',
    });
  });
}

/** "a circle or a (long) slit": the elements the smallest-spot search can vary. */
function searchableWords(): string {
  const words = ELEMENTS.flatMap((e) => ('sizeSearch' in e && e.sizeSearch ? [e.sizeSearch.words] : []));
  return words.length <= 1 ? (words[0] ?? 'nothing') : `${words.slice(0, -1).join(', ')} or ${words[words.length - 1]}`;
}

/** Which kind of quantity a key path of a (valid) job holds, for the bare-number warning. */
export function quantityKindAt(path: readonly (string | number)[]): UnitKind | undefined {
  const keys = path.filter((p): p is string => typeof p === 'string');
  // A range's ends are the swept key's own kind.
  if (keys.length > 1 && (keys[keys.length - 1] === 'from' || keys[keys.length - 1] === 'to')) keys.pop();
  return QUANTITY_KEYS[keys.join('.')];
}
const QUANTITY_KEYS: Record<string, UnitKind> = {
  wavelength: 'length',
  distance: 'length',
  ...elementLengthKeys('aperture'),
  'illumination.waist': 'length',
  'illumination.tilt': 'angle',
  'grid.pitch': 'length',
  window: 'length',
  'detector.size': 'length',
  'detector.at': 'length',
  'search.smallest-spot.between': 'length',
  'orders.overlap': 'length',
  'orders.focal_length': 'length',
  'orders.use': 'length',
  'output.zoom.centre': 'length',
  'output.zoom.width': 'length',
  'planes.after': 'length',
  ...elementLengthKeys('planes.element'),
};

/** An element's sweepable keys that are not counts are lengths, under the path that holds the element. */
function elementLengthKeys(prefix: string): Record<string, UnitKind> {
  return Object.fromEntries(
    ELEMENTS.flatMap((e) => Object.keys(e.tokens).filter((k) => !('counts' in e && (e.counts as readonly string[] | undefined)?.includes(k))).map((k) => [`${prefix}.${k}`, 'length' as UnitKind])),
  );
}

export type JobSpec = z.output<typeof jobSchema>;
export type JobInput = z.input<typeof jobSchema>;
