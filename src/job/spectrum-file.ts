// A spectrum given as a CSV file: a header naming the wavelength's unit, then rows of (wavelength,
// spectral power density) in increasing wavelength. Read by the loader like the job file (never
// blocking, capped, special files refused); every problem says the file, the row and what was
// expected.
import { WAVELENGTH_MAX, WAVELENGTH_MIN } from './quantities.js';
import { safeEcho } from '../safe-text.js';
import type { SpectrumTable } from './schema.js';

export const SPECTRUM_FILE_MAX_BYTES = 4 * 1024 * 1024;
export const SPECTRUM_ROWS_MAX = 100_000;

const UNITS: [RegExp, number][] = [
  [/(^|[^a-z])nm([^a-z]|$)/i, 1e-9],
  [/(^|[^a-z])(um|µm|μm|micron|microns)([^a-z]|$)/i, 1e-6],
  [/(^|[^a-z])(angstrom|Å)([^a-z]|$)/i, 1e-10],
];

/** The table, or the first problem in words (the caller names the key and the file). */
export function parseSpectrumCsv(text: string): SpectrumTable | { problem: string } {
  const lines = text.split(/\r?\n/).map((l) => l.trim()).filter((l) => l !== '' && !l.startsWith('#'));
  if (lines.length === 0) return { problem: 'the file is empty: expected a header such as wavelength_nm,power and then rows' };
  const header = lines[0]!.split(/[,;\t]/).map((h) => h.trim());
  const scale = UNITS.find(([re]) => re.test(header[0] ?? ''))?.[1];
  if (header.length < 2 || scale === undefined || !/wavelength/i.test(header[0]!)) {
    return { problem: `expected a header row naming the wavelength's unit, such as wavelength_nm,power (found '${safeEcho(lines[0]!, 80)}')` };
  }
  if (lines.length - 1 > SPECTRUM_ROWS_MAX) return { problem: `expected at most ${SPECTRUM_ROWS_MAX} rows (found ${lines.length - 1})` };
  const wavelengths: number[] = [];
  const density: number[] = [];
  for (let r = 1; r < lines.length; r++) {
    const cells = lines[r]!.split(/[,;\t]/).map((c) => c.trim());
    const lam = Number(cells[0]) * scale;
    const p = Number(cells[1]);
    const row = `row ${r + 1} ('${safeEcho(lines[r]!, 60)}')`;
    if (cells.length < 2 || cells[0] === '' || cells[1] === '' || !Number.isFinite(lam) || !Number.isFinite(p)) return { problem: `${row}: expected two numbers, a wavelength and a power` };
    if (!(lam >= WAVELENGTH_MIN && lam <= WAVELENGTH_MAX)) return { problem: `${row}: expected a wavelength from 1 nm to 1 mm` };
    if (p < 0) return { problem: `${row}: expected a power of 0 or more` };
    if (wavelengths.length && !(lam > wavelengths[wavelengths.length - 1]!)) return { problem: `${row}: expected wavelengths in increasing order, each longer than the row before` };
    wavelengths.push(lam);
    density.push(p);
  }
  if (wavelengths.length < 2) return { problem: 'expected at least two rows after the header' };
  if (!density.some((p) => p > 0)) return { problem: 'expected some power: every row has 0' };
  return { wavelengths, density };
}
