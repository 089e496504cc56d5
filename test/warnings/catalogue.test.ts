// The warning catalogue (src/warnings/catalogue.ts): every code in it is raised somewhere in src,
// no site builds a warning of its own, titles are unique, and its messages, rendered from fixed
// details, are the texts the sites produced before the catalogue held their wording. Those texts
// are copied from real runs: the demo jobs' result.json files (spotcast run jobs/*.yaml, at the
// commit before the catalogue) and test/golden/warning-texts.json (recorded from the same commit
// by test/golden/warning-texts.mjs, which takes them from runPlannedCase as result.json does).
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import {
  ACCURACY_CODES,
  WARNING_CATALOGUE,
  WARNING_CODES,
  isAccuracyWarning,
  warning,
  warningTitle,
  type StrayPeakDetails,
} from '../../src/warnings/catalogue.js';

const root = fileURLToPath(new URL('../..', import.meta.url));
const deg = Math.PI / 180;

function sources(): { file: string; text: string }[] {
  const dir = join(root, 'src');
  return (readdirSync(dir, { recursive: true }) as string[])
    .filter((f) => f.endsWith('.ts'))
    .map((f) => ({ file: f.split('\\').join('/'), text: readFileSync(join(dir, f), 'utf8') }));
}

/**
 * Every code must be raised through warning() somewhere in src; no file builds one inline.
 */

describe('every code is raised somewhere, and only through the catalogue', () => {
  const files = sources().filter((s) => s.file !== 'warnings/catalogue.ts');
  it.each(WARNING_CODES)('%s', (code) => {
    const call = new RegExp(`\\bwarning\\(\\s*'${code}'`);
    const literal = `code: '${code}'`;
    const raisedBy = files.filter((s) => call.test(s.text)).map((s) => s.file);
    expect(raisedBy.length, `no file in src raises ${code}`).toBeGreaterThan(0);
    // A warning built inline elsewhere would carry wording the catalogue does not hold.
    const inline = files.filter((s) => s.text.includes(literal)).map((s) => s.file);
    expect(inline).toEqual([]);
  });
});

describe('entries', () => {
  it('titles are one line each, and unique', () => {
    const titles = WARNING_CODES.map(warningTitle);
    for (const t of titles) expect(t).toMatch(/^[^\n\r]{8,80}$/);
    expect(new Set(titles).size).toBe(titles.length);
  });

  it('the accuracy codes are the entries with accuracy: true, and isAccuracyWarning reads any string', () => {
    expect(ACCURACY_CODES).toEqual(WARNING_CODES.filter((c) => WARNING_CATALOGUE[c].accuracy));
    for (const c of WARNING_CODES) expect(isAccuracyWarning(c)).toBe(WARNING_CATALOGUE[c].accuracy);
    expect(isAccuracyWarning('paraxail')).toBe(false);
    expect(isAccuracyWarning('toString')).toBe(false);
  });

  it('the recorded warning texts (test/golden/warning-texts.json) use every code and no other', () => {
    const recorded = JSON.parse(readFileSync(join(root, 'test/golden/warning-texts.json'), 'utf8')) as Record<string, { code: string }[]>;
    const codes = new Set(Object.values(recorded).flatMap((ws) => ws.map((w) => w.code)));
    expect([...codes].sort()).toEqual([...WARNING_CODES].sort());
  });

  it('a warning is { code, message } in that order (result.json writes it as built)', () => {
    expect(JSON.stringify(warning('tilt-y-ignored'))).toBe(
      '{"code":"tilt-y-ignored","message":"illumination.tilt[1] (along the slits) is ignored: a 1-D aperture is computed in the x–z plane only"}',
    );
  });

  it('a code not in the catalogue does not compile', () => {
    // Never called: the check is tsc's (npm run typecheck), which fails if the line below compiles.
    const typo = () =>
      // @ts-expect-error 'paraxail' is not a WarningCode
      warning('paraxail', {});
    expect(typeof typo).toBe('function');
  });
});

