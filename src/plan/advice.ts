// Advice in a warning: another method that is valid here and fits, from the plan's options.
import type { MethodName, MethodOption } from './types.js';

/** A valid method that fits, other than `not`, to advise; null if there is none. */
export function advisable(options: MethodOption[], not: MethodName): MethodOption | null {
  const ok = options.filter((o) => o.valid && o.fits && o.method !== not);
  if (ok.length === 0) return null;
  return ok.reduce((b, o) => ((o.work ?? Infinity) < (b.work ?? Infinity) ? o : b));
}
