// A thin grating of any profile (count periods centred on the axis, lines along y; without a length
// infinitely long, a 1-D problem): sinusoidal amplitude, sinusoidal phase, binary phase (any duty
// and step), blazed (a sawtooth phase of a given depth in waves), or binary amplitude. Its
// transmittance is complex, sampled as exact cell averages (optics/grating-profile.ts); every
// order's share of the power follows from the profile's Fourier coefficients (thin-grating theory,
// Goodman, Introduction to Fourier Optics, §4.4 and ch. 7).
import { z } from 'zod';
import { quantity, sweepCount, sweepLength, SLIT_COUNT_MAX } from '../job/quantities.js';
import type { Axis } from '../optics/field.js';
import { sizeWords } from '../optics/geometry.js';
import { describeProfile, gratingCellAverages, SINUSOIDAL_PHASE_MAX, type GratingProfile } from '../optics/grating-profile.js';
import { gratingPowerAverages } from '../optics/grating-transform.js';
import { sampleProfile } from '../optics/mask-cells.js';
import type { CellTransmittance, ElementKind } from './types.js';

export interface Grating {
  shape: 'grating';
  profile: GratingProfile;
  count: number;
  period: number;
  length?: number;
  opaque: boolean;
  /**
   * A reflection grating: the light is diffracted back to the incidence side. Unfolded about the
   * grating's plane, the field just off a thin reflection grating is its reflectance profile times
   * the incident wave, so it is computed as a transmission grating under the same tilt, the orders
   * given unfolded (analysis/grating-answers.ts states the convention). Absent for transmission.
   */
  reflective?: true;
}

export const PROFILES = ['sinusoidal-amplitude', 'sinusoidal-phase', 'binary-phase', 'blazed', 'binary-amplitude'] as const;

const fraction = (what: string) =>
  z.number({ error: `expected ${what}, a number between 0 and 1` }).gt(0, { error: `expected ${what}, a number between 0 and 1` }).lt(1, { error: `expected ${what}, a number between 0 and 1` });
const phase = quantity('angle', { absMax: SINUSOIDAL_PHASE_MAX, range: `a phase of at most ${SINUSOIDAL_PHASE_MAX} rad` });

const schema = z.strictObject({
  shape: z.literal('grating'),
  profile: z.enum(PROFILES, { error: `expected a profile: one of ${PROFILES.join(', ')}` }),
  period: sweepLength(),
  count: sweepCount(1, SLIT_COUNT_MAX),
  length: sweepLength().optional(),
  /** Sinusoidal amplitude: t = ½ + (contrast/2)·cos(2πx/d), 0 < contrast ≤ 1. */
  contrast: z.number({ error: 'expected a contrast between 0 and 1' }).gt(0, { error: 'expected a contrast between 0 and 1' }).max(1, { error: 'expected a contrast between 0 and 1' }).optional(),
  /** Sinusoidal phase: the peak-to-peak phase; binary phase: the step (default half a wave). */
  phase: phase.optional(),
  /** Binary phase and binary amplitude: the fraction of each period that is stepped (or open). */
  duty: fraction('a duty cycle').optional(),
  /**
   * Blazed: the sawtooth's depth, in waves (a number: the same at every wavelength of a sweep) or
   * as an optical path (a length, (n − 1)·height: depth/λ waves at each wavelength, as a real part
   * behaves). 1 wave sends all the light into order 1 in thin-grating theory.
   */
  depth: z
    .union([
      z.number().min(-1000).max(1000).transform((w) => ({ waves: w })),
      quantity('length', { absMax: 1e-3, range: 'an optical path of at most 1 mm' }).transform((p) => ({ path: p })),
    ], { error: "expected a depth in waves (a number such as 1) or as an optical path (a length such as '633 nm')" })
    .optional(),
  opaque: z.literal(false, { error: 'expected no opaque gratings (a grating of opaque lines is the slits element)' }).default(false),
  /**
   * true: a reflection grating. A blazed depth given as a length is then the groove depth h, an
   * optical path 2h·cos θ_i (the path difference of light reflected at the top and the bottom of a
   * groove, k·h·(cos θ_i + cos θ_m), taken where the order leaves along the specular or the Littrow
   * direction, cos θ_m = cos θ_i; Palmer, Diffraction Grating Handbook, ch. 9, from memory); a depth
   * in waves and a phase are the phase itself, as for transmission.
   */
  reflective: z.boolean({ error: 'expected true (a reflection grating) or false (transmission, the default)' }).optional(),
});
type Job = z.output<typeof schema>;

