// A mask given as an image: a PNG whose grey level is the amplitude transmission (black 0, opaque;
// white 1, open), optionally a second PNG of the same size whose grey level is the phase (grey
// 0…1 → phase-range, 0 to 2π by default), with the pixel pitch in the job:
//
//   aperture: {shape: image, file: 'masks/reticle.png', pitch: '2 um',
//              phase: 'masks/reticle-phase.png', phase-range: ['0 deg', '180 deg'], center: ['0 um', '0 um']}
//
// Paths are relative to the job file's folder (absolute ones are taken as they are; a path may
// lead outside the job's folder, like any file a person names; special files are refused). The
// image is centred on the optical axis, or on `center`; outside it everything is opaque. Row 0 of
// the image (its top row) lies at the most negative y, as row 0 of intensity.npy and of the
// pictures: the geometric shadow looks like the image. The PNG rules (bit depths, grey + alpha,
// palettes; colour refused) and the size caps are in src/job/grey-png.ts.
//
// Every pixel is a cell of constant complex transmittance, sampled exactly by area
// (optics/image-cells.ts). The element is always treated as non-binary (it declares a
// transmittance: cell averages of t and of |t|²), even when its pixels are only 0 and 1; the
// cost is none (for 0/1 pixels both averages are the open fraction), but an image cannot be an
// obstacle (`opaque: true` is refused: draw the obstacle black on a white image as large as the
// light that reaches it), and no exact-edge form of the exact integral takes it (exactEdges false:
// it is summed as area-sampled cells, which carry the complex source).
import { createHash } from 'node:crypto';
import { z } from 'zod';
import { formatDegrees, position, quantity, sweepLength } from '../job/quantities.js';
import { decodeGreyPng, MAX_IMAGE_BYTES, type GreyImage } from '../job/grey-png.js';
import type { ApertureFacts } from '../optics/geometry.js';
import { sizeWords } from '../optics/geometry.js';
import { imageCellAverages, imageHalfExtent, imageNearestOpen, imageStats, type ImagePlanes, type ImageStats } from '../optics/image-cells.js';
import { safeEcho } from '../safe-text.js';
import type { ElementKind } from './types.js';

/** What the image files held, read and decoded once by the loader. */
export interface ImagePixels {
  width: number;
  height: number;
  /** SHA-256 (hex, 32 digits) of the image files' bytes: it stands for the pixels in JSON. */
  digest: string;
  stats: ImageStats;
  /**
   * 'amplitude' (0…1) and, with a phase image, 'phase' (radians), row-major from the top row. Held
   * in a Map on purpose: structured clone copies a Map whole to the worker threads, while
   * JSON.stringify writes it as {} — so result.json, record.json, the case hash and the shared-
   * spectrum keys carry the digest (and the size) instead of millions of numbers.
   */
  planes: Map<'amplitude' | 'phase', Float32Array>;
}

export interface ImageMask {
  shape: 'image';
  /** The paths as written in the job (for words; the pixels are already read). */
  file: string;
  phaseFile: string | null;
  pitch: number;
  center: [number, number];
  /** Phase at grey 0 and at grey 1 (radians). */
  phaseRange: [number, number];
  opaque: boolean;
  pixels: ImagePixels;
}

/** Longest path accepted (PATH_MAX on Linux). */
const PATH_MAX = 4096;
const pathMsg = "expected the path of a PNG image such as 'masks/reticle.png' (relative to the job file's folder)";
const imagePath = z
  .string({ error: pathMsg })
  .min(1, { error: pathMsg })
  .max(PATH_MAX, { error: `expected a path of at most ${PATH_MAX} characters` })
  // No control characters (NUL cannot be in a path at all; the others would be echoed in messages).
  .refine((t) => !/[\u0000-\u001f\u007f-\u009f]/.test(t), { error: `${pathMsg}, without control characters` });

/** Phases: |φ| ≤ 1000 rad covers any ramp of a few hundred waves. */
const phase = quantity('angle', { absMax: 1000, range: 'a phase within ±1000 rad' });
const rangeMsg = "expected the phases at grey 0 and at grey 1, such as ['0 deg', '360 deg']";

const schema = z.strictObject({
  shape: z.literal('image'),
  file: imagePath,
  pitch: sweepLength(),
  phase: imagePath.optional(),
  'phase-range': z.tuple([phase, phase], { error: rangeMsg }).optional(),
  center: z.tuple([position, position], { error: "expected the image centre [x, y] such as ['0 um', '50 um']" }).default([0, 0]),
  opaque: z.boolean({ error: 'expected true or false' }).default(false),
});

type Job = z.output<typeof schema> & { pixels?: ImagePixels };

const TWO_PI = 2 * Math.PI;

function planes(s: ImageMask): ImagePlanes {
  const amplitude = s.pixels.planes.get('amplitude');
  if (!amplitude) throw new Error(`aperture.file: the pixels of '${safeEcho(s.file, 80)}' are missing from the case`);
  return { width: s.pixels.width, height: s.pixels.height, amplitude, phase: s.pixels.planes.get('phase') ?? null };
}

