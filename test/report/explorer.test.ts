// The explorer page (src/report/explorer.ts) of real jobs, opened in Debian's Chromium offline:
// every value it reads out on hover and along a drawn profile is the value of the case's
// intensity.npy at the index it names, at the position the grid gives that index.
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runJobFile } from '../../src/run/run-job.js';
import { readRecord } from '../../src/run/records.js';
import { decodeNpy } from '../../src/output/npy.js';
import { decimate, explorerSide, explorerSourceOf, writeExplorer, type ExplorerSource } from '../../src/report/explorer.js';
import { CHROMIUM, haveChromium } from './browser.js';
import { mulberry32 } from '../helpers.js';

// Invented bench checks: a 60 µm pinhole at 633 nm seen at three distances (2-D maps), and a 25 µm
// slit at 532 nm at two (1-D results).
const PINHOLE = `name: pinhole-look
wavelength: 633 nm
distance: [5 mm, 20 mm, 80 mm]
aperture: {shape: circle, diameter: 60 um}
`;
const SLIT = `name: slit-look
wavelength: 532 nm
distance: [2 mm, 40 mm]
aperture: {shape: slit, width: 25 um}
`;

interface Job {
  dir: string;
  sources: ExplorerSource[];
  npy: Map<string, { data: Float64Array; shape: number[] }>;
}

let tmp = '';
const jobs: Record<string, Job> = {};
beforeAll(async () => {
  tmp = await mkdtemp(join(tmpdir(), 'spotcast-explorer-'));
  for (const [name, text, ids] of [
    ['pinhole', PINHOLE, 3],
    ['slit', SLIT, 2],
  ] as const) {
    await writeFile(join(tmp, `${name}.yaml`), text);
    const o = await runJobFile(join(tmp, `${name}.yaml`), { outDir: join(tmp, 'out') });
    expect(o.error).toBeUndefined();
    expect(o.done).toBe(ids);
    const dir = o.folder!;
    const sources: ExplorerSource[] = [];
    const npy = new Map<string, { data: Float64Array; shape: number[] }>();
    for (const id of (await readdir(dir, { withFileTypes: true })).filter((d) => d.isDirectory() && /^\d/.test(d.name)).map((d) => d.name).sort()) {
      const rec = await readRecord(dir, id);
      expect(rec).not.toBeNull();
      sources.push(explorerSourceOf(rec!, `z = ${rec!.plan.case.distance * 1e3} mm`));
      npy.set(id, decodeNpy(new Uint8Array(await readFile(join(dir, id, 'intensity.npy')))));
    }
    expect(sources.length).toBe(ids);
    await writeExplorer(dir, 'explorer.html', name, sources);
    jobs[name] = { dir, sources, npy };
  }
}, 120_000);
afterAll(async () => {
  if (tmp) await rm(tmp, { recursive: true, force: true });
});

describe('explorer data', () => {
  it('keeps exact samples of the map (every k-th, from sample 0), within the page budget', () => {
    const nx = 1001;
    const ny = 700;
    const intensity = Float64Array.from({ length: nx * ny }, (_, i) => Math.sin(i) ** 2);
    const d = decimate({ nx, ny, intensity }, 256);
    expect(d.nx).toBeLessThanOrEqual(256);
    expect(d.ny).toBeLessThanOrEqual(256);
    for (const [r, q] of [
      [0, 0],
      [d.ny - 1, d.nx - 1],
      [7, 100],
    ] as const) {
      expect(d.values[r * d.nx + q]).toBe(Math.fround(intensity[r * d.ky * nx + q * d.kx]!));
    }
    // The budget: about 1.5e6 values over a job, 96 to 320 per side.
    expect(explorerSide(1)).toBe(320);
    expect(explorerSide(100)).toBe(122);
    expect(explorerSide(10_000)).toBe(96);
  });
});

// The page's state as the test reads it (window.__explorer; the test program has no DOM types).
interface Pt {
  row: number;
  col: number;
  x: number;
  y: number;
  intensity: number;
}
declare const window: { __explorer: { state: { last: Pt | null; profile: { points: (Pt & { s: number })[] } | null; log: boolean }; layouts: Record<string, { x: number; y: number; w: number; h: number }> } };
declare const document: {
  getElementById(id: string): { textContent: string | null; hidden?: boolean; clientLeft: number; clientTop: number; clientWidth: number; getBoundingClientRect(): { left: number; top: number; width: number; height: number } } | null;
  documentElement: { scrollWidth: number };
};
declare const innerWidth: number;

