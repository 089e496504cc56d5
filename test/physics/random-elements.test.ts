// Property test over random polygons, combinations and arrays (random-elements.ts, its own seed):
// every case either matches the exact scalar reference (test/reference/: the first
// Rayleigh–Sommerfeld solution; Goodman, Introduction to Fourier Optics, §3.5) within 5 % of the
// reference's peak, or carries a warning that the computed values may be off. The runner, the
// comparison and the classes are those of random-cases.test.ts. 70 cases under a work bound of 3e8
// (ELEMENT_CASE_COUNT, ELEMENT_WORK_LIMIT: see random-elements.ts for why these still span the space).
import { beforeAll, describe, expect, it } from 'vitest';
import { countTable, describeOutcome, isFailure, runInChildren, type Outcome } from './random-cases.js';
import { drawElementCases, ELEMENT_CASE_COUNT, ELEMENT_SEED, ELEMENT_WORK_LIMIT } from './random-elements.js';

let outcomes: Outcome[] = [];

beforeAll(async () => {
  outcomes = await runInChildren(drawElementCases(ELEMENT_SEED, ELEMENT_CASE_COUNT).map((d) => ({ ...d, workLimit: ELEMENT_WORK_LIMIT })));
  if (process.env.SPOTCAST_RANDOM_REPORT) {
    for (const o of outcomes) console.log((isFailure(o) ? 'FAIL ' : '     ') + describeOutcome(o));
  }
  console.log(`random elements, seed ${ELEMENT_SEED}, ${ELEMENT_CASE_COUNT} cases, work bound ${ELEMENT_WORK_LIMIT.toExponential(1)}\n${countTable(outcomes)}`);
}, 900_000);

describe(`random polygons, combinations and arrays against the exact references (seed ${ELEMENT_SEED})`, () => {
  it('ran every drawn case to an outcome, and compared a good share of them', () => {
    expect(outcomes.length).toBe(ELEMENT_CASE_COUNT);
    // Not an accuracy claim: a guard that the comparison did not silently stop comparing.
    expect(outcomes.filter((o) => o.status === 'compared').length).toBeGreaterThan(ELEMENT_CASE_COUNT / 5);
  });

  it('has no case more than 5 % off the reference without an accuracy warning', () => {
    const failures = outcomes.filter(isFailure).map((o) => describeOutcome(o));
    if (failures.length) console.log(`${failures.length} case(s) more than 5 % off without an accuracy warning:\n${failures.join('\n')}`);
    expect(failures).toEqual([]);
  });
});
