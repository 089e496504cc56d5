// The job report page: escaping, self-containment, the safety note, missing files, the caps for
// large jobs, and a real browser that opens the file with the network cut off.
//
// All report data here is INVENTED for the test (a made-up coupon of bench apertures); nothing is
// a computed result. The pictures are tiny PNGs encoded here with pngjs and one hand-written SVG.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { REPORT_LIMITS, renderReportHtml, type ReportAssets } from '../../src/report/html.js';
import type { JobReport, ReportCase } from '../../src/report/types.js';
import { CHROMIUM, haveChromium, openOffline } from './browser.js';

// --- Invented fixtures -------------------------------------------------------------------------

function tinyPng(width: number, height: number, rgb: [number, number, number]): Uint8Array {
  const png = new PNG({ width, height });
  for (let i = 0; i < width * height; i++) {
    png.data[4 * i] = rgb[0];
    png.data[4 * i + 1] = rgb[1];
    png.data[4 * i + 2] = rgb[2];
    png.data[4 * i + 3] = 255;
  }
  return new Uint8Array(PNG.sync.write(png));
}

const SVG_PLOT = new TextEncoder().encode(
  '<?xml version="1.0" encoding="UTF-8"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="160" height="90" viewBox="0 0 160 90">' +
    '<defs><clipPath id="c"><rect width="160" height="90"/></clipPath></defs>' +
    '<polyline clip-path="url(#c)" fill="none" stroke="#224" points="0,80 40,60 80,30 120,20 160,10"/></svg>',
);

const HOSTILE = '<script>alert(1)</script> & "quoted" \'single\'';

function demoCase(over: Partial<ReportCase> & { id: string; folder: string }): ReportCase {
  return {
    status: 'done',
    swept: { distance: 0.02 },
    wavelength: 532e-9,
    distance: 0.02,
    fresnelNumber: 0.094,
    regime: 'far field',
    method: 'fraunhofer',
    metrics: { peak: 0.0123, firstZero: 0.000213, fwhm: null },
    warnings: [],
    reasons: ['invented reason: the far-field phase error is small here'],
    ...over,
  };
}

function demoReport(): { report: JobReport; files: Map<string, Uint8Array> } {
  const files = new Map<string, Uint8Array>([
    ['c1/intensity.png', tinyPng(12, 8, [200, 120, 40])],
    ['plots/peak.svg', SVG_PLOT],
    ['plots/width.png', tinyPng(16, 9, [40, 80, 160])],
    ['contact-sheet.png', tinyPng(20, 10, [90, 90, 90])],
    ['c3/intensity.png', new TextEncoder().encode('this is not a picture')],
  ]);
  const report: JobReport = {
    job: 'coupon-demo',
    file: 'jobs/coupon-demo.yaml',
    description: HOSTILE,
    given: { name: 'coupon-demo', description: HOSTILE, distance: ['20 mm', '80 mm'], note: '</pre><img src=x onerror=alert(2)>' },
    toolVersion: '9.9.9-test',
    createdAt: '2030-01-02T03:04:05Z',
    sweeps: [{ key: 'distance', label: 'distance', unit: 'm', spacing: 'list', values: [0.02, 0.08] }],
    metrics: [
      { key: 'peak', label: 'peak intensity', unit: '1', log: true },
      { key: 'firstZero', label: 'first dark ring radius', unit: 'm' },
      { key: 'fwhm', label: 'FWHM', unit: 'm' },
    ],
    cases: [
      demoCase({
        id: 'c1<b>',
        folder: 'c1',
        picture: 'c1/intensity.png',
        verdict: 'Invented verdict: diffraction-limited at this distance.',
        warnings: [
          { code: 'edge-energy', message: 'invented: 0.4 % of the power near the grid edge' },
          { code: 'window-loss', message: 'invented: the window holds 97 % of the power' },
        ],
      }),
      demoCase({
        id: 'c2',
        folder: 'c2',
        swept: { distance: 0.08 },
        distance: 0.08,
        picture: 'c2/intensity.png', // deliberately absent from the files
        warnings: [{ code: 'edge-energy', message: 'invented: 0.2 % near the edge' }],
      }),
      demoCase({ id: 'c3', folder: 'c3', picture: 'c3/intensity.png' }), // a file that is not a PNG
      demoCase({
        id: 'c4',
        folder: 'c4',
        status: 'failed',
        error: 'invented failure: <grid> too large',
        fresnelNumber: null,
        regime: null,
        method: null,
        metrics: {},
        reasons: [],
      }),
    ],
    tables: [
      {
        title: 'Summary <all cases>',
        header: ['case', 'distance (m)', 'peak'],
        rows: [
          ['c1<b>', 0.02, 0.0123],
          ['c2', 0.08, null],
        ],
        note: 'invented table',
      },
    ],
    plots: [
      { title: 'peak against distance', svg: 'plots/peak.svg', png: 'plots/peak.png' },
      { title: 'width against distance', svg: 'plots/width.svg', png: 'plots/width.png' },
      { title: 'lost plot', svg: 'plots/lost.svg', png: 'plots/lost.png' },
    ],
    contactSheet: 'contact-sheet.png',
    plans: ['case c1<b>\n  method  far-field formula (invented)', 'case c2\n  method  far-field formula (invented)'],
  };
  return { report, files };
}

