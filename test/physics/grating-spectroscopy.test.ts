// The spectroscopy answers of a grating case (analysis/grating-answers.ts): the linear dispersion in
// a camera lens's focal plane, and order sorting for the range the job will use, from job files
// through the planner and the tool's own order tables.
import { describe, expect, it } from 'vitest';
import { gratingUse, orderUseAnswer, ordersWithAnswers } from '../../src/analysis/grating-answers.js';
import { expandJob } from '../../src/job/expand.js';
import { parseJobText } from '../../src/job/load.js';
import { planCase } from '../../src/plan/planner.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { testContext } from '../engine.js';
import { nm, um } from '../helpers.js';

const deg = Math.PI / 180;

/** Runs every case of a job text; returns plans and records. */
function runJob(text: string) {
  const cases = expandJob(parseJobText(text).spec);
  return cases.map((c) => {
    const plan = planCase(c);
    return { plan, rec: runPlannedCase(plan, testContext()) };
  });
}

describe.each([0, 20])('linear dispersion in the focal plane of a 200 mm camera lens at %i° incidence', (tiltDeg) => {
  // An invented bench: a 600 lines/mm test grating, 50 periods, read far away.
  const d = (1 / 600) * 1e-3;
  const lam = 550 * nm;
  const [{ plan, rec }] = runJob(
    `name: camera
wavelength: 550 nm
distance: 5 m
method: fraunhofer
aperture: {shape: grating, profile: sinusoidal-phase, phase: 2 rad, period: ${d * 1e3} mm, count: 50}
illumination: {kind: plane, tilt: ['${tiltDeg} deg', 0]}
orders: {focal_length: 200 mm}
`,
  );
  const orders = ordersWithAnswers(plan, rec.metrics.orders!);
  it('gives f·m/(d·cos θ_m) for each order that lands: the grating equation differenced over ±1 pm, times f (a camera lens aimed along the order maps angle to f·Δθ)', () => {
    const f = 0.2;
    const sinI = Math.sin(tiltDeg * deg);
    const landing = orders.filter((o) => o.angle !== null && o.m !== 0);
    expect(landing.length).toBeGreaterThan(0);
    for (const o of landing) {
      // Grating equation sin θ_m = sin θ_i + mλ/d (Born & Wolf §8.6.1).
      const theta = (l: number) => Math.asin(sinI + (o.m * l) / d);
      const numeric = (f * (theta(lam + 1e-12) - theta(lam - 1e-12))) / 2e-12;
      expect(o.focalDispersion! / numeric).toBeCloseTo(1, 6);
    }
    for (const o of orders.filter((k) => k.angle === null || k.m === 0)) expect(o.focalDispersion).toBeNull();
    expect(gratingUse(plan)!.focalLength).toBe(f);
  });
  it('is the flat screen\'s z·m/(d cos³θ_m) times cos²θ_m·f/z: the same dispersion seen at f instead of z, without the flat screen\'s obliquity', () => {
    for (const o of orders.filter((k) => k.angle !== null && k.m !== 0)) {
      expect(o.focalDispersion! / ((o.linearDispersion! * Math.cos(o.angle!) ** 2 * 0.2) / 5)).toBeCloseTo(1, 9);
    }
  });
});

