// Property test over random cases lit by several wavelengths at once (random-spectra.ts, seed
// SPECTRA_SEED): every case the planner accepts must either match Σ wᵢ·I_ref(λᵢ), the weighted sum
// of the exact scalar references at its lines' wavelengths (test/reference/: first
// Rayleigh–Sommerfeld solution; Goodman, Introduction to Fourier Optics, §3.5; incoherent lines add
// in intensity, Born & Wolf, Principles of Optics, §7.5.8, from memory), within 5 % of that sum's
// peak, or carry a warning that says the computed values may be off (ACCURACY_CODES,
// src/warnings/catalogue.ts).
//
// The draw is random-cases.ts drawCases' (circles, rectangles, annuli, slits with and without
// length, sets of slits, open or opaque; plane or Gaussian light, some tilted), each with two or
// three lines within ±20 % of its wavelength and random powers, or a flat band of 3–5 samples;
// and drawDispersing's gratings (sets of 5–60 slits a few to 30 wavelengths apart, 1–50 mm away)
// in a narrow band or close lines, where the lines land apart and the planner refines a band.
// Cases the planner refuses, whose plan (all lines together) exceeds SPECTRA_WORK_LIMIT, or whose
// reference is over its budget at some line are counted, not compared. Cases run in child
// processes (a case that does not come back is counted as timed out).
//
// Besides the values: the lines computed are the light's (worked out in random-spectra.ts, not by
// the tool), every line's plan delivers onto the case's one output grid, and where a line is
// computed on an FFT lattice the grid's step is a whole number of lattice steps and its points are
// lattice points (nothing interpolated).
//
// Every case, one line each: SPOTCAST_RANDOM_REPORT=1 npx vitest run test/physics/random-spectra.test.ts
import { beforeAll, describe, expect, it } from 'vitest';
import {
  DISPERSING_CASE_COUNT,
  SPECTRA_CASE_COUNT,
  SPECTRA_SEED,
  SPECTRA_WORK_LIMIT,
  describeSpectrumOutcome,
  drawDispersing,
  drawSpectra,
  isSpectrumFailure,
  runSpectraInChildren,
  spectrumCountTable,
  type SpectrumOutcome,
} from './random-spectra.js';

let outcomes: SpectrumOutcome[] = [];
const TOTAL = SPECTRA_CASE_COUNT + DISPERSING_CASE_COUNT;

beforeAll(async () => {
  outcomes = await runSpectraInChildren([...drawSpectra(SPECTRA_SEED, SPECTRA_CASE_COUNT), ...drawDispersing(SPECTRA_SEED, DISPERSING_CASE_COUNT)]);
  if (process.env.SPOTCAST_RANDOM_REPORT) {
    for (const o of outcomes) console.log((isSpectrumFailure(o) ? 'FAIL ' : '     ') + describeSpectrumOutcome(o));
  }
  console.log(`random spectra, seed ${SPECTRA_SEED}, ${SPECTRA_CASE_COUNT} drawn cases and ${DISPERSING_CASE_COUNT} gratings, work limit ${SPECTRA_WORK_LIMIT.toExponential(1)}\n${spectrumCountTable(outcomes)}`);
}, 300_000);

describe(`random cases in several wavelengths against the weighted exact references (seed ${SPECTRA_SEED})`, () => {
  it('ran every drawn case to an outcome, and compared a good share of them, bands and FFT lattices among them', () => {
    expect(outcomes.length).toBe(TOTAL);
    expect(outcomes.every((o) => o !== undefined)).toBe(true);
    const compared = outcomes.filter((o) => o.status === 'compared');
    // Not accuracy claims: guards that the comparison did not silently stop comparing.
    expect(compared.length).toBeGreaterThan(TOTAL / 4);
    expect(compared.filter((o) => o.draw.spectrum.kind === 'band').length).toBeGreaterThan(0);
    // A band whose samples the planner refined (more lines than asked) among them.
    expect(compared.filter((o) => o.draw.spectrum.kind === 'band' && o.lines! > o.draw.spectrum.samples).length).toBeGreaterThan(0);
    expect(compared.filter((o) => !o.oneD).length).toBeGreaterThan(0);
    expect(compared.reduce((t, o) => t + (o.fftMembers ?? 0), 0)).toBeGreaterThan(0);
  });

  it('has no case more than 5 % off the weighted reference without an accuracy warning', () => {
    const failures = outcomes.filter(isSpectrumFailure).map(describeSpectrumOutcome);
    if (failures.length) console.log(`${failures.length} case(s) more than 5 % off without an accuracy warning:\n${failures.join('\n')}`);
    expect(failures).toEqual([]);
  });

  it('computes the lines the light stands for: lines as given (powers over their total), a band at the midpoints of its samples', () => {
    const wrong = outcomes.filter((o) => o.lineProblems?.length).map((o) => `${describeSpectrumOutcome(o)}: ${o.lineProblems!.join('; ')}`);
    expect(wrong).toEqual([]);
  });

  it('puts every line on the case\'s one output grid; an FFT line\'s grid step is a whole number of its lattice steps', () => {
    const checked = outcomes.filter((o) => o.gridProblems !== undefined);
    expect(checked.length).toBeGreaterThan(TOTAL / 4);
    const wrong = checked.filter((o) => o.gridProblems!.length).map((o) => `${describeSpectrumOutcome(o)}: ${o.gridProblems!.join('; ')}`);
    expect(wrong).toEqual([]);
  });
});
