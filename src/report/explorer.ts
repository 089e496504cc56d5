// The explorer: one self-contained HTML page per job (no network, no files beside it) where a
// reader picks a case, hovers over its intensity map to read position and intensity, switches
// between linear and logarithmic scales, drags a line to plot the profile along it, and puts a
// second case beside the first. The maps are carried decimated (every k-th sample of the case's
// intensity.npy, not averaged), so that every value the page shows is a value of the .npy at the
// sample index it names; the page says which file holds the full resolution.
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { writeFileAtomic } from '../output/atomic.js';
import { CASE_FILES, type CaseSummary } from '../output/case-output.js';
import { methodWords } from '../plan/planner.js';
import { decodeNpy } from '../output/npy.js';
import { shoal } from '../output/colour-scales.js';
import { escapeHtml } from '../safe-text.js';
import { formatLength } from '../job/units.js';
import type { Grid } from '../model/grid.js';

/** One case as the page shows it: its map (the plan's output grid and |U|² row-major) and words. */
export interface ExplorerCase extends Grid {
  id: string;
  /** What varies along the sweep, in words ("z = 2 mm"), or the id. */
  label: string;
  /** One line on how it was computed (method, regime). */
  note: string;
  warnings: string[];
  intensity: ArrayLike<number>;
}

/** A decimated map: every k-th sample per axis, starting at sample 0. */
export interface DecimatedMap {
  nx: number;
  ny: number;
  kx: number;
  ky: number;
  values: Float32Array;
}

/** Values the page carries in all, over all cases: about 6 MB of base64 text at most. */
const VALUE_BUDGET = 1.5e6;
const MIN_SIDE = 96;
const MAX_SIDE = 320;

/** The longest side a case's map keeps on a page of `cases` cases. */
export function explorerSide(cases: number): number {
  return Math.max(MIN_SIDE, Math.min(MAX_SIDE, Math.floor(Math.sqrt(VALUE_BUDGET / Math.max(1, cases)))));
}

/** Every k-th sample of a map per axis (k the least that brings the axis within `side`). */
export function decimate(c: Pick<ExplorerCase, 'nx' | 'ny' | 'intensity'>, side: number): DecimatedMap {
  // A 1-D result (one row) keeps more of its samples: a line costs far less than a map.
  const lineSide = c.ny === 1 ? side * 8 : side;
  const kx = Math.max(1, Math.ceil(c.nx / lineSide));
  const ky = Math.max(1, Math.ceil(c.ny / side));
  const nx = Math.ceil(c.nx / kx);
  const ny = Math.ceil(c.ny / ky);
  const values = new Float32Array(nx * ny);
  for (let r = 0; r < ny; r++) for (let q = 0; q < nx; q++) values[r * nx + q] = c.intensity[r * ky * c.nx + q * kx]!;
  return { nx, ny, kx, ky, values };
}

function base64Of(a: Float32Array): string {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('base64');
}

/** The page's colour table: the report's own scale, 256 steps, as one hex string. */
function colourTable(): string {
  let s = '';
  for (let i = 0; i < 256; i++) for (const v of shoal(i / 255)) s += Math.round(v).toString(16).padStart(2, '0');
  return s;
}

/** One case as the page's data carries it: its decimated map and the peak of the full one. */
export type PageCase = ReturnType<typeof pageCase>;

/**
 * A case's entry in the page's data, on a page whose maps keep at most `side` samples a side
 * (explorerSide of the page's case count). Made from the full map, which may be dropped after:
 * a run makes the entries as it reads each case's intensity.npy once (run/gather.ts).
 */