describe('order sorting from the job\'s orders.use', () => {
  // An invented survey spectrometer: 300 lines/mm, used 400–700 nm in first order, light from a lamp
  // swept at 300 and 600 nm.
  const d = (1 / 300) * 1e-3;
  const runs = runJob(
    `name: sorting
wavelength: [300 nm, 600 nm]
distance: 2 m
method: fraunhofer
aperture: {shape: grating, profile: sinusoidal-phase, phase: 2.5 rad, period: ${d * 1e3} mm, count: 40}
orders: {use: {from: 400 nm, to: 700 nm, order: 1}}
`,
  );
  it('the tool puts the second order of 300 nm where the first order of 600 nm lands (2 × 300 = 1 × 600; common practice, any spectroscopy text)', () => {
    const at300 = runs[0]!.rec.metrics.orders!.find((o) => o.m === 2)!;
    const at600 = runs[1]!.rec.metrics.orders!.find((o) => o.m === 1)!;
    expect(at300.position! / at600.position!).toBeCloseTo(1, 12);
    // And the computed light is there: each case's order peaks at the same place, within 2 % of the
    // line's width λz/(Nd) (the parabolic vertex of the sampled peak; 8 samples per width).
    const width = (600 * nm * 2) / (40 * d);
    const peak = (r: (typeof runs)[number], x0: number) => {
      const c = r.rec.computed;
      let best = -1;
      for (let i = 1; i < c.nx - 1; i++) if (Math.abs(c.x0 + i * c.dx - x0) < width / 2 && (best < 0 || c.intensity[i]! > c.intensity[best]!)) best = i;
      const [a, b, e] = [c.intensity[best - 1]!, c.intensity[best]!, c.intensity[best + 1]!];
      return c.x0 + (best + (0.5 * (a - e)) / (a - 2 * b + e)) * c.dx;
    };
    expect(Math.abs(peak(runs[0]!, at300.position!) - peak(runs[1]!, at600.position!))).toBeLessThan(0.02 * width);
  });
  it('answers per case with the light of the sweep (300–600 nm): order 2 puts 300–350 nm on 400–700 nm; a long-pass cut-on in (350, 400] nm removes it', () => {
    for (const { plan } of runs) {
      const s = gratingUse(plan)!.orderSorting!;
      expect(s.light.map((v) => v / nm)).toEqual([expect.closeTo(300, 9), expect.closeTo(600, 9)]);
      expect(s.landsWhole).toBe(true);
      expect(s.overlaps.map((o) => o.order)).toEqual([2]);
      expect([s.overlaps[0]!.from / nm, s.overlaps[0]!.to / nm]).toEqual([expect.closeTo(300, 9), expect.closeTo(350, 9)]);
      expect(s.longPassNeeded).toBe(true);
      expect([s.longPass!.low / nm, s.longPass!.high / nm]).toEqual([expect.closeTo(350, 9), expect.closeTo(400, 9)]);
      expect(s.words).toMatch(/order 2 puts 300 nm – 350 nm there/);
      expect(s.words).toMatch(/long-pass filter with its cut-on in \(350 nm, 400 nm\]/);
    }
  });
  it('with one wavelength the light is the range itself: nothing else lands on 400–700 nm and no filter is needed', () => {
    const [{ plan }] = runJob(
      `name: one
wavelength: 550 nm
distance: 2 m
method: fraunhofer
aperture: {shape: grating, profile: sinusoidal-phase, phase: 2.5 rad, period: ${d * 1e3} mm, count: 40}
orders: {use: {from: 400 nm, to: 700 nm, order: 1}}
`,
    );
    const s = gratingUse(plan)!.orderSorting!;
    expect(s.light.map((v) => v / nm)).toEqual([expect.closeTo(400, 9), expect.closeTo(700, 9)]);
    expect(s.overlaps).toEqual([]);
    expect(s.words).toMatch(/no filter is needed/);
  });
  it('says "none" where the range is wider than the free spectral range (400–900 nm in first order, light 350–900 nm)', () => {
    const s = orderUseAnswer({ from: 400 * nm, to: 900 * nm, order: 1 }, [350 * nm, 900 * nm], { period: 10 * um, sinIncidence: 0 })!;
    expect(s.longPassNeeded).toBe(true);
    expect(s.longPass).toBeNull();
    expect(s.words).toMatch(/No long-pass filter removes the higher orders: the range is wider than the free spectral range/);
  });
  it('keeps to the part of the range that lands: 400–1200 nm in first order of a 1 µm grating at normal incidence lands below 1000 nm', () => {
    const s = orderUseAnswer({ from: 400 * nm, to: 1200 * nm, order: 1 }, [400 * nm, 1200 * nm], { period: 1 * um, sinIncidence: 0 })!;
    expect(s.landsWhole).toBe(false);
    expect(s.range[1] / nm).toBeCloseTo(1000, 6);
    expect(s.requested[1] / nm).toBeCloseTo(1200, 9);
    // At 30° incidence toward +x, order −1 lands up to (1 + sin 30°)·d = 1.5 µm: all of it.
    expect(orderUseAnswer({ from: 400 * nm, to: 1200 * nm, order: -1 }, [400 * nm, 1200 * nm], { period: 1 * um, sinIncidence: 0.5 })!.landsWhole).toBe(true);
    expect(orderUseAnswer({ from: 1100 * nm, to: 1200 * nm, order: 1 }, [400 * nm, 1200 * nm], { period: 1 * um, sinIncidence: 0 })).toBeNull();
  });
});

