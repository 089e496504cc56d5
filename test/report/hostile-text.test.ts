// Text from a hostile job file in the files the tool writes: report.html, the contact sheet and
// the plots. A job file must not be able to put a raw control character (an escape sequence that
// rewrites a terminal showing the file, BEL, NUL, a bidi override that reorders what a reader
// sees) or one 100 kB value into them. The loader refuses most such names before any work; these
// tests build the report's inputs directly, so they hold whatever the loader lets through.
//
// All data here is INVENTED for the test; nothing is a computed result.
import { describe, expect, it, vi } from 'vitest';

// Every string the contact sheet draws goes through drawText; recording them lets the test read
// what was drawn (the same technique as contact-sheet.test.ts).
const drawn = vi.hoisted(() => [] as string[]);
vi.mock('../../src/output/font.js', async (importOriginal) => {
  const m = await importOriginal<typeof import('../../src/output/font.js')>();
  return {
    ...m,
    drawText: (...args: Parameters<typeof m.drawText>) => {
      drawn.push(args[3]);
      m.drawText(...args);
    },
  };
});

import { REPORT_LIMITS, renderReportHtml, safeGiven } from '../../src/report/html.js';
import { renderContactSheet, type SheetTile } from '../../src/report/contact-sheet.js';
import { plotSpec, sweepPlots } from '../../src/report/plots.js';
import type { JobReport, ReportCase } from '../../src/report/types.js';
import { ECHO_MAX } from '../../src/safe-text.js';

// ESC [2J clears a terminal's screen; BEL rings; NUL ends C strings; U+202E (right-to-left
// override) reverses the text after it on screen.
const CONTROL = 'clear\x1b[2J bell\x07 nul\x00 rlo\u202egpj.exe tab\tcr\r del\x7f c1\x9b end';
const HUGE = 'Q'.repeat(100_000);
const BOTH = `${CONTROL}${HUGE}`;

// Every character escapeControl escapes (src/safe-text.ts), except the line feed and tab that
// the page's own markup holds between tags: none of them may be in the page raw.
const RAW_CONTROL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u2028\u2029\u200e\u200f\u202a-\u202e\u2066-\u2069]/;

const longestRun = (text: string, ch: string) => Math.max(0, ...(text.match(new RegExp(`${ch}+`, 'g')) ?? []).map((s) => s.length));

function hostileCase(i: number, over: Partial<ReportCase> = {}): ReportCase {
  return {
    id: i === 0 ? `${CONTROL}-${i}` : `${HUGE}-${i}`,
    folder: BOTH,
    status: 'failed',
    error: `${BOTH}\nsecond line ${CONTROL}`,
    swept: { [BOTH]: 1e-3 * (i + 1) },
    wavelength: 633e-9,
    distance: 1,
    fresnelNumber: 1.2,
    regime: BOTH,
    method: CONTROL,
    metrics: { [BOTH]: 0.5, peak: 0.25 },
    warnings: [{ code: BOTH, message: BOTH }],
    reasons: [BOTH],
    verdict: BOTH,
    picture: `${BOTH}/intensity.png`,
    ...over,
  };
}

function hostileReport(): JobReport {
  const given = JSON.parse('{"__proto__": {"polluted": "yes"}}') as Record<string, unknown>;
  Object.assign(given, {
    name: BOTH,
    [BOTH]: [BOTH, { deeper: CONTROL }],
    aperture: { shape: HUGE, [CONTROL]: 1 },
    detector: [{ kind: BOTH, size: '5 um' }],
  });
  return {
    job: BOTH,
    file: `jobs/${BOTH}.yaml`,
    description: BOTH,
    given,
    toolVersion: CONTROL,
    createdAt: CONTROL,
    sweeps: [{ key: BOTH, label: BOTH, unit: 'm', spacing: 'list', values: [1e-3, 2e-3] }],
    metrics: [{ key: 'peak', label: `fraction on ${BOTH} 1`, unit: '1' }],
    cases: [hostileCase(0), hostileCase(1, { status: 'done', error: undefined })],
    tables: [
      {
        title: BOTH,
        header: [BOTH, 'v'],
        rows: [
          [BOTH, -1.5],
          [HUGE, null],
        ],
        note: BOTH,
      },
    ],
    plots: [{ title: BOTH, svg: `plots/${BOTH}.svg`, png: `plots/${BOTH}.png` }],
    contactSheet: `${BOTH}.png`,
    plans: [`plan of ${BOTH}\n${CONTROL}`],
  };
}

