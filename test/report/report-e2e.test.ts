// A real job end to end: its report page, plots and contact sheet, opened in the browser.
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runJobFile } from '../../src/run/run-job.js';
import { CHROMIUM, haveChromium, openOffline } from './browser.js';

// An invented bench check: a 30 µm slit at 532 nm, screen moved from 0.5 mm to 50 mm (1-D, quick).
const JOB = `name: slit-bench
description: 30 um slit, screen from 0.5 mm to 50 mm
wavelength: 532 nm
distance: {from: 0.5 mm, to: 50 mm, count: 5, spacing: log}
aperture: {shape: slit, width: 30 um}
detector: {kind: square, size: 20 um}
`;

let dir = '';
let jobDir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-e2e-'));
  await writeFile(join(dir, 'job.yaml'), JOB);
  const o = await runJobFile(join(dir, 'job.yaml'), { outDir: join(dir, 'out') });
  expect(o.error).toBeUndefined();
  expect(o.reportError).toBeUndefined();
  expect(o.done).toBe(5);
  jobDir = o.folder!;
});
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('job report of a distance sweep', () => {
  it('writes the report, the contact sheet and plots of the swept metrics (SVG and PNG)', async () => {
    expect(existsSync(join(jobDir, 'report.html'))).toBe(true);
    expect(existsSync(join(jobDir, 'contact-sheet.png'))).toBe(true);
    expect(existsSync(join(jobDir, 'contact-sheet-log.png'))).toBe(true);
    const plots = await readdir(join(jobDir, 'plots'));
    const svg = plots.filter((p) => p.endsWith('.svg'));
    expect(svg.length).toBeGreaterThanOrEqual(5);
    expect(plots.filter((p) => p.endsWith('.png')).length).toBe(svg.length);
    expect(svg.some((p) => p.startsWith('fwhm-x'))).toBe(true);
    expect(svg.some((p) => p.includes('fraction-on-square'))).toBe(true);
  });

  it('writes the explorer page, each 1-D case\'s profile plot, and says where D4σ depends on the window', async () => {
    expect(existsSync(join(jobDir, 'explorer.html'))).toBe(true);
    const folders = (await readdir(jobDir, { withFileTypes: true })).filter((d) => d.isDirectory() && d.name !== 'plots');
    expect(folders.length).toBe(5);
    for (const f of folders) expect(existsSync(join(jobDir, f.name, 'profile.png')), f.name).toBe(true);
    const html = await readFile(join(jobDir, 'report.html'), 'utf8');
    expect(html).toContain('explorer.html');
    // The far-field slit's sinc² wings: D4σ falls by about 10 % with the window cut to 80 %.
    expect(html).toMatch(/D4σ depends on the window here: it falls x by \d+ %/);
    // The spot with its two references in one chart, and the axial intensity drawn densely.
    const plots = await readdir(join(jobDir, 'plots'));
    expect(plots.some((p) => p.startsWith('spot-size-x'))).toBe(true);
    expect(plots.some((p) => p.startsWith('spot-geometric-shadow'))).toBe(false);
  });

  it.skipIf(!haveChromium)(`opens in the browser with every plot and picture drawn (needs ${CHROMIUM})`, async () => {
    const seen = await openOffline(join(jobDir, 'report.html'));
    expect(seen.consoleErrors).toEqual([]);
    expect(seen.pageErrors).toEqual([]);
    expect(seen.foreign).toEqual([]);
    const plots = (await readdir(join(jobDir, 'plots'))).filter((p) => p.endsWith('.svg')).length;
    // Plots, the contact sheet and the five case pictures, all decoded and laid out.
    expect(seen.images.length).toBeGreaterThanOrEqual(plots + 1 + 5);
    for (const i of seen.images) {
      expect(i.complete, i.alt).toBe(true);
      expect(i.nw * i.nh, i.alt).toBeGreaterThan(0);
      expect(i.w * i.h, i.alt).toBeGreaterThan(0);
    }
    expect(seen.safety.w * seen.safety.h).toBeGreaterThan(0);
    // Nothing reaches past the window at 1280 or 800 px (wide tables scroll inside their box).
    for (const o of seen.overflow) expect(o.over, `${o.width} px`).toBeLessThanOrEqual(0);
  }, 90_000);
});
