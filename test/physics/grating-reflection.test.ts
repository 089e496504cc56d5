// Reflection gratings (elements/grating.ts, reflective: true): computed unfolded about the grating's
// plane as a transmission grating under the same tilt, a groove depth h taken as an optical path
// 2h·cos θ_i. Checked: the Littrow angle against the grating equation, and a blazed reflection
// grating used in Littrow against scalar thin-grating theory (Goodman, Introduction to Fourier
// Optics, §4.4: a sawtooth of α waves sends sinc²(m − α) into order m) and the blaze condition
// mλ_B = 2d·sin θ_B for Littrow use (Palmer, Diffraction Grating Handbook, ch. 9; from memory).
import { describe, expect, it } from 'vitest';
import { ordersWithAnswers, reflectionDepthWarnings, REFLECTION_DEPTH_TOLERANCE, SIGN_CONVENTION } from '../../src/analysis/grating-answers.js';
import { isAccuracyWarning } from '../../src/warnings/catalogue.js';
import { expandJob } from '../../src/job/expand.js';
import { parseJobText } from '../../src/job/load.js';
import { ordersCsv, resultJson } from '../../src/output/case-output.js';
import { planCase } from '../../src/plan/planner.js';
import { orderTable } from '../../src/report/assemble.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { testContext } from '../engine.js';
import { nm } from '../helpers.js';

const deg = Math.PI / 180;
const sinc = (u: number) => (u === 0 ? 1 : Math.sin(Math.PI * u) / (Math.PI * u));

function runJob(text: string) {
  return expandJob(parseJobText(text).spec).map((c) => {
    const plan = planCase(c);
    return { plan, rec: runPlannedCase(plan, testContext()) };
  });
}

describe('the Littrow angle of a 1200 lines/mm reflection grating at 633 nm', () => {
  const d = 1e-3 / 1200;
  const lam = 633 * nm;
  const thetaL = Math.asin(lam / (2 * d));
  // Lit at the first order's Littrow incidence θ_i = −θ_L (an invented bench: a laser tuned by a
  // grating in Littrow).
  const [{ plan, rec }] = runJob(
    `name: littrow
wavelength: 633 nm
distance: 1 m
method: fraunhofer
aperture: {shape: grating, profile: blazed, depth: '200 nm', period: ${d * 1e3} mm, count: 60, reflective: true}
illumination: {kind: plane, tilt: ['${-(thetaL / deg)} deg', 0]}
`,
  );
  const orders = ordersWithAnswers(plan, rec.metrics.orders!);
  const order = (m: number) => orders.find((o) => o.m === m)!;
  it('gives sin θ_L = mλ/(2d) per order (null where it exceeds 1), and at θ_i = −θ_L the grating equation sends order 1 back along the incident beam, θ_1 = −θ_i', () => {
    expect(order(1).littrowAngle!).toBeCloseTo(thetaL, 12);
    expect(order(0).littrowAngle).toBeCloseTo(0, 15);
    // Order ±2: sin θ_L = ±λ/d = ±0.76, it exists; ±3: ±1.14, none.
    for (const o of orders) {
      const s = (o.m * lam) / (2 * d);
      if (Math.abs(s) <= 1) expect(o.littrowAngle!).toBeCloseTo(Math.asin(s), 12);
      else expect(o.littrowAngle).toBeNull();
    }
    // Grating equation sin θ_m = sin θ_i + mλ/d (Born & Wolf §8.6.1) at sin θ_i = −λ/(2d).
    expect(order(1).sinAngle).toBeCloseTo(Math.sin(thetaL), 12);
    expect(order(1).angle!).toBeCloseTo(-plan.case.illumination.tilt[0], 12);
    // The zero order is the mirror reflection, unfolded: it keeps the incident direction cosine.
    expect(order(0).sinAngle).toBeCloseTo(-Math.sin(thetaL), 12);
  });
  it('states the sign convention in result.json and the report, and gives the Littrow angle in orders.csv and the order table', () => {
    const json = resultJson({ ...rec, plan }) as { metrics: { spectroscopy: { convention: string; reflective: boolean }; orders: { m: number; littrowAngle?: number }[] } };
    expect(json.metrics.spectroscopy.convention).toBe(SIGN_CONVENTION);
    expect(json.metrics.spectroscopy.reflective).toBe(true);
    expect(json.metrics.orders.find((o) => o.m === 1)!.littrowAngle).toBeCloseTo(thetaL, 12);
    expect(SIGN_CONVENTION).toMatch(/θ_m = −θ_i/);
    const csv = ordersCsv(orders).trim().split('\n');
    const head = csv[0]!.split(',');
    const row1 = csv.find((l) => l.startsWith('1,'))!.split(',');
    expect(Number(row1[head.indexOf('littrow_angle_rad')])).toBeCloseTo(thetaL, 9);
    const t = orderTable({ plan, metrics: rec.metrics, warnings: rec.warnings, seconds: 0 });
    const col = t.header.indexOf('Littrow angle');
    expect(col).toBeGreaterThan(0);
    expect(t.rows.find((r) => r[0] === 1)![col]).toBe(`${Number(((thetaL * 180) / Math.PI).toPrecision(5))}°`);
    expect(t.note).toContain(SIGN_CONVENTION);
  });
});

