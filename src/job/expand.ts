// Expanding a job's sweeps into cases: the cartesian product of every swept key, with distance
// innermost so that consecutive cases share an aperture and a wavelength.
import type { Illumination } from '../optics/aperture.js';
import { directionCosines } from '../optics/source.js';
import { elementOf, type Aperture } from '../elements/registry.js';
import type { ResolveContext } from '../elements/types.js';
import type { Case } from '../plan/types.js';
import type { JobSpec, SweepValues } from './schema.js';
import { lengthToken } from './units.js';
import { DEFAULT_BAND_SAMPLES, meanWavelength, spectrumLines, spectrumRange, type SpectrumSource } from '../analysis/spectrum.js';
import { flatIllumination, type CaseSource } from '../plan/curved-light.js';
import type { SpectrometerSetup } from '../analysis/spectrometer.js';
import { SPECTROMETER_SWEEPS } from './spectrometer-keys.js';

export const MAX_CASES = 1_000_000;

export interface SweepAxis {
  /** Dotted key path in the job file, e.g. "aperture.diameter". */
  key: string;
  /** Short token used in case folder names. */
  token: string;
  values: number[];
  spacing: SweepValues['spacing'];
  unit: 'm' | '1';
}

/** Folder-name tokens of the job's own sweepable keys; an element's come from its kind. */
const TOKENS: Record<string, string> = {
  wavelength: 'wl',
  distance: 'z',
  'illumination.waist': 'waist',
  'illumination.waist_distance': 'waist-at',
  'illumination.distance': 'source',
};

function isSweep(v: unknown): v is SweepValues {
  return typeof v === 'object' && v !== null && Array.isArray((v as SweepValues).values);
}

/** All sweepable keys of a job in product order (outermost first), swept or not. */
export function sweepAxes(job: JobSpec): SweepAxis[] {
  const axes: SweepAxis[] = [];
  const add = (key: string, v: SweepValues, unit: 'm' | '1' = 'm', token = TOKENS[key]) =>
    axes.push({ key, token: token ?? key.replace(/\W/g, '-'), values: v.values, spacing: v.spacing, unit });
  // A spectrum is one case's light, not a sweep: its mean wavelength stands for it where one is asked.
  add('wavelength', job.wavelength ?? { values: [meanWavelength(spectrumLines(spectrumOf(job)!))], spacing: 'single' });
  const element = elementOf(job.aperture);
  for (const [k, v] of Object.entries(job.aperture)) {
    if (isSweep(v)) add(`aperture.${k}`, v, element.counts?.includes(k) ? '1' : 'm', element.tokens[k]);
  }
  (job.planes ?? []).forEach((p, i) => {
    // Plane numbers in folder names count the aperture as plane 1.
    add(`planes.${i}.after`, p.after, 'm', `gap${i + 2}`);
    const e = elementOf(p.element);
    for (const [k, v] of Object.entries(p.element)) {
      if (isSweep(v)) add(`planes.${i}.element.${k}`, v, e.counts?.includes(k) ? '1' : 'm', `p${i + 2}${e.tokens[k] ?? k}`);
    }
  });
  if (job.illumination.kind === 'gaussian') add('illumination.waist', job.illumination.waist);
  if (job.illumination.kind === 'gaussian' && job.illumination.waist_distance) add('illumination.waist_distance', job.illumination.waist_distance);
  if (job.illumination.kind === 'point' || job.illumination.kind === 'extended') add('illumination.distance', job.illumination.distance);
  if (job.illumination.kind === 'points' && job.illumination.distance) add('illumination.distance', job.illumination.distance);
  if (job.spectrometer) for (const [k, token] of Object.entries(SPECTROMETER_SWEEPS)) add(`spectrometer.${k}`, job.spectrometer[k as keyof typeof SPECTROMETER_SWEEPS], 'm', token);
  add('distance', job.distance);
  return axes;
}

export function caseCount(job: JobSpec): number {
  return sweepAxes(job).reduce((n, a) => n * a.values.length, 1);
}

