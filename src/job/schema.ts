// The job-file schema. Leaves parse units into SI as they validate, so the parsed job holds plain
// numbers in metres and radians. Every sweepable key is parsed into a list of values (a single
// value becomes a list of one) together with how the list was given.
import { z } from 'zod';
import { formatLength, parseQuantity, type UnitKind } from './units.js';

export interface SweepValues {
  values: number[];
  /** 'single' when one value was given; the others are sweeps. */
  spacing: 'single' | 'list' | 'linear' | 'log';
}

const MAX_SWEEP_COUNT = 100_000;

const EXAMPLES: Record<UnitKind, string> = { length: "'50 um'", angle: "'2 deg'" };

function quantity(kind: UnitKind, opts: { positive?: boolean; nonNegative?: boolean; what?: string } = {}) {
  const adjective = opts.positive ? 'positive ' : opts.nonNegative ? 'non-negative ' : '';
  const article = adjective === '' && kind === 'angle' ? 'an' : 'a';
  const expected = `expected ${opts.what ?? `${article} ${adjective}${kind} such as ${EXAMPLES[kind]}`}`;
  return z.unknown().transform((raw, ctx): number => {
    if (raw === undefined) {
      ctx.addIssue({ code: 'custom', message: `missing: ${expected}` });
      return z.NEVER;
    }
    if (typeof raw === 'object' && raw !== null) {
      // A list or a mapping is a different type, not a bad value: reported as such, so that where a
      // list or a range is also allowed, the error of that branch is the one shown.
      ctx.addIssue({ code: 'invalid_type', expected: 'number', message: expected, input: raw });
      return z.NEVER;
    }
    const r = parseQuantity(raw, kind);
    if (!r.ok) {
      // The reason goes in params so that the message can put it after the value given.
      ctx.addIssue({ code: 'custom', message: expected, params: { reason: r.reason } });
      return z.NEVER;
    }
    if ((opts.positive && !(r.value > 0)) || (opts.nonNegative && !(r.value >= 0))) {
      ctx.addIssue({ code: 'custom', message: expected });
      return z.NEVER;
    }
    return r.value;
  });
}

const positiveLength = () => quantity('length', { positive: true });

/** A range given as {from, to, count, spacing}. */
const rangeShape = {
  from: positiveLength(),
  to: positiveLength(),
  count: z
    .number({ error: 'expected a whole number of values, 2 or more' })
    .int({ error: 'expected a whole number of values, 2 or more' })
    .min(2, { error: 'expected a whole number of values, 2 or more' })
    .max(MAX_SWEEP_COUNT, { error: `expected at most ${MAX_SWEEP_COUNT} values` }),
  spacing: z.enum(['linear', 'log'], { error: "expected 'linear' or 'log'" }).default('linear'),
};
export const RANGE_KEYS = Object.keys(rangeShape);

const range = z.strictObject(rangeShape).transform((r): SweepValues => {
  const values: number[] = [];
  for (let i = 0; i < r.count; i++) {
    const t = i / (r.count - 1);
    values.push(r.spacing === 'log' ? r.from * Math.pow(r.to / r.from, t) : r.from + (r.to - r.from) * t);
  }
  return { values, spacing: r.spacing };
});

/** A sweepable positive length: one value, a list, or a range. */
function sweepLength() {
  const one = positiveLength();
  const msg = 'expected a length, a list of lengths or {from, to, count, spacing}';
  return z.union([
    z
      .array(one, { error: msg })
      .min(1, { error: 'expected at least one value in the list' })
      .max(MAX_SWEEP_COUNT)
      .transform((values): SweepValues => ({ values, spacing: values.length === 1 ? 'single' : 'list' })),
    range,
    one.transform((v): SweepValues => ({ values: [v], spacing: 'single' })),
  ], { error: msg });
}

function sweepCount(min: number) {
  const msg = `expected a whole number ${min} or more, or a list of them`;
  const one = z.number({ error: msg }).int({ error: msg }).min(min, { error: msg });
  return z.union([
    z
      .array(one, { error: msg })
      .min(1, { error: msg })
      .transform((values): SweepValues => ({ values, spacing: values.length === 1 ? 'single' : 'list' })),
    one.transform((v): SweepValues => ({ values: [v], spacing: 'single' })),
  ], { error: msg });
}

/** The message for a mapping given as something else (the schema's own type issue only). */
function mappingError(msg: string) {
  return (issue: { code?: string }) => (issue.code === 'invalid_type' ? msg : undefined);
}

const opaque = z.boolean({ error: 'expected true or false' }).default(false);