describe('a blazed reflection grating used in Littrow peaks at its blaze wavelength', () => {
  // Facet angle θ_B = 5° on a 4 µm period: groove depth h = d·tan θ_B, blaze wavelength in Littrow
  // λ_B = 2d·sin θ_B = 697.2 nm. The incidence is fixed at λ_B's first-order Littrow angle, θ_i = −θ_B.
  const d = 4e-6;
  const thetaB = 5 * deg;
  const h = d * Math.tan(thetaB);
  const lamB = 2 * d * Math.sin(thetaB);
  const factors = [0.8, 0.9, 1, 1.1, 1.25];
  const runs = runJob(
    `name: blaze
wavelength: [${factors.map((f) => `${(f * lamB) / nm} nm`).join(', ')}]
distance: 1 m
method: fraunhofer
window: 0.6 m
aperture: {shape: grating, profile: blazed, depth: '${h / nm} nm', period: 4 um, count: 50, reflective: true}
illumination: {kind: plane, tilt: ['-5 deg', 0]}
`,
  );
  const first = runs.map(({ rec }) => rec.metrics.orders!.find((o) => o.m === 1)!);
  it('sends all the light into order 1 at λ_B, back along the incident beam (θ_1 = −θ_i): the groove\'s path 2h·cos θ_B is one wave there', () => {
    const atBlaze = first[factors.indexOf(1)]!;
    expect(atBlaze.angle!).toBeCloseTo(thetaB, 9);
    // Budget: thin-grating theory gives exactly 1; the computed order's interval (half-way to its
    // neighbours) misses its 50-period line's sinc² tails beyond ±N/2 zeros, at most
    // 2·∫_{25}^∞ sinc²(u) du ≈ 2/(25π²) = 0.8 % (measured: 0.4 % at every wavelength here).
    expect(atBlaze.fractionOfTransmitted!).toBeGreaterThan(0.99);
    expect(runs[factors.indexOf(1)]!.plan.case.aperture).toMatchObject({ profile: { kind: 'blazed', depth: expect.closeTo(1, 12) } });
  });
  it('measures sinc²(1 − λ_B/λ) in order 1 at the other wavelengths (within 1 % of the transmitted power, the same budget), each below the blaze\'s', () => {
    first.forEach((o, i) => {
      const alpha = lamB / (factors[i]! * lamB);
      expect(Math.abs(o.fractionOfTransmitted! - sinc(1 - alpha) ** 2)).toBeLessThan(0.01);
      if (factors[i] !== 1) expect(o.fractionOfTransmitted!).toBeLessThan(first[factors.indexOf(1)]!.fractionOfTransmitted! - 0.02);
    });
  });
});

describe('the warning where a reflection grating\'s groove phase is taken far from an order\'s own', () => {
  it('is quiet for the blazed grating used in Littrow (orders 0 and 1 leave along the specular and Littrow directions)', () => {
    const d = 4e-6;
    const h = d * Math.tan(5 * deg);
    const [{ plan, rec }] = runJob(
      `name: quiet\nwavelength: ${(2 * d * Math.sin(5 * deg)) / nm} nm\ndistance: 1 m\nmethod: fraunhofer\nwindow: 0.6 m\naperture: {shape: grating, profile: blazed, depth: '${h / nm} nm', period: 4 um, count: 50, reflective: true}\nillumination: {kind: plane, tilt: ['-5 deg', 0]}\n`,
    );
    expect(reflectionDepthWarnings(plan, rec.metrics.orders!)).toEqual([]);
    expect(rec.warnings.map((k) => k.code)).not.toContain('reflection-depth-oblique');
  });
  it('fires (accuracy) for a one-wave blazed reflection grating of 2 µm at 633 nm lit normally: order 1 leaves at 18.5° and meets h·(1 + cos θ_1)/λ, 0.026 wave short of the computed 2h/λ', () => {
    const text = (extra: string) =>
      `name: oblique\nwavelength: 633 nm\ndistance: 1 m\nmethod: fraunhofer\nwindow: 2 m\naperture: {shape: grating, profile: blazed, depth: '316.5 nm', period: 2 um, count: 50${extra}}\n`;
    const [{ plan, rec }] = runJob(text(', reflective: true'));
    const w = reflectionDepthWarnings(plan, rec.metrics.orders!);
    expect(w).toHaveLength(1);
    // The run carries it (analysis/order-checks.ts adds it to the order checks' warnings).
    expect(rec.warnings).toContainEqual(w[0]);
    expect(isAccuracyWarning(w[0]!.code)).toBe(true);
    // Independently: h = λ/2 (2h = one wave at normal incidence), path h·(cos 0 + cos θ_1) for
    // order 1, sin θ_1 = λ/d (Born & Wolf §8.6.1).
    const lam = 633 * nm;
    const cos1 = Math.sqrt(1 - (lam / 2e-6) ** 2);
    const short = (lam / 2) * (2 - (1 + cos1)) / lam;
    expect(short).toBeGreaterThan(REFLECTION_DEPTH_TOLERANCE);
    expect(w[0]!.message).toContain(`${Number(short.toPrecision(2))} wave at order 1`);
    // The same grating in transmission has no such warning (its depth is the optical path given).
    const [t] = runJob(text(''));
    expect(reflectionDepthWarnings(t!.plan, t!.rec.metrics.orders!)).toEqual([]);
    expect(t!.rec.warnings.map((k) => k.code)).not.toContain('reflection-depth-oblique');
  });
});
