// Orders of different wavelengths that land on the same place: the grating equation depends on mλ
// only, so order m₁ of λ₁ and m₂ of λ₂ coincide when m₁λ₁ = m₂λ₂ (common practice: the reason
// spectrometers need order-sorting filters).
import type { GratingOrder } from './orders.js';

export interface OrderSet {
  caseId: string;
  wavelength: number;
  distance: number;
  /** Lines of the grating and its period, for the resolution-limited tolerance. */
  count: number;
  period: number;
  /** Cases are compared only within the same group (same grating, distance and incidence). */
  group: string;
  orders: GratingOrder[];
}

export interface Overlap {
  caseA: string;
  wavelengthA: number;
  orderA: number;
  positionA: number;
  caseB: string;
  wavelengthB: number;
  orderB: number;
  positionB: number;
  separation: number;
  /** Distance within which the two count as overlapping. */
  tolerance: number;
}

/**
 * Half-width of order m's peak on the screen: angular half-width λ/(N d cos θ) to the first zero
 * (Hecht, Optics, §10.2.8), times dx/dθ = z/cos²θ.
 */
export function orderHalfWidth(s: OrderSet, o: GratingOrder): number {
  const cos = Math.cos(o.angle ?? 0);
  return (s.distance * s.wavelength) / (s.count * s.period * cos ** 3);
}

export function orderOverlaps(sets: OrderSet[], tolerance?: number): Overlap[] {
  const out: Overlap[] = [];
  for (let i = 0; i < sets.length; i++) {
    for (let j = i + 1; j < sets.length; j++) {
      const a = sets[i]!;
      const b = sets[j]!;
      if (a.group !== b.group || a.wavelength === b.wavelength) continue;
      for (const oa of a.orders) {
        if (!oa.propagates || !oa.inWindow || oa.m === 0 || oa.position === null) continue;
        for (const ob of b.orders) {
          if (!ob.propagates || !ob.inWindow || ob.m === 0 || ob.position === null) continue;
          const tol = tolerance ?? Math.max(orderHalfWidth(a, oa), orderHalfWidth(b, ob));
          const sep = Math.abs(oa.position - ob.position);
          if (sep <= tol) {
            out.push({
              caseA: a.caseId,
              wavelengthA: a.wavelength,
              orderA: oa.m,
              positionA: oa.position,
              caseB: b.caseId,
              wavelengthB: b.wavelength,
              orderB: ob.m,
              positionB: ob.position,
              separation: sep,
              tolerance: tol,
            });
          }
        }
      }
    }
  }
  return out;
}
