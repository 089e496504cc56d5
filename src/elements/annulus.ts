// An annular opening (a ring between two diameters) or, opaque, a ring-shaped stop.
import { z } from 'zod';
import { opaque, sweepLength } from '../job/quantities.js';
import { formatLength } from '../job/units.js';
import { sizeWords } from '../optics/geometry.js';
import type { BoundaryRegion } from '../optics/rs-boundary.js';
import type { ElementKind } from './types.js';

export interface Annulus {
  shape: 'annulus';
  outer: number;
  inner: number;
  opaque: boolean;
}

const schema = z.strictObject({ shape: z.literal('annulus'), outer: sweepLength(), inner: sweepLength(), opaque });

export const annulus: ElementKind<Annulus, typeof schema> = {
  shape: 'annulus',
  schema,
  tokens: { outer: 'do', inner: 'di' },
  check(job, problem) {
    let minOuter = Infinity;
    for (const v of job.outer.values) if (v < minOuter) minOuter = v;
    let maxInner = -Infinity;
    for (const v of job.inner.values) if (v > maxInner) maxInner = v;
    if (maxInner >= minOuter) problem('inner', `expected the inner diameter to be smaller than the outer one (${formatLength(minOuter)})`);
  },
  resolve: (job, v) => ({ shape: 'annulus', outer: v('outer'), inner: v('inner'), opaque: job.opaque }),
  geometry: (s) => ({ kind: 'rings', outer: s.outer / 2, inner: s.inner / 2 }),
  boundary: (s) => {
    const open: BoundaryRegion[] = [{ kind: 'disc', radius: s.outer / 2, sign: 1 }];
    if (s.inner > 0) open.push({ kind: 'disc', radius: s.inner / 2, sign: -1 });
    return open;
  },
  describe: (s) => `${s.opaque ? 'opaque ' : ''}annulus, outer ${sizeWords(s.outer)}, inner ${sizeWords(s.inner)}`,
};
