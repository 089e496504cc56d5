// The job-file schema: the job's keys, assembled from the quantities (quantities.ts) and the
// elements' own keys (src/elements/). Every number has physical bounds checked at load time, so
// that nothing absurd reaches the planner or an allocation: a refusal names the key and the range
// expected.
import { z } from 'zod';
import { isFastFftSize } from '../optics/fft.js';
import type { UnitKind } from './units.js';
import { spectrumSchema } from './spectrum-schema.js';
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
import { SPECTROMETER_LENGTH_KEYS, spectrometerSchema } from './spectrometer-keys.js';

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

// Curved light (plan/curved-light.ts): a point or an extended source `distance` before the aperture,
// at [ξ, η] across the axis (its direction to the aperture's centre replaces a tilt).
const sourceAt = z
  .tuple([position, position], { error: "expected the source's position across the axis [x, y] such as ['1 mm', 0]" })
  .default([0, 0]);
const SOURCE_SHAPES = ['disc', 'slit', 'rectangle'] as const;
const sourceSizeMsg = "expected the source's size: a diameter or width such as '0.5 mm', or [width, height] for a rectangle";
const sourceSize = z.union([
  z.tuple([positiveLength(), positiveLength()], { error: sourceSizeMsg }).transform(([w, h]): [number, number] => [w, h]),
  positiveLength().transform((w): [number, number] => [w, w]),
], { error: sourceSizeMsg });

// Mutually incoherent points (two-point resolution): at a distance, each point's position; at
// infinity (no distance), each point's direction as two angles. Powers are relative.
export const POINT_COUNT_MAX = 16;
const powerMsg = 'expected a relative power, a number above 0 and at most 1e6, such as 1 or 0.5';
const pointOne = z.strictObject(
  {
    at: z.tuple([position, position], { error: "expected a position [x, y] across the axis such as ['0.1 mm', 0]" }).optional(),
    angle: z.tuple([angle, angle], { error: "expected the point's direction as angles [x, y] such as ['0.5 mrad', 0]" }).optional(),
    power: z.number({ error: powerMsg }).gt(0, { error: powerMsg }).max(1e6, { error: powerMsg }).default(1),
  },
  { error: mappingError("expected a point such as {at: ['0.1 mm', 0], power: 1} (or {angle: ['0.5 mrad', 0]} without a distance)") },
);
const pointList = z
  .array(pointOne, { error: `expected a list of 2 to ${POINT_COUNT_MAX} points` })
  .min(2, { error: `expected a list of 2 to ${POINT_COUNT_MAX} points` })
  .max(POINT_COUNT_MAX, { error: `expected a list of 2 to ${POINT_COUNT_MAX} points` });

const illuminationKinds = {
  plane: { kind: z.literal('plane'), tilt },
  gaussian: { kind: z.literal('gaussian'), waist: sweepLength(), tilt, waist_distance: sweepLength().optional() },
  point: { kind: z.literal('point'), distance: sweepLength(), at: sourceAt },
  points: { kind: z.literal('points'), distance: sweepLength().optional(), points: pointList },
  extended: { kind: z.literal('extended'), shape: z.enum(SOURCE_SHAPES, { error: `expected one of ${SOURCE_SHAPES.join(', ')}` }), size: sourceSize, distance: sweepLength(), at: sourceAt },
} as const;
export type IlluminationKind = keyof typeof illuminationKinds;
export const ILLUMINATION_KINDS = Object.keys(illuminationKinds) as IlluminationKind[];
export const ILLUMINATION_KEYS: Record<IlluminationKind, string[]> = Object.fromEntries(
  Object.entries(illuminationKinds).map(([k, v]) => [k, Object.keys(v)]),
) as Record<IlluminationKind, string[]>;

