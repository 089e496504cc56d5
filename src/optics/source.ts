// The field just behind the aperture: area-sampled open fraction × illumination amplitude.
// Tilt is given as angles [θx, θy] of the incident direction, with direction cosines
// α = sin θx, β = sin θy; a tilted plane wave is exp(i2π(αx + βy)/λ).
import type { Aperture, Illumination, Profile } from './aperture.js';
import { axisAt, createField, type Axis, type Field } from './field.js';
import { sampleMask2D, sampleProfile } from './mask.js';
import { apertureTransmittance } from '../elements/registry.js';
import { gratingCellAverages } from './grating-profile.js';
import { gratingPowerAverages } from './grating-transform.js';
import type { CellTransmittance } from '../elements/types.js';

export function directionCosines(ill: Illumination): [number, number, number] {
  const a = Math.sin(ill.tilt[0]);
  const b = Math.sin(ill.tilt[1]);
  const g2 = 1 - a * a - b * b;
  if (g2 <= 0) throw new Error(`illumination.tilt: the two tilts together exceed 90° (sin²θx + sin²θy = ${1 - g2})`);
  return [a, b, Math.sqrt(g2)];
}

/** Spatial frequencies (1/m) of the illumination's carrier: α/λ, β/λ. */
export function carrierFrequencies(ill: Illumination, wavelength: number): [number, number] {
  const [a, b] = directionCosines(ill);
  return [a / wavelength, b / wavelength];
}

/** Real amplitude envelope of the illumination along one axis (1 for a plane wave). */
export function envelope(ill: Illumination, axis: Axis): Float64Array {
  const out = new Float64Array(axis.n);
  if (ill.kind === 'plane') return out.fill(1);
  const w2 = ill.waist * ill.waist;
  for (let j = 0; j < axis.n; j++) {
    const x = axisAt(axis, j);
    out[j] = Math.exp(-(x * x) / w2);
  }
  return out;
}

export interface SourceOptions {
  /** Multiply in the tilt carrier (FFT methods); direct methods shift frequencies instead. */
  sampleCarrier: boolean;
  /**
   * The aperture is an obstacle in a beam of finite extent (a Gaussian): the field is the beam
   * where the obstacle is not (1 − open fraction of the obstacle's shape), propagated as it is.
   */
  obstructed?: boolean;
}

function applyCarrier(f: Field, fx0: number, fy0: number): void {
  if (fx0 === 0 && fy0 === 0) return;
  const d = f.data;
  for (let r = 0; r < f.ny; r++) {
    const y = f.y0 + r * f.dy;
    for (let c = 0; c < f.nx; c++) {
      const x = f.x0 + c * f.dx;
      const ph = 2 * Math.PI * (fx0 * x + fy0 * y);
      const i = 2 * (r * f.nx + c);
      const re = d[i]!;
      d[i] = re * Math.cos(ph);
      d[i + 1] = re * Math.sin(ph);
    }
  }
}

/**
 * A source field and the power through the aperture, Σ open-fraction·|envelope|²·cell: the integral
 * of the illumination over the open area. (Σ|sample|² would undercount the partly open edge cells.)
 */
export interface Source {
  field: Field;
  power: number;
}

/** The open part of the aperture, illuminated, on a 2-D grid. */
export function sourceField2D(
  a: Aperture,
  ill: Illumination,
  xa: Axis,
  ya: Axis,
  wavelength: number,
  opts: SourceOptions,
): Source {
  const f = createField(xa, ya, wavelength);
  const complex = apertureTransmittance(a, xa, ya, wavelength);
  if (complex) return complexSource(f, complex, ill, xa, ya, wavelength, opts);
  const mask = sampleMask2D(a, xa, ya);
  if (opts.obstructed) for (let i = 0; i < mask.length; i++) mask[i] = 1 - mask[i]!;
  const ex = envelope(ill, xa);
  const ey = envelope(ill, ya);
  let power = 0;
  for (let r = 0; r < ya.n; r++) {
    for (let c = 0; c < xa.n; c++) {
      const e = ex[c]! * ey[r]!;
      const m = mask[r * xa.n + c]!;
      f.data[2 * (r * xa.n + c)] = m * e;
      power += m * e * e;
    }
  }
  if (opts.sampleCarrier) {
    const [fx0, fy0] = carrierFrequencies(ill, wavelength);
    applyCarrier(f, fx0, fy0);
  }
  return { field: f, power: power * xa.step * ya.step };
}

