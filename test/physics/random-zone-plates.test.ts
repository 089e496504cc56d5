// Property test over random zone plates (random-zone-plates.ts, its own seed): the computed
// intensity on the axis either matches the exact on-axis reference (test/reference/rs2d.ts: the
// first Rayleigh–Sommerfeld solution for discs with signs; Goodman, Introduction to Fourier
// Optics, §3.5) within 2 % of the larger of the reference there and at the plate's first focus,
// or the case carries a warning that the computed values may be off (random-cases.ts
// ACCURACY_WARNINGS). Cases the planner refuses or that cost more than the bound below are counted,
// not compared. In process: the cases are small (the axis only, a window of a few focal spots).
import { testContext } from '../engine.js';
import { beforeAll, describe, expect, it } from 'vitest';
import { planCase } from '../../src/plan/planner.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { makeCase } from '../helpers.js';
import { roundOnAxisIntensity } from '../reference/rs2d.js';
import { ACCURACY_WARNINGS } from './random-cases.js';
import { drawZonePlates, ZONE_PLATE_CASE_COUNT, ZONE_PLATE_SEED, type DrawnZonePlate } from './random-zone-plates.js';

/** Cases whose plan estimates more work than this are skipped (about 2 s each at most). */
const WORK_BOUND = 2e9;

/** The plate as centred discs with signs: disc r_n weighs s_n − s_{n+1} (s_n = 1 open, −1 π-shifted, 0 closed or beyond). */
function discs(a: DrawnZonePlate['spec']['aperture']): { radius: number; sign: 1 | -1 }[] {
  const N = a.zones;
  const s = (n: number) => (n > N ? 0 : n % 2 === 1 ? 1 : a.kind === 'phase' ? -1 : 0);
  // Attwood, Soft X-Rays and EUV Radiation, ch. 9: r_n² = nλf + (nλ/2)², λ the design wavelength.
  const r = (n: number) => Math.sqrt(n * a.design * a.focal + (n * a.design * 0.5) ** 2);
  const out: { radius: number; sign: 1 | -1 }[] = [];
  for (let n = 1; n <= N; n++) {
    const w = s(n) - s(n + 1);
    for (let i = 0; i < Math.abs(w); i++) out.push({ radius: r(n), sign: w > 0 ? 1 : -1 });
  }
  return out;
}

interface Outcome {
  d: DrawnZonePlate;
  status: 'compared' | 'refused' | 'too-much-work';
  how?: string;
  error?: number;
  warned?: boolean;
  codes?: string[];
  values?: { I: number; ref: number; scale: number };
}

function run(d: DrawnZonePlate): Outcome {
  const plan = planCase(makeCase(d.spec));
  if (plan.error) return { d, status: 'refused', how: plan.error };
  if (plan.work > WORK_BOUND) return { d, status: 'too-much-work', how: `${plan.method} ${plan.work.toExponential(1)}` };
  const rec = runPlannedCase(plan, testContext());
  const c = rec.computed;
  const col = Math.round(c.center[0]);
  const row = Math.round(c.center[1]);
  if (Math.abs(c.center[0] - col) + Math.abs(c.center[1] - row) > 1e-9) throw new Error('the axis is not a sample of the window');
  const I = c.intensity[row * c.nx + col]!;
  const s = d.spec;
  const w = s.illumination!.kind === 'gaussian' ? s.illumination!.waist : Infinity;
  const ds = discs(s.aperture);
  const ref = roundOnAxisIntensity(s.wavelength, s.distance, ds, w, false);
  const focus = roundOnAxisIntensity(s.wavelength, (s.aperture.focal * s.aperture.design) / s.wavelength, ds, w, false);
  const scale = Math.max(ref, focus);
  const codes = rec.warnings.map((x) => x.code);
  return {
    d,
    status: 'compared',
    how: `${plan.method}${plan.form ? ` (${plan.form})` : ''}`,
    error: Math.abs(I - ref) / scale,
    warned: codes.some((x) => ACCURACY_WARNINGS.includes(x)),
    codes,
    values: { I, ref, scale },
  };
}

function words(o: Outcome): string {
  const s = o.d.spec;
  const a = s.aperture;
  const light = s.illumination!.kind === 'gaussian' ? `Gaussian w = ${(s.illumination!.waist * 1e6).toPrecision(3)} µm` : 'plane';
  const head = `#${o.d.index} ${a.kind} N=${a.zones} f=${(a.focal * 1e3).toPrecision(3)} mm λd=${(a.design * 1e9).toPrecision(3)} nm λ=${(s.wavelength * 1e9).toPrecision(3)} nm z=${(s.distance * 1e3).toPrecision(3)} mm ${light}`;
  if (o.status !== 'compared') return `${head}: ${o.status} (${o.how})`;
  return `${head}: ${o.how}, I=${o.values!.I.toPrecision(5)} ref=${o.values!.ref.toPrecision(5)} error ${(o.error! * 100).toPrecision(2)} % of ${o.values!.scale.toPrecision(4)}${o.codes!.length ? ` [${o.codes!.join(' ')}]` : ''}`;
}

let outcomes: Outcome[] = [];

beforeAll(() => {
  outcomes = drawZonePlates(ZONE_PLATE_SEED, ZONE_PLATE_CASE_COUNT).map(run);
  console.log(`random zone plates, seed ${ZONE_PLATE_SEED}:\n${outcomes.map(words).join('\n')}`);
}, 300_000);

describe(`random zone plates on the axis against the exact reference (seed ${ZONE_PLATE_SEED})`, () => {
  it('compared most of the drawn cases, both kinds among them', () => {
    const compared = outcomes.filter((o) => o.status === 'compared');
    expect(compared.length).toBeGreaterThanOrEqual(ZONE_PLATE_CASE_COUNT / 2);
    expect(compared.some((o) => o.d.spec.aperture.kind === 'phase')).toBe(true);
    expect(compared.some((o) => o.d.spec.aperture.kind === 'amplitude')).toBe(true);
  });
  it('has no case more than 2 % off without an accuracy warning', () => {
    const failures = outcomes.filter((o) => o.status === 'compared' && o.error! > 0.02 && !o.warned).map(words);
    expect(failures).toEqual([]);
  });
});
