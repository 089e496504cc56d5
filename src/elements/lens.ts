// A thin lens: t(x, y) = exp(−iπ(x² + y²)/(λf)) (Goodman, Introduction to Fourier Optics, §5.1),
// f > 0 converging, f < 0 diverging, optionally behind a circular stop, with an optional wavefront
// error on the stop as Zernike terms in Noll's indexing (optics/zernike.ts). Without a stop the lens
// is unbounded and the illumination (a Gaussian beam) limits the light.
//
// Job keys (ours): focal_length (a signed length, sweepable), stop (the stop's diameter,
// sweepable), aberrations (a mapping from Noll's index to the term's RMS over the stop: a plain
// number in waves, or a length with its unit, '30 nm', converted with each case's wavelength), and
// wavefront_map, a wavefront error given as a greyscale PNG:
//
//   wavefront_map: {image: 'lens-error.png', peak_to_valley: 0.25}
//
// The image is square and spans the stop's diameter (so it scales with a swept stop); grey 0 is no
// error and full white is peak_to_valley, in waves (a plain number) or as an optical path with its
// unit ('150 nm'). The map is defined on the stop only: pixels whose centre lies outside it are not
// read. Between pixel centres the wavefront is interpolated bilinearly (optics/wavefront-map.ts says
// why); it adds to the Zernike terms, its steepest slope joins theirs in the sampling, and its RMS
// over the stop (piston and tilt removed by a least-squares plane) joins theirs in the Strehl
// estimate. Row 0 of the image (its top row) lies at the most negative y, as for an image mask. The
// path is relative to the job file's folder; the PNG rules are the image mask's (job/grey-png.ts).
import { createHash } from 'node:crypto';
import { z } from 'zod';
import { SIZE, plainNumber, quantity, sweepLength, MAX_SWEEP_COUNT, type SweepValues } from '../job/quantities.js';
import { formatLength } from '../job/units.js';
import { decodeGreyPng, imagePathSchema, MAX_IMAGE_BYTES } from '../job/grey-png.js';
import { safeEcho } from '../safe-text.js';
import { axisAt, type Axis } from '../optics/field.js';
import { discCellAverage } from '../optics/disc-rim-cells.js';
import type { ApertureFacts } from '../optics/geometry.js';
import { sizeWords } from '../optics/geometry.js';
import { sampleMask2D } from '../optics/mask.js';
import { lensCellAverages, lensLocalFrequency } from '../optics/thin-lens.js';
import { cellRuleFor, pupilCellAverages, wavefrontRms, wavefrontSlopeMax, zernikeSum, type ZernikeTerm } from '../optics/zernike.js';
import { mapPupilCellAverages, mapSlopeMax, mapWavefrontRms, prepareWavefrontMap, type PreparedWavefrontMap, type WavefrontMapStats } from '../optics/wavefront-map.js';
import type { CellTransmittance, ElementKind, Focusing } from './types.js';

/** One Zernike term as given: its RMS in waves, or as an optical path (m). */
export interface LensTerm {
  j: number;
  rms: number;
  unit: 'waves' | 'm';
}

/** What a wavefront map's image held, read, decoded and prepared once by the loader. */
export interface MapPixels {
  /** SHA-256 (hex, 32 digits) of the image file's bytes: it stands for the pixels in JSON. */
  digest: string;
  stats: WavefrontMapStats;
  /**
   * 'levels': the grey levels 0…1 (row-major from the top row, the pixels outside the stop that
   * interpolation reaches filled: optics/wavefront-map.ts). In a Map on purpose, as an image mask's
   * planes: structured clone copies it to the worker threads, JSON writes it as {}, so records and
   * case hashes carry the digest instead of the pixels.
   */
  planes: Map<'levels', Float32Array>;
}

/** A wavefront error given as an image across the stop. */
export interface LensWavefrontMap {
  /** The path as written in the job (for words; the pixels are already read). */
  file: string;
  /** What full white stands for: waves, or an optical path (m); grey 0 is no error. */
  peakToValley: number;
  unit: 'waves' | 'm';
  pixels: MapPixels;
}

