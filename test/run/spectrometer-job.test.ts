// The spectrometer mapping end to end (src/job/spectrometer-keys.ts, plan/spectrometer.ts,
// metrics/spectrometer.ts, output/detector-files.ts): load errors by key path, the plan's words and
// refusals, the warning where thin-grating powers are unreliable, and the files a case writes.
// The physics of the detector is checked in test/physics/spectrometer.test.ts; here the numbers
// read back from the files are checked against the grating equation and the reciprocal dispersion
// d·cos θ/(m·f) (Hecht, Optics, §10.2.8), and detector.csv's sum against result.json.
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { afterAll, describe, expect, it } from 'vitest';
import { expandJob } from '../../src/job/expand.js';
import { parseJobText } from '../../src/job/load.js';
import { planCase } from '../../src/plan/planner.js';
import { runJob } from '../../src/run/run-job.js';
import { spectrometerPart } from '../../src/metrics/spectrometer.js';
import { loadProblems } from '../helpers.js';

const SPECTROMETER = "spectrometer: {slit: '10 um', collimator: '200 mm', camera: '200 mm', pixel: '7 um', pixels: 256, centre: {wavelength: '589.3 nm', order: 1}}\n";
const JOB = (aperture: string, extra = '') =>
  `name: bench\nspectrum: {lines: [{wavelength: 589.0 nm, power: 2}, {wavelength: 589.6 nm, power: 1}]}\ndistance: 2 mm\nillumination: {kind: plane, tilt: [10 deg, 0]}\naperture: ${aperture}\n${extra}`;
const GRATING = "{shape: grating, profile: blazed, period: 3.333 um, count: 1800, depth: '589 nm'}";

describe('the spectrometer mapping', () => {
  it('reaches each case with its lengths in metres', () => {
    const c = expandJob(parseJobText(JOB(GRATING, SPECTROMETER)).spec)[0]!;
    expect(c.analysis.spectrometer).toMatchObject({ pixels: 256, centre: { order: 1 } });
    expect(c.analysis.spectrometer!.slit).toBeCloseTo(10e-6, 15);
    expect(c.analysis.spectrometer!.centre.wavelength).toBeCloseTo(589.3e-9, 18);
  });

  it('is refused, naming the key, with what it expects', () => {
    expect(loadProblems(JOB("{shape: circle, diameter: '1 mm'}", SPECTROMETER))[0]).toMatchObject({ path: 'spectrometer', message: expect.stringMatching(/slits or grating/) });
    expect(loadProblems(JOB(GRATING, SPECTROMETER).replace('{kind: plane, tilt: [10 deg, 0]}', "{kind: gaussian, waist: '1 mm'}"))[0]).toMatchObject({ path: 'illumination.kind', message: expect.stringMatching(/plane light/) });
    expect(loadProblems(JOB(GRATING, SPECTROMETER).replace('[10 deg, 0]', '[10 deg, 1 deg]'))[0]!.path).toBe('illumination.tilt');
    expect(loadProblems(JOB(GRATING, SPECTROMETER.replace('order: 1', 'order: 0')))[0]).toMatchObject({ path: 'spectrometer.centre.order', message: expect.stringMatching(/not 0/) });
    expect(loadProblems(JOB(GRATING, SPECTROMETER.replace('pixels: 256', 'pixels: 1.5')))[0]!.path).toBe('spectrometer.pixels');
    expect(loadProblems(JOB(GRATING, SPECTROMETER.replace("slit: '10 um'", "slit: '-10 um'")))[0]!.path).toBe('spectrometer.slit');
    expect(loadProblems(JOB(GRATING, SPECTROMETER.replace("camera: '200 mm', ", '')))[0]!.path).toBe('spectrometer.camera');
    expect(loadProblems(JOB(GRATING, "spectrometer: '10 um'\n"))[0]).toMatchObject({ path: 'spectrometer', message: expect.stringMatching(/collimator: '300 mm'/) });
  });

  it('is planned with its words, refused where the camera\'s order does not leave, warned where λ/d is large', () => {
    const plan = planCase(expandJob(parseJobText(JOB(GRATING, SPECTROMETER)).spec)[0]!);
    expect(plan.error).toBeUndefined();
    expect(plan.reasons.join('\n')).toMatch(/Spectrometer: slit 10 µm, collimator f = 200 mm, camera f = 200 mm pointed at 20\.5\d*°/);
    expect(plan.warnings.map((w) => w.code)).not.toContain('detector-powers-scalar');
    // Order 3 of 589 nm at a 1.667 µm period: sin θ = 0.17 + 1.06 > 1.
    const far = planCase(expandJob(parseJobText(JOB(GRATING.replace('3.333 um', '1.667 um'), SPECTROMETER.replace('order: 1', 'order: 3'))).spec)[0]!);
    expect(far.error).toMatch(/spectrometer\.centre: order 3 of 589\.300 nm does not leave the grating/);
    // λ/d = 0.35 at 1.667 µm (above 0.2): the order powers are thin-grating theory's, unreliable.
    const steep = planCase(expandJob(parseJobText(JOB(GRATING.replace('3.333 um', '1.667 um'), SPECTROMETER)).spec)[0]!);
    expect(steep.warnings.filter((w) => w.code === 'detector-powers-scalar')).toHaveLength(1);
    // The detector's work counts against the limit like a propagation's.
    const c = expandJob(parseJobText(JOB(GRATING, SPECTROMETER.replace('pixels: 256', 'pixels: 100000'))).spec)[0]!;
    // (A limit above the screen's and the 256-pixel detector's work, below 100 000 pixels'.)
    expect(planCase(c, { maxWork: 1.2 * plan.work }).error).toMatch(/spectrometer: the detector needs about \d+ s of computing/);
  });
});