describe('messages as the sites wrote them (texts from real runs)', () => {
  // Demo jobs, result.json of the case named.
  it('edge-energy (alignment-disc/3_z-3m)', () => {
    expect(warning('edge-energy', { fraction: 0.00159, frame: 1 / 16, gridGiven: false, padded: [1024, 1024] }).message).toBe(
      '0.159 % of the power reaches the outer 6.3 % of the padded grid: light wraps around the periodic FFT grid into the window; unexpected for the grid the planner chose (1024 × 1024 samples padded); give a larger grid.size',
    );
  });
  it('near-wavelength, a feature (compact-spectrometer-grating/1_wl-405nm)', () => {
    expect(warning('near-wavelength', { cause: 'feature', feature: 333e-9, ratio: 0.82 }).message).toBe(
      'the smallest feature (333 nm) is only 0.82 λ: scalar diffraction loses accuracy there (polarisation, edge and thickness effects); a rigorous vector method is needed for quantitative results',
    );
  });
  it('evanescent, a grating (compact-spectrometer-grating/2_wl-532nm)', () => {
    expect(warning('evanescent', { fraction: 0.142, cutoff: [-2, 2], source: 'planner', nearWavelength: true }).message).toBe(
      "14.2 % of the light through the aperture goes into evanescent waves (the grating orders m ≤ -2 and m ≥ 2): spatial frequencies above 1/λ, which decay within a few wavelengths of the aperture and carry no power to any screen (the planner's model of the light). This is physics, not a fault of the window: the screen can receive at most 85.8 % of that power. Features near or below λ make it: scalar theory is not reliable here; a rigorous vector method is needed for quantitative results",
    );
  });
  it('detector-outside, 2-D, planner window (filter-pinhole/1_z-500um)', () => {
    const d = { detectors: [{ kind: 'pinhole', number: 1, size: 2e-3, at: [0, 0] as [number, number], inside: 0.005 }], window: { size: [118e-6, 118e-6] as [number, number], centre: [0, 0] as [number, number] }, windowGiven: false };
    expect(warning('detector-outside', d).message).toBe(
      'pinhole 1 (2 mm at 0 m, 0 m) has 99.5 % of its area outside the window: its value counts only the part inside and is a lower bound (the 118 µm × 118 µm window centred at 0 m, 0 m); give a window in the job that covers it or move the detector',
    );
  });
  it('orders-unresolved (mask-grating-coupon/2_wl-532nm)', () => {
    expect(warning('orders-unresolved', { distance: 0.5, orders: [-15, -14, 14, 15], gratingWidth: 200e-6, separateBeyond: 0.5 }).message).toBe(
      "at 500 mm the orders -15, -14, 14, 15 overlap on the screen (each is a beam as wide as the grating's 200 µm, widened by its diffraction): the light between two orders is theirs together, so their powers are left empty in the order table; they separate beyond about 500 mm",
    );
  });

  // test/golden/warning-texts.json, case named.
  it('detector-outside, 1-D, given window (detectors partly and wholly outside a given window)', () => {
    const det = (number: number, at: number, inside: number) => ({ kind: 'square', number, size: 2e-3, at: [at, 0] as [number, number], inside });
    expect(warning('detector-outside', { detectors: [det(1, 3e-3, 0.501), det(2, 5e-3, 0)], window: { size: [6e-3, null], centre: [0, null] }, windowGiven: true }).message).toBe(
      'square 1 (2 mm at 3 mm) has 49.9 % of its width outside the window: its value counts only the part inside and is a lower bound; square 2 (2 mm at 5 mm) lies wholly outside the window: it has no value (null) (the 6 mm window centred at 0 m); widen the window the job gives or move the detector',
    );
  });
  it('orders-unresolved, few lines (two slits at 1 mm)', () => {
    expect(warning('orders-unresolved', { distance: 1e-3, orders: Array.from({ length: 31 }, (_, i) => i - 15), gratingWidth: 20e-6, separateBeyond: null }).message).toBe(
      "at 1 mm the orders -15…15 overlap on the screen (each is a beam as wide as the grating's 20 µm, widened by its diffraction): the light between two orders is theirs together, so their powers are left empty in the order table; with so few lines they never separate fully",
    );
  });
  it('window-loss, about as planned (sub-wavelength slit)', () => {
    expect(warning('window-loss', { loss: 0.0668, babinet: false, evanescent: 0.243, window: [20.9e-6, null], limit: 0.05, then: 'as-planned', expected: 0.238 }).message).toBe(
      '6.68 % of the power that reaches the screen (the power through the aperture less the 24.3 % that goes into evanescent waves) falls outside the 20.9 µm window (limit 5 %), about what the planner expected when it chose this window (23.8 %; its reasons say what it left out and why); totals and encircled energies are low by that much; a window given in the job around the light of interest holds it',
    );
  });
  it('window-loss, an obstacle in a plane wave (opaque disc in a small given window)', () => {
    expect(warning('window-loss', { loss: 0.924, babinet: true, evanescent: 0, window: [2e-3, 2e-3], limit: 0.05, then: 'nothing', expected: 0 }).message).toBe(
      '92.4 % of the light the obstacle removes (its complementary hole, by Babinet) falls outside the 2 mm × 2 mm window (limit 5 %)',
    );
  });
  it('window-loss, the planner’s window, unexpected (angular spectrum on a small grid)', () => {
    expect(warning('window-loss', { loss: 0.695, babinet: false, evanescent: 0, window: [64.3e-3, null], limit: 0.05, then: 'unexpected', expected: 0.02 }).message).toBe(
      '69.5 % of the power through the aperture falls outside the 64.3 mm window (limit 5 %): unexpected for the window the planner chose, which it expected to miss about 2 %; totals and encircled energies are low by that much; a wider window given in the job holds more',
    );
  });
  it('band-limit and power-excess', () => {
    expect(warning('band-limit', { fraction: 0.693, gridGiven: true }).message).toBe(
      'the angular-spectrum band limit removed 69.3 % of the spectral power (light at angles the grid cannot carry to this distance without aliasing); the window misses that light; use a larger grid.size',
    );
    expect(warning('power-excess', { excess: 5.18 }).message).toBe(
      'the window holds 518 % more power than went through the aperture: the result is aliased or under-sampled (check grid.pitch and the window); do not trust it',
    );
  });
  it('orders-power (paraxial method on a steep grating)', () => {
    const order = (m: number) => ({ m, measured: 0.0121, predicted: 0.0225, tolerance: 0.0011 });
    const advice =
      'the Fresnel method is paraxial: it sends order m to z·sin θ_m instead of z·tan θ_m and lands orders that should be evanescent (this case forces method: fresnel); use method: auto, with which the planner picks rayleigh-sommerfeld here (valid, and it fits)';
    expect(warning('orders-power', { orders: [order(-3), order(3)], farField: true, advice }).message).toBe(
      "the power of 2 orders differs from thin-grating theory (Goodman §4.4: (w/d)·sinc²(m·w/d) of the power through the slits) by more than a correct computation of this finite grating allows — order -3: 1.21 % of the transmitted power measured, 2.25 % predicted (allowed ±0.11 %); order 3: 1.21 % of the transmitted power measured, 2.25 % predicted (allowed ±0.11 %). The allowance is twice this finite grating's own departure from the thin-grating value (its far-field model), plus what the window misses and 0.5 % for the method's own accuracy. The computation itself is off here: " +
        advice,
    );
  });
  it('orders-misplaced, orders and stray light (paraxial method on a tilted grating)', () => {
    // Positions are chosen within the printed rounding so that centroid − position is the printed offset.
    const order = (m: number, position: number, thetaDeg: number, off: number, tolerance: number, paraxialAt: number | null = null) => ({
      m,
      position,
      angle: thetaDeg * deg,
      centroid: position + off,
      paraxialAt,
      tolerance,
    });
    const misplaced = [
      order(-11, -9.037e-3, -61.04, -151.2e-6, 90.37e-6),
      order(-9, -4.00304e-3, -38.68, -360.5e-6, 40.03e-6),
      order(-7, -2.0226e-3, -22.02, 144.2e-6, 20.23e-6, -1.875e-3),
      order(-1, 2.0226e-3, 22.02, -124.2e-6, 20.23e-6, 1.875e-3),
      order(0, 2.887e-3, 30, -193.1e-6, 28.87e-6),
      order(1, 4.003e-3, 38.68, 358.9e-6, 40.03e-6),
    ];
    const peak = (position: number, fraction: number, order: number, at: number, landsAt: number | null, nearest: number, nearestAt: number): StrayPeakDetails => ({
      position,
      fraction,
      paraxial: { order, at, landsAt },
      nearest: { order: nearest, position: nearestAt },
    });
    const stray = [
      peak(-10.62e-3, 0.000462, -21, -10.63e-3, null, -11, -9.037e-3),
      peak(-6.877e-3, 0.000888, -15, -6.875e-3, null, -11, -9.037e-3),
      peak(-4.373e-3, 0.00162, -11, -4.375e-3, -9.037e-3, -9, -4.003e-3),
      peak(-3.125e-3, 0.00238, -9, -3.125e-3, -4.003e-3, -8, -2.887e-3),
      ...Array.from({ length: 6 }, () => peak(1, 0.5, 0, 1, null, 0, 0)),
    ];
    const advice =
      'the Fresnel method is paraxial: it sends order m to z·sin θ_m instead of z·tan θ_m and lands orders that should be evanescent (this case forces method: fresnel); use method: auto, with which the planner picks rayleigh-sommerfeld here (valid, and it fits)';
    expect(warning('orders-misplaced', { misplaced, stray, sampleStep: 6.606e-6, advice }).message).toBe(
      "6 orders are not where they should be — order -11: its light is centred at -9.188 mm, but the grating equation puts it at z·tan θ = -9.037 mm (θ = -61.04°), 151.2 µm off, tolerance 90.37 µm; order -9: its light is centred at -4.364 mm, but the grating equation puts it at z·tan θ = -4.003 mm (θ = -38.68°), 360.5 µm off, tolerance 40.03 µm; order -7: its light is centred at -1.878 mm (about z·sin θ = -1.875 mm, where a paraxial method puts it), but the grating equation puts it at z·tan θ = -2.023 mm (θ = -22.02°), 144.2 µm off, tolerance 20.23 µm; order -1: its light is centred at 1.898 mm (about z·sin θ = 1.875 mm, where a paraxial method puts it), but the grating equation puts it at z·tan θ = 2.023 mm (θ = 22.02°), 124.2 µm off, tolerance 20.23 µm; order 0: its light is centred at 2.694 mm, but the grating equation puts it at z·tan θ = 2.887 mm (θ = 30°), 193.1 µm off, tolerance 28.87 µm; order 1: its light is centred at 4.362 mm, but the grating equation puts it at z·tan θ = 4.003 mm (θ = 38.68°), 358.9 µm off, tolerance 40.03 µm (centroids over each order's interval, less the small shift this finite grating's envelope gives them; tolerance: the larger of one output sample, 6.606 µm, and 1 % of the order's distance from the axis). Also light where no order lands: a peak at -10.62 mm holding 0.0462 % of the transmitted power, where a paraxial method lands the evanescent order -21 (z·sin θ = -10.63 mm; it should reach no screen at all); the nearest order that lands is -11, at -9.037 mm; a peak at -6.877 mm holding 0.0888 % of the transmitted power, where a paraxial method lands the evanescent order -15 (z·sin θ = -6.875 mm; it should reach no screen at all); the nearest order that lands is -11, at -9.037 mm; a peak at -4.373 mm holding 0.162 % of the transmitted power, where a paraxial method puts order -11 (z·sin θ = -4.375 mm; it lands at z·tan θ = -9.037 mm); the nearest order that lands is -9, at -4.003 mm; a peak at -3.125 mm holding 0.238 % of the transmitted power, where a paraxial method puts order -9 (z·sin θ = -3.125 mm; it lands at z·tan θ = -4.003 mm); the nearest order that lands is -8, at -2.887 mm; and 6 more such peaks. The computation itself is off here, not the physics: " +
        advice,
    );
  });

  // The planner's codes, whose sites have not moved to warning() yet: the catalogue's wording is
  // checked against what the planner wrote.
  it('paraxial, 2-D, behind an obstacle (fresnel near an opaque disc)', () => {
    expect(warning('paraxial', { at: [-516e-6, -516e-6], phase: 530, weight: 1, weighted: 6.3, limit: 0.03, goodmanRatio: 750, instead: 'rayleigh-sommerfeld' }).message).toBe(
      "the Fresnel (paraxial) approximation is off where light lands: at (-516 µm, -516 µm) it drops 530 rad of phase across the aperture where the light is 100 % of the peak (weighted 6.3 rad, limit 0.03 rad; Goodman's sufficient condition ratio 750): positions and intensities there are off; use method: rayleigh-sommerfeld (valid here, and it fits)",
    );
  });
  it('not-far-field (far-field formula at N_F 2)', () => {
    expect(warning('not-far-field', { phase: 6.3, fresnelNumber: 2, farFieldDistance: 3.16, peakError: 3.3, instead: 'angular-spectrum' }).message).toBe(
      "the far-field formula neglects the aperture's quadratic phase π·N_F = 6.3 rad here (N_F = 2; far field from 3.16 m), about 330 % at the peak: the pattern is not yet the far-field one; use method: angular-spectrum (valid here, and it fits)",
    );
  });
  it('grid-too-small, both forms (given grid short of the aperture; angular spectrum on a small grid)', () => {
    expect(warning('grid-too-small', { covers: 'aperture', samples: 64, pitch: 2e-6, aperture: 1e-3 }).message).toBe('the grid (64 × 2 µm) does not cover the aperture (1 mm): the aperture is cut');
    expect(warning('grid-too-small', { covers: 'aperture-and-window', samples: 256, pitch: 1.5625e-6 }).message).toBe(
      'the grid (256 × 1.56 µm = 400 µm) does not cover the aperture and the window; the field is cut and wraps around',
    );
  });
  it('orders-outside, a given window (grating with orders outside a given window)', () => {
    const orders = [...Array.from({ length: 12 }, (_, i) => i - 15), ...Array.from({ length: 12 }, (_, i) => i + 4)];
    expect(warning('orders-outside', { orders, fraction: 0.063, windowGiven: true, maxOutput: 2049 }).message).toBe(
      'propagating orders -15…-4, 4…15 (6.3 % of the power that reaches the screen) land outside the window the job gives; they are listed in the order table as outside; widen the window to see them',
    );
  });
  it('little-light, coarse-sampling, undersampled-feature', () => {
    expect(warning('little-light', { waist: 2e-6, passing: 5.4e-32, openFrom: 12e-6 }).message).toBe(
      "the 2 µm beam passes only about 5.4e-32 of its power (the open part begins 12 µm from its axis, 6 beam radii): the result is the beam's far tail, where the computed values are at the level of rounding and of the beam's truncation, and their relative accuracy is not controlled",
    );
    // The rule as the planner states it for a given pitch (the wrapper is dropped in the message).
    expect(
      warning('coarse-sampling', { pitch: 4e-6, required: 78.125e-9, rule: 'grid.pitch as given (the accuracy rules ask for 78.1 nm: 64 samples across the smallest feature (5 µm))' }).message,
    ).toBe('pitch 4 µm is coarser than the 78.1 nm the accuracy target needs (64 samples across the smallest feature (5 µm)); expect aliasing or missing fringes');
    expect(warning('undersampled-feature', { samples: 1.25, feature: 5e-6, needed: 4 }).message).toBe(
      'only 1.3 samples across the smallest feature (5 µm); at least 4 are needed for its edges to be resolved',
    );
  });
});