function facts(s: ImageMask): ApertureFacts {
  const p = planes(s);
  const st = s.pixels.stats;
  const at = { pitch: s.pitch, center: s.center };
  const half = imageHalfExtent(p, st, at);
  return {
    oneD: false,
    separable: false,
    // From the non-zero pixels, not the whole frame: a small opening in a large black image asks
    // for the window (and the grid) of the opening.
    halfExtent: half,
    characteristic: half,
    // The shortest run of equal pixels along a row or a column: edges closer than that exist.
    minFeature: st.minRun * s.pitch,
    openMeasure: st.power * s.pitch * s.pitch,
    edgeMeasure: st.edges * s.pitch,
    nearestOpen: imageNearestOpen(p, st, at),
    exactEdges: false,
    description: describe(s),
  };
}

function describe(s: ImageMask): string {
  const { width: w, height: h } = s.pixels;
  const phaseWords = s.phaseFile
    ? `, phase from '${safeEcho(s.phaseFile, 60)}' (${formatDegrees(s.phaseRange[0])} to ${formatDegrees(s.phaseRange[1])})`
    : '';
  return `image mask '${safeEcho(s.file, 60)}', ${w} × ${h} pixels of ${sizeWords(s.pitch)} (${sizeWords(w * s.pitch)} × ${sizeWords(h * s.pitch)})${phaseWords}`;
}

const readAs = { maxBytes: MAX_IMAGE_BYTES, noun: 'a PNG image' };

export const image: ElementKind<ImageMask, typeof schema, Job> = {
  shape: 'image',
  schema,
  tokens: { pitch: 'pitch' },
  check(job, problem) {
    if (job.opaque) {
      problem('opaque', 'expected false (an image cannot be an obstacle: its grey levels are already the transmission, so draw the obstacle black on a white image that covers the light)');
    }
    if (job['phase-range'] && !job.phase) problem('phase-range', 'expected a phase image (the phase key) for the range to apply to');
  },
  files: {
    named: (job) => [
      { key: 'file', path: job.file, limits: readAs },
      ...(job.phase ? [{ key: 'phase', path: job.phase, limits: readAs }] : []),
    ],
    attach(job, bytes, problem) {
      const decode = (key: string, path: string): GreyImage | null => {
        try {
          return decodeGreyPng(bytes.get(key)!);
        } catch (e) {
          problem(key, `'${safeEcho(path, 120)}' ${(e as Error).message}`);
          return null;
        }
      };
      const amp = decode('file', job.file);
      const ph = job.phase ? decode('phase', job.phase) : null;
      if (!amp || (job.phase && !ph)) return job;
      if (ph && (ph.width !== amp.width || ph.height !== amp.height)) {
        problem('phase', `'${safeEcho(job.phase!, 120)}' is ${ph.width} × ${ph.height} pixels: expected the size of the amplitude image, ${amp.width} × ${amp.height}`);
        return job;
      }
      const [p0, p1] = job['phase-range'] ?? [0, TWO_PI];
      let phasePlane: Float32Array | null = null;
      if (ph) {
        phasePlane = new Float32Array(ph.levels.length);
        for (let n = 0; n < phasePlane.length; n++) phasePlane[n] = p0 + ph.levels[n]! * (p1 - p0);
      }
      const p: ImagePlanes = { width: amp.width, height: amp.height, amplitude: amp.levels, phase: phasePlane };
      const stats = imageStats(p);
      if (!stats.box) {
        problem('file', `'${safeEcho(job.file, 120)}' is black everywhere: expected some pixels that pass light (grey level above 0)`);
        return job;
      }
      const h = createHash('sha256').update(bytes.get('file')!);
      if (ph) h.update('\u0000phase\u0000').update(bytes.get('phase')!);
      const planes = new Map<'amplitude' | 'phase', Float32Array>([['amplitude', amp.levels]]);
      if (phasePlane) planes.set('phase', phasePlane);
      return { ...job, pixels: { width: amp.width, height: amp.height, digest: h.digest('hex').slice(0, 32), stats, planes } };
    },
  },
  resolve(job, v) {
    if (!job.pixels) {
      throw new Error(`aperture.file: the image '${safeEcho(job.file, 120)}' has not been read: load the job from its file (loadJobFile), which reads the images it names`);
    }
    return {
      shape: 'image',
      file: job.file,
      phaseFile: job.phase ?? null,
      pitch: v('pitch'),
      center: job.center,
      phaseRange: job['phase-range'] ?? [0, TWO_PI],
      opaque: job.opaque,
      pixels: job.pixels,
    };
  },
  geometry: () => ({ kind: 'sampled' }),
  facts,
  // The power each cell passes (for pixels of 0 and 1 only: the open fraction); the field is the
  // transmittance below.
  mask: (s, xa, ya) => imageCellAverages(planes(s), { pitch: s.pitch, center: s.center }, xa, ya).weight,
  transmittance: (s, xa, ya) => imageCellAverages(planes(s), { pitch: s.pitch, center: s.center }, xa, ya),
  describe,
};