export function expandJob(job: JobSpec): Case[] {
  const axes = sweepAxes(job);
  const total = axes.reduce((n, a) => n * a.values.length, 1);
  if (total > MAX_CASES) {
    throw new Error(`the sweeps make ${total} cases, more than the ${MAX_CASES} one job may hold; split the job`);
  }
  // The loader's bounds keep every swept value a positive finite number; a JobSpec built by a
  // script without the loader is checked here, so no NaN, 0 or infinity reaches a case.
  for (const a of axes) {
    // An element's signed keys (a diverging lens's focal length) may be negative, never zero.
    const signed = signedKey(job, a.key);
    for (const v of a.values) {
      if (signed ? !(Number.isFinite(v) && v !== 0) : !(Number.isFinite(v) && v > 0)) throw new Error(`${a.key}: ${v} is not a ${signed ? 'non-zero' : 'positive'} finite number; validate the job with validateJob first`);
    }
  }
  const swept = axes.filter((a) => a.values.length > 1);
  const width = String(total).length;
  const spot = job.search?.['smallest-spot'];
  const spectrum = spectrumOf(job);
  const analysis = {
    detectors: (job.detector ?? []).map((d) => ({ kind: d.kind, size: d.size, ...(d.at ? { at: d.at } : {}) })),
    ...(spot ? { smallestSpot: { between: spot.between, measure: spot.measure } } : {}),
    ...(job.orders?.overlap ? { orderOverlap: job.orders.overlap } : {}),
    ...(job.orders?.focal_length ? { focalLength: job.orders.focal_length } : {}),
    ...(job.orders?.use ? { orderUse: { ...job.orders.use, light: useLight(spectrum ? spectrumRange(spectrum) : job.wavelength!.values, job.orders.use) } } : {}),
    ...(job.search?.pinhole ? { pinholePassing: job.search.pinhole.passing } : {}),
  };
  const cases: Case[] = [];
  const idx = new Array<number>(axes.length).fill(0);
  for (let n = 0; n < total; n++) {
    const value = (key: string) => {
      const i = axes.findIndex((a) => a.key === key);
      return axes[i]!.values[idx[i]!]!;
    };
    const sweptValues: Record<string, number> = {};
    const tokens: string[] = [String(n + 1).padStart(width, '0')];
    for (const a of swept) {
      const v = value(a.key);
      sweptValues[a.key] = v;
      tokens.push(`${a.token}-${a.unit === 'm' ? lengthToken(v) : String(v)}`);
    }
    const light = curvedLight(job, value);
    cases.push({
      job: job.name,
      index: n,
      id: tokens.join('_'),
      wavelength: value('wavelength'),
      distance: value('distance'),
      aperture: resolveAperture(job, value, { wavelength: value('wavelength'), cosIncidence: directionCosines(light.illumination)[2] }),
      ...(job.planes ? { planes: job.planes.map((p, i) => ({ after: value(`planes.${i}.after`), aperture: resolveElement(p.element, (k) => value(`planes.${i}.element.${k}`), { wavelength: value('wavelength') }) })) } : {}),
      ...light,
      ...(spectrum ? { spectrum } : {}),
      ...(job.grid ? { grid: job.grid } : {}),
      ...(job.window ? { window: job.window } : {}),
      method: job.method,
      swept: sweptValues,
      output: job.output,
      analysis: job.spectrometer ? { ...analysis, spectrometer: spectrometerOf(job.spectrometer, value) } : analysis,
    });
    // Odometer increment, last axis fastest.
    for (let i = axes.length - 1; i >= 0; i--) {
      idx[i]!++;
      if (idx[i]! < axes[i]!.values.length) break;
      idx[i] = 0;
    }
  }
  return cases;
}

/** One case's spectrometer: its swept lengths at this case's values. */
function spectrometerOf(s: NonNullable<JobSpec['spectrometer']>, value: (key: string) => number): SpectrometerSetup {
  return {
    slit: value('spectrometer.slit'),
    collimator: value('spectrometer.collimator'),
    camera: value('spectrometer.camera'),
    pixel: value('spectrometer.pixel'),
    pixels: s.pixels,
    centre: s.centre,
  };
}

