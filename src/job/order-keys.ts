// The orders mapping's spectroscopy keys (beside overlap, in schema.ts): the focal length of the
// camera lens that images the orders (its focal plane's linear dispersion), and the wavelength
// range the grating will be used over in one order (order sorting: which other orders land on it,
// the filters that remove them). Both are answered per grating case (analysis/grating-answers.ts).
import { z } from 'zod';
import { formatLength } from './units.js';
import { mappingError, positiveLength, WAVELENGTH } from './quantities.js';

/** Orders the use range may name: |m| up to this (beyond it no grating is used in practice). */
export const USE_ORDER_MAX = 100;

/** A dispersing diffraction order, |m| ≤ max and not 0, refused with `what` said. */
export function dispersingOrder(what: string, max = USE_ORDER_MAX) {
  const msg = `expected ${what}: a whole number from -${max} to ${max}, not 0`;
  return z
    .number({ error: msg })
    .int({ error: msg })
    .min(-max, { error: msg })
    .max(max, { error: msg })
    .refine((m) => m !== 0, { error: `${msg} (order 0 does not disperse)` });
}

const useShape = {
  from: positiveLength(WAVELENGTH),
  to: positiveLength(WAVELENGTH),
  order: dispersingOrder('a diffraction order'),
};
export const ORDER_USE_KEYS = Object.keys(useShape);

const use = z
  .strictObject(useShape, { error: mappingError("expected a mapping such as {from: '400 nm', to: '700 nm', order: 1}") })
  .superRefine((u, ctx) => {
    if (!(u.from < u.to)) ctx.addIssue({ code: 'custom', path: ['to'], message: `expected 'to' above 'from' (${formatLength(u.from)}): the range runs from its shortest wavelength to its longest` });
  });

/** Spread into schema.ts's ordersShape. */
export const orderAnswerKeys = {
  /** The camera lens's focal length: linear dispersion f·m/(d·cos θ_m) in its focal plane. */
  focal_length: positiveLength().optional(),
  /** The wavelength range used in one order: answered by order sorting. */
  use: use.optional(),
};
