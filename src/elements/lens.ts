// A thin lens: t(x, y) = exp(−iπ(x² + y²)/(λf)) (Goodman, Introduction to Fourier Optics, §5.1),
// f > 0 converging, f < 0 diverging, optionally behind a circular stop, with an optional wavefront
// error on the stop as Zernike terms in Noll's indexing (optics/zernike.ts). Without a stop the lens
// is unbounded and the illumination (a Gaussian beam) limits the light.
//
// Job keys (ours): focal_length (a signed length, sweepable), stop (the stop's diameter,
// sweepable), aberrations (a mapping from Noll's index to the term's RMS over the stop: a plain
// number in waves, or a length with its unit, '30 nm', converted with each case's wavelength).
import { z } from 'zod';
import { SIZE, plainNumber, quantity, sweepLength, MAX_SWEEP_COUNT, type SweepValues } from '../job/quantities.js';
import { formatLength } from '../job/units.js';
import type { Axis } from '../optics/field.js';
import type { ApertureFacts } from '../optics/geometry.js';
import { sizeWords } from '../optics/geometry.js';
import { sampleMask2D } from '../optics/mask.js';
import { lensCellAverages, lensLocalFrequency } from '../optics/thin-lens.js';
import { pupilCellAverages, wavefrontRms, wavefrontSlopeMax, type ZernikeTerm } from '../optics/zernike.js';
import type { CellTransmittance, ElementKind, Focusing } from './types.js';

/** One Zernike term as given: its RMS in waves, or as an optical path (m). */
export interface LensTerm {
  j: number;
  rms: number;
  unit: 'waves' | 'm';
}

export interface Lens {
  shape: 'lens';
  /** Focal length (m): positive converging, negative diverging. */
  focal: number;
  /** Diameter of the circular stop (m), or null: unbounded. */
  stop: number | null;
  aberrations: LensTerm[];
  opaque: false;
}

/**
 * What an unbounded lens's facts say of its extent: the largest length a job holds (10 km). The
 * planner takes the illuminated part (three beam radii of a Gaussian) from it, as for any element
 * wider than its beam; a plane wave on an unbounded lens is refused at load.
 */
const UNBOUNDED = SIZE.max;
/** Noll indices accepted: up to radial degree 20 (j ≤ 231); higher orders are not a lens's error. */
export const MAX_NOLL = 231;
/** Largest RMS accepted: 100 waves, or 100 µm of optical path. */
const MAX_RMS_WAVES = 100;
const MAX_RMS_PATH = 100e-6;

const focalMsg = "expected a focal length such as '100 mm' (negative for a diverging lens), a list of them, or {from, to, count, spacing}";
const signedOne = quantity('length', { absMax: SIZE.max, range: 'a focal length from −10 km to 10 km, not zero', what: "a focal length such as '100 mm' or '-50 mm'" }).refine(
  (v) => Math.abs(v) >= SIZE.min,
  { message: 'expected a focal length of at least 0.1 nm in size, positive (converging) or negative (diverging)' },
);
/** A focal length: the positive sweeps of any length, or signed single values and lists. */
const focalLength = z.union(
  [
    sweepLength(),
    z
      .array(signedOne, { error: focalMsg })
      .min(1, { error: 'expected at least one value in the list' })
      .max(MAX_SWEEP_COUNT, { error: `expected at most ${MAX_SWEEP_COUNT} values in the list` })
      .transform((values): SweepValues => ({ values, spacing: values.length === 1 ? 'single' : 'list' })),
    signedOne.transform((v): SweepValues => ({ values: [v], spacing: 'single' })),
  ],
  { error: focalMsg },
);

const termMsg = "expected an RMS in waves such as 0.05, or an optical path with its unit such as '30 nm'";
const term = z.union(
  [
    z.number({ error: termMsg }).refine((v) => Number.isFinite(v) && Math.abs(v) <= MAX_RMS_WAVES, { message: `expected an RMS of at most ${MAX_RMS_WAVES} waves in size` }),
    // (Numbers are taken by the branch above: only a length with its unit reaches this one.)
    quantity('length', { absMax: MAX_RMS_PATH, range: 'an optical path of at most 100 µm in size', what: "an optical path such as '30 nm'" }).transform((v) => ({ path: v })),
  ],
  { error: termMsg },
);
const aberrations = z
  .record(z.string().regex(/^[1-9][0-9]*$/, { error: 'expected a Noll index (a whole number from 1) as the key' }), term, {
    error: "expected a mapping from Noll's index to the term's RMS, such as {4: 0.05, 11: '30 nm'}",
  })
  .optional();

const schema = z.strictObject({
  shape: z.literal('lens'),
  focal_length: focalLength,
  stop: sweepLength().optional(),
  aberrations,
});

function termsOf(job: z.output<typeof schema>): LensTerm[] {
  return Object.entries(job.aberrations ?? {})
    .map(([k, v]) => (typeof v === 'number' ? { j: Number(k), rms: v, unit: 'waves' as const } : { j: Number(k), rms: v.path, unit: 'm' as const }))
    .sort((a, b) => a.j - b.j);
}

/** The wavefront error in waves at this wavelength. */
export function lensWaves(s: Lens, wavelength: number): ZernikeTerm[] {
  return s.aberrations.map((t) => ({ j: t.j, rms: t.unit === 'waves' ? t.rms : t.rms / wavelength }));
}