/**
 * A source from given cell averages of a transmittance (a lens's pupil without its phase, which the
 * focal-plane form folds into its chirp): × the illumination's envelope, and its carrier if asked.
 */
export function transmittanceSource(c: CellTransmittance, ill: Illumination, xa: Axis, ya: Axis, wavelength: number, opts: SourceOptions): Source {
  return complexSource(createField(xa, ya, wavelength), c, ill, xa, ya, wavelength, opts);
}

/**
 * A non-binary element's source: cell-averaged transmittance × envelope, and the power as the
 * cell averages of |t|² weigh the illumination (a phase element passes all the light its stop does).
 */
function complexSource(f: Field, c: CellTransmittance, ill: Illumination, xa: Axis, ya: Axis, wavelength: number, opts: SourceOptions): Source {
  if (opts.obstructed) throw new Error('an element with a complex transmittance cannot be an obstacle (opaque)');
  const ex = envelope(ill, xa);
  const ey = envelope(ill, ya);
  const [fx0, fy0] = opts.sampleCarrier ? carrierFrequencies(ill, wavelength) : [0, 0];
  const tilted = fx0 !== 0 || fy0 !== 0;
  const d = f.data;
  let power = 0;
  for (let r = 0; r < ya.n; r++) {
    const y = axisAt(ya, r);
    for (let col = 0; col < xa.n; col++) {
      const k = r * xa.n + col;
      const e = ex[col]! * ey[r]!;
      let re = c.t[2 * k]! * e;
      let im = c.t[2 * k + 1]! * e;
      if (tilted) {
        const ph = 2 * Math.PI * (fx0 * axisAt(xa, col) + fy0 * y);
        const cs = Math.cos(ph);
        const sn = Math.sin(ph);
        const r2 = re * cs - im * sn;
        im = re * sn + im * cs;
        re = r2;
      }
      d[2 * k] = re;
      d[2 * k + 1] = im;
      power += c.weight[k]! * e * e;
    }
  }
  return { field: f, power: power * xa.step * ya.step };
}

/** Multiplies a 1-D field by the carrier e^{i2πf₀x}. */
function applyComplexCarrier(f: Field, fx0: number): void {
  if (fx0 === 0) return;
  const d = f.data;
  for (let c = 0; c < f.nx; c++) {
    const ph = 2 * Math.PI * fx0 * (f.x0 + c * f.dx);
    const cs = Math.cos(ph);
    const sn = Math.sin(ph);
    const re = d[2 * c]!;
    const im = d[2 * c + 1]!;
    d[2 * c] = re * cs - im * sn;
    d[2 * c + 1] = re * sn + im * cs;
  }
}

/** One factor of a separable (or 1-D) source: profile × envelope along one axis. */
export function sourceField1D(
  p: Profile,
  ill: Illumination,
  axis: Axis,
  wavelength: number,
  carrierFrequency: number,
  opts: SourceOptions,
): Source {
  const f = createField(axis, null, wavelength);
  if (p.kind === 'periodic') {
    const t = gratingCellAverages(p.profile, p.period, p.count, axis);
    const cells: CellTransmittance = { t, weight: gratingPowerAverages(p.profile, p.period, p.count, axis, t) };
    const one: Axis = { n: 1, start: 0, step: 1 };
    // As a 2-D source of one row: the envelope along y is 1 (createField's 1-D layout keeps dy = 0).
    const src = complexSource(f, cells, { ...ill, tilt: [ill.tilt[0], 0] } as Illumination, axis, one, wavelength, { ...opts, sampleCarrier: false });
    if (opts.sampleCarrier) applyComplexCarrier(f, carrierFrequency);
    return { field: f, power: src.power };
  }
  const mask = sampleProfile(p, axis);
  if (opts.obstructed) for (let i = 0; i < mask.length; i++) mask[i] = 1 - mask[i]!;
  const e = envelope(ill, axis);
  let power = 0;
  for (let j = 0; j < axis.n; j++) {
    f.data[2 * j] = mask[j]! * e[j]!;
    power += mask[j]! * e[j]! * e[j]!;
  }
  if (opts.sampleCarrier) applyCarrier(f, carrierFrequency, 0);
  return { field: f, power: power * axis.step };
}
