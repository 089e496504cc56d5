// A grating of equal slits (count, width, period; without a length the lines are infinitely long
// along y), or, opaque, a grating of equal bars.
import { z } from 'zod';
import { opaque, sweepCount, sweepLength, SLIT_COUNT_MAX } from '../job/quantities.js';
import { sizeWords } from '../optics/geometry.js';
import type { BoundaryRegion } from '../optics/rs-boundary.js';
import type { ElementKind } from './types.js';

export interface Slits {
  shape: 'slits';
  count: number;
  width: number;
  period: number;
  length?: number;
  opaque: boolean;
}

const schema = z.strictObject({
  shape: z.literal('slits'),
  count: sweepCount(1, SLIT_COUNT_MAX),
  width: sweepLength(),
  period: sweepLength(),
  length: sweepLength().optional(),
  opaque,
});

export const slits: ElementKind<Slits, typeof schema> = {
  shape: 'slits',
  schema,
  tokens: { count: 'n', width: 'w', period: 'p', length: 'len' },
  counts: ['count'],
  check(job, problem) {
    let maxWidth = -Infinity;
    for (const v of job.width.values) if (v > maxWidth) maxWidth = v;
    let minPeriod = Infinity;
    for (const v of job.period.values) if (v < minPeriod) minPeriod = v;
    if (maxWidth >= minPeriod) problem('width', 'expected the slit width to be smaller than the period (otherwise the slits merge)');
  },
  resolve: (job, v) => ({
    shape: 'slits',
    count: v('count'),
    width: v('width'),
    period: v('period'),
    ...(job.length ? { length: v('length') } : {}),
    opaque: job.opaque,
  }),
  geometry: (s) => ({
    kind: 'separable',
    x: { kind: 'grating', count: s.count, width: s.width, period: s.period },
    y: s.length ? { kind: 'interval', width: s.length } : null,
  }),
  // The lines at (i − (count − 1)/2)·period, as the mask places them.
  boundary: (s) => {
    if (!s.length) return null;
    const open: BoundaryRegion[] = [];
    const first = -((s.count - 1) / 2) * s.period;
    for (let i = 0; i < s.count; i++) {
      const c = first + i * s.period;
      open.push({ kind: 'rect', x0: c - s.width / 2, x1: c + s.width / 2, y0: -s.length / 2, y1: s.length / 2, sign: 1 });
    }
    return open;
  },
  describe: (s) =>
    `${s.opaque ? 'opaque ' : ''}grating of ${s.count} slits, width ${sizeWords(s.width)}, period ${sizeWords(s.period)}${
      s.length ? `, length ${sizeWords(s.length)}` : ''
    }`,
};
