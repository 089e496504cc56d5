// The job file's building blocks: quantities with units and physical bounds, sweepable values,
// ranges. Leaves parse units into SI as they validate, so the parsed job holds plain numbers in
// metres and radians. Every sweepable key is parsed into a list of values (a single value becomes
// a list of one) together with how the list was given. The elements (src/elements/) build their
// job keys from these; schema.ts assembles the job.
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

export function quantity(kind: UnitKind, opts: QuantityOptions = {}) {
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

export function formatDegrees(rad: number): string {
  return `${plainNumber((rad * 180) / Math.PI)}°`;
}

/** 4 significant digits, in exponent form when large or small: 9.007e15, 5e-324. */
export function plainNumber(x: number): string {
  const s = Number(x.toPrecision(4));
  const a = Math.abs(s);
  return a >= 1e5 || (a !== 0 && a < 1e-3) ? s.toExponential().replace('e+', 'e') : String(s);
}

export interface LengthBounds {
  min: number;
  max: number;
  range: string;
}
export const SIZE: LengthBounds = { min: LENGTH_MIN, max: LENGTH_MAX, range: 'a length from 0.1 nm to 10 km (1e-10 m to 1e4 m)' };
export const WAVELENGTH: LengthBounds = { min: WAVELENGTH_MIN, max: WAVELENGTH_MAX, range: 'a wavelength from 1 nm to 1 mm' };

export const positiveLength = (b: LengthBounds = SIZE) => quantity('length', { positive: true, ...b });

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
export function sweepLength(b: LengthBounds = SIZE) {
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

export function sweepCount(min: number, max: number) {
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
export function mappingError(msg: string) {
  return (issue: { code?: string }) => (issue.code === 'invalid_type' ? msg : undefined);
}

export const opaque = z.boolean({ error: 'expected true or false' }).default(false);

/** A position that may be zero or negative (a detector's centre, a part's place): |x| ≤ 1e4 m. */
export const position = quantity('length', { absMax: POSITION_MAX, range: 'a position within ±10 km (|x| ≤ 1e4 m)' });
