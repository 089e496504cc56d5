// Property test over random binary phase gratings (random-phase-gratings.ts, its own seed): every
// case either matches the exact scalar reference (the 1-D Rayleigh–Sommerfeld integral; Goodman,
// Introduction to Fourier Optics, §3.5) within 5 % of the reference's peak, or carries a warning
// that the computed values may be off. Runner, comparison and classes: random-cases.test.ts. Cases
// over PHASE_GRATING_WORK_LIMIT (3e7 work units; see random-phase-gratings.ts) are counted, not run.
import { beforeAll, describe, expect, it } from 'vitest';
import { countTable, describeOutcome, isFailure, runInChildren, type Outcome } from './random-cases.js';
import { drawPhaseGratings, PHASE_GRATING_CASE_COUNT, PHASE_GRATING_SEED, PHASE_GRATING_WORK_LIMIT } from './random-phase-gratings.js';

let outcomes: Outcome[] = [];

beforeAll(async () => {
  outcomes = await runInChildren(drawPhaseGratings(PHASE_GRATING_SEED, PHASE_GRATING_CASE_COUNT).map((d) => ({ ...d, workLimit: PHASE_GRATING_WORK_LIMIT })));
  if (process.env.SPOTCAST_RANDOM_REPORT) {
    for (const o of outcomes) console.log((isFailure(o) ? 'FAIL ' : '     ') + describeOutcome(o));
  }
  console.log(`random binary phase gratings, seed ${PHASE_GRATING_SEED}, ${PHASE_GRATING_CASE_COUNT} cases, work bound ${PHASE_GRATING_WORK_LIMIT.toExponential(1)}\n${countTable(outcomes)}`);
}, 900_000);

describe(`random binary phase gratings against the exact reference (seed ${PHASE_GRATING_SEED})`, () => {
  it('ran every drawn case to an outcome, and compared a good share of them', () => {
    expect(outcomes.length).toBe(PHASE_GRATING_CASE_COUNT);
    expect(outcomes.filter((o) => o.status === 'compared').length).toBeGreaterThan(PHASE_GRATING_CASE_COUNT / 5);
  });

  it('has no case more than 5 % off the reference without an accuracy warning', () => {
    const failures = outcomes.filter(isFailure).map((o) => describeOutcome(o));
    if (failures.length) console.log(`${failures.length} case(s) more than 5 % off without an accuracy warning:\n${failures.join('\n')}`);
    expect(failures).toEqual([]);
  });
});