const illumination = z.discriminatedUnion(
  'kind',
  [z.strictObject(illuminationKinds.plane), z.strictObject(illuminationKinds.gaussian), z.strictObject(illuminationKinds.point), z.strictObject(illuminationKinds.points), z.strictObject(illuminationKinds.extended)],
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
  // A spectrum's map of each wavelength beside the sum (line-<λ>.npy).
  lineMaps: z.boolean({ error: 'expected true or false' }).optional(),
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
  // One wavelength (or a sweep of them, a case each), or a spectrum: several at once in one case.
  wavelength: sweepLength(WAVELENGTH).optional(),
  spectrum: spectrumSchema.optional(),
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
  spectrometer: spectrometerSchema.optional(),
};
export const JOB_KEYS = Object.keys(jobShape);

export const jobSchema = z.strictObject(jobShape)
  // One of wavelength and spectrum, said even where other keys are wrong too (when: always).
  .superRefine(
    (job, ctx) => {
      const has = (k: string) => (job as Record<string, unknown>)[k] !== undefined;
      if (has('wavelength') && has('spectrum')) ctx.addIssue({ code: 'custom', path: ['spectrum'], message: 'expected either wavelength or spectrum, not both: a spectrum gives its own wavelengths' });
      else if (!has('wavelength') && !has('spectrum')) ctx.addIssue({ code: 'custom', path: ['wavelength'], message: "missing: expected a positive length such as '50 um' (or, for light of several wavelengths, a spectrum: lines, a band, a blackbody or a file)" });
    },
    { when: (p) => typeof p.value === 'object' && p.value !== null && !Array.isArray(p.value) },
  )
  .superRefine((job, ctx) => {
  const a = job.aperture;
  if (job.spectrum && job.search?.['smallest-spot']) ctx.addIssue({ code: 'custom', path: ['search', 'smallest-spot'], message: 'expected no smallest-spot search with a spectrum: the search is made at one wavelength' });
  if (job.spectrum && job.search?.pinhole) ctx.addIssue({ code: 'custom', path: ['search', 'pinhole'], message: 'expected no pinhole search with a spectrum: the answers are made at one wavelength' });
  if (job.spectrum && job.planes) ctx.addIssue({ code: 'custom', path: ['spectrum'], message: 'expected a single wavelength with planes in sequence: a spectrum is not yet carried from plane to plane' });
  const ill = job.illumination as { kind: string; waist_distance?: unknown };
  if (job.spectrum && (ill.kind === 'point' || ill.kind === 'points' || ill.kind === 'extended' || ill.waist_distance !== undefined)) {
    ctx.addIssue({ code: 'custom', path: ['illumination', 'kind'], message: 'expected plane light or a Gaussian beam with its waist at the aperture with a spectrum: light from a source at a distance is computed at one wavelength (use wavelength, or a wavelength sweep)' });
  }
  // The tilts are the incident direction's cosines α = sin θx, β = sin θy (optics/source.ts): both
  // under 90° is not enough, the direction must exist (α² + β² < 1), or no light reaches the screen.
  const [tx, ty] = 'tilt' in job.illumination ? job.illumination.tilt : [0, 0];
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
  element.check?.(a as unknown as Record<string, unknown> & { shape: string; opaque: boolean }, (key, message) => ctx.addIssue({ code: 'custom', path: ['aperture', ...(Array.isArray(key) ? key : [key])], message }), { illumination: job.illumination.kind === 'gaussian' ? 'gaussian' : 'plane' });
  if (job.planes) checkPlanes(job, (path, message) => ctx.addIssue({ code: 'custom', path, message }));
  if (job.spectrometer) checkSpectrometer(job, (path, message) => ctx.addIssue({ code: 'custom', path, message }));
  checkCurvedLight(job, (path, message) => ctx.addIssue({ code: 'custom', path, message }));
});

/**
 * What a spectrometer needs: a grating (a slits or grating element, its lines along y) lit by the
 * collimated light of the slit (plane light, tilted only across the lines), as the aperture itself.
 */