describe('end to end: a job with the spectroscopy keys writes the answers', () => {
  it('into result.json, orders.csv (columns with units) and the report\'s order table', async () => {
    const { mkdtemp, readFile, rm, writeFile } = await import('node:fs/promises');
    const { tmpdir } = await import('node:os');
    const { join } = await import('node:path');
    const { runJobFile } = await import('../../src/run/run-job.js');
    const dir = await mkdtemp(join(tmpdir(), 'spotcast-spectro-'));
    try {
      // An invented bench: a 600 l/mm blazed reflection coupon of 100 periods in a 25 µm beam, camera f = 150 mm.
      await writeFile(
        join(dir, 'job.yaml'),
        `name: bench-spectrograph
wavelength: 532 nm
distance: 1 m
method: fraunhofer
aperture: {shape: grating, profile: blazed, depth: '200 nm', period: 1.6667 um, count: 100, reflective: true}
illumination: {kind: gaussian, waist: 25 um, tilt: ['-9 deg', 0]}
orders: {focal_length: 150 mm, use: {from: 450 nm, to: 650 nm, order: 1}}
`,
      );
      const o = await runJobFile(join(dir, 'job.yaml'), { outDir: join(dir, 'out') });
      expect(o.error).toBeUndefined();
      expect(o.reportError).toBeUndefined();
      const id = (await import('node:fs')).readdirSync(o.folder!).find((f) => /^\d/.test(f))!;
      const json = JSON.parse(await readFile(join(o.folder!, id, 'result.json'), 'utf8'));
      const sp = json.metrics.spectroscopy;
      expect(sp.reflective).toBe(true);
      expect(sp.periodsRule).toBe('beam');
      // πw/(1.318·d) (analysis/resolving-power.ts), not the 100 periods of the coupon.
      expect(sp.illuminatedPeriods).toBeCloseTo((Math.PI * 25e-6) / (1.31806 * 1.6667e-6), 1);
      expect(sp.focalLength).toBeCloseTo(0.15, 12);
      expect(sp.orderSorting.words).toMatch(/450 nm – 650 nm in order 1/);
      const first = json.metrics.orders.find((k: { m: number }) => k.m === 1);
      expect(first.resolvingPower).toBeCloseTo(sp.illuminatedPeriods, 9);
      const csv = (await readFile(join(o.folder!, id, 'orders.csv'), 'utf8')).trim().split('\n');
      const head = csv[0]!.split(',');
      for (const h of ['resolving_power', 'smallest_resolvable_m', 'focal_linear_dispersion_mm_per_nm', 'littrow_angle_rad']) expect(head).toContain(h);
      const row = csv.find((l) => l.startsWith('1,'))!.split(',');
      expect(Number(row[head.indexOf('smallest_resolvable_m')])).toBeCloseTo(532e-9 / sp.illuminatedPeriods, 15);
      // f·m/(d cos θ_1) in mm per nm.
      const cos1 = Math.cos(first.angle);
      expect(Number(row[head.indexOf('focal_linear_dispersion_mm_per_nm')])).toBeCloseTo((0.15 / (1.6667e-6 * cos1)) * 1e-9 * 1e3, 9);
      const html = await readFile(join(o.folder!, 'report.html'), 'utf8');
      expect(html).toContain('smallest Δλ resolved, λ/R');
      expect(html).toContain('at f = 150 mm, per nm');
      expect(html).toContain('Littrow angle');
      expect(html).toContain('Order sorting: 450 nm – 650 nm in order 1');
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
