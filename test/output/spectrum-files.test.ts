// The files a case of several wavelengths writes beside the usual ones (src/output/spectrum-files.ts
// through writeCase): colour.png, and for a grating line-orders.csv and line-pairs.csv; each listed
// in result.json's files and digested in record.json (SHA-256, FIPS 180-4, computed here with
// node:crypto), the order table one row per line and order where the grating equation puts it.
import { createHash } from 'node:crypto';
import { mkdtemp, readFile, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SpectrumSource } from '../../src/analysis/spectrum.js';
import { writeCase } from '../../src/output/case-output.js';
import { planCase } from '../../src/plan/planner.js';
import type { Case } from '../../src/plan/types.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { testContext } from '../engine.js';
import { makeCase, nm, um, type CaseSpec } from '../helpers.js';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-spectrum-files-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const BLUE = 450 * nm;
const RED = 650 * nm;
const twoLines: SpectrumSource = { kind: 'lines', lines: [{ wavelength: BLUE, power: 1 }, { wavelength: RED, power: 1 }] };

async function written(id: string, spec: CaseSpec, spectrum?: SpectrumSource) {
  const c: Case = { ...makeCase(spec), id, ...(spectrum ? { spectrum } : {}) };
  const plan = planCase(c);
  expect(plan.error).toBeUndefined();
  const rec = runPlannedCase(plan, testContext());
  const folder = await writeCase(dir, rec);
  const result = JSON.parse(await readFile(join(folder, 'result.json'), 'utf8'));
  const record = JSON.parse(await readFile(join(folder, 'record.json'), 'utf8'));
  return { rec, folder, result, record };
}

const exists = (p: string) => stat(p).then(() => true, () => false);

