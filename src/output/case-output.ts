// Everything written for one case. The case folder is assembled under a temporary name and renamed
// into place when complete, so a case folder either holds a whole result or does not exist.
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { createHash, randomBytes } from 'node:crypto';
import { describe } from '../optics/aperture.js';
import { formatLength } from '../job/units.js';
import type { SpotMetrics } from '../analysis/metrics.js';
import { isOneD, pitchPair, xAt, yAt } from '../model/grid.js';
import { profileCol, profileRow, type IntensityMap } from '../model/intensity-map.js';
import type { GratingOrder, OmittedOrders } from '../analysis/orders.js';
import { metricsWithAnswers, ordersWithAnswers, type GratingUse } from '../analysis/grating-answers.js';
import type { OrderCheck, StrayLight } from '../analysis/order-checks.js';
import type { Verdict } from '../analysis/verdict.js';
import type { EnergyCurve } from '../analysis/encircled.js';
import type { Plan, Warning } from '../plan/types.js';
import type { ComputedCase } from '../run/compute.js';
import { safeJoin, writeError } from './atomic.js';
import { toCsv } from './csv.js';
import { encodeNpy } from './npy.js';
import { renderIntensityPngs } from './picture.js';
import { TOOL_NAME, TOOL_VERSION } from '../version.js';
import { metricDefinitions } from '../metrics/registry.js';
import type { LensStrehl } from '../metrics/strehl.js';
import type { PlaneResult } from '../metrics/planes.js';
import type { SpatialFilterResult } from '../metrics/spatial-filter.js';
import type { MtfCurve, MtfSummary } from '../analysis/mtf.js';
import type { LineOrders, LinePair } from '../analysis/line-pairs.js';
import type { ColourMaps, LineMap } from '../run/spectrum-case.js';
import { mtfCsv, renderMtfPng } from './mtf-files.js';
import { lineMapName, spectrumFileEntries, spectrumFiles } from './spectrum-files.js';
import { detectorFileEntries, detectorFiles } from './detector-files.js';
import type { DetectorSignal, SpectrometerMetrics } from '../metrics/spectrometer.js';
import type { TwoPointResult } from '../analysis/two-points.js';
import { energyPicture, hasEnergyPicture, hasSearchPicture, profilePicture, searchPicture, zoomBoxOf, zoomPicture } from './extra-pictures.js';

export interface CaseMetrics extends SpotMetrics {
  /** ∫ irradiance over the open area (null for opaque obstacles). */
  powerThroughAperture: number | null;
  /** For opaque obstacles: the incident power they block. */
  powerBlocked?: number;
  /** powerInWindow / powerThroughAperture (null for opaque obstacles). */
  windowFraction: number | null;
  /**
   * Encircled energy about the centroid (2-D: radii; 1-D: half-widths of a strip), as fractions of
   * the power through the aperture; null for obstacles in a plane wave (no finite total).
   */
  encircled: { centre: [number, number]; radius50: number | null; radius84: number | null; radius90: number | null } | null;
  /** The detectors the job names, each as a fraction of its `reference` power. */
  detectors: DetectorResult[];
  /**
   * Grating orders (slits): every order that lands (propagating or outside-window), and the
   * evanescent ones out to where thin-grating theory gives them under 0.1 % of the transmitted
   * power (at least the first on each side). See analysis/orders.ts for the two power measures.
   */
  orders?: GratingOrder[];
  /** Runs of orders wholly outside the window left out of `orders` (gratings with thousands of orders). */
  ordersOmitted?: OmittedOrders[];
  /** Gratings: fraction of the power through the slits that thin-grating theory sends into evanescent orders (all of them). */
  evanescentFraction?: number;
  /**
   * Gratings: the case-level spectroscopy answers (analysis/grating-answers.ts: the sign convention,
   * the effective count of lit periods, the focal length, order sorting). Added where result.json,
   * orders.csv and the report are written, with each order's resolving power, smallest resolvable
   * Δλ, focal-plane dispersion and Littrow angle.
   */
  spectroscopy?: GratingUse;
  /** Gratings: the orders the consistency checks compared with the grating equation and thin-grating theory. */
  orderChecks?: OrderCheck[];
  /** Gratings: peaks of light away from every order that lands (see analysis/order-checks.ts). */
  strayLight?: StrayLight[];
  /** Diffraction-limited verdicts (circles, slits, rectangles in a plane wave). */
  verdicts?: Verdict[];
  /** A converging lens with the screen within its focal depth: the Strehl ratio and its verdict (metrics/strehl.ts). */
  strehl?: LensStrehl;
  /** Planes in sequence: what each plane passes (metrics/planes.ts). */
  planes?: PlaneResult[];
  /** A converging lens with the screen within its focal depth: the spot's 1/e² diameter and the pinholes for it (metrics/spatial-filter.ts). */
  spatialFilter?: SpatialFilterResult;
  /** The same lens cases: the MTF of the computed PSF, in summary (analysis/mtf.ts; the curve is mtf.csv). */
  mtf?: MtfSummary;
  /** Light of several wavelengths (the job's spectrum): the lines computed and how they were added. */
  spectrum?: SpectrumMetrics;
  /** A grating in light of several wavelengths: each line's order table (line-orders.csv). */
  lineOrders?: LineOrders[];
  /** Close pairs of lines in each order: resolved or not on the computed pattern (analysis/line-pairs.ts). */
  linePairs?: LinePair[];
  /** The job's spectrometer: the detector's answers (metrics/spectrometer.ts; the signal is detector.csv). */
  spectrometer?: SpectrometerMetrics;
  /** Two incoherent points: the dip between their patterns, Rayleigh's and Sparrow's verdicts (analysis/two-points.ts). */
  twoPoints?: TwoPointResult;
}

