// A case's share of the job report — its contact-sheet tile and its explorer entry — made from its
// map as written. The job report needs them for up to 36 and 48 cases; gathering reads each such
// case's intensity.npy back, once the last case is done. A run makes them instead on the thread that
// computed the case, right after writing it, while its map is still in memory: the work then runs
// beside the other cases, not after them, where it was the longest serial part of a small sweep's
// end. Which cases the report shows depends on how many are done; a run predicts it from its plans
// (all done), and gathering uses a prepared share only where the prediction held (the same label,
// the same page side), reading the others from disk as before. Both paths call the functions here
// on the same values, so the report is the same either way.
import { explorerCaseOf, explorerSide, explorerSourceOf, pageCase, type PageCase } from './explorer.js';
import type { SheetTile } from './contact-sheet.js';
import type { CaseSummary } from '../output/case-output.js';
import type { NpyDtype } from '../output/npy.js';
import type { SweepAxis } from '../job/expand.js';
import type { Case, Plan } from '../plan/types.js';
import { formatLength } from '../job/units.js';
import { isOneD } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';

/** How many cases a contact sheet shows at most (chosen evenly along the sweep). */
export const SHEET_MAX_TILES = 36;

/** Indices of the cases that go on the contact sheet. */
export function sheetIndices(count: number): Set<number> {
  if (count < 2) return new Set();
  return evenIndices(count, SHEET_MAX_TILES);
}

/** At most `most` indices of `count`, evenly along them, the first and last included. */
export function evenIndices(count: number, most: number): Set<number> {
  const n = Math.min(count, most);
  return new Set(Array.from({ length: n }, (_, i) => Math.round((i * (count - 1)) / Math.max(1, n - 1))));
}

/** How many cases the explorer page carries at most (chosen evenly along the sweep). */
export const EXPLORER_MAX_CASES = 48;

/** A case's map reduced (box average) to at most `limit` samples per axis, for the contact sheet. */
export function sheetTile(label: string, c: IntensityMap, limit = 400): SheetTile {
  const oneD = isOneD(c);
  const fx = Math.max(1, Math.ceil(c.nx / limit));
  const fy = oneD ? 1 : Math.max(1, Math.ceil(c.ny / limit));
  const cols = Math.floor(c.nx / fx);
  const rows = Math.floor(c.ny / fy);
  const out = new Float64Array(rows * cols);
  for (let r = 0; r < rows; r++) {
    for (let q = 0; q < cols; q++) {
      let s = 0;
      for (let i = 0; i < fy; i++) for (let j = 0; j < fx; j++) s += c.intensity[(r * fy + i) * c.nx + q * fx + j]!;
      out[r * cols + q] = s / (fx * fy);
    }
  }
  // The reduced sample (r, q) is centred on the mean position of the samples it averages; a 1-D
  // map stays in the grid's 1-D form.
  const map: IntensityMap = {
    nx: cols,
    ny: rows,
    dx: c.dx * fx,
    dy: oneD ? 0 : c.dy * fy,
    x0: c.x0 + ((fx - 1) / 2) * c.dx,
    y0: oneD ? 0 : c.y0 + ((fy - 1) / 2) * c.dy,
    intensity: out,
  };
  // The case's peak from the full map: the reduced one's box averages are lower.
  let peak = 0;
  for (let i = 0; i < c.intensity.length; i++) if (c.intensity[i]! > peak) peak = c.intensity[i]!;
  return { label, map, peak };
}

const LABELS: Record<string, string> = {
  wavelength: 'wavelength',
  distance: 'distance',
  'aperture.diameter': 'diameter',
  'aperture.width': 'width',
  'aperture.height': 'height',
  'aperture.length': 'length',
  'aperture.outer': 'outer diameter',
  'aperture.inner': 'inner diameter',
  'aperture.count': 'slit count',
  'aperture.period': 'period',
  'illumination.waist': 'beam waist',
  'spectrometer.slit': 'entrance slit',
  'spectrometer.collimator': 'collimator focal length',
  'spectrometer.camera': 'camera focal length',
  'spectrometer.pixel': 'pixel pitch',
};

