// A slit (without a length: infinitely long along y, a 1-D problem) or, opaque, a strip (a wire).
import { z } from 'zod';
import { opaque, sweepLength } from '../job/quantities.js';
import { sizeWords } from '../optics/geometry.js';
import type { ElementKind } from './types.js';

export interface Slit {
  shape: 'slit';
  width: number;
  length?: number;
  opaque: boolean;
}

const schema = z.strictObject({ shape: z.literal('slit'), width: sweepLength(), length: sweepLength().optional(), opaque });

export const slit: ElementKind<Slit, typeof schema> = {
  shape: 'slit',
  schema,
  tokens: { width: 'w', length: 'len' },
  resolve: (job, v) => ({ shape: 'slit', width: v('width'), ...(job.length ? { length: v('length') } : {}), opaque: job.opaque }),
  geometry: (s) => ({ kind: 'separable', x: { kind: 'interval', width: s.width }, y: s.length ? { kind: 'interval', width: s.length } : null }),
  boundary: (s) => (s.length ? [{ kind: 'rect', x0: -s.width / 2, x1: s.width / 2, y0: -s.length / 2, y1: s.length / 2, sign: 1 }] : null),
  verdictWidth: (s, axis) => (axis === 'x' ? s.width : axis === 'y' ? (s.length ?? null) : null),
  sizeSearch: {
    words: 'a (long) slit',
    applies: (job) => !job.length,
    key: 'width',
    axis: 'x',
    withSize: (s, size) => ({ ...s, width: size }),
    textbook: (lam, z) => Math.sqrt(2 * lam * z),
  },
  describe: (s) =>
    s.opaque
      ? `opaque strip (wire), width ${sizeWords(s.width)}${s.length ? `, length ${sizeWords(s.length)}` : ''}`
      : `slit, width ${sizeWords(s.width)}${s.length ? `, length ${sizeWords(s.length)}` : ' (infinitely long along y)'}`,
};