/** A value of the .npy at [row, col], as the page carries it (float32). */
function npyAt(j: Job, id: string, row: number, col: number): number {
  const n = j.npy.get(id)!;
  const cols = n.shape.length === 2 ? n.shape[1]! : n.shape[0]!;
  return n.data[row * cols + col]!;
}

describe.skipIf(!haveChromium)(`explorer page in Chromium (needs ${CHROMIUM})`, () => {
  it('reads out positions and intensities that are the .npy values at the named index, draws profiles from them, compares two cases, fits 1280 and 800 px', async () => {
    const { chromium } = await import('playwright-core');
    const browser = await chromium.launch({ executablePath: CHROMIUM, timeout: 60_000, args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking'] });
    try {
      for (const [name, j] of Object.entries(jobs)) {
        const context = await browser.newContext({ offline: true, viewport: { width: 1280, height: 1000 } });
        const foreign: string[] = [];
        const errors: string[] = [];
        await context.route('**/*', (route) => {
          const u = route.request().url();
          if (u.startsWith('file:') || u.startsWith('data:')) return route.continue();
          foreign.push(u);
          return route.abort('blockedbyclient');
        });
        const page = await context.newPage();
        page.on('console', (m) => {
          if (m.type() === 'error') errors.push(m.text());
        });
        page.on('pageerror', (e) => errors.push(e.message));
        await page.goto('file://' + join(j.dir, 'explorer.html'), { waitUntil: 'load' });
        const rnd = mulberry32(name === 'pinhole' ? 11 : 12);
        for (const [k, src] of j.sources.entries()) {
          await page.selectOption('#pickA', String(k));
          const box = (await page.evaluate(() => {
            const e = document.getElementById('mapA')!;
            const r = e.getBoundingClientRect();
            return { left: r.left + e.clientLeft, top: r.top + e.clientTop, width: e.clientWidth, height: r.height, L: window.__explorer.layouts['mapA']! };
          })) as { left: number; top: number; width: number; height: number; L: { x: number; y: number; w: number; h: number } };
          const scale = box.width / 480;
          // Hover at random points of the image: the readout is the .npy at [row, col], placed on the grid.
          for (let t = 0; t < 6; t++) {
            const px = box.L.x + (0.05 + 0.9 * rnd()) * box.L.w;
            const py = box.L.y + (0.05 + 0.9 * rnd()) * box.L.h;
            await page.mouse.move(box.left + px * scale, box.top + py * scale);
            const last = await page.evaluate(() => window.__explorer.state.last);
            expect(last).not.toBeNull();
            const v = npyAt(j, src.id, last!.row, last!.col);
            expect(Math.abs(last!.intensity - v)).toBeLessThanOrEqual(1e-6 * Math.abs(v) + 1e-300);
            expect(last!.x).toBeCloseTo(src.grid.x0 + last!.col * src.grid.dx, 12);
            // And it is the sample under the pointer: within one shown sample of where the pixel
            // falls on the axes (x grows to the right, y downwards as the .npy rows).
            const kx = (await page.evaluate((i) => {
              const c = (window as unknown as { __explorer: { data: { cases: { kx: number; ky: number; nx: number; ny: number }[] } } }).__explorer.data.cases[i]!;
              return { kx: c.kx, ky: c.ky, nx: c.nx, ny: c.ny };
            }, k)) as { kx: number; ky: number; nx: number; ny: number };
            const xLo = src.grid.x0 - 0.5 * kx.kx * src.grid.dx;
            const xPix = xLo + ((px - box.L.x) / box.L.w) * kx.nx * kx.kx * src.grid.dx;
            // One shown sample, or one and a half screen pixels where a pixel spans several samples.
            const perPixelX = (kx.nx * kx.kx * src.grid.dx) / box.L.w;
            expect(Math.abs(last!.x - xPix), `${name} ${src.id} at ${px}`).toBeLessThanOrEqual(Math.max(kx.kx * src.grid.dx, 1.5 * perPixelX));
            if (src.grid.ny > 1) {
              const yLo = src.grid.y0 - 0.5 * kx.ky * src.grid.dy;
              const yPix = yLo + ((py - box.L.y) / box.L.h) * kx.ny * kx.ky * src.grid.dy;
              const perPixelY = (kx.ny * kx.ky * src.grid.dy) / box.L.h;
              expect(Math.abs(last!.y - yPix)).toBeLessThanOrEqual(Math.max(kx.ky * src.grid.dy, 1.5 * perPixelY));
            }
            if (src.grid.ny > 1) expect(last!.y).toBeCloseTo(src.grid.y0 + last!.row * src.grid.dy, 12);
            const text = await page.evaluate(() => document.getElementById('readout')!.textContent);
            expect(text).toContain(`${src.id}/intensity.npy [${src.grid.ny > 1 ? `${last!.row}, ${last!.col}` : last!.col}]`);
          }
        }
        // A profile dragged across the first case: every point is the .npy at its index, in order along the line.
        await page.selectOption('#pickA', '0');
        const L = (await page.evaluate(() => window.__explorer.layouts['mapA']!)) as { x: number; y: number; w: number; h: number };
        const r = (await page.evaluate(() => {
          const e = document.getElementById('mapA')!;
          const b = e.getBoundingClientRect();
          return { left: b.left + e.clientLeft, top: b.top + e.clientTop, width: e.clientWidth };
        })) as { left: number; top: number; width: number };
        const s = r.width / 480;
        await page.mouse.move(r.left + (L.x + 0.1 * L.w) * s, r.top + (L.y + 0.3 * L.h) * s);
        await page.mouse.down();
        await page.mouse.move(r.left + (L.x + 0.9 * L.w) * s, r.top + (L.y + 0.6 * L.h) * s, { steps: 5 });
        await page.mouse.up();
        const prof = await page.evaluate(() => window.__explorer.state.profile);
        expect(prof).not.toBeNull();
        expect(prof!.points.length).toBeGreaterThan(10);
        const id0 = j.sources[0]!.id;
        let lastS = -1;
        for (const p of prof!.points) {
          const v = npyAt(j, id0, p.row, p.col);
          expect(Math.abs(p.intensity - v)).toBeLessThanOrEqual(1e-6 * Math.abs(v) + 1e-300);
          expect(p.s).toBeGreaterThanOrEqual(lastS);
          lastS = p.s;
        }
        // Log scale.
        await page.check('input[value=log]');
        expect(await page.evaluate(() => window.__explorer.state.log)).toBe(true);
        // A second case beside the first.
        await page.selectOption('#pickB', '1');
        expect(await page.evaluate(() => document.getElementById('paneB')!.hidden)).toBe(false);
        const rb = (await page.evaluate(() => {
          const e = document.getElementById('mapB')!;
          const b = e.getBoundingClientRect();
          return { left: b.left + e.clientLeft, top: b.top + e.clientTop, width: e.clientWidth, L: window.__explorer.layouts['mapB']! };
        })) as { left: number; top: number; width: number; L: { x: number; y: number; w: number; h: number } };
        const sb = rb.width / 480;
        await page.mouse.move(rb.left + (rb.L.x + rb.L.w / 2) * sb, rb.top + (rb.L.y + rb.L.h / 2) * sb);
        const lastB = await page.evaluate(() => window.__explorer.state.last);
        const idB = j.sources[1]!.id;
        const vB = npyAt(j, idB, lastB!.row, lastB!.col);
        expect(Math.abs(lastB!.intensity - vB)).toBeLessThanOrEqual(1e-6 * Math.abs(vB) + 1e-300);
        // No overflow at 1280 px and at 800 px.
        for (const width of [1280, 800]) {
          await page.setViewportSize({ width, height: 900 });
          const over = await page.evaluate(() => document.documentElement.scrollWidth - innerWidth);
          expect(over, `${name} at ${width} px`).toBeLessThanOrEqual(0);
        }
        expect(errors).toEqual([]);
        expect(foreign).toEqual([]);
        await context.close();
      }
    } finally {
      await browser.close();
    }
  }, 120_000);
});