export interface SpectrumMetrics {
  light: string;
  normalisation: string;
  samples: { own: number; needed: number | null; used: number };
  lines: { wavelength: number; weight: number; method: string; form?: string }[];
}

/**
 * A detector's reading. `reference` says what `fraction` is relative to: the power through the
 * aperture, or — behind an opaque obstacle, where that power is infinite in a plane wave — the
 * power the same detector would receive with nothing in the way (plane wave: its area × 1;
 * Gaussian beam: the unobstructed beam's intensity integrated over it).
 */
export interface DetectorResult {
  kind: 'pinhole' | 'square';
  size: number;
  at: [number, number];
  /** Power on the part of the detector inside the window / reference power; null when the detector is wholly outside the window. */
  fraction: number | null;
  reference: 'power-through-aperture' | 'unobstructed-beam';
  /** The reference power (W per unit incident irradiance; per metre along y in 1-D). */
  referencePower: number;
  /** Fraction of the detector's area (1-D: width) inside the window; below 1 the fraction is a lower bound. */
  areaInWindow: number;
}

/** What a finished case leaves for the job: small, serialisable, stored as record.json. */
export interface CaseSummary {
  plan: Plan;
  metrics: CaseMetrics;
  warnings: Warning[];
  seconds: number;
  /** Results of the job's search, when it asked for one. */
  search?: SmallestSpot;
}

export interface CaseRecord extends CaseSummary {
  computed: ComputedCase;
  /** Several wavelengths: the CIE 1931 tristimulus maps behind colour.png. */
  colour?: ColourMaps;
  /** Several wavelengths with output.lineMaps: each wavelength's own map (line-<λ>.npy). */
  lineMaps?: LineMap[];
  /** The encircled-energy curve behind metrics.encircled (written as a CSV). */
  energy: EnergyCurve | null;
  /** The MTF curve behind metrics.mtf (written as mtf.csv and mtf.png). */
  mtf?: MtfCurve;
  /** The spectrometer's signal per pixel behind metrics.spectrometer (detector.csv, detector.png). */
  detector?: DetectorSignal;
}

export interface SmallestSpot {
  measure: 'energy' | 'fwhm' | 'd4sigma';
  /** What was varied: the circle's diameter or the slit's width. */
  key: string;
  best: number;
  bestMeasure: number;
  textbook: number;
  textbookMeasure: number | null;
  method: string;
  evaluations: number;
  /** Every size evaluated and its spot, in order of size ([size, spot] in metres). */
  samples?: [number, number][];
}