function stopMask(s: Lens, xa: Axis, ya: Axis): Float64Array {
  if (s.stop === null) return new Float64Array(xa.n * ya.n).fill(1);
  return sampleMask2D({ shape: 'circle', diameter: s.stop, opaque: false }, xa, ya);
}

/** Stop × exp(i2πW) per cell, without the lens phase; |t|² per cell is the stop's open fraction. */
function pupil(s: Lens, xa: Axis, ya: Axis, wavelength: number): CellTransmittance {
  const weight = stopMask(s, xa, ya);
  const waves = lensWaves(s, wavelength);
  if (s.stop !== null && waves.some((t) => t.rms !== 0)) return { t: pupilCellAverages(waves, s.stop / 2, xa, ya), weight };
  const t = new Float64Array(2 * weight.length);
  for (let i = 0; i < weight.length; i++) t[2 * i] = weight[i]!;
  return { t, weight };
}

/**
 * The lens's cell averages (exact, Fresnel integrals: thin-lens.ts) times the pupil's. The product
 * of two cell averages is the average of the product up to the covariance of the two factors within
 * a cell, second order in the phase steps per cell, which the pitch rule (phaseFrequency) keeps small.
 */
function transmittance(s: Lens, xa: Axis, ya: Axis, wavelength: number): CellTransmittance {
  const p = pupil(s, xa, ya, wavelength);
  const lens = lensCellAverages(s.focal, wavelength, null, xa, ya);
  const t = p.t;
  for (let i = 0; i < p.weight.length; i++) {
    const ar = t[2 * i]!;
    const ai = t[2 * i + 1]!;
    if (ar === 0 && ai === 0) continue;
    const br = lens[2 * i]!;
    const bi = lens[2 * i + 1]!;
    t[2 * i] = ar * br - ai * bi;
    t[2 * i + 1] = ar * bi + ai * br;
  }
  return { t, weight: p.weight };
}

function pupilFrequency(s: Lens, wavelength: number): number {
  if (s.stop === null) return 0;
  return wavefrontSlopeMax(lensWaves(s, wavelength), s.stop / 2);
}

function facts(s: Lens): ApertureFacts {
  const r = s.stop === null ? UNBOUNDED : s.stop / 2;
  return {
    oneD: false,
    separable: false,
    halfExtent: [r, r],
    characteristic: [r, r],
    minFeature: 2 * r,
    openMeasure: Math.PI * r * r,
    edgeMeasure: s.stop === null ? 0 : Math.PI * s.stop,
    nearestOpen: 0,
    exactEdges: false,
    description: describe(s),
  };
}

function describe(s: Lens): string {
  const kind = s.focal > 0 ? 'converging' : 'diverging';
  const stop = s.stop === null ? 'no stop (the illumination limits the light)' : `stop ${sizeWords(s.stop)} (f/${plainNumber(Math.abs(s.focal) / s.stop)})`;
  const terms = s.aberrations.filter((t) => t.rms !== 0);
  const error = terms.length
    ? `, wavefront error ${terms.map((t) => `Z${t.j} ${t.unit === 'waves' ? `${plainNumber(t.rms)} wave` : formatLength(t.rms)} RMS`).join(', ')}`
    : '';
  return `thin lens, focal length ${s.focal < 0 ? '−' : ''}${sizeWords(Math.abs(s.focal))} (${kind}), ${stop}${error}`;
}

export const lens: ElementKind<Lens, typeof schema> = {
  shape: 'lens',
  schema,
  tokens: { focal_length: 'f', stop: 'stop' },
  signed: ['focal_length'],
  check(job, problem, light) {
    const terms = termsOf(job);
    for (const t of terms) if (t.j > MAX_NOLL) problem(['aberrations', String(t.j)], `expected a Noll index from 1 to ${MAX_NOLL}`);
    if (terms.some((t) => t.rms !== 0) && !job.stop) problem('aberrations', 'expected a stop: the wavefront error is given on the stop (its Zernike terms are defined over it)');
    if (!job.stop && light?.illumination === 'plane') {
      problem('stop', 'expected a stop diameter: a lens without a stop in a plane wave passes unbounded light (give a stop, or a Gaussian beam)');
    }
  },
  resolve: (job, v) => ({ shape: 'lens', focal: v('focal_length'), stop: job.stop ? v('stop') : null, aberrations: termsOf(job), opaque: false }),
  geometry: () => ({ kind: 'sampled' }),
  facts,
  mask: stopMask,
  transmittance,
  phaseFrequency: (s, wavelength, reach) =>
    lensLocalFrequency(s.focal, wavelength, Math.min(reach, s.stop === null ? Infinity : s.stop / 2)) + pupilFrequency(s, wavelength),
  focusing: (s): Focusing => ({
    focal: s.focal,
    stopRadius: s.stop === null ? null : s.stop / 2,
    // Noll's j = 2, 3 are the tilts: they move the focus without lowering its peak.
    rmsWaves: (wavelength, withoutTilt = false) => wavefrontRms(lensWaves(s, wavelength).filter((t) => !withoutTilt || t.j > 3)),
    pupil: (xa, ya, wavelength) => pupil(s, xa, ya, wavelength),
    pupilFrequency: (wavelength) => pupilFrequency(s, wavelength),
  }),
  describe,
};
