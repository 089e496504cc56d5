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

describe('cases found silently off by other seeds (kept here, failing, until the planner answers them)', () => {
  // Both are near-field views of an opening lit by the light of a 'sum' leg whose input lattice
  // gives about 2 samples per period of that leg's integrand at the lit opening's edge (its chirp
  // plus the cross term to the far side of the output window); each plane's passed power agrees
  // with the reference's to 0.2 %, the intensity pattern does not. Moving the screen away shrinks
  // the error (the fine structure it comes from washes out).
  const found = [
    // `random-sequences-report.mjs 30 11`, case 24: a Gaussian beam (w 61.6 µm, λ 1.73 µm) through a
    // 123 µm opening, 188 mm to a 2.46 mm opening, 1.28 m to a 7.63 mm opening, the screen 624 mm
    // on (legs sum, sum, spectrum): the axis 2.4 % of the peak above the reference, unwarned.
    { seed: 11, index: 24 },
    // `random-sequences-report.mjs 60 20261203`, case 5: a plane wave (λ 390 nm) through a 3.18 mm
    // opening, 1.33 m to a 1.89 mm opening, the screen 81 mm on (legs sum, spectrum): 5.9 % of the
    // peak above the reference 20 µm off the axis, unwarned.
    { seed: 20261203, index: 5 },
    // `random-sequences-report.mjs 60 777`, case 17: a plane wave (λ 356 nm) through a 571 µm
    // opening, 114 mm to a 1.75 mm opening, 1.75 m to a 4.52 mm opening, the screen 115 mm on (legs
    // sum, sum, spectrum): the axis 9.5 % of the peak below the reference, unwarned.
    { seed: 777, index: 17 },
  ];
  for (const f of found) {
    it.fails(`seed ${f.seed} case ${f.index}: within 2 % of the peak or warned`, () => {
      const d = drawSequences(f.seed, f.index + 1)[f.index]!;
      const o = runSequence(d, ACCURACY_CODES);
      console.log(describeSequenceOutcome(o));
      expect(o.status).toBe('compared');
      expect(isSequenceFailure(o, 0.02)).toBe(false);
    });
  }
});