export const CASE_FILES = {
  intensity: 'intensity.npy',
  result: 'result.json',
  picture: 'intensity.png',
  pictureGray: 'intensity-gray.png',
  profileX: 'profile-x.csv',
  profileY: 'profile-y.csv',
  orders: 'orders.csv',
  energy: 'encircled-energy.csv',
  mtf: 'mtf.csv',
  mtfPlot: 'mtf.png',
  /** The profile as a line plot (a 2-D result's row through its peak; output/extra-pictures.ts). */
  profilePlot: 'profile.png',
  /** A 2-D result's spot (or the region output.zoom asks for) at its own scale. */
  zoom: 'intensity-zoom.png',
  /** The smallest-spot search: spot against size, the optimum and the textbook size marked. */
  searchPlot: 'smallest-spot.png',
  /** 2-D results: the encircled-energy curve, with the Airy pattern's for a plainly lit circle. */
  energyPlot: 'encircled-energy.png',
  /**
   * The case's summary, the hash of what made it, and the size and SHA-256 digest of every other
   * file of the case; written last, it marks a complete case (run/records.ts verifies it).
   */
  record: 'record.json',
} as const;

/** Files every complete case has, whatever its record lists (a record that omits one is not trusted). */
export const REQUIRED_CASE_FILES: readonly string[] = [
  CASE_FILES.intensity,
  CASE_FILES.result,
  CASE_FILES.picture,
  CASE_FILES.pictureGray,
  CASE_FILES.profileX,
];

/** A file of a case as its record holds it. */
export interface FileDigest {
  size: number;
  /** SHA-256 of the file's bytes, hex. */
  sha256: string;
  /**
   * Files above FULL_DIGEST_MAX: SHA-256 of their first and last EDGE_BYTES, which a rerun checks
   * instead of reading the whole file (see run/records.ts for why).
   */
  ends?: string;
}

/** Files up to this size are digested whole when a rerun verifies them; larger ones by size and ends. */
export const FULL_DIGEST_MAX = 16 * 1024 ** 2;
export const EDGE_BYTES = 1024 ** 2;

export function digestOf(data: Uint8Array): FileDigest {
  const d: FileDigest = { size: data.byteLength, sha256: createHash('sha256').update(data).digest('hex') };
  if (data.byteLength > FULL_DIGEST_MAX) {
    d.ends = createHash('sha256').update(data.subarray(0, EDGE_BYTES)).update(data.subarray(data.byteLength - EDGE_BYTES)).digest('hex');
  }
  return d;
}

export function caseTitle(plan: Plan): string {
  const c = plan.case;
  const beam = c.illumination.kind === 'gaussian' ? ` · beam w0 ${formatLength(c.illumination.waist, 3)}` : '';
  // (Plain text: the pictures' font has no arrows.)
  const planes = (c.planes ?? []).map((p) => `; ${formatLength(p.after, 4)} on, ${describe(p.aperture)}`).join("");
  return `${describe(c.aperture)}${planes}${beam} · ${formatLength(c.wavelength, 4)} · z = ${formatLength(c.distance, 4)}${planes ? ' (from the last plane)' : ''}`;
}

/** result.json; `zoomed`: whether the case writes intensity-zoom.png (computed here when not given). */
/** A per-metre-of-wavelength rate per nanometre (null stays null). */
const perNm = (v: number | null | undefined) => (v === null || v === undefined ? null : v * 1e-9);