// No file exists: every picture and plot is a "missing: <path>" note, which quotes the path.
const noFiles = { readFile: async () => null };

describe('report.html with hostile text from the job', () => {
  it('holds no raw control character, no value past its cut, and says how long cut values were', async () => {
    const html = await renderReportHtml(hostileReport(), noFiles);
    const raw = RAW_CONTROL.exec(html);
    expect(raw, raw ? `raw U+${raw[0].charCodeAt(0).toString(16)} at ${raw.index}` : '').toBeNull();
    expect(html).not.toContain('\r');
    // The control characters are there as visible escapes instead.
    for (const e of ['\\x1b[2J', '\\x07', '\\x00', '\\u202e', '\\x09', '\\x0d', '\\x7f', '\\x9b']) expect(html).toContain(e);
    // No line of any message is longer than the cut; the 100 kB value is nowhere whole.
    expect(longestRun(html, 'Q')).toBeLessThanOrEqual(REPORT_LIMITS.lineChars);
    expect(html).toContain(`…(${BOTH.length} characters)`);
    // Every input text (and a 100 kB one at that) fits in well under a megabyte.
    expect(html.length).toBeLessThan(1_000_000);
  });

  it('cuts single values (name, case id, key, heading) at ECHO_MAX, paths at pathChars', async () => {
    const html = await renderReportHtml(hostileReport(), noFiles);
    const h1 = /<h1>([^<]*)<\/h1>/.exec(html)![1]!;
    const title = /<title>([^<]*)<\/title>/.exec(html)![1]!;
    for (const t of [h1, title]) {
      expect(longestRun(t, 'Q')).toBeLessThanOrEqual(ECHO_MAX);
      expect(t).toContain(`…(${BOTH.length} characters)`);
    }
    const caseHeads = [...html.matchAll(/<h3>case <code>([^<]*)<\/code>/g)].map((m) => m[1]!);
    expect(caseHeads).toHaveLength(2);
    expect(caseHeads[0]).toBe('clear\\x1b[2J bell\\x07 nul\\x00 rlo\\u202egpj.exe tab\\x09cr\\x0d del\\x7f c1\\x9b end-0');
    expect(longestRun(caseHeads[1]!, 'Q')).toBeLessThanOrEqual(ECHO_MAX);
    expect(caseHeads[1]).toContain(`(${HUGE.length + 2} characters)`);
    const file = /<dt>job file<\/dt><dd><code>([^<]*)<\/code>/.exec(html)![1]!;
    expect(longestRun(file, 'Q')).toBeLessThanOrEqual(REPORT_LIMITS.pathChars);
    const th = [...html.matchAll(/<th[^>]*>([^<]*)<\/th>/g)].map((m) => m[1]!);
    for (const t of th) expect(longestRun(t, 'Q')).toBeLessThanOrEqual(ECHO_MAX);
  });

  it('shows the job as given with every key and string cut and escaped, and a "__proto__" key as a key', async () => {
    const html = await renderReportHtml(hostileReport(), noFiles);
    const given = /<pre class="given">([\s\S]*?)<\/pre>/.exec(html)![1]!;
    expect(longestRun(given, 'Q')).toBeLessThanOrEqual(ECHO_MAX);
    expect(given).toContain(`…(${HUGE.length} characters)`);
    expect(given).toContain('\\x1b[2J');
    expect(given).toContain('__proto__');
    expect(given).toContain('polluted');
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it('shows at most givenLines lines of a huge job, walking at most givenValues values, in well under 10 s', async () => {
    const t0 = Date.now();
    const report = hostileReport();
    report.file = 'big.json';
    report.given = { distance: Array.from({ length: 300_000 }, (_, i) => i) };
    const html = await renderReportHtml(report, noFiles);
    const given = /<pre class="given">([\s\S]*?)<\/pre>/.exec(html)![1]!;
    expect(given.split('\n').length).toBeLessThanOrEqual(REPORT_LIMITS.givenLines + 1);
    expect(given).toMatch(/…\(\d+ more lines\)$/);
    const walked = safeGiven(report.given) as { distance: unknown[] };
    expect(walked.distance.length).toBeLessThanOrEqual(REPORT_LIMITS.givenValues + 1);
    expect(walked.distance.at(-1)).toMatch(/^…\(\d+ more\)$/);
    expect(Date.now() - t0).toBeLessThan(10_000);
  });

  it('walks a document nested deeper than givenDepth without following it all the way', () => {
    let deep: unknown = 'bottom';
    for (let i = 0; i < 5000; i++) deep = { d: deep };
    let v = safeGiven(deep);
    let depth = 0;
    while (typeof v === 'object' && v !== null) {
      v = (v as { d: unknown }).d;
      depth++;
    }
    expect(depth).toBe(REPORT_LIMITS.givenDepth);
    expect(v).toMatch(/^…\(nested deeper than/);
  });
});

function tile(label: string): SheetTile {
  const n = 8;
  return { label, map: { nx: n, ny: n, dx: 1e-6, dy: 1e-6, x0: -3.5e-6, y0: -3.5e-6, intensity: new Float64Array(n * n).fill(1) } };
}

describe('contact sheet with hostile text', () => {
  it('draws control characters as their escapes and cuts a 100 kB title and labels to the room they have, in well under 10 s', () => {
    const t0 = Date.now();
    drawn.length = 0;
    renderContactSheet([tile(CONTROL), tile(HUGE)], { title: BOTH });
    expect(Date.now() - t0).toBeLessThan(10_000);
    for (const t of drawn) {
      expect(t).not.toMatch(RAW_CONTROL);
      expect(t).not.toMatch(/[\t\n\r]/);
      // A sheet of two 160 px tiles is a few hundred pixels wide: 6 px per character.
      expect(t.length).toBeLessThan(200);
    }
    expect(drawn[0]).toMatch(/^clear\\x1b\[2J bell\\x07.*\.\.\.$/);
    expect(drawn.some((t) => t.startsWith('clear\\x1b[2J'))).toBe(true);
  });

  it('draws a backslash with a glyph of its own, not the missing-glyph box', async () => {
    const font = await vi.importActual<typeof import('../../src/output/font.js')>('../../src/output/font.js');
    expect(font.hasGlyph('\\')).toBe(true);
  });
});

describe('plots with hostile labels', () => {
  it('draw no control character and no label longer than 80 characters (plus its length said)', () => {
    const r = hostileReport();
    r.cases = [
      hostileCase(0, { status: 'done', error: undefined, swept: { [BOTH]: 1e-3 }, metrics: { peak: 0.2 } }),
      hostileCase(1, { status: 'done', error: undefined, swept: { [BOTH]: 2e-3 }, metrics: { peak: 0.3 } }),
    ];
    const plots = sweepPlots(r);
    expect(plots).toHaveLength(1);
    // Every string the plot draws: its title, axis titles and series names.
    const texts = plots.flatMap((p) => [p.title, p.x.label, p.y.label, ...p.points.map((q) => q.series ?? '')]);
    for (const t of texts) {
      expect(t).not.toMatch(RAW_CONTROL);
      expect(t).not.toMatch(/[\t\n\r]/);
    }
    expect(longestRun(texts.join(' '), 'Q')).toBeLessThanOrEqual(80);
    expect(plots[0]!.x.label).toMatch(/^clear\\x1b\[2J/);
    // The spec (what vega draws) is made from those strings only.
    const spec = JSON.stringify(plotSpec(plots[0]!));
    expect(longestRun(spec, 'Q')).toBeLessThanOrEqual(80);
  });
});
