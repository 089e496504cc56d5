// Property test over random planes in sequence (random-sequences.ts, its own seed): coaxial circular
// openings and thin lenses, 2–3 planes, under a plane wave or a Gaussian beam. Each case either
// matches the Fresnel reference (test/reference/coaxial-fresnel.ts: nested Hankel-form Fresnel
// integrals, Goodman, Introduction to Fourier Optics, §4.2) within 2 % of the reference's peak over
// the compared points (the screen's axis, the computed peak, points along the middle row), or
// carries a warning that the computed values may be off (the catalogue's codes with accuracy:
// true). Cases the planner refuses, that cost more than the work bound, or with an exact
// ('spectrum') leg steeper than the paraxial reference reaches are counted, not compared.
import { beforeAll, describe, expect, it } from 'vitest';
import { ACCURACY_CODES } from '../../src/warnings/catalogue.js';
import {
  describeSequenceOutcome,
  drawSequences,
  isSequenceFailure,
  runSequence,
  SEQUENCE_CASE_COUNT,
  SEQUENCE_SEED,
  sequenceCounts,
  type SequenceOutcome,
} from './random-sequences.js';

let outcomes: SequenceOutcome[] = [];

beforeAll(() => {
  outcomes = drawSequences(SEQUENCE_SEED, SEQUENCE_CASE_COUNT).map((d) => runSequence(d, ACCURACY_CODES));
  if (process.env.SPOTCAST_RANDOM_REPORT) for (const o of outcomes) console.log((isSequenceFailure(o) ? 'FAIL ' : '     ') + describeSequenceOutcome(o));
  console.log(`random sequences, seed ${SEQUENCE_SEED}, ${SEQUENCE_CASE_COUNT} cases\n${sequenceCounts(outcomes)}`);
}, 300_000);

describe(`random planes in sequence against the coaxial Fresnel reference (seed ${SEQUENCE_SEED})`, () => {
  it('compared a good share of the drawn cases, with both leg forms and both kinds of light among them', () => {
    const compared = outcomes.filter((o) => o.status === 'compared');
    // Not an accuracy claim: a guard that the comparison did not silently stop comparing.
    expect(compared.length).toBeGreaterThanOrEqual(SEQUENCE_CASE_COUNT / 3);
    expect(compared.some((o) => o.forms!.includes('spectrum'))).toBe(true);
    expect(compared.some((o) => o.forms!.split(',').every((f) => f === 'sum'))).toBe(true);
    expect(compared.some((o) => Number.isFinite(o.d.system.w))).toBe(true);
    expect(compared.some((o) => !Number.isFinite(o.d.system.w))).toBe(true);
    expect(compared.some((o) => o.d.system.planes.some((p) => p.focal !== undefined))).toBe(true);
    expect(compared.some((o) => o.d.system.planes.length === 3)).toBe(true);
  });

  it('has no case more than 2 % of the peak off without an accuracy warning', () => {
    const failures = outcomes.filter((o) => isSequenceFailure(o, 0.02)).map(describeSequenceOutcome);
    if (failures.length) console.log(`${failures.length} case(s) more than 2 % off without an accuracy warning:\n${failures.join('\n')}`);
    expect(failures).toEqual([]);
  });
});

describe('cases other seeds found silently off, now within 2 % of the peak', () => {
  // Near-field views of an opening lit by a 'sum' leg that sampled the hard-edged opening before it
  // at 2 samples per period of its integrand: each plane's passed power agreed with the reference's
  // to 0.2 %, the pattern was 2.4–9.5 % off. Sums from a plane with edges in the light now take 4
  // (plan/sequence.ts EDGE_SUM_OVERSAMPLING): measured 0.42 %, 0.45 % and 0.44 % of the peak
  // (`SPOTCAST_SEQUENCE_WORK=3e10 node test/physics/random-sequences-report.mjs 30 11`, `… 60
  // 20261203`, `… 60 777`: cases 24, 5 and 17). The last two are over this test's work bound and
  // are checked by those commands only; the first runs here.
  it('seed 11 case 24 (a Gaussian beam through 123 µm, 2.46 mm and 7.63 mm openings): within 2 % of the peak or warned', () => {
    const d = drawSequences(11, 25)[24]!;
    const o = runSequence(d, ACCURACY_CODES);
    expect(o.status).toBe('compared');
    expect(isSequenceFailure(o, 0.02)).toBe(false);
  });
});
