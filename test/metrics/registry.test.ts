// The metric registry (src/metrics/registry.ts): the columns it gives summary.csv, the metrics it
// flags for the report, the definitions it gives result.json, and its readers checked on a computed
// far-field pinhole against the Airy pattern (Born & Wolf, Principles of Optics, §8.5.2; Bessel
// functions from a reference library).
import besselj0 from '@stdlib/math-base-special-besselj0';
import besselj1 from '@stdlib/math-base-special-besselj1';
import { describe, expect, it } from 'vitest';
import { METRICS, metricDefinitions, metricQuantities, reportedMetrics } from '../../src/metrics/registry.js';
import type { MetricFamily, MetricScope } from '../../src/metrics/types.js';
import { summaryOf, type CaseSummary } from '../../src/output/case-output.js';
import { summaryColumns } from '../../src/output/summary.js';
import { nm, runCase, um } from '../helpers.js';

/** A job whose cases have every kind of column: two detectors, verdicts on three axes, grating orders, a search. */
function fullScope(): MetricScope {
  const detectors = [
    { kind: 'pinhole' as const, size: 1e-4 },
    { kind: 'square' as const, size: 2e-5, at: [1e-4, 0] as [number, number] },
  ];
  const rec = (metrics: Partial<CaseSummary['metrics']>, extra: Partial<CaseSummary> = {}) =>
    ({ metrics: { detectors: [], ...metrics }, ...extra }) as unknown as CaseSummary;
  return {
    cases: [{ analysis: { detectors } }] as unknown as MetricScope['cases'],
    records: [
      rec({ verdicts: [{ axis: 'radial' }] as never, evanescentFraction: 0.01 }),
      rec({ verdicts: [{ axis: 'x' }, { axis: 'y' }] as never }, { search: { best: 1e-4 } as never }),
    ],
  };
}

describe('the registry', () => {
  it('gives every column a header of its own, none of them one of the plan or run columns of summary.csv', () => {
    const headers = metricQuantities(fullScope()).map((q) => q.header);
    const fixed = ['case', 'status', 'wavelength_m', 'distance_m', 'fresnel_number', 'regime', 'method', 'seconds', 'warnings', 'error'];
    expect(new Set(headers).size).toBe(headers.length);
    for (const f of fixed) expect(headers).not.toContain(f);
  });

  it('orders the columns as summary.csv had them before the registry (the recorded header of a rectangle job with two detectors), with the D4σ window check after D4σ and the verdicts\' spot, shadow and far-field sizes before their ratios', () => {
    const scope = fullScope();
    scope.records = scope.records.slice(1, 2).map((r) => ({ ...r, search: undefined }) as unknown as CaseSummary);
    expect(metricQuantities(scope).map((q) => q.header).join(',')).toBe(
      'peak_intensity,on_axis_intensity,peak_x_m,peak_y_m,centroid_x_m,centroid_y_m,fwhm_x_m,fwhm_y_m,e2_width_x_m,e2_width_y_m,d4sigma_x_m,d4sigma_y_m,d4sigma_window_change_x,d4sigma_window_change_y,first_min_x_m,first_min_y_m,ee50_radius_m,ee84_radius_m,ee90_radius_m,power_through_aperture,power_in_window,window_fraction,detector1_fraction,detector1_area_in_window,detector2_fraction,detector2_area_in_window,verdict_x,spot_x_m,shadow_x_m,far_field_size_x_m,spot_over_far_field_x,spot_over_shadow_x,far_field_from_x_m,verdict_y,spot_y_m,shadow_y_m,far_field_size_y_m,spot_over_far_field_y,spot_over_shadow_y,far_field_from_y_m',
    );
  });

  it('flags for the report the answers it plots: intensities, FWHM, D4σ, 50 and 84 % radii, detector fractions, the spot-size chart (spot, shadow, far field), smallest spot; not the window fraction (a diagnostic in the cases table)', () => {
    const reported = reportedMetrics(fullScope());
    const keys = reported.map((m) => m.info.key);
    const spot = (t: string) => [`spot${t}_m`, `shadow${t}_m`, `far_field_size${t}_m`];
    expect(keys).toEqual([
      'peak_intensity',
      'on_axis_intensity',
      'fwhm_x_m',
      'fwhm_y_m',
      'd4sigma_x_m',
      'd4sigma_y_m',
      'ee50_radius_m',
      'ee84_radius_m',
      'detector1_fraction',
      'detector2_fraction',
      ...spot(''),
      ...spot('_x'),
      ...spot('_y'),
      'smallest_spot_size_m',
      'smallest_spot_m',
    ]);
    // The chart's references are drawn as lines; the spot as points joined.
    expect(reported.filter((m) => m.info.chart?.reference).map((m) => m.info.key)).toEqual(['shadow_m', 'far_field_size_m', 'shadow_x_m', 'far_field_size_x_m', 'shadow_y_m', 'far_field_size_y_m']);
    const log = reported.filter((m) => m.info.log).map((m) => m.info.key);
    expect(log).toEqual(['peak_intensity', 'on_axis_intensity', ...spot(''), ...spot('_x'), ...spot('_y')]);
  });

  it("gives result.json's definitions in the order they were written, and refuses a field defined twice", () => {
    expect(Object.keys(metricDefinitions())).toEqual(['fwhm', 'e2Width', 'd4sigma', 'd4sigmaWindowChange', 'detectors', 'orders', 'evanescentFraction', 'planes', 'spatialFilter', 'mtf', 'spectrometer', 'twoPoints']);
    const again: MetricFamily = { key: 'again', quantities: () => [], definitions: { fwhm: 'another width' } };
    expect(() => metricDefinitions([...METRICS, again])).toThrow(/fwhm given twice/);
  });
});

