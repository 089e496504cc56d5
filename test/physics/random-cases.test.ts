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
// planner refuses, whose plan's work estimate exceeds WORK_LIMIT, or for which no reference is
// affordable are counted, not compared.
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
  countTable,
  describeOutcome,
  drawCases,
  isFailure,
  runInChildren,
  type Outcome,
} from './random-cases.js';

let outcomes: Outcome[] = [];

beforeAll(async () => {
  outcomes = await runInChildren(drawCases(SEED, CASE_COUNT));
  if (process.env.SPOTCAST_RANDOM_REPORT) {
    for (const o of outcomes) console.log((isFailure(o) ? 'FAIL ' : '     ') + describeOutcome(o));
  }
  console.log(`random cases, seed ${SEED}, ${CASE_COUNT} cases; accuracy warnings: ${ACCURACY_WARNINGS.join(', ')}\n${countTable(outcomes)}`);
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