describe('a grating in two lines: colour.png, line-orders.csv, line-pairs.csv', () => {
  // 20 slits 2 µm wide at a 4 µm period, 1 m away, in a 450 nm and a 650 nm line (an invented test
  // set-up): the first orders at sin θ = λ/d, 0.1125 and 0.1625.
  const grating = { shape: 'slits' as const, count: 20, width: 2 * um, period: 4 * um, opaque: false };
  let w: Awaited<ReturnType<typeof written>>;
  beforeAll(async () => {
    w = await written('grating-two-lines', { wavelength: (BLUE + RED) / 2, distance: 1, window: [1.2, 1.2], aperture: grating }, twoLines);
  }, 60_000);

  it("lists the three files in result.json's files and digests each in record.json (size and SHA-256 of the bytes on disk)", async () => {
    expect(w.result.files).toMatchObject({ colour: 'colour.png', lineOrders: 'line-orders.csv', linePairs: 'line-pairs.csv' });
    for (const name of ['colour.png', 'line-orders.csv', 'line-pairs.csv']) {
      const bytes = await readFile(join(w.folder, name));
      expect(w.record.files[name]).toEqual({ size: bytes.byteLength, sha256: createHash('sha256').update(bytes).digest('hex') });
    }
  });

  it("result.json says the light: the lines computed with weights summing to 1, the case's wavelength their weighted mean", () => {
    const sp = w.result.metrics.spectrum;
    expect(sp.lines.map((l: { wavelength: number }) => l.wavelength)).toEqual([BLUE, RED]);
    expect(sp.lines.map((l: { weight: number }) => l.weight)).toEqual([0.5, 0.5]);
    expect(sp.samples).toEqual({ own: 2, needed: null, used: 2 });
    expect(w.result.wavelength).toBeCloseTo((BLUE + RED) / 2, 18);
  });

  it('line-orders.csv: one row per line and order, each first order where the grating equation puts it (d sin θ = mλ; Born & Wolf §8.6.1)', async () => {
    const lines = (await readFile(join(w.folder, 'line-orders.csv'), 'utf8')).trimEnd().split('\n');
    const header = lines[0]!.split(',');
    expect(header.slice(0, 5)).toEqual(['wavelength_m', 'weight', 'm', 'status', 'sin_angle']);
    const rows = lines.slice(1).map((l) => l.split(','));
    const expectedRows = w.rec.metrics.lineOrders!.reduce((t, l) => t + l.orders.length, 0);
    expect(rows.length).toBe(expectedRows);
    const keys = rows.map((r) => `${r[0]}|${r[2]}`);
    expect(new Set(keys).size).toBe(rows.length);
    const col = (name: string) => header.indexOf(name);
    for (const lam of [BLUE, RED]) {
      const mine = rows.filter((r) => Math.abs(Number(r[col('wavelength_m')]) - lam) < 1e-15);
      expect(mine.length).toBeGreaterThan(2);
      // Equal powers: each line half the light.
      for (const r of mine) expect(Number(r[col('weight')])).toBeCloseTo(0.5, 12);
      // The orders are consecutive whole numbers, each once.
      const ms = mine.map((r) => Number(r[col('m')])).sort((a, b) => a - b);
      expect(ms).toEqual(Array.from({ length: ms.length }, (_, i) => ms[0]! + i));
      const first = mine.find((r) => Number(r[col('m')]) === 1)!;
      expect(Number(first[col('sin_angle')])).toBeCloseTo(lam / (4 * um), 9);
      expect(Number(first[col('position_m')])).toBeCloseTo(lam / (4 * um) / Math.sqrt(1 - (lam / (4 * um)) ** 2), 6);
    }
  });

  it('line-pairs.csv has its header and one row per pair the record lists', async () => {
    const lines = (await readFile(join(w.folder, 'line-pairs.csv'), 'utf8')).trimEnd().split('\n');
    expect(lines[0]!.split(',').slice(0, 3)).toEqual(['order', 'wavelength_1_m', 'wavelength_2_m']);
    expect(lines.length - 1).toBe(w.rec.metrics.linePairs!.length);
  });

  /** colour.png decoded, and a panel's interior (left: linear, right: log10): found inside the frame drawn around it. */
  async function colourPanel(side: 'left' | 'right' = 'left') {
    const png = PNG.sync.read(await readFile(join(w.folder, 'colour.png')));
    const at = (x: number, y: number) => [png.data[4 * (y * png.width + x)]!, png.data[4 * (y * png.width + x) + 1]!, png.data[4 * (y * png.width + x) + 2]!];
    // The frame's colour (src/output/colour-picture.ts FRAME), in that half of the picture.
    let [x0, x1, y0, y1] = [Infinity, -1, Infinity, -1];
    const half = png.width >> 1;
    for (let y = 0; y < png.height; y++) {
      for (let x = side === 'left' ? 0 : half; x < (side === 'left' ? half : png.width); x++) {
        const [r, g, b] = at(x, y);
        if (r === 96 && g === 96 && b === 108) (x0 = Math.min(x0, x)), (x1 = Math.max(x1, x)), (y0 = Math.min(y0, y)), (y1 = Math.max(y1, y));
      }
    }
    expect(x1 - x0).toBeGreaterThan(100);
    expect(y1 - y0).toBeGreaterThan(10);
    return { png, at, panel: { x: x0 + 1, y: y0 + 1, w: x1 - x0 - 1, h: y1 - y0 - 1 } };
  }

  it('colour.png decodes (pngjs) to a picture whose panel pixels are not all black', async () => {
    const { png, at, panel } = await colourPanel();
    expect(png.width).toBeGreaterThan(400);
    let lit = 0;
    for (let y = panel.y; y < panel.y + panel.h; y++) for (let x = panel.x; x < panel.x + panel.w; x++) if (Math.max(...at(x, y)) > 100) lit++;
    expect(lit).toBeGreaterThan(0);
    // Not lit everywhere either: the dark gaps between the orders are dark.
    expect(lit).toBeLessThan(panel.w * panel.h);
  });

  // (This test found colour.png drawn grey when the resampling's scratch array was shared by X, Y and Z.)
  it("colour.png shows each line's first order in its colour: red at 650 nm's, blue at 450 nm's (CIE 1931 spectral locus, sRGB)", async () => {
    // The log10 panel: the first orders are a tenth of the zero order's power and show brighter there.
    const { at, panel } = await colourPanel('right');
    const c = w.rec.computed;
    const lo = c.x0 - c.dx / 2;
    const span = c.nx * c.dx;
    const column = (x: number) => panel.x + Math.round(((x - lo) / span) * panel.w - 0.5);
    const row = panel.y + (panel.h >> 1);
    const firstOrder = (lam: number) => w.rec.metrics.lineOrders!.find((l) => l.wavelength === lam)!.orders.find((o) => o.m === 1)!.position!;
    // The brightest display pixel within ±2 of where the order lands.
    const brightest = (x: number) => [-2, -1, 0, 1, 2].map((d) => at(column(x) + d, row)).reduce((a, b) => (Math.max(...b) > Math.max(...a) ? b : a));
    const [rr, rg, rb] = brightest(firstOrder(RED));
    expect(rr).toBeGreaterThan(2 * Math.max(rg, rb));
    const [br, bg, bb] = brightest(firstOrder(BLUE));
    expect(bb).toBeGreaterThan(Math.max(br, bg) * 1.5);
  });
});

