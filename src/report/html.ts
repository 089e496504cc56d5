// The job report: one HTML file that a person opens in a browser with no network. Everything it
// shows is inside the file (pictures as data: URIs, styles in a <style>), so it can be mailed,
// archived next to a purchase order or opened on a lab PC that has no access to the job folder.
// No script: a report is read and printed, and a page without script cannot misbehave offline.

import { stringify as yamlStringify } from 'yaml';
import { formatLength, trimNumber } from '../job/units.js';
import { ECHO_MAX, escapeHtml, safeEcho, safeLines } from '../safe-text.js';
import { TOOL_NAME } from '../version.js';
import type { JobReport, MetricInfo, ReportCase, ReportPlot, ReportTable, SweepKey } from './types.js';

/** Reads files of the job folder (PNG, SVG) so they can be inlined; null when a file is absent. */
export interface ReportAssets {
  readFile(relativePath: string): Promise<Uint8Array | null>;
}

/**
 * Caps that keep the page of a large sweep openable. A case picture is a few hundred kB; a
 * browser copes with tens of MB of data: URIs, not with thousands of them. What is left out is
 * counted on the page and pointed to on disk.
 */
export const REPORT_LIMITS = {
  /** Case pictures inlined at most (in case order). */
  casePictures: 60,
  /** Raw bytes of case pictures inlined at most, whichever cap comes first. */
  casePictureBytes: 16 * 1024 * 1024,
  /** Cases given a full section; the rest are counted. */
  caseSections: 1000,
  /** Rows per table; the job folder's CSV files have them all. */
  tableRows: 2000,
  /** Plan blocks printed. */
  plans: 1000,
  /** Case ids listed per warning code in the summary. */
  casesPerWarning: 30,
  /** Failed cases listed with their error in the summary. */
  failedListed: 200,
  // Text from input (names, ids, keys, paths, and messages that quote a job file) is shown with its
  // control characters escaped and cut to these lengths with the full length said (safe-text.ts),
  // so a job file can neither hide markup or escape sequences in the page nor fill it with one
  // 100 kB value.
  /** Characters of one value: a name, a case id, a key, a label, a table heading. */
  valueChars: ECHO_MAX,
  /** Characters of a path (the job file, a case folder, a picture). */
  pathChars: 1024,
  /** Characters per line of a message: a warning, an error, a reason, a plan, a table cell. */
  lineChars: 2000,
  /** Lines of one message; the rest are counted. */
  messageLines: 200,
  /** The job as given: strings and keys are cut to valueChars; at most this many lines are shown. */
  givenLines: 10_000,
  /** ... and this many values (keys, list items, scalars) walked, nested at most givenDepth deep. */
  givenValues: 100_000,
  givenDepth: 32,
} as const;

// ---------------------------------------------------------------------------------------------
// Text

// (escapeHtml lives in safe-text.ts, so that the explorer's per-case part loads no YAML library.)
export { escapeHtml };

/** For the tool's own words (its name, counts, sentences built here): HTML-escaped only. */
const esc = (s: unknown) => escapeHtml(String(s));

/** One value from input (a name, an id, a key, a path): control characters escaped, cut, HTML-escaped. */
const value = (v: unknown, max: number = REPORT_LIMITS.valueChars) => escapeHtml(safeEcho(String(v), max));
const path = (v: unknown) => value(v, REPORT_LIMITS.pathChars);

/**
 * Text of one or more lines that may quote input (a message, a plan, the job as given): line
 * breaks kept, each line as `value` with `lineChars`, at most `maxLines` lines with the rest counted.
 */
function lines(v: unknown, maxLines: number = REPORT_LIMITS.messageLines, lineChars: number = REPORT_LIMITS.lineChars): string {
  return escapeHtml(safeLines(String(v), maxLines, lineChars));
}

function formatValue(v: number | null | undefined, unit: 'm' | '1'): string {
  if (v === null || v === undefined) return '—';
  if (!Number.isFinite(v)) return String(v);
  return unit === 'm' ? formatLength(v, 4) : trimNumber(v, 4);
}

