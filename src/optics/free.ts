// The illumination propagated with nothing in the way, in closed form. Opaque apertures are
// computed by Babinet's principle as U = U_free − U_open, which avoids putting an infinite plane
// wave on a finite grid.
import type { Illumination } from './aperture.js';
import { axisAt, createField, type Axis, type Field } from './field.js';
import { propagationPhase } from './phase.js';
import { directionCosines } from './source.js';

/**
 * Plane wave: exact, exp(ik(αx + βy + γz)). Gaussian beam: the paraxial solution with complex beam
 * parameter q = z − i·z_R, z_R = πw₀²/λ (Siegman, Lasers, ch. 17), shifted along a tilt by the Fresnel
 * shift theorem. 1-D fields use the 1-D (cylindrical) Gaussian, amplitude factor √(q₀/q).
 */
export function freeField(ill: Illumination, z: number, outX: Axis, outY: Axis | null, wavelength: number): Field {
  const out = createField(outX, outY, wavelength);
  const [a, b, g] = directionCosines(ill);
  const k = (2 * Math.PI) / wavelength;
  const ny = outY ? outY.n : 1;
  for (let r = 0; r < ny; r++) {
    const y = outY ? axisAt(outY, r) : 0;
    for (let c = 0; c < outX.n; c++) {
      const x = axisAt(outX, c);
      let re: number;
      let im: number;
      if (ill.kind === 'plane') {
        const ph = k * (a * x + (outY ? b * y : 0)) + propagationPhase(g * z, wavelength);
        re = Math.cos(ph);
        im = Math.sin(ph);
      } else {
        const zr = (Math.PI * ill.waist * ill.waist) / wavelength;
        // q0/q and 1/q with q0 = −i·zR, q = z − i·zR.
        const den = z * z + zr * zr;
        const invQr = z / den;
        const invQi = zr / den;
        const ratioR = (zr * zr) / den; // Re(q0/q)
        const ratioI = (-zr * z) / den; // Im(q0/q)
        const xs = x - a * z;
        const ys = outY ? y - b * z : 0;
        const rho2 = xs * xs + ys * ys;
        // exp(ik ρ²/(2q)): real part of the exponent −kρ²·Im(1/q)/2, phase kρ²·Re(1/q)/2
        const env = Math.exp((-k * rho2 * invQi) / 2);
        const tiltPh = k * (a * x + (outY ? b * y : 0)) - (k * (a * a + (outY ? b * b : 0)) * z) / 2;
        const ph = (k * rho2 * invQr) / 2 + tiltPh + propagationPhase(z, wavelength);
        let pr = ratioR;
        let pi = ratioI;
        if (!outY) {
          // √(q0/q) on the principal branch
          const mod = Math.sqrt(Math.hypot(pr, pi));
          const arg = Math.atan2(pi, pr) / 2;
          pr = mod * Math.cos(arg);
          pi = mod * Math.sin(arg);
        }
        const cr = env * Math.cos(ph);
        const ci = env * Math.sin(ph);
        re = pr * cr - pi * ci;
        im = pr * ci + pi * cr;
      }
      const i = 2 * (r * outX.n + c);
      out.data[i] = re;
      out.data[i + 1] = im;
    }
  }
  return out;
}

/** U ← U_free − U, sample by sample (same grid). */
export function complementInPlace(u: Field, free: Field): void {
  const d = u.data;
  const f = free.data;
  for (let i = 0; i < d.length; i++) d[i] = f[i]! - d[i]!;
}