function bisect(f: (x: number) => number, lo: number, hi: number): number {
  for (let i = 0; i < 100; i++) {
    const mid = (lo + hi) / 2;
    if (f(lo) * f(mid) <= 0) hi = mid;
    else lo = mid;
  }
  return (lo + hi) / 2;
}

describe("summary.csv's cells, read through the registry, for a far-field pinhole (Airy pattern)", () => {
  const lam = 633 * nm;
  const D = 50 * um;
  const z = 1;
  // First dark ring at v = 3.8317 (the first zero of J₁), v = πD r/(λz); 83.8 % of the power within it.
  const v0 = bisect((v) => besselj1(v), 3, 4.5);
  const r0 = z * Math.tan(Math.asin((v0 * lam) / (Math.PI * D)));
  const { rec } = runCase({
    wavelength: lam,
    distance: z,
    aperture: { shape: 'circle', diameter: D, opaque: false },
    analysis: { detectors: [{ kind: 'pinhole', size: 2 * r0 }] },
  });
  const cols = summaryColumns([{ record: summaryOf(rec) }]);
  const cell = (h: string) => {
    const c = cols.find((k) => k.header === h);
    if (!c) throw new Error(`no column ${h}`);
    return c.get({ record: summaryOf(rec) }) as number;
  };

  it('FWHM x and y: 2v½·λz/(πD), [2J₁(v½)/v½]² = ½ (Born & Wolf §8.5.2), to 0.2 %', () => {
    const vh = bisect((v) => ((2 * besselj1(v)) / v) ** 2 - 0.5, 1, 2);
    const ref = (2 * vh * lam * z) / (Math.PI * D);
    expect(Math.abs(cell('fwhm_x_m') - ref) / ref).toBeLessThan(2e-3);
    expect(Math.abs(cell('fwhm_y_m') - ref) / ref).toBeLessThan(2e-3);
  });
  it('the radius holding 50 %: 1 − J₀²(v) − J₁²(v) = ½ (Born & Wolf §8.5.2), to 0.3 %', () => {
    const v50 = bisect((v) => 1 - besselj0(v) ** 2 - besselj1(v) ** 2 - 0.5, 0.5, 3);
    const ref = (v50 * lam * z) / (Math.PI * D);
    // Budget: the encircled fraction is good to 0.2 % (test/physics/answers.test.ts); at 50 % the
    // curve rises about as fast as the radius, so the radius moves by about as much.
    expect(Math.abs(cell('ee50_radius_m') - ref) / ref).toBeLessThan(3e-3);
  });
  it('a pinhole detector as wide as the first dark ring reads 83.8 % (Born & Wolf §8.5.2), to 0.2 %', () => {
    const ref = 1 - besselj0(v0) ** 2;
    expect(ref).toBeCloseTo(0.8378, 4);
    expect(Math.abs(cell('detector1_fraction') - ref) / ref).toBeLessThan(2e-3);
  });
  it('peak intensity (πD²/4λz)², relative to the incident irradiance (Born & Wolf §8.5.2), to 0.2 %', () => {
    const ref = ((Math.PI * D * D) / (4 * lam * z)) ** 2;
    expect(Math.abs(cell('peak_intensity') - ref) / ref).toBeLessThan(2e-3);
  });
});
