// The job-file schema. Leaves parse units into SI as they validate, so the parsed job holds plain
// numbers in metres and radians. Every sweepable key is parsed into a list of values (a single
// value becomes a list of one) together with how the list was given.
//
// Every number has physical bounds checked here, at load time, so that nothing absurd (1e308 m,
// 5e-324 m, 2^53 + 1 slits) reaches the planner or an allocation: a refusal names the key and the
// range expected. The bounds are wide enough for any real bench and narrow enough that products of
// them (λz/L², grid sizes, samples) stay finite numbers with room to spare.
import { z } from 'zod';
import { formatLength, parseQuantity, type UnitKind } from './units.js';

export interface SweepValues {
  values: number[];
  /** 'single' when one value was given; the others are sweeps. */
  spacing: 'single' | 'list' | 'linear' | 'log';
}

/** Values one swept key may hold (a range's count, a list's length). */
export const MAX_SWEEP_COUNT = 100_000;

/**
 * Every length that must be positive (sizes, distances, pitches, windows, waists, detector sizes):
 * 1e-10 m (an atom's size; below it scalar optics means nothing) to 1e4 m (10 km, beyond any bench
 * or range). Their ratios and products stay finite, normal numbers (1e4 / 1e-10 = 1e14,
 * (1e4)² / 1e-9 = 1e17), so what the planner derives from them is a large number it can refuse,
 * never an infinity, a NaN or a zero.
 */
export const LENGTH_MIN = 1e-10;
export const LENGTH_MAX = 1e4;
/** Wavelengths: 1 nm (soft X-rays) to 1 mm (far infrared); outside them the model is wrong. */
export const WAVELENGTH_MIN = 1e-9;
export const WAVELENGTH_MAX = 1e-3;
/** Wavelengths outside 100 nm – 20 µm load with a warning: real, but rarely what was meant. */
export const WAVELENGTH_USUAL_MIN = 100e-9;
export const WAVELENGTH_USUAL_MAX = 20e-6;
/** Positions that may be zero or negative (a detector's centre): |x| ≤ 1e4 m, as lengths. */
export const POSITION_MAX = LENGTH_MAX;
/** Tilts: |θ| < 90°; at 90° the light runs along the aperture plane and never reaches the screen. */
export const TILT_MAX = Math.PI / 2;
/**
 * Slits in a grating: at most 1e6 (a 100 mm grating at 10 000 lines/mm). The planner and the
 * exact sums hold every slit's two edges in lists, so 1e6 slits are tens of MB, not an exhaustion.
 */
export const SLIT_COUNT_MAX = 1_000_000;
/** Detectors in one job: each is integrated over the map of every case, so 100 at most. */
export const DETECTOR_COUNT_MAX = 100;
/** A description is one line or a short paragraph, echoed into results and reports. */
export const DESCRIPTION_MAX = 1000;

const EXAMPLES: Record<UnitKind, string> = { length: "'50 um'", angle: "'2 deg'" };

interface QuantityOptions {
  positive?: boolean;
  nonNegative?: boolean;
  what?: string;
  /** Bounds on the SI value, with how they are said in a message. */
  min?: number;
  max?: number;
  /** |value| < absBelow (strict: tilts). */
  absBelow?: number;
  /** |value| ≤ absMax. */
  absMax?: number;
  range?: string;
}

function quantity(kind: UnitKind, opts: QuantityOptions = {}) {
  const adjective = opts.positive ? 'positive ' : opts.nonNegative ? 'non-negative ' : '';
  const article = adjective === '' && kind === 'angle' ? 'an' : 'a';
  const expected = `expected ${opts.what ?? `${article} ${adjective}${kind} such as ${EXAMPLES[kind]}`}`;
  const outOfRange = `expected ${opts.range ?? `${article} ${kind}`}`;
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
    const v = r.value;
    if (
      (opts.min !== undefined && !(v >= opts.min)) ||
      (opts.max !== undefined && !(v <= opts.max)) ||
      (opts.absBelow !== undefined && !(Math.abs(v) < opts.absBelow)) ||
      (opts.absMax !== undefined && !(Math.abs(v) <= opts.absMax))
    ) {
      const low = (opts.min !== undefined && v < opts.min) || (opts.absBelow === undefined && opts.absMax === undefined && v <= 0);
      const said = kind === 'angle' ? formatDegrees(v) : `${plainNumber(v)} m`;
      ctx.addIssue({ code: 'custom', message: outOfRange, params: { reason: `${said} is too ${low ? 'small' : 'large'}` } });
      return z.NEVER;
    }
    return v;
  });
}

function formatDegrees(rad: number): string {
  return `${plainNumber((rad * 180) / Math.PI)}°`;
}

/** 4 significant digits, in exponent form when large or small: 9.007e15, 5e-324. */
function plainNumber(x: number): string {
  const s = Number(x.toPrecision(4));
  const a = Math.abs(s);
  return a >= 1e5 || (a !== 0 && a < 1e-3) ? s.toExponential().replace('e+', 'e') : String(s);
}

interface LengthBounds {
  min: number;
  max: number;
  range: string;
}
const SIZE: LengthBounds = { min: LENGTH_MIN, max: LENGTH_MAX, range: 'a length from 0.1 nm to 10 km (1e-10 m to 1e4 m)' };
const WAVELENGTH: LengthBounds = { min: WAVELENGTH_MIN, max: WAVELENGTH_MAX, range: 'a wavelength from 1 nm to 1 mm' };

const positiveLength = (b: LengthBounds = SIZE) => quantity('length', { positive: true, ...b });