function checkSpectrometer(job: { aperture: { shape: string; opaque?: boolean }; illumination: { kind: string; tilt?: [number, number] }; planes?: unknown }, problem: (path: (string | number)[], message: string) => void): void {
  // (The two elements whose geometry is a grating along x: elements/registry.ts gratingOf.)
  if ((job.aperture.shape !== 'slits' && job.aperture.shape !== 'grating') || job.aperture.opaque === true) {
    problem(['spectrometer'], `expected the aperture to be the spectrometer's grating (shape slits or grating, not opaque), got ${job.aperture.opaque ? 'an opaque ' : ''}${job.aperture.shape}`);
  }
  if (job.illumination.kind !== 'plane') {
    problem(['illumination', 'kind'], `expected plane light with a spectrometer: the collimator makes the slit's light plane waves on the grating (its incidence is illumination.tilt), got ${job.illumination.kind}`);
  } else if (job.illumination.tilt && job.illumination.tilt[1] !== 0) {
    problem(['illumination', 'tilt'], 'expected no tilt along the lines (the second angle 0) with a spectrometer: the slit, the grating and the detector share one dispersion plane');
  }
  if (job.planes) problem(['planes'], 'expected no planes with a spectrometer: its lenses and slit are in the spectrometer mapping');
}

/** What curved light (a source at a distance, a waist before the aperture) cannot be combined with. */
function checkCurvedLight(job: { illumination: { kind: string; waist_distance?: unknown; distance?: unknown; points?: { at?: unknown; angle?: unknown }[] }; planes?: unknown; search?: { 'smallest-spot'?: unknown; pinhole?: unknown } }, problem: (path: (string | number)[], message: string) => void): void {
  const ill = job.illumination;
  const curved = ill.kind === 'point' || ill.kind === 'points' || ill.kind === 'extended' || (ill.kind === 'gaussian' && ill.waist_distance !== undefined);
  // Points at a distance have positions; points at infinity, directions.
  (ill.points ?? []).forEach((p, i) => {
    if (ill.distance !== undefined && (p.at === undefined || p.angle !== undefined)) problem(['illumination', 'points', i], 'expected a position (at) and no angle: the points are at the distance given');
    if (ill.distance === undefined && (p.angle === undefined || p.at !== undefined)) problem(['illumination', 'points', i], 'expected a direction (angle) and no position: without a distance the points are at infinity (give a distance for points at positions)');
  });
  if (!curved) return;
  const what = ill.kind === 'gaussian' ? 'a waist before the aperture (waist_distance)' : ill.kind === 'points' ? 'several points' : `a ${ill.kind} source`;
  if (job.planes) problem(['planes'], `expected no planes with ${what}: planes in sequence take a plane wave or a Gaussian beam with its waist at the first plane`);
  if (job.search?.['smallest-spot']) problem(['search', 'smallest-spot'], `expected no smallest-spot search with ${what}: the search compares spots under flat light`);
  if (job.search?.pinhole) problem(['search', 'pinhole'], `expected no pinhole search with ${what}: the pinhole answers are read at a lens's focus under flat light`);
}

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
  'spectrum.lines.wavelength': 'length',
  'spectrum.band': 'length',
  'spectrum.blackbody': 'length',
  distance: 'length',
  ...elementLengthKeys('aperture'),
  'illumination.waist': 'length',
  'illumination.tilt': 'angle',
  'illumination.waist_distance': 'length',
  'illumination.distance': 'length',
  'illumination.at': 'length',
  'illumination.size': 'length',
  'illumination.points.at': 'length',
  'illumination.points.angle': 'angle',
  'grid.pitch': 'length',
  window: 'length',
  'detector.size': 'length',
  'detector.at': 'length',
  'search.smallest-spot.between': 'length',
  'orders.overlap': 'length',
  'orders.focal_length': 'length',
  'orders.use': 'length',
  ...Object.fromEntries(SPECTROMETER_LENGTH_KEYS.map((k) => [`spectrometer.${k}`, 'length' as UnitKind])),
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

/** A spectrum file's rows, attached by the loader (load.ts) after validation. */
export interface SpectrumTable {
  wavelengths: number[];
  density: number[];
}
export type JobSpec = z.output<typeof jobSchema> & { spectrum?: { table?: SpectrumTable } };
export type JobInput = z.input<typeof jobSchema>;