export interface Lens {
  shape: 'lens';
  /** Focal length (m): positive converging, negative diverging. */
  focal: number;
  /** Diameter of the circular stop (m), or null: unbounded. */
  stop: number | null;
  aberrations: LensTerm[];
  /** A wavefront error given as an image (absent or null: none). */
  wavefrontMap?: LensWavefrontMap | null;
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

const pvMsg = "expected the wavefront at full white: waves such as 0.25, or an optical path with its unit such as '150 nm'";
const peakToValley = z.union(
  [
    z.number({ error: pvMsg }).refine((v) => Number.isFinite(v) && Math.abs(v) <= MAX_RMS_WAVES, { message: `expected at most ${MAX_RMS_WAVES} waves in size` }),
    quantity('length', { absMax: MAX_RMS_PATH, range: 'an optical path of at most 100 µm in size', what: "an optical path such as '150 nm'" }).transform((v) => ({ path: v })),
  ],
  { error: pvMsg },
);
const wavefrontMap = z
  .strictObject(
    { image: imagePathSchema('lens-error.png'), peak_to_valley: peakToValley },
    { error: "expected {image: 'lens-error.png', peak_to_valley: 0.25}: a square greyscale PNG across the stop, and the wavefront at full white" },
  )
  .optional();

const schema = z.strictObject({
  shape: z.literal('lens'),
  focal_length: focalLength,
  stop: sweepLength().optional(),
  aberrations,
  wavefront_map: wavefrontMap,
});

type Job = z.output<typeof schema> & { mapPixels?: MapPixels };

/** The key under `aperture.` that names the map's image (its problems name it). */
const MAP_IMAGE: [string, string] = ['wavefront_map', 'image'];

function termsOf(job: z.output<typeof schema>): LensTerm[] {
  return Object.entries(job.aberrations ?? {})
    .map(([k, v]) => (typeof v === 'number' ? { j: Number(k), rms: v, unit: 'waves' as const } : { j: Number(k), rms: v.path, unit: 'm' as const }))
    .sort((a, b) => a.j - b.j);
}

/** The wavefront error in waves at this wavelength. */
export function lensWaves(s: Lens, wavelength: number): ZernikeTerm[] {
  return s.aberrations.map((t) => ({ j: t.j, rms: t.unit === 'waves' ? t.rms : t.rms / wavelength }));
}

/** Waves per grey level at this wavelength (full white is the peak-to-valley). */
function mapWavesPerLevel(m: LensWavefrontMap, wavelength: number): number {
  return m.unit === 'waves' ? m.peakToValley : m.peakToValley / wavelength;
}

function preparedMap(m: LensWavefrontMap): PreparedWavefrontMap {
  const levels = m.pixels.planes.get('levels');
  if (!levels) throw new Error(`aperture.wavefront_map.image: the pixels of '${safeEcho(m.file, 80)}' are missing from the case`);
  return { ...m.pixels.stats, levels };
}

/** The map and the stop's radius it spans, or null without a map (a map without a stop is refused at load). */
function mapOf(s: Lens): { map: LensWavefrontMap; radius: number } | null {
  const map = s.wavefrontMap ?? null;
  if (!map) return null;
  if (s.stop === null) throw new Error('aperture.wavefront_map: a wavefront map needs a stop (it spans the stop\'s diameter)');
  return { map, radius: s.stop / 2 };
}

function stopMask(s: Lens, xa: Axis, ya: Axis): Float64Array {
  if (s.stop === null) return new Float64Array(xa.n * ya.n).fill(1);
  return sampleMask2D({ shape: 'circle', diameter: s.stop, opaque: false }, xa, ya);
}

/** Stop × exp(i2πW) per cell, without the lens phase; |t|² per cell is the stop's open fraction. */
function pupil(s: Lens, xa: Axis, ya: Axis, wavelength: number): CellTransmittance {
  const weight = stopMask(s, xa, ya);
  const waves = lensWaves(s, wavelength);
  const m = mapOf(s);
  if (m) return { t: mapPupilCellAverages(preparedMap(m.map), mapWavesPerLevel(m.map, wavelength), waves, m.radius, xa, ya), weight };
  if (s.stop !== null && waves.some((t) => t.rms !== 0)) return { t: pupilCellAverages(waves, s.stop / 2, xa, ya), weight };
  const t = new Float64Array(2 * weight.length);
  for (let i = 0; i < weight.length; i++) t[2 * i] = weight[i]!;
  return { t, weight };
}

/**
 * The lens's cell averages (exact, Fresnel integrals: thin-lens.ts) times the pupil's. The product
 * of two cell averages is the average of the product up to the covariance of the two factors within
 * a cell, second order in the phase steps per cell, which the pitch rule (phaseFrequency) keeps small.
 *
 * Rim cells (the stop's open fraction q strictly between 0 and 1) are averaged over their open part
 * only (optics/disc-rim-cells.ts): over the whole cell the lens's mean would be off by
 * q(1−q)·(mean over the open part − mean over the closed part), first order in the phase step per
 * cell, and behind a lens the rim's light is no small part of the field away from the focus (half
 * of it on the axis of a defocused stop). With Zernike terms only, the lens's phase and the
 * wavefront error are averaged together; with a wavefront map (whose rim cells are averaged over
 * their nodes inside the stop, wavefront-map.ts) the lens's open-part mean multiplies the map's.
 */
function transmittance(s: Lens, xa: Axis, ya: Axis, wavelength: number): CellTransmittance {
  const p = pupil(s, xa, ya, wavelength);
  const lens = lensCellAverages(s.focal, wavelength, null, xa, ya);
  const t = p.t;
  const rim = s.stop === null ? null : rimCells(s, xa, ya, wavelength);
  for (let i = 0; i < p.weight.length; i++) {
    const ar = t[2 * i]!;
    const ai = t[2 * i + 1]!;
    if (ar === 0 && ai === 0) continue;
    const q = p.weight[i]!;
    if (rim && q > 0 && q < 1) {
      const [cr, ci] = rim(i % xa.n, Math.floor(i / xa.n));
      if (rim.withPupil) {
        t[2 * i] = cr;
        t[2 * i + 1] = ci;
      } else {
        // The map's rim value (q × its mean over the open part) times the lens's mean there.
        t[2 * i] = (ar * cr - ai * ci) / q;
        t[2 * i + 1] = (ar * ci + ai * cr) / q;
      }
      continue;
    }
    const br = lens[2 * i]!;
    const bi = lens[2 * i + 1]!;
    t[2 * i] = ar * br - ai * bi;
    t[2 * i + 1] = ar * bi + ai * br;
  }
  return { t, weight: p.weight };
}

/**
 * A rim cell's mean over the open part of the cell (times its area: the open fraction is in it) of
 * the lens's phase −π(x² + y²)/(λf), plus 2πW of the Zernike terms when there is no wavefront map
 * (withPupil true); with a map, of the lens's phase alone.
 */
function rimCells(s: Lens, xa: Axis, ya: Axis, wavelength: number): ((c: number, r: number) => [number, number]) & { withPupil: boolean } {
  const radius = s.stop! / 2;
  const k = -Math.PI / (wavelength * s.focal);
  const withPupil = !mapOf(s);
  const w = withPupil ? zernikeSum(lensWaves(s, wavelength), radius) : null;
  const phase = w ? (x: number, y: number) => k * (x * x + y * y) + 2 * Math.PI * w(x, y) : (x: number, y: number) => k * (x * x + y * y);
  const frequency = lensLocalFrequency(s.focal, wavelength, radius) + (withPupil ? wavefrontSlopeMax(lensWaves(s, wavelength), radius) : 0);
  const rule = cellRuleFor(Math.PI * frequency * Math.max(Math.abs(xa.step), Math.abs(ya.step)));
  const at = (c: number, r: number) => discCellAverage(phase, radius, axisAt(xa, c), axisAt(ya, r), xa.step, ya.step, rule);
  return Object.assign(at, { withPupil });
}

function pupilFrequency(s: Lens, wavelength: number): number {
  if (s.stop === null) return 0;
  const m = mapOf(s);
  const map = m ? mapSlopeMax(m.map.pixels.stats, mapWavesPerLevel(m.map, wavelength), m.radius) : 0;
  return wavefrontSlopeMax(lensWaves(s, wavelength), s.stop / 2) + map;
}

/** RMS over the stop in waves, piston left out (and the tilts when asked), terms and map together. */
function rmsWaves(s: Lens, wavelength: number, withoutTilt: boolean): number {
  const m = mapOf(s);
  if (m) return mapWavefrontRms(preparedMap(m.map), mapWavesPerLevel(m.map, wavelength), lensWaves(s, wavelength), withoutTilt);
  // Noll's j = 2, 3 are the tilts: they move the focus without lowering its peak.
  return wavefrontRms(lensWaves(s, wavelength).filter((t) => !withoutTilt || t.j > 3));
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
  const m = s.wavefrontMap;
  const map = m
    ? `, wavefront map '${safeEcho(m.file, 60)}' (${m.pixels.stats.size} × ${m.pixels.stats.size} pixels across the stop, white ${m.unit === 'waves' ? `${plainNumber(m.peakToValley)} wave` : formatLength(m.peakToValley)})`
    : '';
  return `thin lens, focal length ${s.focal < 0 ? '−' : ''}${sizeWords(Math.abs(s.focal))} (${kind}), ${stop}${error}${map}`;
}

const readAs = { maxBytes: MAX_IMAGE_BYTES, noun: 'a PNG image' };

export const lens: ElementKind<Lens, typeof schema, Job> = {
  shape: 'lens',
  schema,
  tokens: { focal_length: 'f', stop: 'stop' },
  signed: ['focal_length'],
  check(job, problem, light) {
    const terms = termsOf(job);
    for (const t of terms) if (t.j > MAX_NOLL) problem(['aberrations', String(t.j)], `expected a Noll index from 1 to ${MAX_NOLL}`);
    if (terms.some((t) => t.rms !== 0) && !job.stop) problem('aberrations', 'expected a stop: the wavefront error is given on the stop (its Zernike terms are defined over it)');
    if (job.wavefront_map && !job.stop) problem('wavefront_map', "expected a stop: the wavefront map's image spans the stop's diameter");
    if (!job.stop && light?.illumination === 'plane') {
      problem('stop', 'expected a stop diameter: a lens without a stop in a plane wave passes unbounded light (give a stop, or a Gaussian beam)');
    }
  },
  files: {
    named: (job) => (job.wavefront_map ? [{ key: MAP_IMAGE.join('.'), path: job.wavefront_map.image, limits: readAs }] : []),
    attach(job, bytes, problem) {
      if (!job.wavefront_map) return job;
      const path = job.wavefront_map.image;
      const buf = bytes.get(MAP_IMAGE.join('.'))!;
      let img;
      try {
        img = decodeGreyPng(buf);
      } catch (e) {
        problem(MAP_IMAGE, `'${safeEcho(path, 120)}' ${(e as Error).message}`);
        return job;
      }
      if (img.width !== img.height) {
        problem(MAP_IMAGE, `'${safeEcho(path, 120)}' is ${img.width} × ${img.height} pixels: expected a square image (it spans the stop's diameter both ways)`);
        return job;
      }
      const { levels, ...stats } = prepareWavefrontMap(img.levels, img.width);
      const digest = createHash('sha256').update(buf).digest('hex').slice(0, 32);
      return { ...job, mapPixels: { digest, stats, planes: new Map([['levels', levels]]) } };
    },
  },
  resolve(job, v) {
    const base = { shape: 'lens' as const, focal: v('focal_length'), stop: job.stop ? v('stop') : null, aberrations: termsOf(job), opaque: false as const };
    const m = job.wavefront_map;
    if (!m) return base;
    if (!job.mapPixels) {
      throw new Error(`aperture.wavefront_map.image: the image '${safeEcho(m.image, 120)}' has not been read: load the job from its file (loadJobFile), which reads the images it names`);
    }
    const pv = m.peak_to_valley;
    const wavefrontMap: LensWavefrontMap =
      typeof pv === 'number' ? { file: m.image, peakToValley: pv, unit: 'waves', pixels: job.mapPixels } : { file: m.image, peakToValley: pv.path, unit: 'm', pixels: job.mapPixels };
    return { ...base, wavefrontMap };
  },
  geometry: () => ({ kind: 'sampled' }),
  facts,
  mask: stopMask,
  transmittance,
  phaseFrequency: (s, wavelength, reach) =>
    lensLocalFrequency(s.focal, wavelength, Math.min(reach, s.stop === null ? Infinity : s.stop / 2)) + pupilFrequency(s, wavelength),
  focusing: (s): Focusing => ({
    focal: s.focal,
    stopRadius: s.stop === null ? null : s.stop / 2,
    rmsWaves: (wavelength, withoutTilt = false) => rmsWaves(s, wavelength, withoutTilt),
    pupil: (xa, ya, wavelength) => pupil(s, xa, ya, wavelength),
    pupilFrequency: (wavelength) => pupilFrequency(s, wavelength),
  }),
  describe,
};