function resolveAperture(job: JobSpec, value: (key: string) => number, context: ResolveContext): Aperture {
  return resolveElement(job.aperture, (k: string) => value(`aperture.${k}`), context);
}

function resolveElement(spec: { shape: string }, value: (key: string) => number, context: ResolveContext): Aperture {
  const a = spec as unknown as { shape: string; opaque: boolean } & Record<string, unknown>;
  return elementOf(a).resolve(a, value, context) as Aperture;
}

/** An element's signed key (a diverging lens's focal length), in the first plane or a later one. */
function signedKey(job: JobSpec, key: string): boolean {
  const m = /^(?:aperture|planes\.(\d+)\.element)\.(.+)$/.exec(key);
  if (!m) return false;
  const spec = m[1] === undefined ? job.aperture : job.planes![Number(m[1])]!.element;
  return elementOf(spec).signed?.includes(m[2]!) ?? false;
}

/** The job's spectrum in SI, or null for one wavelength. A file's rows come from the loader. */
export function spectrumOf(job: JobSpec): SpectrumSource | null {
  const s = job.spectrum;
  if (!s) return null;
  if (s.lines) return { kind: 'lines', lines: s.lines.map((l) => ({ wavelength: l.wavelength, power: l.power })) };
  if (s.band) return { kind: 'band', from: s.band.from, to: s.band.to, samples: s.samples ?? DEFAULT_BAND_SAMPLES };
  if (s.blackbody) return { kind: 'blackbody', temperature: s.blackbody.temperature, from: s.blackbody.from, to: s.blackbody.to, samples: s.samples ?? DEFAULT_BAND_SAMPLES };
  if (!s.table) throw new Error(`spectrum.file: ${s.file} has not been read (load the job with loadJobFile, which reads the files a job names)`);
  return { kind: 'table', file: s.file!, wavelengths: s.table.wavelengths, density: s.table.density };
}

/** The case's light: flat light as given, or curved light (a source) with the flat light that stands in for it. */
function curvedLight(job: JobSpec, value: (key: string) => number): { illumination: Illumination; source?: CaseSource } {
  const ill = job.illumination;
  let source: CaseSource | null = null;
  if (ill.kind === 'point') source = { kind: 'point', distance: value('illumination.distance'), at: ill.at };
  if (ill.kind === 'points') {
    const far = ill.distance === undefined;
    source = { kind: 'points', distance: far ? null : value('illumination.distance'), points: ill.points.map((p) => ({ at: (far ? p.angle : p.at) ?? [0, 0], power: p.power })) };
  }
  if (ill.kind === 'extended') source = { kind: 'extended', shape: ill.shape, size: ill.size, distance: value('illumination.distance'), at: ill.at };
  if (ill.kind === 'gaussian' && ill.waist_distance) source = { kind: 'gaussian', waist: value('illumination.waist'), waistDistance: value('illumination.waist_distance'), tilt: ill.tilt };
  if (!source) return { illumination: resolveIllumination(job, value) };
  return { illumination: flatIllumination(source, value('wavelength')), source };
}

/** The light order sorting considers: the job's wavelengths from lowest to highest, or the used range itself for one wavelength. */
function useLight(wavelengths: number[], use: { from: number; to: number }): [number, number] {
  return wavelengths.length > 1 ? [wavelengths.reduce((a, b) => Math.min(a, b)), wavelengths.reduce((a, b) => Math.max(a, b))] : [use.from, use.to];
}

function resolveIllumination(job: JobSpec, value: (key: string) => number): Illumination {
  const ill = job.illumination;
  if (ill.kind === 'point' || ill.kind === 'points' || ill.kind === 'extended') throw new Error('a source is resolved by curvedLight');
  if (ill.kind === 'plane') return { kind: 'plane', tilt: ill.tilt };
  return { kind: 'gaussian', waist: value('illumination.waist'), tilt: ill.tilt };
}
