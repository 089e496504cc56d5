// The files of a case of several wavelengths beside the usual ones: colour.png (the true-colour
// picture, output/colour-picture.ts) and, for a grating, line-orders.csv (every line's order
// table, one row per line and order) and line-pairs.csv (close lines resolved or not, per order).
import type { LineOrders, LinePair } from '../analysis/line-pairs.js';
import type { IntensityMap } from '../model/intensity-map.js';
import type { ColourMaps } from '../run/spectrum-case.js';
import { renderColourPng } from './colour-picture.js';
import { toCsv } from './csv.js';

export const SPECTRUM_FILES = {
  colour: 'colour.png',
  lineOrders: 'line-orders.csv',
  linePairs: 'line-pairs.csv',
} as const;

/**
 * A wavelength's own map (output.lineMaps): line-<its place, from 1>-<λ in nm>nm.npy (the place
 * keeps two lines of one wavelength apart), on the case's grid, unweighted (relative to that
 * wavelength's incident irradiance).
 */
export function lineMapName(index: number, count: number, wavelength: number): string {
  return `line-${String(index + 1).padStart(String(count).length, '0')}-${Number((wavelength * 1e9).toFixed(4))}nm.npy`;
}

/** What a spectrum case writes besides the usual files: [file name, bytes or text]. */
export function spectrumFiles(map: IntensityMap, colour: ColourMaps | undefined, lineOrders: LineOrders[] | undefined, pairs: LinePair[] | undefined, title: string, logDecades: number): [string, string | Uint8Array][] {
  const out: [string, string | Uint8Array][] = [];
  if (colour) out.push([SPECTRUM_FILES.colour, renderColourPng({ map, ...colour, logDecades, title, ...(lineOrders?.length ? { marks: orderMarks(lineOrders) } : {}) })]);
  if (lineOrders?.length) out.push([SPECTRUM_FILES.lineOrders, lineOrdersCsv(lineOrders)]);
  if (pairs) out.push([SPECTRUM_FILES.linePairs, linePairsCsv(pairs)]);
  return out;
}

/** Which of SPECTRUM_FILES a case writes, as [key, file name] (for result.json's file list). */
export function spectrumFileEntries(colour: boolean, lineOrders: boolean, pairs: boolean): [string, string][] {
  const has: Record<keyof typeof SPECTRUM_FILES, boolean> = { colour, lineOrders, linePairs: pairs };
  return Object.entries(SPECTRUM_FILES).filter(([k]) => has[k as keyof typeof SPECTRUM_FILES]);
}

/** Each propagating order from where its shortest line lands to where its longest does. */
export function orderMarks(lines: LineOrders[]): { from: number; to: number; label: string }[] {
  const sorted = [...lines].sort((a, b) => a.wavelength - b.wavelength);
  const first = sorted[0]!;
  const last = sorted[sorted.length - 1]!;
  const marks: { from: number; to: number; label: string }[] = [];
  for (const o of first.orders) {
    if (!o.propagates || o.position === null) continue;
    const p = last.orders.find((q) => q.m === o.m && q.propagates && q.position !== null);
    marks.push({ from: o.position, to: p?.position ?? o.position, label: `m=${o.m}` });
  }
  return marks;
}

function lineOrdersCsv(lines: LineOrders[]): string {
  const header = ['wavelength_m', 'weight', 'm', 'status', 'sin_angle', 'angle_rad', 'position_m', 'fraction_of_transmitted', 'predicted_fraction', 'resolving_power', 'free_spectral_range_m'];
  const rows = lines.flatMap((l) =>
    l.orders.map((o) => [l.wavelength, l.weight, o.m, o.status, o.sinAngle, o.angle, o.position, o.fractionOfTransmitted, o.predictedFraction, o.resolvingPower, o.freeSpectralRange ?? null]),
  );
  return toCsv(header, rows);
}

function linePairsCsv(pairs: LinePair[]): string {
  const header = ['order', 'wavelength_1_m', 'wavelength_2_m', 'position_1_m', 'position_2_m', 'dip', 'resolved', 'sparrow_resolved', 'resolving_power', 'lambda_over_delta_lambda', 'expected_resolved'];
  return toCsv(
    header,
    pairs.map((p) => [p.order, p.wavelengths[0], p.wavelengths[1], p.positions[0], p.positions[1], p.dip, p.resolved, p.sparrow, p.resolvingPower, p.needed, p.expected]),
  );
}