/** The keys each profile takes (beyond shape, profile, period, count, length). */
const PROFILE_KEYS: Record<(typeof PROFILES)[number], { needs: (keyof Job)[]; may: (keyof Job)[] }> = {
  'sinusoidal-amplitude': { needs: ['contrast'], may: [] },
  'sinusoidal-phase': { needs: ['phase'], may: [] },
  'binary-phase': { needs: [], may: ['phase', 'duty'] },
  blazed: { needs: ['depth'], may: [] },
  'binary-amplitude': { needs: ['duty'], may: [] },
};

function profileOf(job: Job, wavelength: number, cosIncidence = 1): GratingProfile {
  switch (job.profile) {
    case 'sinusoidal-amplitude':
      return { kind: 'sinusoidal-amplitude', modulation: job.contrast! };
    case 'sinusoidal-phase':
      return { kind: 'sinusoidal-phase', modulation: Math.abs(job.phase!) };
    case 'binary-phase':
      return { kind: 'binary-phase', duty: job.duty ?? 0.5, step: job.phase ?? Math.PI };
    case 'blazed':
      return { kind: 'blazed', depth: 'waves' in job.depth! ? job.depth.waves : (job.depth!.path * (job.reflective ? 2 * cosIncidence : 1)) / wavelength };
    case 'binary-amplitude':
      return { kind: 'binary-amplitude', duty: job.duty! };
  }
}

/** The profile with its phase multiplied by f (amplitude profiles as they are). */
function phaseScaled(p: GratingProfile, f: number): GratingProfile {
  if (p.kind === 'sinusoidal-phase') return { ...p, modulation: p.modulation * f };
  if (p.kind === 'binary-phase') return { ...p, step: p.step * f };
  if (p.kind === 'blazed') return { ...p, depth: p.depth * f };
  return p;
}

function transmittance(s: Grating, xa: Axis, ya: Axis): CellTransmittance {
  const tx = gratingCellAverages(s.profile, s.period, s.count, xa);
  const wx = gratingPowerAverages(s.profile, s.period, s.count, xa, tx);
  const fy = s.length ? sampleProfile({ kind: 'interval', width: s.length }, ya) : new Float64Array(ya.n).fill(1);
  const t = new Float64Array(2 * xa.n * ya.n);
  const weight = new Float64Array(xa.n * ya.n);
  for (let r = 0; r < ya.n; r++) {
    const f = fy[r]!;
    if (f === 0) continue;
    for (let c = 0; c < xa.n; c++) {
      const k = r * xa.n + c;
      t[2 * k] = tx[2 * c]! * f;
      t[2 * k + 1] = tx[2 * c + 1]! * f;
      weight[k] = wx[c]! * f;
    }
  }
  return { t, weight };
}

export const grating: ElementKind<Grating, typeof schema> = {
  shape: 'grating',
  schema,
  tokens: { period: 'p', count: 'n', length: 'len' },
  counts: ['count'],
  check(job, problem) {
    const keys = PROFILE_KEYS[job.profile];
    for (const k of keys.needs) if (job[k] === undefined) problem(k, `missing: a ${job.profile} grating needs ${k}`);
    for (const k of ['contrast', 'phase', 'duty', 'depth'] as const) {
      if (job[k] !== undefined && !keys.needs.includes(k) && !keys.may.includes(k)) problem(k, `expected no ${k}: a ${job.profile} grating does not take it (it takes ${[...keys.needs, ...keys.may].join(', ') || 'none of contrast, phase, duty, depth'})`);
    }
    if (job.profile === 'sinusoidal-phase' && job.phase === 0) problem('phase', 'expected a phase modulation above 0');
  },
  resolve: (job, v, context) => ({
    shape: 'grating',
    profile: profileOf(job, context.wavelength, context.cosIncidence),
    count: v('count'),
    period: v('period'),
    ...(job.length ? { length: v('length') } : {}),
    opaque: false,
    ...(job.reflective ? { reflective: true as const } : {}),
  }),
  // A phase profile is a fixed optical path (a relief or an index step, its dispersion neglected):
  // met by another wavelength its phase goes as 1/λ. Amplitude profiles are the same at every one.
  atWavelength: (s, from, to) => ({ ...s, profile: phaseScaled(s.profile, from / to) }),
  geometry: (s) => ({
    kind: 'separable',
    x: { kind: 'periodic', count: s.count, period: s.period, profile: s.profile },
    y: s.length ? { kind: 'interval', width: s.length } : null,
  }),
  transmittance,
  describe: (s) => `${s.reflective ? 'reflection grating: ' : ''}${describeProfile(s.profile)}, ${s.count} periods of ${sizeWords(s.period)}${s.length ? `, length ${sizeWords(s.length)}` : ' (lines infinitely long along y)'}`,
};
