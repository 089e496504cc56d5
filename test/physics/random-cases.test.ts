// Property test over random cases: every case the job schema accepts must either match the exact
// scalar reference (test/reference/: first Rayleigh–Sommerfeld solution; Goodman, Introduction to
// Fourier Optics, §3.5) within 5 % of the reference's peak, or carry a warning that says the
// computed values may be off (ACCURACY_WARNINGS in random-cases.ts; edit the list there).
//
// The draw (random-cases.ts, seed SEED) covers circles, rectangles, slits with and without length,
// annuli and sets of slits, open or opaque, 250 nm–10 µm, sizes λ–10 mm, distances 2λ–100 m, plane
// waves (sometimes tilted up to ±30° in x) and Gaussian beams (waist 0.2–5× the aperture). Each case
// is planned with planCase and run with runPlannedCase as test/helpers.ts runCase does, in child
// processes (a plan that never ends has been seen; such a case is counted as timed out). Cases the
// planner refuses, whose plan's work estimate exceeds TEST_WORK_LIMIT (1.5e8 work units, below the
// reports' WORK_LIMIT of 4e8: half the time, and 104 of the 116 comparisons kept, every method in
// 1-D and 2-D among them), or for which no reference is affordable are counted, not compared.
//
// The error of a case is max |I − I_ref| / max I_ref over the compared points: 1-D, up to 200 output
// samples evenly spread; 2-D, samples of the output grid's row and column through the axis.
//
// To see every case, one line each:  node test/physics/random-report.mjs [count] [seed]
// or run this file with SPOTCAST_RANDOM_REPORT=1 (prints every case, then the counts).
import { beforeAll, describe, expect, it } from 'vitest';
import {
  ACCURACY_WARNINGS,
  CASE_COUNT,
  SEED,
  TEST_WORK_LIMIT,
  countTable,
  describeOutcome,
  drawCases,
  isFailure,
  runInChildren,
  runRandomCase,
  type DrawnCase,
  type Outcome,
} from './random-cases.js';

let outcomes: Outcome[] = [];

beforeAll(async () => {
  outcomes = await runInChildren(drawCases(SEED, CASE_COUNT).map((d) => ({ ...d, workLimit: TEST_WORK_LIMIT })));
  if (process.env.SPOTCAST_RANDOM_REPORT) {
    for (const o of outcomes) console.log((isFailure(o) ? 'FAIL ' : '     ') + describeOutcome(o));
  }
  console.log(`random cases, seed ${SEED}, ${CASE_COUNT} cases, work bound ${TEST_WORK_LIMIT.toExponential(1)}; accuracy warnings: ${ACCURACY_WARNINGS.join(', ')}\n${countTable(outcomes)}`);
}, 900_000);

describe(`random cases against the exact references (seed ${SEED})`, () => {
  it('ran every drawn case to an outcome, and compared a good share of them with a reference', () => {
    expect(outcomes.length).toBe(CASE_COUNT);
    expect(outcomes.every((o) => o !== undefined)).toBe(true);
    // Not an accuracy claim: a guard that the comparison did not silently stop comparing.
    expect(outcomes.filter((o) => o.status === 'compared').length).toBeGreaterThan(CASE_COUNT / 4);
  });

  it('has no case more than 5 % off the reference without an accuracy warning', () => {
    const failures = outcomes.filter(isFailure).map((o) => describeOutcome(o));
    if (failures.length) console.log(`${failures.length} case(s) more than 5 % off without an accuracy warning:\n${failures.join('\n')}`);
    expect(failures).toEqual([]);
  });
});

// Cases other seeds found (seed 2026 of `random-report.mjs 200 2026`), kept so that they stay
// fixed: a rectangle whose narrow side (1.3λ, 2.2λ) sends light to 30°–60° while its wide side is
// in the near field, chosen for Fresnel and 8 % and 3.5 % off unwarned (the planner's light model
// gave a far-field axis a spike 1/D over its tiny footprint, against which the wide-angle light
// weighed nothing); a sparse set of four wires whose wide-angle light comes from every wire's
// edges, not the set's outline (2.5 % off at 1.4°).
describe('random cases found by other seeds, against the exact references', () => {
  const found: [string, DrawnCase['spec']][] = [
    ['#109: rectangle 4.18 µm × 370 µm, 3.26 µm, 6.2 mm', { wavelength: 3.257458293691932e-6, distance: 0.00620139266797446, aperture: { shape: 'rectangle', width: 4.176808419445655e-6, height: 3.6968127532504034e-4, opaque: false }, illumination: { kind: 'plane', tilt: [0, 0] } }],
    ['#148: rectangle 38.3 µm × 1.69 µm, 776 nm, 0.95 mm', { wavelength: 7.764491298411454e-7, distance: 9.504886890909075e-4, aperture: { shape: 'rectangle', width: 3.8318367060083305e-5, height: 1.6897737106132203e-6, opaque: false }, illumination: { kind: 'plane', tilt: [0, 0] } }],
    // Seed 20261206: a Gaussian beam a quarter of λ wide beside a wire, so only its tail (e-fold
    // 0.11 µm) passes: sampled at w/8 it was 6.6 % off, unwarned.
    ['#54: opaque slit 4.44 µm in a 0.71 µm beam tilted −8.9°, 2.69 µm, 218 mm', { wavelength: 2.68928806667331e-6, distance: 0.21844852868661443, aperture: { shape: 'slit', width: 4.436677645698572e-6, opaque: true }, illumination: { kind: 'gaussian', waist: 7.077156965550549e-7, tilt: [-0.15551401789734975, 0] } }],
    ['#116: four opaque wires of 102 µm at 598 µm, 1.03 µm, 15.8 m', { wavelength: 1.0302054920661494e-6, distance: 15.787954850262944, aperture: { shape: 'slits', count: 4, width: 1.0202899033157213e-4, period: 5.980763054960332e-4, opaque: true }, illumination: { kind: 'plane', tilt: [0, 0] } }],
  ];
  it.each(found)('%s: within 2 % of the peak, or warned (or, beyond the test\'s work limit, not planned paraxially)', (_, spec) => {
    const o = runRandomCase({ index: 0, spec });
    if (o.status === 'too-much-work') {
      // #109 now takes the exact sums (about 1e9 work units), over this test's limit.
      expect(o.plan!.method).not.toBe('fresnel');
      return;
    }
    expect(o.status).toBe('compared');
    if (!o.warned) expect(o.error!).toBeLessThan(0.02);
  });
});