describe('a sweep of the spectrometer\'s lengths', () => {
  it('makes a case per value, named by its token, each with its own setup', () => {
    const cases = expandJob(parseJobText(JOB(GRATING, SPECTROMETER.replace("slit: '10 um'", "slit: ['10 um', '120 um']").replace("pixel: '7 um'", "pixel: ['7 um', '14 um']"))).spec);
    expect(cases.map((c) => c.id)).toEqual(['1_slit-10um_px-7um', '2_slit-10um_px-14um', '3_slit-120um_px-7um', '4_slit-120um_px-14um']);
    expect(cases.map((c) => [c.analysis.spectrometer!.slit, c.analysis.spectrometer!.pixel].map((v) => Math.round(v * 1e7) / 10))).toEqual([[10, 7], [10, 14], [120, 7], [120, 14]]);
    expect(cases.every((c) => c.analysis.spectrometer!.pixels === 256 && c.analysis.spectrometer!.centre.order === 1)).toBe(true);
  });

  it('answers which slit resolves the doublet: its bandpass w·d·cos θ_i/(m·f) against 0.6 nm (Palmer ch. 2, from memory)', () => {
    const cases = expandJob(parseJobText(JOB(GRATING, SPECTROMETER.replace("slit: '10 um'", "slit: ['10 um', '120 um']"))).spec);
    const pairs = cases.map((c) => {
      const plan = planCase(c);
      const part = spectrometerPart(plan, plan.spectrum!.members.map((m, i) => ({ wavelength: m.case.wavelength, weight: plan.spectrum!.lines[i]!.weight, aperture: m.case.aperture })))!;
      return part.metrics;
    });
    // 10 µm: a slit bandpass of 0.16 nm; 120 µm: 1.97 nm, over three times the separation.
    expect(pairs[0]!.bandpass.slit * 1e9).toBeCloseTo((10e-6 * 3.333e-6 * Math.cos((10 * Math.PI) / 180)) / 0.2 * 1e9, 6);
    expect(pairs[0]!.pairs[0]!.resolved).toBe(true);
    expect(pairs[1]!.bandpass.largest).toBe('slit');
    // (0.6 nm is within three bandpasses of 1.97 nm, so the pair is read on the pixels: not resolved.)
    expect(pairs[1]!.pairs[0]!.resolved).toBe(false);
  });
});