export function pageCase(c: ExplorerCase, side: number) {
  const d = decimate(c, side);
  // Math.max's result by comparisons (a call a sample took most of the page's time): the greatest
  // value, NaN once one is met.
  let peak = 0;
  const v = c.intensity;
  for (let i = 0; i < v.length; i++) {
    const x = v[i]!;
    if (x > peak || x !== x) peak = x;
    if (peak !== peak) break;
  }
  return {
    id: c.id,
    label: c.label,
    note: c.note,
    warnings: c.warnings,
    file: `${c.id}/${CASE_FILES.intensity}`,
    full: [c.ny, c.nx],
    oneD: c.ny === 1,
    nx: d.nx,
    ny: d.ny,
    kx: d.kx,
    ky: d.ky,
    // Positions of decimated sample (r, q): x0 + q·kx·dx, y0 + r·ky·dy.
    x0: c.x0,
    y0: c.y0,
    dx: c.dx,
    dy: c.dy,
    peak,
    values: base64Of(d.values),
  };
}

/** The data the page's script reads (JSON inside a non-executed script element). */
function pageData(job: string, cases: PageCase[], logDecades: number) {
  return { job, logDecades, lut: colourTable(), cases };
}

/** Keeps the JSON safe inside a script element (no closing tag, no comment opener). */
function scriptSafe(json: string): string {
  return json.replace(/</g, '\\u003c').replace(/>/g, '\\u003e').replace(/\u2028/g, '\\u2028').replace(/\u2029/g, '\\u2029');
}

export function renderExplorerHtml(job: string, cases: ExplorerCase[], opts: { logDecades?: number } = {}): string {
  const side = explorerSide(cases.length);
  return explorerPageHtml(
    job,
    cases.map((c) => pageCase(c, side)),
    opts.logDecades,
  );
}