function assetsOf(files: Map<string, Uint8Array>): ReportAssets {
  return { readFile: async (p) => files.get(p) ?? null };
}

// --- Small HTML readers for the checks (the page is ours; these need not parse all HTML) -------

const imgTags = (html: string) => [...html.matchAll(/<img\b[^>]*>/g)].map((m) => m[0]);
const attr = (tag: string, name: string) => new RegExp(`\\s${name}="([^"]*)"`).exec(tag)?.[1];
// Entity decoding for text checks: the five escapes the renderer uses plus &nbsp;.
const decode = (s: string) =>
  s
    .replace(/&nbsp;/g, ' ')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&amp;/g, '&');
const textOf = (html: string) => decode(html.replace(/<[^>]*>/g, ' ')).replace(/\s+/g, ' ');
// From a top-level section's start to the next one (case sections nest inside #cases).
function sectionHtml(html: string, id: string): string {
  const start = html.search(new RegExp(`<(section|aside) id="${id}"`));
  expect(start, `section #${id}`).toBeGreaterThanOrEqual(0);
  const next = html.slice(start + 1).search(/<(section|aside) id="|<footer>/);
  return next < 0 ? html.slice(start) : html.slice(start, start + 1 + next);
}

describe('job report HTML', () => {
  it('escapes every text taken from the job', async () => {
    const { report, files } = demoReport();
    const html = await renderReportHtml(report, assetsOf(files));
    // No markup from the job survives as markup (OWASP XSS prevention: escape & < > " ' in content).
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toContain('<img src=x');
    expect(html).not.toContain('<b>');
    expect(html).not.toContain('<grid>');
    expect(html).not.toContain('<all cases>');
    // ...and it is still there, as text.
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;quoted&quot; &#39;single&#39;');
    expect(html).toContain('c1&lt;b&gt;');
    expect(html).toContain('&lt;/pre&gt;&lt;img src=x onerror=alert(2)&gt;');
    expect(html).toContain('invented failure: &lt;grid&gt; too large');
  });

  it('inlines every picture as a data: URI holding the file bytes, and links nothing outside the page', async () => {
    const { report, files } = demoReport();
    const html = await renderReportHtml(report, assetsOf(files));
    const tags = imgTags(html);
    // c1 picture, peak.svg, width.png (fallback), contact sheet: four; c2 is missing, c3 is not a PNG.
    expect(tags).toHaveLength(4);
    const sources = tags.map((t) => attr(t, 'src') ?? '');
    for (const s of sources) expect(s).toMatch(/^data:image\/(png|svg\+xml);base64,[A-Za-z0-9+/=]+$/);
    const decoded = sources.map((s) => Buffer.from(s.slice(s.indexOf(',') + 1), 'base64'));
    for (const path of ['c1/intensity.png', 'plots/peak.svg', 'plots/width.png', 'contact-sheet.png']) {
      expect(decoded.some((d) => d.equals(Buffer.from(files.get(path)!))), path).toBe(true);
    }
    // Sizes come from the PNG header (12×8 was encoded above) so the page does not reflow.
    expect(tags.find((t) => t.includes('case c1'))).toMatch(/width="12" height="8"/);
    // Links stay inside the page; the only other URL is the empty data: icon.
    for (const m of html.matchAll(/\s(?:href|src)="([^"]*)"/g)) expect(m[1]).toMatch(/^(#|data:)/);
    expect(html).not.toMatch(/<link\b(?![^>]*href="data:)/);
    expect(html).not.toMatch(/@import|url\(/);
  });

  it('puts the safety note near the top and names IEC 60825-1 and ANSI Z136.1', async () => {
    const { report, files } = demoReport();
    const html = await renderReportHtml(report, assetsOf(files));
    const note = textOf(sectionHtml(html, 'safety'));
    // Wording required by the project's design notes (§6) and the issue.
    expect(note).toContain('IEC 60825-1');
    expect(note).toContain('ANSI Z136.1');
    expect(note).toContain('not a laser-hazard assessment');
    expect(note).toContain('laser-safety officer');
    expect(note).toMatch(/scalar-diffraction model of an idealised part/);
    expect(note).toMatch(/relative/);
    // Before any result: right after the header.
    expect(html.indexOf('id="safety"')).toBeLessThan(html.indexOf('id="warnings"'));
    expect(html.indexOf('</header>')).toBeLessThan(html.indexOf('id="safety"'));
  });

  it('reports a missing or unusable file in words instead of an image', async () => {
    const { report, files } = demoReport();
    const html = await renderReportHtml(report, assetsOf(files));
    expect(html).toContain('missing: c2/intensity.png');
    expect(html).toContain('not a PNG file: c3/intensity.png');
    expect(html).toContain('missing: plots/width.svg'); // the PNG twin was shown instead
    expect(html).toContain('missing: plots/lost.svg');
    expect(html).toContain('missing: plots/lost.png');
    for (const t of imgTags(html)) {
      expect(t).not.toMatch(/case c2|case c3|lost plot/);
    }
    // A throwing reader is a note too, not a crash of the whole report.
    const html2 = await renderReportHtml(report, {
      readFile: async (p) => {
        if (p === 'contact-sheet.png') throw new Error('EACCES: permission denied');
        return files.get(p) ?? null;
      },
    });
    expect(html2).toContain('could not read: contact-sheet.png (EACCES: permission denied)');
  });

  it('has every section, the header facts and the warnings grouped by code', async () => {
    const { report, files } = demoReport();
    const html = await renderReportHtml(report, assetsOf(files));
    const order = ['safety', 'warnings', 'tables', 'plots', 'contact-sheet', 'cases', 'plans', 'given'];
    const at = order.map((id) => html.search(new RegExp(`<(section|aside) id="${id}"`)));
    for (const [i, p] of at.entries()) expect(p, order[i]).toBeGreaterThan(0);
    expect([...at].sort((a, b) => a - b)).toEqual(at);

    const head = textOf(html.slice(0, html.indexOf('</header>')));
    expect(head).toContain('coupon-demo');
    expect(head).toContain('jobs/coupon-demo.yaml');
    expect(head).toContain('9.9.9-test');
    expect(head).toContain('2030-01-02T03:04:05Z');
    expect(head).toMatch(/cases 4 /);
    expect(head).toMatch(/done \/ failed 3 \/ 1 /);
    expect(head).toMatch(/warnings 3 in 2 cases/);

    // Warnings: edge-energy hit c1 and c2 (twice in all), window-loss only c1.
    const w = sectionHtml(html, 'warnings');
    const rows = [...w.matchAll(/<tr><td><code>([^<]+)<\/code><\/td><td class="num">(\d+)<\/td><td>(.*?)<\/td>/g)].map((m) => ({
      code: m[1],
      count: Number(m[2]),
      cases: textOf(m[3]!),
    }));
    expect(rows.map((r) => [r.code, r.count])).toEqual([
      ['edge-energy', 2],
      ['window-loss', 1],
    ]);
    expect(rows[0]!.cases).toMatch(/c1<b> , c2 \(2 cases\)/);
    expect(w).toContain('href="#case-1"');
    expect(textOf(w)).toContain('c4 : invented failure: <grid> too large');

    // Tables: numbers formatted, null shown as a dash, numeric columns right-aligned.
    const t = sectionHtml(html, 'tables');
    expect(t).toContain('<td class="num">0.0123</td>');
    expect(t).toContain('<td class="num">—</td>');
    expect(textOf(t)).toContain('invented table');

    // Cases: one section each with the key numbers in units, verdict, reasons and warnings.
    const cases = sectionHtml(html, 'cases');
    expect(cases.match(/<section class="case"/g)).toHaveLength(4);
    const c1 = textOf(cases.slice(cases.indexOf('id="case-1"'), cases.indexOf('id="case-2"')));
    expect(c1).toContain('Invented verdict: diffraction-limited at this distance.');
    expect(c1).toContain('first dark ring radius 213 µm');
    expect(c1).toContain('peak intensity 0.0123');
    expect(c1).toContain('distance 20 mm');
    expect(c1).toContain('wavelength 532 nm');
    expect(c1).toContain('Fresnel number 0.094');
    expect(c1).not.toContain('FWHM'); // null for this case: left out, not printed as a number
    expect(c1).toContain('invented reason: the far-field phase error is small here');
    expect(c1).toContain('window-loss invented: the window holds 97 % of the power');

    expect(textOf(sectionHtml(html, 'plans'))).toContain('method far-field formula (invented)');
    // The job as given: YAML for a .yaml file, with the job's own values.
    const given = decode(sectionHtml(html, 'given'));
    expect(given).toContain('name: coupon-demo');
    expect(given).toMatch(/distance:\n\s+- 20 mm\n\s+- 80 mm/);
  });

  it('caps the case pictures of a large job and says where the rest are', async () => {
    const png = tinyPng(4, 4, [10, 20, 30]);
    const n = REPORT_LIMITS.casePictures + 5;
    const cases = Array.from({ length: n }, (_, i) => demoCase({ id: `k${i}`, folder: `k${i}`, picture: `k${i}/intensity.png` }));
    const report: JobReport = { ...demoReport().report, cases, plots: [], contactSheet: undefined, description: undefined };
    const html = await renderReportHtml(report, { readFile: async (p) => (p.endsWith('intensity.png') ? png : null) });
    expect(imgTags(html).filter((t) => t.includes('class="picture"'))).toHaveLength(REPORT_LIMITS.casePictures);
    expect(html).toContain(`Pictures of ${REPORT_LIMITS.casePictures} cases are included in this page; 5 more are left out`);
    // The first left-out case names its file on disk.
    const k = REPORT_LIMITS.casePictures;
    expect(html).toContain(`Picture not included in this page: <code>k${k}/intensity.png</code>`);
    expect(html.match(/<section class="case"/g)).toHaveLength(n);
  });
});

// --- In a real browser ------------------------------------------------------------------------

if (!haveChromium) {
  console.warn(`report browser check skipped: ${CHROMIUM} is absent (Debian package "chromium"; .ci/run installs it)`);
}

describe('job report in headless Chromium', () => {
  let dir = '';
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'spotcast-report-'));
  });
  afterAll(async () => {
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it.skipIf(!haveChromium)(
    `loads offline with no console error, no broken image and nothing fetched (needs ${CHROMIUM}; skipped without it)`,
    async () => {
      const { report, files } = demoReport();
      const html = await renderReportHtml(report, assetsOf(files));
      const file = join(dir, 'report.html');
      await writeFile(file, html);
      const seen = await openOffline(file);
      expect(seen.consoleErrors).toEqual([]);
      expect(seen.pageErrors).toEqual([]);
      expect(seen.foreign).toEqual([]);
      expect(seen.images).toHaveLength(imgTags(html).length);
      expect(seen.images.length).toBeGreaterThanOrEqual(4);
      for (const i of seen.images) {
        expect(i, i.alt).toMatchObject({ complete: true });
        expect(i.nw, i.alt).toBeGreaterThan(0);
        expect(i.nh, i.alt).toBeGreaterThan(0);
        expect(i.w * i.h, i.alt).toBeGreaterThan(0); // drawn, not collapsed by the layout
      }
      // Plots are SVG through <img>: the SVG plot decoded at the size its root declares (160×90).
      expect(seen.images.find((i) => i.alt === 'peak against distance')).toMatchObject({ nw: 160, nh: 90 });
      // The page inlines no <svg> today; this guards the day one is added.
      for (const s of seen.svgs) expect(s.w * s.h).toBeGreaterThan(0);
      // The hostile description is shown as text and nothing became a script.
      expect(seen.scripts).toBe(0);
      expect(seen.description).toBe(HOSTILE);
      expect(seen.safety.w * seen.safety.h).toBeGreaterThan(0);
      expect(seen.title).toContain('coupon-demo');
    },
    90_000,
  );
});

describe('job report: long sentences folded under their headline', () => {
  it('folds a table column marked fold and a long case verdict, keeping the words; short ones stay as they are', async () => {
    const { report, files } = demoReport();
    const long = 'Geometric (near field): the half-width along x holding half the power is 5.23 µm, 0.836× the geometric shadow of 6.25 µm; the far-field value 1.15 µm would be only 0.184× the shadow.';
    report.tables.push({ title: 'verdicts', header: ['case', 'in words'], rows: [['c1', long], ['c2', 'far-field: short']], fold: [1] });
    report.cases[0]!.verdict = long;
    const html = await renderReportHtml(report, assetsOf(files));
    const folds = [...html.matchAll(/<details class="fold"><summary>([^<]*)<\/summary><div class="more">([^<]*)<\/div><\/details>/g)];
    expect(folds.length).toBe(2);
    for (const f of folds) {
      expect(decode(f[1]!)).toBe('Geometric (near field)');
      expect(decode(f[2]!)).toBe(long.slice(long.indexOf(': ') + 2));
    }
    expect(html).toContain('<td>far-field: short</td>');
  });
});