export function resultJson(rec: CaseRecord, zoomed?: boolean): Record<string, unknown> {
  const { plan, computed, metrics } = rec;
  const c = plan.case;
  return {
    tool: { name: TOOL_NAME, version: TOOL_VERSION },
    job: c.job,
    case: c.id,
    index: c.index,
    wavelength: c.wavelength,
    distance: c.distance,
    pixelPitch: pitchPair(computed),
    center: computed.center,
    shape: [computed.ny, computed.nx],
    origin: [computed.x0, computed.y0],
    units: 'SI: lengths in metres, angles in radians, intensity relative to the incident irradiance (1)',
    definitions: METRIC_DEFINITIONS,
    fresnelNumber: Math.max(plan.checks.fresnelNumbers[0], plan.checks.fresnelNumbers[1] ?? 0),
    regime: plan.regime,
    method: plan.method,
    ...(plan.form ? { form: plan.form } : {}),
    layout: plan.layout,
    babinet: plan.babinet,
    reasons: plan.reasons,
    warnings: rec.warnings,
    metrics: metricsWithAnswers(plan, metrics),
    checks: plan.checks,
    diagnostics: computed.diagnostics,
    sampling: {
      x: axisJson(plan.x),
      y: plan.y ? axisJson(plan.y) : null,
      memoryEstimateBytes: plan.memoryBytes,
    },
    parameters: {
      aperture: c.aperture,
      ...(c.planes ? { planes: c.planes } : {}),
      // With curved light `illumination` is the flat light standing in for it; the source is what
      // the job gave.
      ...(c.source ? { source: c.source, illuminationStandIn: c.illumination } : { illumination: c.illumination }),
      ...(c.spectrum ? { spectrum: c.spectrum } : {}),
      ...(c.analysis.spectrometer ? { spectrometer: c.analysis.spectrometer } : {}),
      methodRequested: c.method,
      window: c.window ?? null,
      grid: c.grid ?? null,
      swept: c.swept,
    },
    files: Object.fromEntries([
      ...Object.entries(CASE_FILES).filter(([k]) =>
        k === 'profileY'
          ? !isOneD(computed)
          : k === 'orders'
            ? !!metrics.orders
            : k === 'energy'
              ? !!rec.energy
              : k === 'mtf' || k === 'mtfPlot'
                ? !!(rec.mtf && metrics.mtf)
                : k === 'zoom'
                    ? (zoomed ?? zoomBoxOf(plan, computed) !== null)
                    : k === 'searchPlot'
                      ? hasSearchPicture(rec.search)
                      : k === 'energyPlot'
                        ? hasEnergyPicture(rec.energy, isOneD(computed))
                      : k !== 'record',
      ),
      ...spectrumFileEntries(!!rec.colour, !!metrics.lineOrders?.length, !!metrics.linePairs),
      ...(rec.lineMaps ?? []).map((l, i, all): [string, string] => [lineMapName(i, all.length, l.wavelength), lineMapName(i, all.length, l.wavelength)]),
      ...(metrics.spectrometer ? detectorFileEntries(rec.detector) : []),
    ]),
    ...(rec.search ? { search: rec.search } : {}),
    seconds: rec.seconds,
    note: 'Scalar-diffraction model of an idealised part; not a laser-hazard assessment (see the README).',
  };
}

/**
 * What the less obvious metrics in result.json are, in words (written into every result.json):
 * each metric family's definitions, in registry order (metrics/registry.ts).
 */
export const METRIC_DEFINITIONS: Readonly<Record<string, string>> = metricDefinitions();

function axisJson(a: Plan['x']) {
  return {
    inputPitch: a.inputPitch,
    inputSamples: a.inputSamples,
    paddedSamples: a.paddedSamples,
    outputSamples: a.output.n,
    outputPitch: a.output.step,
    windowHalfWidth: a.windowHalf,
    windowCentre: a.windowCentre,
    pitchRule: a.pitchRule,
  };
}

function profileCsv(map: IntensityMap, axis: 'x' | 'y', row: number, col: number): string {
  if (axis === 'x') {
    const p = profileRow(map, row);
    return toCsv(['x_m', 'intensity'], Array.from(p, (v, i) => [xAt(map, i), v]));
  }
  const p = profileCol(map, col);
  return toCsv(['y_m', 'intensity'], Array.from(p, (v, i) => [yAt(map, i), v]));
}

/** The summary part of a record: everything but the field. */
export function summaryOf(rec: CaseRecord): CaseSummary {
  return {
    plan: rec.plan,
    metrics: rec.metrics,
    warnings: rec.warnings,
    seconds: rec.seconds,
    ...(rec.search ? { search: rec.search } : {}),
  };
}

export interface StoredRecord extends CaseSummary {
  /** Hash of the case's parameters and the tool version (see run/records.ts). */
  hash: string;
  tool: string;
  /**
   * Every other file of the case folder (file name → size and digest). Records of earlier versions
   * have none: their cases are not trusted and are computed again.
   */
  files?: Record<string, FileDigest>;
}