/** The page from cases already made into page entries (pageCase, with explorerSide of their count). */
export function explorerPageHtml(job: string, cases: PageCase[], logDecades = 5): string {
  const data = pageData(job, cases, logDecades);
  const title = `${job}: explorer`;
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body>
<header>
<h1>${escapeHtml(title)}</h1>
<p class="hint">Pick a case; hover over the map to read position and intensity; drag across it to plot the profile along the line. Intensities are relative to the incident irradiance. y grows downwards, as the rows of the .npy files and the case pictures do. The maps here keep every k-th sample of each case's <code>intensity.npy</code> (named under the map), so every value read here is a value of that file.</p>
<div class="controls">
<label>case <select id="pickA"></select></label>
<label>beside it <select id="pickB"><option value="">(none)</option></select></label>
<label><input type="radio" name="scale" value="linear" checked> linear</label>
<label><input type="radio" name="scale" value="log"> log (${data.logDecades} decades)</label>
</div>
</header>
<main>
<div class="panes">
<section class="pane" id="paneA"><h2 id="titleA"></h2><canvas id="mapA" width="480" height="440"></canvas><p class="file" id="fileA"></p><p class="note" id="noteA"></p></section>
<section class="pane" id="paneB" hidden><h2 id="titleB"></h2><canvas id="mapB" width="480" height="440"></canvas><p class="file" id="fileB"></p><p class="note" id="noteB"></p></section>
</div>
<p id="readout" class="readout" aria-live="polite">hover over a map</p>
<section class="profile"><h2>Profile</h2><canvas id="profile" width="960" height="260"></canvas><p id="profileNote" class="note">drag across a map to draw a line</p></section>
</main>
<script type="application/json" id="data">${scriptSafe(JSON.stringify(data))}</script>
<script>${SCRIPT}</script>
</body>
</html>
`;
}

const STYLE = `
body{font:14px/1.4 system-ui,sans-serif;margin:0 auto;padding:12px 16px;max-width:1100px;color:#1b1b1b;background:#fff}
h1{font-size:20px;margin:4px 0}h2{font-size:15px;margin:6px 0}
.hint{color:#444;margin:4px 0 8px}
.controls{display:flex;flex-wrap:wrap;gap:14px;align-items:center;margin-bottom:8px}
select{max-width:320px}
.panes{display:flex;flex-wrap:wrap;gap:16px}
.pane{flex:1 1 480px;min-width:0}
canvas{max-width:100%;height:auto;border:1px solid #ccc;cursor:crosshair;display:block}
.readout{font-family:ui-monospace,monospace;background:#f4f4f4;padding:6px 8px;min-height:1.4em;overflow-wrap:anywhere}
.file,.note{color:#555;font-size:12px;margin:2px 0;overflow-wrap:anywhere}
.warn{color:#8a4b00}
`;

// The page's script: plain browser JavaScript, no libraries. Layout: each map canvas has a margin
// for the axes; the image fills the rest at the map's aspect ratio (equal scales in x and y).
const SCRIPT = String.raw`
(function () {
  'use strict';
  var D = JSON.parse(document.getElementById('data').textContent);
  var LUT = [];
  for (var i = 0; i < 256; i++) LUT.push([parseInt(D.lut.substr(6 * i, 2), 16), parseInt(D.lut.substr(6 * i + 2, 2), 16), parseInt(D.lut.substr(6 * i + 4, 2), 16)]);
  function decode(b64) {
    var s = atob(b64), u = new Uint8Array(s.length);
    for (var i = 0; i < s.length; i++) u[i] = s.charCodeAt(i);
    return new Float32Array(u.buffer);
  }
  D.cases.forEach(function (c) { c.v = decode(c.values); });
  var M = { left: 64, right: 12, top: 10, bottom: 44 };
  var state = { a: 0, b: -1, log: false, line: null, drag: null, last: null, profile: null };
  window.__explorer = { data: D, state: state, layouts: {} };

  function len(m) {
    var a = Math.abs(m);
    if (a === 0) return '0';
    if (a >= 1e-3) return +(m * 1e3).toPrecision(4) + ' mm';
    if (a >= 1e-7) return +(m * 1e6).toPrecision(4) + ' µm';
    return +(m * 1e9).toPrecision(4) + ' nm';
  }
  function unitOf(span) { return span >= 1e-3 ? ['mm', 1e3] : span >= 1e-6 ? ['µm', 1e6] : ['nm', 1e9]; }
  function niceStep(span, n) {
    var raw = span / n, p = Math.pow(10, Math.floor(Math.log10(raw))), f = raw / p;
    return (f < 1.5 ? 1 : f < 3.5 ? 2 : f < 7.5 ? 5 : 10) * p;
  }
  function scaled(c, v) {
    if (!(c.peak > 0)) return 0;
    if (!state.log) return Math.max(0, Math.min(1, v / c.peak));
    var t = Math.log10(Math.max(v / c.peak, 1e-300)) / D.logDecades + 1;
    return Math.max(0, Math.min(1, t));
  }
  function X(c, q) { return c.x0 + q * c.kx * c.dx; }
  function Y(c, r) { return c.oneD ? 0 : c.y0 + r * c.ky * c.dy; }

  // Where the image sits in a canvas: the map's aspect ratio kept, or a line plot for 1-D.
  function layout(canvas, c) {
    var W = canvas.width - M.left - M.right, H = canvas.height - M.top - M.bottom;
    if (c.oneD) return { x: M.left, y: M.top, w: W, h: H };
    var spanX = c.nx * c.kx * c.dx, spanY = c.ny * c.ky * c.dy;
    var s = Math.min(W / spanX, H / spanY);
    var w = Math.max(1, Math.round(spanX * s)), h = Math.max(1, Math.round(spanY * s));
    return { x: M.left + Math.floor((W - w) / 2), y: M.top + Math.floor((H - h) / 2), w: w, h: h };
  }
  function axes(g, L, c) {
    g.strokeStyle = '#333'; g.fillStyle = '#222'; g.font = '11px system-ui,sans-serif'; g.lineWidth = 1;
    g.strokeRect(L.x - 0.5, L.y - 0.5, L.w + 1, L.h + 1);
    var xLo = X(c, -0.5), xHi = X(c, c.nx - 0.5);
    var u = unitOf(Math.max(Math.abs(xLo), Math.abs(xHi)));
    var step = niceStep(xHi - xLo, 6);
    g.textAlign = 'center'; g.textBaseline = 'top';
    for (var t = Math.ceil(xLo / step) * step; t <= xHi; t += step) {
      var px = L.x + (t - xLo) / (xHi - xLo) * L.w;
      g.beginPath(); g.moveTo(px, L.y + L.h); g.lineTo(px, L.y + L.h + 5); g.stroke();
      g.fillText(+(t * u[1]).toPrecision(6) + '', px, L.y + L.h + 7);
    }
    g.fillText('x (' + u[0] + ')', L.x + L.w / 2, L.y + L.h + 24);
    g.textAlign = 'right'; g.textBaseline = 'middle';
    if (c.oneD) {
      var top = state.log ? 0 : 1, ticks = state.log ? D.logDecades : 4;
      for (var k = 0; k <= ticks; k++) {
        var py = L.y + k / ticks * L.h;
        g.beginPath(); g.moveTo(L.x - 5, py); g.lineTo(L.x, py); g.stroke();
        g.fillText(state.log ? '1e-' + k : (+(c.peak * (1 - k / ticks)).toPrecision(3)) + '', L.x - 7, py);
      }
      void top;
      return;
    }
    var yLo = Y(c, -0.5), yHi = Y(c, c.ny - 0.5);
    var uy = unitOf(Math.max(Math.abs(yLo), Math.abs(yHi)));
    var sy = niceStep(yHi - yLo, 6);
    for (var ty = Math.ceil(yLo / sy) * sy; ty <= yHi; ty += sy) {
      // Rows go down the picture, as in intensity.npy and the case pictures: y grows downwards.
      var py2 = L.y + (ty - yLo) / (yHi - yLo) * L.h;
      g.beginPath(); g.moveTo(L.x - 5, py2); g.lineTo(L.x, py2); g.stroke();
      g.fillText(+(ty * uy[1]).toPrecision(6) + '', L.x - 7, py2);
    }
    g.save(); g.translate(14, L.y + L.h / 2); g.rotate(-Math.PI / 2); g.textAlign = 'center'; g.fillText('y (' + uy[0] + ')', 0, 0); g.restore();
    // The optical axis, where the window holds it.
    if (xLo < 0 && xHi > 0 && yLo < 0 && yHi > 0) {
      var ax = L.x + (0 - xLo) / (xHi - xLo) * L.w, ay = L.y + (0 - yLo) / (yHi - yLo) * L.h;
      g.strokeStyle = 'rgba(255,255,255,0.8)'; g.beginPath(); g.moveTo(ax - 6, ay); g.lineTo(ax + 6, ay); g.moveTo(ax, ay - 6); g.lineTo(ax, ay + 6); g.stroke();
    }
  }
  function draw(canvas, idx) {
    var c = D.cases[idx], g = canvas.getContext('2d');
    g.clearRect(0, 0, canvas.width, canvas.height);
    var L = layout(canvas, c);
    window.__explorer.layouts[canvas.id] = { x: L.x, y: L.y, w: L.w, h: L.h, scaleX: canvas.getBoundingClientRect().width / canvas.width };
    if (c.oneD) {
      g.strokeStyle = '#1f4e79'; g.lineWidth = 1.5; g.beginPath();
      for (var q = 0; q < c.nx; q++) {
        var px = L.x + (q + 0.5) / c.nx * L.w, py = L.y + (1 - scaled(c, c.v[q])) * L.h;
        if (q === 0) g.moveTo(px, py); else g.lineTo(px, py);
      }
      g.stroke();
    } else {
      var img = g.createImageData(L.w, L.h);
      for (var j = 0; j < L.h; j++) {
        var r = Math.min(c.ny - 1, Math.floor(j / L.h * c.ny));
        for (var i = 0; i < L.w; i++) {
          var q2 = Math.min(c.nx - 1, Math.floor(i / L.w * c.nx));
          var col = LUT[Math.round(255 * scaled(c, c.v[r * c.nx + q2]))], o = 4 * (j * L.w + i);
          img.data[o] = col[0]; img.data[o + 1] = col[1]; img.data[o + 2] = col[2]; img.data[o + 3] = 255;
        }
      }
      g.putImageData(img, L.x, L.y);
    }
    axes(g, L, c);
    if (state.line && state.line.canvas === canvas.id) {
      g.strokeStyle = '#ff2d2d'; g.lineWidth = 2; g.beginPath();
      g.moveTo(state.line.p0[0], state.line.p0[1]); g.lineTo(state.line.p1[0], state.line.p1[1]); g.stroke();
    }
  }
  // Canvas pixel -> decimated sample (r, q), or null outside the image.
  function sampleAt(canvas, c, px, py) {
    var L = layout(canvas, c);
    if (px < L.x || px >= L.x + L.w || py < L.y || py >= L.y + L.h) return null;
    var q = Math.min(c.nx - 1, Math.floor((px - L.x) / L.w * c.nx));
    var r = c.oneD ? 0 : Math.min(c.ny - 1, Math.floor((py - L.y) / L.h * c.ny));
    return { r: r, q: q };
  }
  function caseOf(canvas) { return D.cases[canvas.id === 'mapA' ? state.a : state.b]; }
  function toCanvas(canvas, ev) {
    // The content box (inside the border), which is what the canvas's pixels fill.
    var b = canvas.getBoundingClientRect();
    return [(ev.clientX - b.left - canvas.clientLeft) * canvas.width / canvas.clientWidth, (ev.clientY - b.top - canvas.clientTop) * canvas.height / canvas.clientHeight];
  }
  function fmtI(v) { return v === 0 ? '0' : Math.abs(v) >= 1e-3 && Math.abs(v) < 1e4 ? (+v.toPrecision(5)) + '' : v.toExponential(4); }
  function readout(canvas, ev) {
    var c = caseOf(canvas), p = toCanvas(canvas, ev), s = sampleAt(canvas, c, p[0], p[1]);
    var el = document.getElementById('readout');
    if (!s) { el.textContent = 'outside the map'; state.last = null; return; }
    var row = s.r * c.ky, col = s.q * c.kx, v = c.v[s.r * c.nx + s.q];
    state.last = { caseId: c.id, row: row, col: col, x: X(c, s.q), y: Y(c, s.r), intensity: v };
    el.textContent = c.label + ': x = ' + len(X(c, s.q)) + (c.oneD ? '' : ', y = ' + len(Y(c, s.r))) + ', I = ' + fmtI(v) + ' (' + (c.peak > 0 ? (100 * v / c.peak).toPrecision(3) + ' % of the peak' : 'no light') + '); ' + c.file + ' [' + (c.oneD ? col : row + ', ' + col) + ']';
  }
  // The profile along the drawn line: one point per decimated sample step, nearest sample.
  function profile(canvas) {
    var c = caseOf(canvas), l = state.line;
    var a = sampleAt(canvas, c, l.p0[0], l.p0[1]), b = sampleAt(canvas, c, l.p1[0], l.p1[1]);
    if (!a || !b) return;
    var n = Math.max(Math.abs(b.q - a.q), Math.abs(b.r - a.r)) + 1;
    var pts = [];
    for (var k = 0; k < n; k++) {
      var t = n === 1 ? 0 : k / (n - 1);
      var q = Math.round(a.q + t * (b.q - a.q)), r = Math.round(a.r + t * (b.r - a.r));
      pts.push({ row: r * c.ky, col: q * c.kx, x: X(c, q), y: Y(c, r), intensity: c.v[r * c.nx + q] });
    }
    var x0 = pts[0].x, y0 = pts[0].y;
    pts.forEach(function (p) { p.s = Math.hypot(p.x - x0, p.y - y0); });
    state.profile = { caseId: c.id, points: pts };
    drawProfile(c);
  }
  function drawProfile(c) {
    var cv = document.getElementById('profile'), g = cv.getContext('2d'), P = state.profile;
    g.clearRect(0, 0, cv.width, cv.height);
    if (!P) return;
    var pts = P.points, L = { x: 70, y: 10, w: cv.width - 90, h: cv.height - 56 };
    var sMax = pts[pts.length - 1].s || 1, vMax = 0;
    pts.forEach(function (p) { vMax = Math.max(vMax, p.intensity); });
    var val = function (v) { return state.log ? scaled(c, v) : (vMax > 0 ? v / vMax : 0); };
    g.strokeStyle = '#333'; g.fillStyle = '#222'; g.font = '11px system-ui,sans-serif'; g.strokeRect(L.x - 0.5, L.y - 0.5, L.w + 1, L.h + 1);
    var u = unitOf(sMax), step = niceStep(sMax, 8);
    g.textAlign = 'center'; g.textBaseline = 'top';
    for (var t = 0; t <= sMax * (1 + 1e-9); t += step) {
      var px = L.x + t / sMax * L.w;
      g.beginPath(); g.moveTo(px, L.y + L.h); g.lineTo(px, L.y + L.h + 5); g.stroke();
      g.fillText(+(t * u[1]).toPrecision(6) + '', px, L.y + L.h + 7);
    }
    g.fillText('distance along the line (' + u[0] + ')', L.x + L.w / 2, L.y + L.h + 24);
    g.textAlign = 'right'; g.textBaseline = 'middle';
    for (var k = 0; k <= 4; k++) {
      var py = L.y + k / 4 * L.h;
      g.fillText(state.log ? (k === 0 ? 'peak' : '') : (+(vMax * (1 - k / 4)).toPrecision(3)) + '', L.x - 6, py);
    }
    g.strokeStyle = '#b0171f'; g.lineWidth = 1.5; g.beginPath();
    pts.forEach(function (p, i) {
      var x = L.x + (p.s / sMax) * L.w, y = L.y + (1 - val(p.intensity)) * L.h;
      if (i === 0) g.moveTo(x, y); else g.lineTo(x, y);
    });
    g.stroke();
    document.getElementById('profileNote').textContent = c.label + ': ' + pts.length + ' samples from (' + len(pts[0].x) + ', ' + len(pts[0].y) + ') to (' + len(pts[pts.length - 1].x) + ', ' + len(pts[pts.length - 1].y) + ')' + (state.log ? '; log scale, ' + D.logDecades + ' decades below the case peak' : '; linear, relative to the incident irradiance');
  }
  function every(k, what) { return 'every ' + (k === 1 ? '' : nth(k) + ' ') + what; }
  function nth(k) { return k + (k % 10 === 2 && k % 100 !== 12 ? 'nd' : k % 10 === 3 && k % 100 !== 13 ? 'rd' : k % 10 === 1 && k % 100 !== 11 ? 'st' : 'th'); }
  function label(idx, which) {
    var c = D.cases[idx];
    document.getElementById('title' + which).textContent = c.label;
    document.getElementById('file' + which).textContent = 'full resolution: ' + c.file + ' (' + (c.oneD ? c.full[1] + ' samples' : c.full[0] + ' rows × ' + c.full[1] + ' columns') + '; ' + (c.kx === 1 && c.ky === 1 ? 'every sample' : c.oneD ? every(c.kx, 'sample') : every(c.ky, 'row') + ' and ' + every(c.kx, 'column')) + ' shown); peak ' + fmtI(c.peak);
    var n = document.getElementById('note' + which);
    n.textContent = c.note + (c.warnings.length ? ' — warnings: ' + c.warnings.join('; ') : '');
    n.className = c.warnings.length ? 'note warn' : 'note';
  }
  function redraw() {
    draw(document.getElementById('mapA'), state.a); label(state.a, 'A');
    var pb = document.getElementById('paneB');
    pb.hidden = state.b < 0;
    if (state.b >= 0) { draw(document.getElementById('mapB'), state.b); label(state.b, 'B'); }
    if (state.profile) drawProfile(D.cases.filter(function (c) { return c.id === state.profile.caseId; })[0]);
  }
  var A = document.getElementById('pickA'), B = document.getElementById('pickB');
  D.cases.forEach(function (c, i) {
    var o = document.createElement('option'); o.value = i; o.textContent = c.label; A.appendChild(o);
    var o2 = document.createElement('option'); o2.value = i; o2.textContent = c.label; B.appendChild(o2);
  });
  A.addEventListener('change', function () { state.a = +A.value; state.line = null; state.profile = null; redraw(); });
  B.addEventListener('change', function () { state.b = B.value === '' ? -1 : +B.value; redraw(); });
  Array.prototype.forEach.call(document.querySelectorAll('input[name=scale]'), function (r) {
    r.addEventListener('change', function () { state.log = r.value === 'log' && r.checked; redraw(); });
  });
  ['mapA', 'mapB'].forEach(function (id) {
    var cv = document.getElementById(id);
    cv.addEventListener('mousemove', function (ev) {
      readout(cv, ev);
      if (state.drag && state.drag.canvas === id) { state.line = { canvas: id, p0: state.drag.p0, p1: toCanvas(cv, ev) }; redraw(); }
    });
    cv.addEventListener('mousedown', function (ev) { state.drag = { canvas: id, p0: toCanvas(cv, ev) }; });
    cv.addEventListener('mouseup', function (ev) {
      if (!state.drag) return;
      state.line = { canvas: id, p0: state.drag.p0, p1: toCanvas(cv, ev) };
      state.drag = null;
      profile(cv); redraw();
    });
  });
  redraw();
})();
`;

/** One case of a job as the explorer reads it from the job folder. */
export interface ExplorerSource {
  id: string;
  label: string;
  note: string;
  warnings: string[];
  /** The plan's output axes: the map's grid (no y axis: the 1-D form). */
  grid: Grid;
}

/** Reads each case's intensity.npy from the job folder and writes the explorer page (atomically). */
export async function writeExplorer(jobDir: string, file: string, job: string, sources: ExplorerSource[], logDecades = 5): Promise<void> {
  const side = explorerSide(sources.length);
  const cases: PageCase[] = [];
  // One full map in memory at a time: each is made into its page entry and dropped.
  for (const s of sources) cases.push(pageCase(explorerCaseOf(s, decodeNpy(new Uint8Array(await readFile(join(jobDir, s.id, CASE_FILES.intensity))))), side));
  await writeExplorerPage(jobDir, file, job, cases, logDecades);
}

/** Writes the page (atomically) from entries made already (pageCase). */
export async function writeExplorerPage(jobDir: string, file: string, job: string, cases: PageCase[], logDecades = 5): Promise<void> {
  await writeFileAtomic(join(jobDir, file), explorerPageHtml(job, cases, logDecades));
}

/** The explorer's case from its source and its decoded intensity.npy (shape [rows, cols] or [n]). */
export function explorerCaseOf(s: ExplorerSource, npy: { data: Float64Array; shape: number[] }): ExplorerCase {
  const [rows, cols] = npy.shape.length === 2 ? (npy.shape as [number, number]) : [1, npy.shape[0]!];
  return { ...s, ...s.grid, nx: cols, ny: rows, intensity: npy.data };
}

/** A case's explorer entry from its record (the plan's output axes are the map's grid). */
export function explorerSourceOf(rec: CaseSummary, label: string): ExplorerSource {
  const p = rec.plan;
  return {
    id: p.case.id,
    label,
    note: `${methodWords(p.method, p.form)}, ${p.regime}; λ = ${formatLength(p.case.wavelength)}, z = ${formatLength(p.case.distance)}`,
    warnings: rec.warnings.map((w) => w.code),
    grid: { nx: p.x.output.n, ny: p.y ? p.y.output.n : 1, dx: p.x.output.step, dy: p.y ? p.y.output.step : 0, x0: p.x.output.start, y0: p.y ? p.y.output.start : 0 },
  };
}