/** A range given as {from, to, count, spacing}. */
function rangeShape(b: LengthBounds) {
  return {
    from: positiveLength(b),
    to: positiveLength(b),
    count: z
      .number({ error: 'expected a whole number of values, 2 or more' })
      .int({ error: 'expected a whole number of values, 2 or more' })
      .min(2, { error: 'expected a whole number of values, 2 or more' })
      .max(MAX_SWEEP_COUNT, { error: `expected at most ${MAX_SWEEP_COUNT} values` }),
    spacing: z.enum(['linear', 'log'], { error: "expected 'linear' or 'log'" }).default('linear'),
  };
}
export const RANGE_KEYS = Object.keys(rangeShape(SIZE));

/**
 * A range may run downwards (from > to: a descending sweep, deliberately: the cases come in the
 * order written). Its ends must differ, and its steps must be distinguishable numbers; the ends
 * are kept exactly, and every value lies between them, so within the bounds (never NaN, 0 or a
 * denormal).
 */
function range(b: LengthBounds) {
  return z.strictObject(rangeShape(b)).transform((r, ctx): SweepValues => {
    if (r.from === r.to) {
      ctx.addIssue({
        code: 'custom',
        path: ['to'],
        message: `expected 'to' to differ from 'from' (${formatLength(r.from)}): a range of one value is written as that value`,
      });
      return z.NEVER;
    }
    const values: number[] = new Array<number>(r.count);
    const last = r.count - 1;
    for (let i = 0; i <= last; i++) {
      const t = i / last;
      values[i] =
        i === 0 ? r.from : i === last ? r.to : r.spacing === 'log' ? r.from * Math.pow(r.to / r.from, t) : r.from + (r.to - r.from) * t;
    }
    for (let i = 1; i <= last; i++) {
      if (values[i] === values[i - 1]) {
        ctx.addIssue({
          code: 'custom',
          path: ['count'],
          message: `expected fewer values: ${r.count} steps from ${formatLength(r.from)} to ${formatLength(r.to)} are too fine to tell apart`,
        });
        return z.NEVER;
      }
    }
    return { values, spacing: r.spacing };
  });
}

/** A sweepable positive length: one value, a list, or a range. */
function sweepLength(b: LengthBounds = SIZE) {
  const one = positiveLength(b);
  const msg = 'expected a length, a list of lengths or {from, to, count, spacing}';
  return z.union([
    z
      .array(one, { error: msg })
      .min(1, { error: 'expected at least one value in the list' })
      .max(MAX_SWEEP_COUNT, { error: `expected at most ${MAX_SWEEP_COUNT} values in the list` })
      .transform((values): SweepValues => ({ values, spacing: values.length === 1 ? 'single' : 'list' })),
    range(b),
    one.transform((v): SweepValues => ({ values: [v], spacing: 'single' })),
  ], { error: msg });
}

function sweepCount(min: number, max: number) {
  const msg = `expected a whole number from ${min} to ${max}, or a list of them`;
  const one = z.number({ error: msg }).int({ error: msg }).min(min, { error: msg }).max(max, { error: msg });
  return z.union([
    z
      .array(one, { error: msg })
      .min(1, { error: msg })
      .max(MAX_SWEEP_COUNT, { error: `expected at most ${MAX_SWEEP_COUNT} values in the list` })
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
    count: sweepCount(1, SLIT_COUNT_MAX),
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

// Grid sizes: powers of two from 16 to 2^16 per axis for 2-D grids (2^32 complex samples would be
// 64 GiB) and 2^24 for 1-D ones (256 MiB); the planner holds a 2-D grid to 2^16 and refuses what
// its memory estimate cannot hold. The check here keeps the number itself sane.
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

const position = quantity('length', { absMax: POSITION_MAX, range: 'a position within ±10 km (|x| ≤ 1e4 m)' });
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
const searchShape = {
  'smallest-spot': z.strictObject(smallestSpotShape, {
    error: mappingError("expected a mapping such as {between: ['10 um', '300 um']}"),
  }),
};
export const SEARCH_KEYS = Object.keys(searchShape);

const ordersShape = { overlap: positiveLength().optional() };
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
    const minOuter = minOf(a.outer.values);
    if (maxOf(a.inner.values) >= minOuter) {
      ctx.addIssue({
        code: 'custom',
        path: ['aperture', 'inner'],
        message: `expected the inner diameter to be smaller than the outer one (${formatLength(minOuter)})`,
      });
    }
  }
  if (a.shape === 'slits') {
    if (maxOf(a.width.values) >= minOf(a.period.values)) {
      ctx.addIssue({
        code: 'custom',
        path: ['aperture', 'width'],
        message: 'expected the slit width to be smaller than the period (otherwise the slits merge)',
      });
    }
  }
});

// Loops, not Math.min(...values): a spread of 100 000 arguments can overflow the call stack.
function minOf(values: readonly number[]): number {
  let m = Infinity;
  for (const v of values) if (v < m) m = v;
  return m;
}
function maxOf(values: readonly number[]): number {
  let m = -Infinity;
  for (const v of values) if (v > m) m = v;
  return m;
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
  'aperture.diameter': 'length',
  'aperture.width': 'length',
  'aperture.height': 'length',
  'aperture.length': 'length',
  'aperture.outer': 'length',
  'aperture.inner': 'length',
  'aperture.period': 'length',
  'illumination.waist': 'length',
  'illumination.tilt': 'angle',
  'grid.pitch': 'length',
  window: 'length',
  'detector.size': 'length',
  'detector.at': 'length',
  'search.smallest-spot.between': 'length',
  'orders.overlap': 'length',
};

export type JobSpec = z.output<typeof jobSchema>;
export type JobInput = z.input<typeof jobSchema>;