/**
 * Writes a case into jobDir/<case id>/, replacing an older result only once the new one is whole.
 * The files go into a fresh temporary folder, each written once (flag wx: a folder removed or
 * replaced under us fails the write rather than being silently re-made with some files missing),
 * and record.json, written last, holds every file's size and digest.
 */
export async function writeCase(jobDir: string, rec: CaseRecord, hash = ''): Promise<string> {
  const { plan, computed } = rec;
  const final = await safeJoin(jobDir, plan.case.id);
  const tmp = await safeJoin(jobDir, `.${plan.case.id}.partial-${randomBytes(4).toString('hex')}`);
  try {
    await mkdir(tmp);
  } catch (e) {
    throw writeError(e, final, jobDir);
  }
  const files: Record<string, FileDigest> = {};
  // Each file's write goes out at once and the next file is made while it is under way (the pictures
  // take tens of milliseconds to draw); all are awaited before record.json, which is written last.
  const writes: Promise<void>[] = [];
  const put = (name: string, content: string | Uint8Array) => {
    const data = typeof content === 'string' ? Buffer.from(content, 'utf8') : content;
    if (name !== CASE_FILES.record) files[name] = digestOf(data);
    const w = writeFile(join(tmp, name), data, { flag: 'wx' }).catch((e: unknown) => {
      throw writeError(e, join(final, name), jobDir);
    });
    // Awaited with the others (allWritten); this keeps an early failure from counting as unhandled.
    w.catch(() => undefined);
    writes.push(w);
  };
  /** Every write so far, settled; the first failure (in file order) thrown. */
  const allWritten = async () => {
    const settled = await Promise.allSettled(writes.splice(0));
    const failed = settled.find((r): r is PromiseRejectedResult => r.status === 'rejected');
    if (failed) throw failed.reason;
  };
  try {
    const map: IntensityMap = computed;
    const shape = [computed.ny, computed.nx];
    put(CASE_FILES.intensity, encodeNpy(computed.intensity, shape, plan.case.output.npy));
    // Profiles through the optical axis when it is in the window, else through the window centre.
    const row = clampIndex(Math.round(computed.center[1]), computed.ny);
    const col = clampIndex(Math.round(computed.center[0]), computed.nx);
    put(CASE_FILES.profileX, profileCsv(map, 'x', row, col));
    if (!isOneD(computed)) put(CASE_FILES.profileY, profileCsv(map, 'y', row, col));
    if (rec.metrics.orders) {
      put(CASE_FILES.orders, ordersCsv(ordersWithAnswers(plan, rec.metrics.orders), rec.metrics.evanescentFraction, rec.metrics.ordersOmitted));
    }
    if (rec.energy) {
      const head = isOneD(computed) ? 'half_width_m' : 'radius_m';
      put(
        CASE_FILES.energy,
        toCsv([head, 'fraction_of_power_through_aperture'], Array.from(rec.energy.radius, (r, i) => [r, rec.energy!.fraction[i]!])),
      );
    }
    if (rec.mtf && rec.metrics.mtf) {
      put(CASE_FILES.mtf, mtfCsv(rec.mtf));
      put(CASE_FILES.mtfPlot, renderMtfPng(rec.mtf, rec.metrics.mtf, caseTitle(plan)));
    }
    const picture = {
      map,
      logDecades: plan.case.output.logDecades,
      title: caseTitle(plan),
    };
    const [shoal, gray] = renderIntensityPngs(picture, ['shoal', 'gray']);
    put(CASE_FILES.picture, shoal!);
    put(CASE_FILES.pictureGray, gray!);
    const profile = profilePicture(plan, map, picture.title);
    if (profile) put(CASE_FILES.profilePlot, profile);
    const zoom = zoomPicture(plan, map, picture.title);
    if (zoom) put(CASE_FILES.zoom, zoom);
    const search = rec.search ? searchPicture(rec.search, picture.title) : null;
    if (search) put(CASE_FILES.searchPlot, search);
    const energy = energyPicture(plan, rec.energy, isOneD(computed), picture.title);
    if (energy) put(CASE_FILES.energyPlot, energy);
    for (const [name, content] of spectrumFiles(map, rec.colour, rec.metrics.lineOrders, rec.metrics.linePairs, picture.title, picture.logDecades)) put(name, content);
    if (rec.detector && rec.metrics.spectrometer) for (const [name, content] of detectorFiles(rec.detector, rec.metrics.spectrometer, picture.title)) put(name, content);
    (rec.lineMaps ?? []).forEach((l, i, all) => put(lineMapName(i, all.length, l.wavelength), encodeNpy(l.intensity, shape, plan.case.output.npy)));
    put(CASE_FILES.result, JSON.stringify(resultJson(rec, zoom !== null), jsonNumbers, 2) + '\n');
    const stored: StoredRecord = { ...summaryOf(rec), hash, tool: TOOL_VERSION, files };
    await allWritten();
    put(CASE_FILES.record, JSON.stringify(stored, jsonNumbers) + '\n');
    await allWritten();
    await replaceDir(tmp, final);
  } catch (e) {
    // No write of this case may still be under way when its folder is removed.
    await Promise.allSettled(writes);
    await rm(tmp, { recursive: true, force: true });
    throw e;
  }
  return final;
}

