// The method registry (src/methods/registry.ts): the planner and the computation must agree on
// which descriptor a plan belongs to, and every form of a method must share what belongs to the
// method (its validity, its name, its place in the choice rule). Structural checks of the code's
// own bookkeeping (common practice); the physics of each form is checked in test/physics/.
import type { Aperture } from '../../src/optics/aperture.js';
import { describe, expect, it } from 'vitest';
import { descriptorOf, METHOD_NAMES, METHOD_REGISTRY, methodWords } from '../../src/methods/registry.js';
import { planCase } from '../../src/plan/planner.js';
import type { Plan } from '../../src/plan/types.js';
import { makeCase, type CaseSpec } from '../helpers.js';

const um = 1e-6;
const mm = 1e-3;

/** Cases that between them reach every form (1-D, separable, round, obstacles, gratings, tilts, Gaussian beams, a given grid). */
const SPECS: CaseSpec[] = [
  { wavelength: 633e-9, distance: 50 * mm, aperture: { shape: 'slit', width: 100 * um, opaque: false } },
  { wavelength: 633e-9, distance: 2 * mm, aperture: { shape: 'slits', count: 5, width: 10 * um, period: 40 * um, opaque: false } },
  { wavelength: 1 * um, distance: 0.5 * mm, aperture: { shape: 'slit', width: 30 * um, opaque: true }, illumination: { kind: 'gaussian', waist: 40 * um, tilt: [0, 0] } },
  { wavelength: 633e-9, distance: 5 * mm, aperture: { shape: 'rectangle', width: 60 * um, height: 40 * um, opaque: false } },
  { wavelength: 1 * um, distance: 2 * mm, aperture: { shape: 'circle', diameter: 60 * um, opaque: false } },
  { wavelength: 1 * um, distance: 1 * mm, aperture: { shape: 'circle', diameter: 40 * um, opaque: false }, illumination: { kind: 'plane', tilt: [0.2, 0] } },
  { wavelength: 1 * um, distance: 20 * um, aperture: { shape: 'circle', diameter: 8 * um, opaque: true }, illumination: { kind: 'gaussian', waist: 6 * um, tilt: [0, 0] } },
  { wavelength: 1 * um, distance: 1 * mm, aperture: { shape: 'annulus', outer: 40 * um, inner: 20 * um, opaque: true } },
  // A grid.size names an FFT grid: Fresnel's transfer-function form.
  { wavelength: 633e-9, distance: 5 * mm, aperture: { shape: 'circle', diameter: 100 * um, opaque: false }, grid: { size: 256 } },
  // A lens with its screen at the focus: Fresnel's form with the lens folded into the chirp.
  { wavelength: 633e-9, distance: 100 * mm, aperture: { shape: 'lens', focal: 100 * mm, stop: 25 * mm, aberrations: [], opaque: false } },
];

function plans(): Plan[] {
  const out: Plan[] = [];
  for (const s of SPECS) for (const method of ['auto', ...METHOD_NAMES] as const) out.push(planCase(makeCase({ ...s, method }), { maxWork: Infinity }));
  // Planes in sequence (a lens, a pinhole at its focus): planned by plan/sequence.ts.
  const lens = { shape: 'lens', focal: 0.05, stop: 0.01, aberrations: [], opaque: false } as unknown as Aperture;
  const pinhole = { shape: 'circle', diameter: 30e-6, opaque: false } as unknown as Aperture;
  out.push(planCase({ ...makeCase({ wavelength: 633e-9, distance: 0.3, aperture: lens, illumination: { kind: 'gaussian', waist: 1e-3, tilt: [0, 0] } }), planes: [{ after: 0.05, aperture: pinhole }] }));
  return out;
}

describe('method registry', () => {
  it('lists the methods in the planner\'s order of preference: far field, Fresnel, angular spectrum, exact integral', () => {
    expect(METHOD_NAMES).toEqual(['fraunhofer', 'fresnel', 'angular-spectrum', 'rayleigh-sommerfeld']);
    expect(new Set(METHOD_REGISTRY.map((d) => d.id)).size).toBe(METHOD_REGISTRY.length);
  });

  it('gives every form of a method the method\'s validity, name and place in the choice rule', () => {
    for (const m of METHOD_NAMES) {
      const forms = METHOD_REGISTRY.filter((d) => d.method === m);
      for (const d of forms) {
        expect(d.validity, d.id).toBe(forms[0]!.validity);
        expect(d.words.method, d.id).toBe(forms[0]!.words.method);
        expect(d.closedForm, d.id).toBe(forms[0]!.closedForm);
      }
    }
  });

  it('finds exactly one descriptor, of the plan\'s method and form, for every plan the planner makes', () => {
    const seen = new Set<string>();
    for (const p of plans()) {
      const matching = METHOD_REGISTRY.filter((d) => d.method === p.method && d.form === p.form && (d.claims ? d.claims(p) : true));
      expect(matching.map((d) => d.id), `${p.method} ${p.form ?? ''} ${p.layout}`).toHaveLength(1);
      const d = descriptorOf(p);
      expect(d).toBe(matching[0]);
      expect(methodWords(p.method, p.form)).toBe(d.words.form ? `${d.words.method} (${d.words.form})` : d.words.method);
      seen.add(d.id);
    }
    // The cases reach every form, so the check above covers the whole registry.
    expect([...seen].sort()).toEqual(METHOD_REGISTRY.map((d) => d.id).sort());
  });

  it('refuses a plan no descriptor computes', () => {
    expect(() => descriptorOf({ method: 'fraunhofer', form: 'shifted' })).toThrow(/no method/);
  });
});