const apertureShapes = {
  circle: { shape: z.literal('circle'), diameter: sweepLength(), opaque },
  rectangle: { shape: z.literal('rectangle'), width: sweepLength(), height: sweepLength(), opaque },
  slit: { shape: z.literal('slit'), width: sweepLength(), length: sweepLength().optional(), opaque },
  annulus: { shape: z.literal('annulus'), outer: sweepLength(), inner: sweepLength(), opaque },
  slits: {
    shape: z.literal('slits'),
    count: sweepCount(1),
    width: sweepLength(),
    period: sweepLength(),
    length: sweepLength().optional(),
    opaque,
  },
} as const;
export type ShapeName = keyof typeof apertureShapes;
export const SHAPE_NAMES = Object.keys(apertureShapes) as ShapeName[];
export const APERTURE_KEYS: Record<ShapeName, string[]> = Object.fromEntries(
  Object.entries(apertureShapes).map(([k, v]) => [k, Object.keys(v)]),
) as Record<ShapeName, string[]>;

const aperture = z.discriminatedUnion(
  'shape',
  [
    z.strictObject(apertureShapes.circle),
    z.strictObject(apertureShapes.rectangle),
    z.strictObject(apertureShapes.slit),
    z.strictObject(apertureShapes.annulus),
    z.strictObject(apertureShapes.slits),
  ],
  { error: `expected a mapping such as {shape: circle, diameter: '50 um'} (shape: one of ${SHAPE_NAMES.join(', ')})` },
);

const angle = quantity('angle');
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

const gridSizeMsg = 'expected a whole number of samples, a power of two from 16 to 65536 (2-D) or 2^24 (1-D)';
const gridSize = z
  .number({ error: gridSizeMsg })
  .int({ error: gridSizeMsg })
  .min(16, { error: gridSizeMsg })
  .max(1 << 24, { error: gridSizeMsg })
  .refine((n) => (n & (n - 1)) === 0, { error: gridSizeMsg });

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
};
export const OUTPUT_KEYS = Object.keys(outputShape);

const nameMsg = 'expected a name of letters, digits, - and _ (at most 64 characters), such as pinhole-50um';

const detectorShape = {
  kind: z.enum(['pinhole', 'square'], { error: "expected 'pinhole' (a disc) or 'square' (a pixel)" }),
  size: positiveLength(),
  at: z
    .tuple([quantity('length'), quantity('length')], { error: "expected a position [x, y] such as ['0 mm', '1.5 mm']" })
    .optional(),
};
export const DETECTOR_KEYS = Object.keys(detectorShape);
const detectorOne = z.strictObject(detectorShape, {
  error: mappingError("expected a mapping such as {kind: pinhole, size: '20 um'}"),
});
const detectors = z.union([z.array(detectorOne).min(1), detectorOne.transform((d) => [d])], {
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
const searchShape = {
  'smallest-spot': z.strictObject(smallestSpotShape, {
    error: mappingError("expected a mapping such as {between: ['10 um', '300 um']}"),
  }),
};
export const SEARCH_KEYS = Object.keys(searchShape);

const ordersShape = { overlap: positiveLength().optional() };
export const ORDERS_KEYS = Object.keys(ordersShape);

const jobShape = {
  name: z
    .string({ error: nameMsg })
    .regex(/^[A-Za-z0-9_-]{1,64}$/, { error: nameMsg }),
  description: z.string({ error: 'expected a line of text' }).optional(),
  wavelength: sweepLength(),
  distance: sweepLength(),
  aperture,
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
  const spot = job.search?.['smallest-spot'];
  if (spot) {
    if (a.shape !== 'circle' && !(a.shape === 'slit' && !a.length)) {
      ctx.addIssue({
        code: 'custom',
        path: ['search', 'smallest-spot'],
        message: `expected a circle or a (long) slit: the search varies the diameter or the width, not the sizes of a ${a.shape}`,
      });
    } else if ((a.shape === 'circle' ? a.diameter : a.width).values.length > 1) {
      ctx.addIssue({
        code: 'custom',
        path: ['search', 'smallest-spot'],
        message: `expected a single aperture size: the search chooses the ${a.shape === 'circle' ? 'diameter' : 'width'} itself, so it cannot also be swept`,
      });
    }
    if (!(spot.between[0] < spot.between[1])) {
      ctx.addIssue({ code: 'custom', path: ['search', 'smallest-spot', 'between'], message: 'expected [smallest, largest] with smallest < largest' });
    }
  }
  if (a.shape === 'annulus') {
    const minOuter = Math.min(...a.outer.values);
    if (Math.max(...a.inner.values) >= minOuter) {
      ctx.addIssue({
        code: 'custom',
        path: ['aperture', 'inner'],
        message: `expected the inner diameter to be smaller than the outer one (${formatLength(minOuter)})`,
      });
    }
  }
  if (a.shape === 'slits') {
    if (Math.max(...a.width.values) >= Math.min(...a.period.values)) {
      ctx.addIssue({
        code: 'custom',
        path: ['aperture', 'width'],
        message: 'expected the slit width to be smaller than the period (otherwise the slits merge)',
      });
    }
  }
});

export type JobSpec = z.output<typeof jobSchema>;
export type JobInput = z.input<typeof jobSchema>;