function clampIndex(i: number, n: number): number {
  return Math.min(n - 1, Math.max(0, Number.isFinite(i) ? i : Math.floor(n / 2)));
}

async function replaceDir(tmp: string, final: string): Promise<void> {
  try {
    await rename(tmp, final);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code !== 'ENOTEMPTY' && code !== 'EEXIST') throw e;
    // An older result is in the way: move it aside first so that one of the two is always whole.
    const old = `${final}.old-${randomBytes(4).toString('hex')}`;
    await rename(final, old);
    await rename(tmp, final);
    await rm(old, { recursive: true, force: true });
  }
}

/**
 * orders.csv: one row per listed order (see CaseMetrics.orders), then one row per summarised run
 * of orders outside the window, and a last row with m empty and status "all-evanescent" that holds
 * the power of all evanescent orders together (thin-grating theory).
 */
export function ordersCsv(orders: GratingOrder[], evanescentFraction?: number, omitted: OmittedOrders[] = []): string {
  const header = [
    'm',
    'status',
    'outside',
    'sin_angle',
    'angle_rad',
    'position_m',
    'interval_from_m',
    'interval_to_m',
    'centroid_m',
    'fraction_of_transmitted',
    'fraction_of_incident',
    'predicted_fraction',
    'flux_fraction',
    'predicted_flux',
    'resolving_power',
    'separated',
    'angular_dispersion_rad_per_nm',
    'linear_dispersion_mm_per_nm',
    'free_spectral_range_m',
    'smallest_resolvable_m',
    'focal_linear_dispersion_mm_per_nm',
    'littrow_angle_rad',
  ];
  const rows: (string | number | boolean | null)[][] = orders.map((o) => [
    o.m,
    o.status,
    o.outside ?? null,
    o.sinAngle,
    o.angle,
    o.position,
    o.interval ? o.interval[0] : null,
    o.interval ? o.interval[1] : null,
    o.centroid,
    o.fractionOfTransmitted,
    o.fractionOfIncident,
    o.predictedFraction,
    o.fluxFraction,
    o.predictedFlux,
    o.resolvingPower,
    o.propagates ? o.separated : null,
    perNm(o.angularDispersion),
    o.linearDispersion === null || o.linearDispersion === undefined ? null : o.linearDispersion * 1e-9 * 1e3,
    o.freeSpectralRange ?? null,
    o.smallestResolvable ?? null,
    o.focalDispersion === null || o.focalDispersion === undefined ? null : o.focalDispersion * 1e-9 * 1e3,
    o.littrowAngle ?? null,
  ]);
  for (const r of omitted) {
    rows.push([`${r.from}..${r.to}`, r.status, r.outside, null, null, null, null, null, null, null, null, r.predictedFraction, null, null, null, null, null, null, null, null, null, null]);
  }
  if (evanescentFraction !== undefined) {
    rows.push([null, 'all-evanescent', null, null, null, null, null, null, null, 0, null, evanescentFraction, 0, 0, null, null, null, null, null, null, null, null]);
  }
  return toCsv(header, rows);
}

/** JSON has no Infinity or NaN: write them as null rather than failing. */
export function jsonNumbers(_key: string, v: unknown): unknown {
  return typeof v === 'number' && !Number.isFinite(v) ? null : v;
}