function formatCell(v: string | number | null): { text: string; numeric: boolean } {
  if (v === null) return { text: '—', numeric: false };
  if (typeof v === 'number') return { text: Number.isFinite(v) ? trimNumber(v, 5) : String(v), numeric: true };
  return { text: v, numeric: false };
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

// Anchors by case position: ids come from job files and need not be valid or unique fragments.
const caseAnchor = (index: number) => `case-${index + 1}`;

// ---------------------------------------------------------------------------------------------
// Assets

interface Embedded {
  uri: string;
  bytes: number;
  width?: number;
  height?: number;
}
type EmbedResult = { ok: true; image: Embedded } | { ok: false; note: string };

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

// The size is in the IHDR chunk, which the PNG specification (W3C / ISO 15948) requires first.
function pngSize(b: Uint8Array): { width: number; height: number } | null {
  if (b.length < 24 || PNG_SIGNATURE.some((v, i) => b[i] !== v)) return null;
  if (String.fromCharCode(b[12]!, b[13]!, b[14]!, b[15]!) !== 'IHDR') return null;
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  const width = dv.getUint32(16);
  const height = dv.getUint32(20);
  return width > 0 && height > 0 ? { width, height } : null;
}

// An SVG shown through <img> has a size only if its root says so; read it so the page can
// reserve the space (and so a size-less file is noticed rather than drawn as a zero box).
function svgSize(text: string): { width?: number; height?: number } | null {
  const root = /<svg\b[^>]*>/i.exec(text);
  if (!root) return null;
  const attr = (name: string) => {
    const m = new RegExp(`\\s${name}\\s*=\\s*["']\\s*([0-9.]+)\\s*(px)?\\s*["']`, 'i').exec(root[0]);
    return m ? Number(m[1]) : undefined;
  };
  let width = attr('width');
  let height = attr('height');
  if (width === undefined || height === undefined) {
    const vb = /\sviewBox\s*=\s*["']\s*[-0-9.eE]+[\s,]+[-0-9.eE]+[\s,]+([0-9.eE]+)[\s,]+([0-9.eE]+)\s*["']/.exec(root[0]);
    if (vb) {
      width ??= Number(vb[1]);
      height ??= Number(vb[2]);
    }
  }
  return {
    ...(width !== undefined && width > 0 ? { width } : {}),
    ...(height !== undefined && height > 0 ? { height } : {}),
  };
}

async function embed(assets: ReportAssets, path: string, kind: 'png' | 'svg'): Promise<EmbedResult> {
  let bytes: Uint8Array | null;
  try {
    bytes = await assets.readFile(path);
  } catch (e) {
    return { ok: false, note: `could not read: ${path} (${e instanceof Error ? e.message : String(e)})` };
  }
  if (bytes === null) return { ok: false, note: `missing: ${path}` };
  const b64 = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('base64');
  if (kind === 'png') {
    const size = pngSize(bytes);
    // A file that is not a PNG would show as a broken image; say what is wrong instead.
    if (!size) return { ok: false, note: `not a PNG file: ${path}` };
    return { ok: true, image: { uri: `data:image/png;base64,${b64}`, bytes: bytes.byteLength, ...size } };
  }
  const size = svgSize(new TextDecoder().decode(bytes));
  if (!size) return { ok: false, note: `not an SVG file: ${path}` };
  // Through <img> rather than inline: plots made separately may reuse element ids (clip paths,
  // gradients) that would clash in one document, and an image context runs no script.
  return { ok: true, image: { uri: `data:image/svg+xml;base64,${b64}`, bytes: bytes.byteLength, ...size } };
}

function img(image: Embedded, alt: string, cls: string): string {
  const dims = `${image.width ? ` width="${Math.round(image.width)}"` : ''}${image.height ? ` height="${Math.round(image.height)}"` : ''}`;
  return `<img class="${cls}" src="${image.uri}" alt="${value(alt, REPORT_LIMITS.lineChars)}"${dims}>`;
}

const missingNote = (note: string) => `<p class="missing">${lines(note)}</p>`;

// ---------------------------------------------------------------------------------------------
// Sections

const SAFETY_NOTE = `<aside id="safety" class="safety" aria-labelledby="safety-title">
<h2 id="safety-title">Safety note</h2>
<p>This report is a scalar-diffraction model of an idealised part. It is <strong>not a laser-hazard
assessment</strong>. Irradiances are relative to the incident irradiance (taken as 1); they are not
exposure values and say nothing about the power of a real source. Real parts differ from the model:
edge roughness, thickness, coatings, reflections, and vector effects where features approach the
wavelength.</p>
<p>For any work with lasers, follow local codes and regulations, the laser-safety standards
IEC&nbsp;60825-1 and ANSI&nbsp;Z136.1, and the instructions of your site's laser-safety officer.</p>
</aside>`;

function header(r: JobReport): string {
  const done = r.cases.filter((c) => c.status === 'done').length;
  const failed = r.cases.filter((c) => c.status === 'failed').length;
  const missing = r.cases.length - done - failed;
  const warnings = r.cases.reduce((n, c) => n + c.warnings.length, 0);
  const warned = r.cases.filter((c) => c.warnings.length > 0).length;
  const row = (k: string, v: string) => `<div><dt>${k}</dt><dd>${v}</dd></div>`;
  return `<header>
<p class="kicker">${esc(TOOL_NAME)} job report</p>
<h1>${value(r.job)}</h1>
${r.description ? `<p class="description">${lines(r.description)}</p>` : ''}
<dl class="facts">
${row('job file', `<code>${path(r.file)}</code>`)}
${row('tool', `${esc(TOOL_NAME)} ${value(r.toolVersion)}`)}
${row('created', value(r.createdAt))}
${row('cases', String(r.cases.length))}
${row('done / failed', `${done} / <span class="${failed > 0 ? 'bad' : ''}">${failed}</span>`)}
${missing > 0 ? row('not computed yet', `<span class="bad">${missing}</span>`) : ''}
${row('warnings', warnings === 0 ? 'none' : `${warnings} in ${plural(warned, 'case')}`)}
</dl>
</header>`;
}

function contents(r: JobReport): string {
  const items: [string, string][] = [
    ['safety', 'Safety note'],
    ['warnings', 'Warnings and failures'],
    ['tables', 'Tables'],
    ['plots', 'Plots'],
  ];
  if (r.contactSheet) items.push(['contact-sheet', 'Contact sheet']);
  items.push(['cases', 'Cases'], ['plans', 'Plans'], ['given', 'The job as given']);
  // The page links nothing outside itself: the explorer is named, to be opened from the folder.
  const explorer = r.explorer
    ? `<p class="note">To read positions and intensities off the maps, draw profiles and compare cases side by side, open <code>${path(r.explorer)}</code> in this folder (one page, offline).</p>`
    : '';
  return `<nav class="contents" aria-label="Contents"><ul>${items
    .map(([id, t]) => `<li><a href="#${id}">${t}</a></li>`)
    .join('')}</ul></nav>${explorer}`;
}

function caseRef(r: JobReport, index: number): string {
  const id = `<code>${value(r.cases[index]!.id)}</code>`;
  return index < REPORT_LIMITS.caseSections ? `<a href="#${caseAnchor(index)}">${id}</a>` : id;
}

function warningsSection(r: JobReport): string {
  const byCode = new Map<string, { count: number; cases: number[]; first: string }>();
  r.cases.forEach((c, i) => {
    for (const w of c.warnings) {
      let g = byCode.get(w.code);
      if (!g) byCode.set(w.code, (g = { count: 0, cases: [], first: w.message }));
      g.count++;
      if (g.cases[g.cases.length - 1] !== i) g.cases.push(i);
    }
  });
  const out: string[] = ['<section id="warnings"><h2>Warnings and failures</h2>'];
  if (byCode.size === 0) {
    out.push('<p>No case raised a warning.</p>');
  } else {
    out.push(
      '<p>Each warning means a result, or part of it, should not be trusted as it stands; the case sections below give the full message.</p>',
      '<div class="scroll"><table class="warnings"><thead><tr><th>code</th><th class="num">count</th><th>cases</th><th>first message</th></tr></thead><tbody>',
    );
    const groups = [...byCode.entries()].sort((a, b) => b[1].count - a[1].count || a[0].localeCompare(b[0]));
    for (const [code, g] of groups) {
      const shown = g.cases.slice(0, REPORT_LIMITS.casesPerWarning).map((i) => caseRef(r, i));
      const more = g.cases.length - shown.length;
      out.push(
        `<tr><td><code>${value(code)}</code></td><td class="num">${g.count}</td><td>${shown.join(', ')}${
          more > 0 ? ` and ${more} more` : ''
        } <span class="muted">(${plural(g.cases.length, 'case')})</span></td><td>${lines(g.first)}</td></tr>`,
      );
    }
    out.push('</tbody></table></div>');
  }
  const failed = r.cases.map((c, i) => [c, i] as const).filter(([c]) => c.status === 'failed');
  if (failed.length === 0) {
    out.push('<p>No case failed.</p>');
  } else {
    out.push(`<h3>Failed cases (${failed.length})</h3><ul class="failed">`);
    for (const [c, i] of failed.slice(0, REPORT_LIMITS.failedListed)) {
      out.push(`<li>${caseRef(r, i)}: ${lines(c.error ?? 'no error message was recorded')}</li>`);
    }
    out.push('</ul>');
    if (failed.length > REPORT_LIMITS.failedListed) {
      out.push(`<p class="note">${failed.length - REPORT_LIMITS.failedListed} more failed cases are not listed here; each case folder's result.json has its error.</p>`);
    }
  }
  out.push('</section>');
  return out.join('\n');
}

/**
 * A long sentence as its headline (the clause before the first colon, where there is one within
 * the first 120 characters) and the rest folded under it; short sentences stay as they are.
 */
function folded(text: string): string {
  const at = text.indexOf(': ');
  if (text.length <= 140 || at < 0 || at > 120) return lines(text);
  return `<details class="fold"><summary>${lines(text.slice(0, at))}</summary><div class="more">${lines(text.slice(at + 2))}</div></details>`;
}

function table(t: ReportTable, index: number): string {
  const rows = t.rows.slice(0, REPORT_LIMITS.tableRows);
  // A column is right-aligned when its cells are numbers, so digits line up.
  const numericCol = t.header.map((_, j) => rows.length > 0 && rows.every((row) => row[j] === null || row[j] === undefined || typeof row[j] === 'number'));
  const out: string[] = [
    `<div class="scroll"><table class="data" id="table-${index + 1}"><caption>${value(t.title, REPORT_LIMITS.lineChars)}</caption>`,
    `<thead><tr>${t.header.map((h, j) => `<th${numericCol[j] ? ' class="num"' : ''}>${value(h)}</th>`).join('')}</tr></thead><tbody>`,
  ];
  for (const row of rows) {
    out.push(
      `<tr>${t.header
        .map((_, j) => {
          const { text, numeric } = formatCell(row[j] ?? null);
          if (t.fold?.includes(j) && typeof row[j] === 'string') return `<td>${folded(text)}</td>`;
          return `<td${numeric || numericCol[j] ? ' class="num"' : ''}>${lines(text)}</td>`;
        })
        .join('')}</tr>`,
    );
  }
  out.push('</tbody></table></div>');
  if (t.rows.length > rows.length) {
    out.push(`<p class="note">${t.rows.length - rows.length} further rows are left out of this page; the job folder's CSV files have every row.</p>`);
  }
  if (t.note) out.push(`<p class="note">${lines(t.note)}</p>`);
  return out.join('\n');
}

function tablesSection(r: JobReport): string {
  const body = r.tables.length === 0 ? '<p>This job has no tables.</p>' : r.tables.map(table).join('\n');
  return `<section id="tables"><h2>Tables</h2>\n${body}\n</section>`;
}

async function plotFigure(p: ReportPlot, assets: ReportAssets): Promise<string> {
  const svg = await embed(assets, p.svg, 'svg');
  let body: string;
  if (svg.ok) {
    // A size-less SVG has no intrinsic width in an <img>; let it take the column's width.
    body = img(svg.image, p.title, svg.image.width ? 'plot' : 'plot fill');
  } else {
    // The PNG twin of the same plot stands in when the SVG cannot be used.
    const png = await embed(assets, p.png, 'png');
    body = png.ok ? img(png.image, p.title, 'plot') + missingNote(svg.note) : missingNote(svg.note) + missingNote(png.note);
  }
  return `<figure class="plot">${body}<figcaption>${value(p.title, REPORT_LIMITS.lineChars)} <span class="muted">(${path(p.svg)})</span></figcaption></figure>`;
}

async function plotsSection(r: JobReport, assets: ReportAssets): Promise<string> {
  if (r.plots.length === 0) {
    const why = r.sweeps.length === 0 ? 'nothing is swept in this job' : 'none were written for this job';
    return `<section id="plots"><h2>Plots</h2><p>No plots: ${why}.</p></section>`;
  }
  const figures: string[] = [];
  for (const p of r.plots) figures.push(await plotFigure(p, assets));
  return `<section id="plots"><h2>Plots</h2>\n<div class="plots">${figures.join('\n')}</div>\n</section>`;
}

async function contactSheetSection(r: JobReport, assets: ReportAssets): Promise<string> {
  if (!r.contactSheet) return '';
  const e = await embed(assets, r.contactSheet, 'png');
  const body = e.ok ? img(e.image, 'contact sheet of the case pictures', 'sheet') : missingNote(e.note);
  let log = '';
  if (r.contactSheetLog) {
    const l = await embed(assets, r.contactSheetLog, 'png');
    const lb = l.ok ? img(l.image, 'contact sheet of the case pictures, log brightness', 'sheet') : missingNote(l.note);
    log = `\n<figure>${lb}<figcaption>The same, each tile in decades below its peak <span class="muted">(${path(r.contactSheetLog)})</span></figcaption></figure>`;
  }
  return `<section id="contact-sheet"><h2>Contact sheet</h2>
<figure>${body}<figcaption>Every done case at a glance <span class="muted">(${path(r.contactSheet)})</span></figcaption></figure>${log}
</section>`;
}

interface PictureBudget {
  count: number;
  bytes: number;
  skipped: number;
}

async function caseSection(
  r: JobReport,
  c: ReportCase,
  index: number,
  assets: ReportAssets,
  budget: PictureBudget,
): Promise<string> {
  const metricByKey = new Map<string, MetricInfo>(r.metrics.map((m) => [m.key, m]));
  const sweepByKey = new Map<string, SweepKey>(r.sweeps.map((s) => [s.key, s]));
  const out: string[] = [];
  out.push(
    `<section class="case" id="${caseAnchor(index)}">`,
    `<h3>case <code>${value(c.id)}</code> <span class="status ${value(c.status)}">${value(c.status)}</span>${
      c.warnings.length > 0 ? ` <span class="badge">${plural(c.warnings.length, 'warning')}</span>` : ''
    }</h3>`,
  );
  if (c.verdict) out.push(`<div class="verdict">${folded(c.verdict)}</div>`);
  if (c.status === 'failed') out.push(`<pre class="error">${lines(c.error ?? 'no error message was recorded')}</pre>`);
  for (const n of c.notes ?? []) out.push(`<p class="note">${lines(n)}</p>`);

  const facts: [string, string][] = [];
  for (const [key, v] of Object.entries(c.swept)) {
    const s = sweepByKey.get(key);
    facts.push([s?.label ?? key, formatValue(v, s?.unit ?? '1')]);
  }
  if (!sweepByKey.has('wavelength')) facts.push(['wavelength', formatLength(c.wavelength, 4)]);
  if (!sweepByKey.has('distance')) facts.push(['distance', formatLength(c.distance, 4)]);
  facts.push(['Fresnel number', formatValue(c.fresnelNumber, '1')]);
  facts.push(['regime', c.regime ?? '—'], ['method', c.method ?? '—']);
  const metricRows: [string, string][] = [];
  for (const m of r.metrics) {
    const v = c.metrics[m.key];
    if (v !== null && v !== undefined) metricRows.push([m.label, formatValue(v, m.unit)]);
  }
  for (const [key, v] of Object.entries(c.metrics)) {
    if (!metricByKey.has(key) && v !== null && v !== undefined) metricRows.push([key, formatValue(v, '1')]);
  }
  const kv = (rows: [string, string][]) => rows.map(([k, v]) => `<tr><th>${value(k)}</th><td>${value(v)}</td></tr>`).join('');
  out.push('<div class="case-grid">');
  out.push(`<table class="kv"><caption>case</caption>${kv(facts)}<tr><th>folder</th><td><code>${path(c.folder)}</code></td></tr></table>`);
  if (metricRows.length > 0) out.push(`<table class="kv"><caption>key numbers</caption>${kv(metricRows)}</table>`);
  out.push('</div>');

  if (c.reasons.length > 0) {
    out.push(`<h4>Why this plan</h4><ul class="reasons">${c.reasons.map((x) => `<li>${lines(x)}</li>`).join('')}</ul>`);
  }
  if (c.warnings.length > 0) {
    out.push(
      `<h4>Warnings</h4><ul class="case-warnings">${c.warnings
        .map((w) => `<li><code>${value(w.code)}</code> ${lines(w.message)}</li>`)
        .join('')}</ul>`,
    );
  }
  for (const [file, what] of [
    [c.picture, 'intensity picture'],
    [c.colour, 'true-colour picture'],
    [c.profilePlot, 'profile plot'],
    [c.zoom, 'zoomed picture'],
    [c.searchPlot, 'smallest-spot search'],
    [c.energyPlot, 'encircled-energy plot'],
    [c.mtfPlot, 'MTF plot'],
  ] as const) {
    if (!file) continue;
    if (budget.count < REPORT_LIMITS.casePictures && budget.bytes < REPORT_LIMITS.casePictureBytes) {
      const e = await embed(assets, file, 'png');
      if (e.ok) {
        budget.count++;
        budget.bytes += e.image.bytes;
        out.push(`<figure>${img(e.image, `${what} of case ${safeEcho(c.id)}`, 'picture')}<figcaption><code>${path(file)}</code></figcaption></figure>`);
      } else {
        out.push(missingNote(e.note));
      }
    } else {
      budget.skipped++;
      out.push(`<p class="note">Picture not included in this page: <code>${path(file)}</code> in the job folder.</p>`);
    }
  }
  out.push('</section>');
  return out.join('\n');
}

async function casesSection(r: JobReport, assets: ReportAssets): Promise<string> {
  const budget: PictureBudget = { count: 0, bytes: 0, skipped: 0 };
  const detailed = r.cases.slice(0, REPORT_LIMITS.caseSections);
  const sections: string[] = [];
  for (let i = 0; i < detailed.length; i++) sections.push(await caseSection(r, detailed[i]!, i, assets, budget));
  const notes: string[] = [];
  if (budget.skipped > 0) {
    notes.push(
      `Pictures of ${plural(budget.count, 'case')} are included in this page; ${budget.skipped} more are left out to keep it small; each case below names its picture file, relative to the job folder.`,
    );
  }
  if (r.cases.length > detailed.length) {
    notes.push(
      `${r.cases.length - detailed.length} cases after the first ${detailed.length} have no section here; their result.json files are in their case folders and every case is in summary.csv.`,
    );
  }
  const intro = r.cases.length === 0 ? '<p>This job has no cases.</p>' : '';
  // Before the sections, so a reader of a long page knows early what is not in it.
  const noteHtml = notes.map((n) => `<p class="note">${esc(n)}</p>`).join('\n');
  return `<section id="cases"><h2>Cases</h2>\n${intro}${noteHtml}\n${sections.join('\n')}\n</section>`;
}

function plansSection(r: JobReport): string {
  const shown = r.plans.slice(0, REPORT_LIMITS.plans);
  const out = ['<section id="plans"><h2>Plans</h2>'];
  if (r.plans.length === 0) out.push('<p>No plans were recorded.</p>');
  for (const p of shown) out.push(`<pre class="plan">${lines(p)}</pre>`);
  if (r.plans.length > shown.length) {
    out.push(`<p class="note">${r.plans.length - shown.length} more plans are left out of this page; <code>${esc(TOOL_NAME)} plan ${path(r.file)}</code> prints them all.</p>`);
  }
  out.push('</section>');
  return out.join('\n');
}

/**
 * The job as given with every string, key or value, as safeEcho shows it (control characters
 * escaped, cut to valueChars with the length said), walked to a bounded depth and number of
 * values: the page shows what the file held without carrying a raw escape sequence or a 100 kB
 * value, and the walk costs no more than the caps whatever the parsed document is.
 */
export function safeGiven(given: unknown): unknown {
  const { givenValues, givenDepth, valueChars } = REPORT_LIMITS;
  let budget = givenValues;
  const walk = (v: unknown, depth: number): unknown => {
    budget--;
    if (typeof v === 'string') return safeEcho(v, valueChars);
    if (v === null || typeof v === 'number' || typeof v === 'boolean') return v;
    const plain = typeof v === 'object' && (Array.isArray(v) || [Object.prototype, null].includes(Object.getPrototypeOf(v)));
    if (!plain) return safeEcho(String(v), valueChars);
    if (depth >= givenDepth) return `…(nested deeper than ${givenDepth} levels, not shown)`;
    const entries: [string, unknown][] = Array.isArray(v) ? v.map((x, i) => [String(i), x]) : Object.entries(v as object);
    const kept: [string, unknown][] = [];
    for (const [k, x] of entries) {
      if (budget <= 0) {
        kept.push([`…(${entries.length - kept.length} more)`, '…(left out of this page; the job file has them)']);
        break;
      }
      kept.push([Array.isArray(v) ? k : safeEcho(k, valueChars), walk(x, depth + 1)]);
    }
    if (Array.isArray(v)) return kept.map(([k, x]) => (k.startsWith('…') ? k : x));
    // No prototype: a key such as "__proto__" is kept as a key instead of setting one.
    const out = Object.create(null) as Record<string, unknown>;
    for (const [k, x] of kept) out[k] = x;
    return out;
  };
  return walk(given, 0);
}

function givenText(r: JobReport): string {
  try {
    const given = safeGiven(r.given);
    // Shown in the notation it was written in, so it reads like the file the person wrote.
    // No folding (lineWidth 0): a value stays on one line, with its "…(N characters)" beside it.
    if (/\.ya?ml$/i.test(r.file)) return yamlStringify(given, { lineWidth: 0 }).trimEnd();
    return JSON.stringify(given, null, 2) ?? String(given);
  } catch (e) {
    return `(the job could not be printed: ${e instanceof Error ? e.message : String(e)})`;
  }
}

function givenSection(r: JobReport): string {
  return `<section id="given"><h2>The job as given</h2>
<p class="muted">From <code>${path(r.file)}</code>, as parsed, before units were converted and sweeps expanded; long values are cut and control characters shown as escapes.</p>
<pre class="given">${lines(givenText(r), REPORT_LIMITS.givenLines)}</pre>
</section>`;
}

// ---------------------------------------------------------------------------------------------
// Page

const STYLE = `
:root { --ink: #1e2126; --muted: #5d636e; --rule: #d6d9df; --faint: #f4f5f7; --accent: #2d5b78; }
* { box-sizing: border-box; }
html { font-size: 15px; }
body { margin: 0 auto; max-width: 78rem; padding: 1.5rem 1.25rem 3rem; color: var(--ink); background: #fff;
  font-family: system-ui, sans-serif; line-height: 1.45; }
h1 { font-size: 1.8rem; margin: 0.1rem 0 0.4rem; }
h2 { font-size: 1.3rem; margin: 2.2rem 0 0.6rem; padding-bottom: 0.2rem; border-bottom: 1px solid var(--rule); }
h3 { font-size: 1.08rem; margin: 1.4rem 0 0.4rem; }
h4 { font-size: 0.95rem; margin: 0.9rem 0 0.3rem; color: var(--muted); }
code, pre { font-family: ui-monospace, monospace; font-size: 0.88em; }
pre { background: var(--faint); border: 1px solid var(--rule); padding: 0.6rem 0.8rem; overflow-x: auto; white-space: pre-wrap; word-break: break-word; }
a { color: var(--accent); }
.kicker { margin: 0; color: var(--muted); text-transform: uppercase; letter-spacing: 0.06em; font-size: 0.8rem; }
.description { margin: 0 0 0.8rem; white-space: pre-line; }
.muted { color: var(--muted); }
.note { color: var(--muted); font-size: 0.92rem; }
.missing { display: inline-block; margin: 0.3rem 0; padding: 0.25rem 0.5rem; border: 1px dashed #a0a6b0; color: var(--muted); font-family: ui-monospace, monospace; font-size: 0.85rem; }
.bad { color: #9b2c2c; font-weight: 600; }
dl.facts { display: grid; grid-template-columns: repeat(auto-fill, minmax(13rem, 1fr)); gap: 0.3rem 1.2rem; margin: 0.6rem 0 0; }
dl.facts div { border-top: 1px solid var(--rule); padding-top: 0.2rem; }
dl.facts dt { color: var(--muted); font-size: 0.8rem; }
dl.facts dd { margin: 0; }
.safety { margin: 1.4rem 0; padding: 0.7rem 1rem; background: #fbf8f0; border: 1px solid #e6dcc3; border-left: 4px solid #b08a3e; }
.safety h2 { margin: 0 0 0.3rem; font-size: 1.05rem; border: 0; padding: 0; }
.safety p { margin: 0.35rem 0; }
nav.contents ul { list-style: none; padding: 0; margin: 0.5rem 0; display: flex; flex-wrap: wrap; gap: 0.3rem 1.1rem; font-size: 0.92rem; }
.scroll { overflow-x: auto; }
table { border-collapse: collapse; margin: 0.4rem 0 0.8rem; font-size: 0.9rem; }
caption { text-align: left; font-weight: 600; padding: 0.2rem 0; }
th, td { padding: 0.22rem 0.6rem; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; }
thead th { border-bottom: 2px solid #b9bec7; }
.scroll { max-width: 100%; }
table.data td:first-child { white-space: nowrap; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
table.data tbody tr:nth-child(even) { background: #fafbfc; }
table.kv th { font-weight: normal; color: var(--muted); white-space: nowrap; }
table.kv caption { font-size: 0.8rem; color: var(--muted); font-weight: normal; text-transform: uppercase; letter-spacing: 0.05em; }
.case { border-top: 1px solid var(--rule); padding-top: 0.2rem; margin-top: 1.2rem; }
#cases > h2 + .case { border-top: 0; margin-top: 0; }
.case-grid { display: flex; flex-wrap: wrap; gap: 0 2rem; align-items: flex-start; }
.status { font-size: 0.75rem; font-weight: 600; padding: 0.05rem 0.4rem; border-radius: 3px; vertical-align: middle; }
.status.done { background: #e6f0ea; color: #285e3c; }
.status.failed { background: #f7e4e4; color: #9b2c2c; }
.status.missing { background: #f1eee2; color: #6b5a1e; }
.badge { font-size: 0.75rem; padding: 0.05rem 0.4rem; border-radius: 3px; background: #fbf1db; color: #7a5410; vertical-align: middle; }
.verdict { margin: 0.3rem 0 0.5rem; font-weight: 600; }
.verdict .more { font-weight: normal; }
details.fold > summary { cursor: pointer; }
details.fold[open] > summary { margin-bottom: 0.2rem; }
.plots { display: grid; grid-template-columns: repeat(auto-fill, minmax(min(100%, 30rem), 1fr)); gap: 0 1.2rem; }
.plots figure { margin: 0.6rem 0; min-width: 0; }
pre.error { border-color: #e2bcbc; background: #fbf3f3; }
ul.reasons, ul.case-warnings { margin: 0.2rem 0 0.6rem; padding-left: 1.3rem; }
ul.case-warnings code { color: #7a5410; }
figure { margin: 0.8rem 0; }
figcaption { font-size: 0.85rem; color: var(--muted); margin-top: 0.2rem; }
img { max-width: 100%; height: auto; display: block; }
img.plot { border: 1px solid var(--rule); background: #fff; }
img.fill { width: 100%; }
footer { margin-top: 3rem; border-top: 1px solid var(--rule); padding-top: 0.5rem; font-size: 0.85rem; color: var(--muted); }
@media print {
  html { font-size: 10pt; }
  body { max-width: none; padding: 0; }
  nav.contents { display: none; }
  a { color: inherit; text-decoration: none; }
  h2, h3, h4 { break-after: avoid-page; }
  figure, table.kv, .safety, pre.plan { break-inside: avoid-page; }
  .scroll { overflow: visible; }
  table.data tbody tr:nth-child(even) { background: none; }
}
`;

/** Renders the job report as one self-contained HTML page (no network, no script). */
export async function renderReportHtml(report: JobReport, assets: ReportAssets): Promise<string> {
  const parts = [
    header(report),
    SAFETY_NOTE,
    contents(report),
    warningsSection(report),
    tablesSection(report),
    await plotsSection(report, assets),
    await contactSheetSection(report, assets),
    await casesSection(report, assets),
    plansSection(report),
    givenSection(report),
  ];
  // The policy forbids every fetch but data: images: the page works the same on a PC with no
  // network, and any markup that slipped past escaping could neither run nor phone home.
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src data:; style-src 'unsafe-inline'">
<title>${value(report.job)} — ${esc(TOOL_NAME)} report</title>
<link rel="icon" href="data:,">
<style>${STYLE}</style>
</head>
<body>
${parts.filter((p) => p !== '').join('\n')}
<footer>Written by ${esc(TOOL_NAME)} ${value(report.toolVersion)} on ${value(report.createdAt)}. Scalar-diffraction model; not a laser-hazard assessment (see the safety note above).</footer>
</body>
</html>
`;
}
