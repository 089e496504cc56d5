// A circular opening (a pinhole) or, opaque, a disc.
import { z } from 'zod';
import { opaque, sweepLength } from '../job/quantities.js';
import { sizeWords } from '../optics/geometry.js';
import type { ElementKind } from './types.js';

export interface Circle {
  shape: 'circle';
  diameter: number;
  opaque: boolean;
}

const schema = z.strictObject({ shape: z.literal('circle'), diameter: sweepLength(), opaque });

export const circle: ElementKind<Circle, typeof schema> = {
  shape: 'circle',
  schema,
  tokens: { diameter: 'd' },
  resolve: (job, v) => ({ shape: 'circle', diameter: v('diameter'), opaque: job.opaque }),
  geometry: (s) => ({ kind: 'rings', outer: s.diameter / 2, inner: 0 }),
  boundary: (s) => [{ kind: 'disc', radius: s.diameter / 2, sign: 1 }],
  verdictWidth: (s, axis) => (axis === 'radial' ? s.diameter : null),
  sizeSearch: {
    words: 'a circle',
    key: 'diameter',
    axis: 'radial',
    withSize: (s, size) => ({ ...s, diameter: size }),
    textbook: (lam, z) => Math.sqrt(2.44 * lam * z),
  },
  describe: (s) => `${s.opaque ? 'opaque disc' : 'circular aperture'}, diameter ${sizeWords(s.diameter)}`,
};