/** A swept key's name in the report (its label, or the key itself). */
export function sweptKeyName(key: string): string {
  return LABELS[key] ?? key;
}

export function sweptLabel(a: { key: string; unit: 'm' | '1' }, value: number): string {
  const short = sweptKeyName(a.key);
  return `${short} ${a.unit === 'm' ? formatLength(value, 4) : value}`;
}

/** What the report will want of one case, sent with its task. */
export interface ReportShare {
  label: string;
  tile: boolean;
  /** The explorer page's side (explorerSide) if the case is on the page, else null. */
  pageSide: number | null;
}

/** What a case's thread made of its share. */
export interface PreparedShare {
  label: string;
  tile?: SheetTile;
  page?: PageCase;
  pageSide?: number;
}

/** The report's cases when `count` are done: those on the contact sheet, those on the explorer page, and its side. */
export function reportSelection(count: number): { onSheet: Set<number>; onPage: Set<number>; side: number } {
  const onSheet = sheetIndices(count);
  // The explorer page's cases: the done ones, evenly chosen along the sweep past EXPLORER_MAX_CASES.
  const onPage = count <= EXPLORER_MAX_CASES ? new Set(Array.from({ length: count }, (_, i) => i)) : evenIndices(count, EXPLORER_MAX_CASES);
  return { onSheet, onPage, side: explorerSide(onPage.size) };
}

/** A case's label in the report: its swept values, or its folder name when nothing is swept. */
export function caseLabel(axes: SweepAxis[], c: Case): string {
  return axes.map((a) => sweptLabel(a, c.swept[a.key]!)).join(', ') || c.id;
}

/** Every case's share when all of `plans` (the job's cases, in order) are done. */
export function reportShares(axes: SweepAxis[], plans: Plan[]): Map<string, ReportShare> {
  const { onSheet, onPage, side } = reportSelection(plans.length);
  const out = new Map<string, ReportShare>();
  plans.forEach((p, i) => {
    if (onSheet.has(i) || onPage.has(i)) out.set(p.case.id, { label: caseLabel(axes, p.case), tile: onSheet.has(i), pageSide: onPage.has(i) ? side : null });
  });
  return out;
}

/** The values intensity.npy holds: float32 files round each value (output/npy.ts). */
export function writtenValues(intensity: Float64Array, dtype: NpyDtype): Float64Array {
  return dtype === 'float32' ? Float64Array.from(Float32Array.from(intensity)) : intensity;
}

/** A case's contact-sheet tile from its map as written ([rows, cols], the plan's output axes). */
export function tileOf(label: string, plan: Plan, data: Float64Array, rows: number, cols: number): SheetTile {
  // The plan's output axes are the map's grid (no y axis: the 1-D form, ny = 1, dy = 0).
  return sheetTile(label, {
    nx: cols,
    ny: rows,
    dx: plan.x.output.step,
    dy: plan.y ? plan.y.output.step : 0,
    x0: plan.x.output.start,
    y0: plan.y ? plan.y.output.start : 0,
    intensity: data,
  });
}

/** A case's explorer entry from its map as written (shape as intensity.npy's). */
export function pageOf(rec: CaseSummary, label: string, data: Float64Array, shape: number[], side: number): PageCase {
  return pageCase(explorerCaseOf(explorerSourceOf(rec, label), { data, shape }), side);
}

/** The share made where the case was computed, from the values just written. */
export function prepareShare(share: ReportShare, rec: CaseSummary, written: Float64Array, rows: number, cols: number): PreparedShare {
  const out: PreparedShare = { label: share.label };
  if (share.tile) out.tile = tileOf(share.label, rec.plan, written, rows, cols);
  if (share.pageSide !== null) {
    out.page = pageOf(rec, share.label, written, [rows, cols], share.pageSide);
    out.pageSide = share.pageSide;
  }
  return out;
}