describe('which spectrum files a case writes', () => {
  it('a single slit in two lines: colour.png only (no grating orders), listed and on disk', async () => {
    const w = await written('slit-two-lines', { wavelength: (BLUE + RED) / 2, distance: 1, aperture: { shape: 'slit', width: 100 * um, opaque: false } }, twoLines);
    expect(w.result.files.colour).toBe('colour.png');
    expect(w.record.files['colour.png']).toBeDefined();
    expect(w.result.files.lineOrders).toBeUndefined();
    expect(await exists(join(w.folder, 'line-orders.csv'))).toBe(w.result.files.lineOrders !== undefined);
    expect(await exists(join(w.folder, 'line-pairs.csv'))).toBe(w.result.files.linePairs !== undefined);
  });

  it('a case of one wavelength writes none of them', async () => {
    const w = await written('slit-mono', { wavelength: RED, distance: 1, aperture: { shape: 'slit', width: 100 * um, opaque: false } });
    for (const k of ['colour', 'lineOrders', 'linePairs']) expect(w.result.files[k]).toBeUndefined();
    for (const f of ['colour.png', 'line-orders.csv', 'line-pairs.csv']) {
      expect(await exists(join(w.folder, f))).toBe(false);
      expect(w.record.files[f]).toBeUndefined();
    }
  });
});

describe('output.lineMaps: each wavelength\'s own map beside the sum', () => {
  it('writes line-<n>-<λ>nm.npy per line, listed and digested, and the sum of weight × map is intensity.npy', async () => {
    const base: CaseSpec = { wavelength: (BLUE + RED) / 2, distance: 1, aperture: { shape: 'slit', width: 100 * um, opaque: false } };
    const c: Case = { ...makeCase(base), id: 'line-maps', spectrum: { kind: 'lines', lines: [{ wavelength: BLUE, power: 1 }, { wavelength: RED, power: 3 }] }, output: { npy: 'float64', logDecades: 5, lineMaps: true } };
    const plan = planCase(c);
    const folder = await writeCase(dir, runPlannedCase(plan, testContext()));
    const result = JSON.parse(await readFile(join(folder, 'result.json'), 'utf8'));
    const names = ['line-1-450nm.npy', 'line-2-650nm.npy'];
    const record = JSON.parse(await readFile(join(folder, 'record.json'), 'utf8'));
    for (const n of names) {
      expect(Object.values(result.files)).toContain(n);
      const bytes = await readFile(join(folder, n));
      expect(record.files[n]).toEqual({ size: bytes.byteLength, sha256: createHash('sha256').update(bytes).digest('hex') });
    }
    const { decodeNpy } = await import('../../src/output/npy.js');
    const sum = decodeNpy(await readFile(join(folder, 'intensity.npy'))).data;
    const maps = await Promise.all(names.map(async (n) => decodeNpy(await readFile(join(folder, n))).data));
    // The weights are the powers over their total: 1/4 and 3/4 (the sum is relative to the total incident irradiance).
    let worst = 0;
    let peak = 0;
    for (let i = 0; i < sum.length; i++) {
      worst = Math.max(worst, Math.abs(sum[i]! - (0.25 * maps[0]![i]! + 0.75 * maps[1]![i]!)));
      peak = Math.max(peak, sum[i]!);
    }
    expect(worst).toBeLessThan(1e-12 * peak);
    // And each map is its wavelength's own: the blue one differs from the red one.
    expect(maps[0]!.some((v, i) => Math.abs(v - maps[1]![i]!) > 1e-3 * peak)).toBe(true);
    // The kept maps are in the memory estimate: more than the same case without the key.
    expect(plan.memoryBytes).toBeGreaterThan(planCase({ ...c, output: { npy: 'float64', logDecades: 5 } }).memoryBytes);
  });
});