describe('a spectrometer case\'s files', () => {
  let work = '';
  afterAll(async () => {
    if (work) await rm(work, { recursive: true, force: true });
  });

  it('writes detector.csv and detector.png, and answers in result.json that agree with them', async () => {
    work = await mkdtemp(join(tmpdir(), 'spotcast-spectrometer-'));
    const outcome = await runJob(parseJobText(JOB(GRATING, SPECTROMETER)), { outDir: work });
    expect(outcome.done).toBe(1);
    const dir = join(work, 'bench', '1');
    const result = JSON.parse(await readFile(join(dir, 'result.json'), 'utf8'));
    expect(result.files).toMatchObject({ detectorTable: 'detector.csv', detectorPlot: 'detector.png', detectorColour: 'detector-colour.png' });
    // The colour strip: its brightest pixel is the sodium lines' orange-yellow (589 nm: red above
    // green, next to no blue; the CIE 1931 colour-matching functions give x ≈ 0.57, y ≈ 0.43 there).
    const strip = PNG.sync.read(await readFile(join(dir, 'detector-colour.png')));
    // (The most coloured pixel, so that the grey text does not count: the largest red less blue.)
    let best = 0;
    for (let i = 0; i < strip.width * strip.height; i++) {
      const at = (k: number) => strip.data[4 * k]! - strip.data[4 * k + 2]!;
      if (at(i) > at(best)) best = i;
    }
    const [R, G, B] = [strip.data[4 * best]!, strip.data[4 * best + 1]!, strip.data[4 * best + 2]!];
    expect(R).toBe(255);
    expect(G).toBeGreaterThan(100);
    expect(G).toBeLessThan(R);
    expect(B).toBeLessThan(40);
    const png = await readFile(join(dir, 'detector.png'));
    expect(png.subarray(1, 4).toString()).toBe('PNG');
    const rows = (await readFile(join(dir, 'detector.csv'), 'utf8')).trim().split('\n');
    expect(rows[0]).toBe('pixel,x_m,wavelength_m,fraction_of_light_on_grating');
    expect(rows).toHaveLength(257);
    const signal = rows.slice(1).map((r) => Number(r.split(',')[3]));
    const s = result.metrics.spectrometer;
    expect(Math.abs(signal.reduce((a, b) => a + b, 0) - s.powerOnDetector)).toBeLessThan(1e-12);
    // The centre pixel's wavelength, and the spacing of the pixels' wavelengths, against the
    // grating equation and d·cos θ_c/(m·f) per pixel.
    const d = 3.333e-6;
    const sinI = Math.sin((10 * Math.PI) / 180);
    const betaC = Math.asin(sinI + 589.3e-9 / d);
    expect(s.cameraAngle).toBeCloseTo(betaC, 12);
    const w = rows.slice(1).map((r) => Number(r.split(',')[2]));
    expect(Math.abs((w[128]! + w[127]!) / 2 - 589.3e-9)).toBeLessThan(1e-13);
    expect(Math.abs((w[128]! - w[127]!) / ((d * Math.cos(betaC) * 7e-6) / 0.2) - 1)).toBeLessThan(1e-5);
    // The two lines, in order 1, resolved (R = 1800 against 982), the brighter twice the other.
    expect(s.lines.map((l: { order: number }) => l.order)).toEqual([1, 1]);
    expect(s.pairs).toHaveLength(1);
    expect(s.pairs[0].resolved).toBe(true);
    expect(result.definitions.spectrometer).toMatch(/reciprocalDispersion/);
    // The parameters say what the job gave: its spectrum and its spectrometer.
    expect(result.parameters.spectrum.kind).toBe('lines');
    expect(result.parameters.spectrometer).toMatchObject({ pixels: 256, centre: { order: 1 } });
    const summary = (await readFile(join(work, 'bench', 'summary.csv'), 'utf8')).split('\n')[0]!;
    expect(summary).toMatch(/detector_per_pixel,detector_bandpass,detector_power,detector_closest_pair_dip/);
  }, 60_000);
});
