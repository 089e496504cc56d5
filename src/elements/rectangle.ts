// A rectangular opening or, opaque, a rectangular stop.
import { z } from 'zod';
import { opaque, sweepLength } from '../job/quantities.js';
import { sizeWords } from '../optics/geometry.js';
import type { ElementKind } from './types.js';

export interface Rectangle {
  shape: 'rectangle';
  width: number;
  height: number;
  opaque: boolean;
}

const schema = z.strictObject({ shape: z.literal('rectangle'), width: sweepLength(), height: sweepLength(), opaque });

export const rectangle: ElementKind<Rectangle, typeof schema> = {
  shape: 'rectangle',
  schema,
  tokens: { width: 'w', height: 'h' },
  resolve: (job, v) => ({ shape: 'rectangle', width: v('width'), height: v('height'), opaque: job.opaque }),
  geometry: (s) => ({ kind: 'separable', x: { kind: 'interval', width: s.width }, y: { kind: 'interval', width: s.height } }),
  boundary: (s) => [{ kind: 'rect', x0: -s.width / 2, x1: s.width / 2, y0: -s.height / 2, y1: s.height / 2, sign: 1 }],
  verdictWidth: (s, axis) => (axis === 'x' ? s.width : axis === 'y' ? s.height : null),
  describe: (s) => `${s.opaque ? 'opaque ' : ''}rectangle ${sizeWords(s.width)} × ${sizeWords(s.height)}`,
};
