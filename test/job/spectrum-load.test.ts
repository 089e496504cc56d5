// The job's spectrum key at load time (src/job/spectrum-schema.ts, spectrum-file.ts, load.ts): every
// refusal names the key path and says what was expected; a CSV of (wavelength, power) rows is read
// relative to the job file and attached as the spectrum's table; the expansion makes one case per
// distance whose wavelength is the power-weighted mean (common practice for the schema).
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JobError, loadJobFile, parseJobText } from '../../src/job/load.js';
import { expandJob, spectrumOf } from '../../src/job/expand.js';
import { spectrumLines } from '../../src/analysis/spectrum.js';

const HEAD = 'name: t\ndistance: 1 m\naperture: {shape: slit, width: 100 um}\n';
const LINES = 'spectrum: {lines: [{wavelength: 500 nm}]}\n';

type Problem = { path: string; message: string; line?: number };

function problems(text: string): Problem[] {
  try {
    parseJobText(text);
  } catch (e) {
    expect(e).toBeInstanceOf(JobError);
    return (e as JobError).problems;
  }
  throw new Error(`expected the job to be refused:\n${text}`);
}

/** The one problem at `path` (and no other at a spectrum key). */
function refusedAt(text: string, path: string): Problem {
  const all = problems(text);
  const at = all.filter((p) => p.path === path);
  expect(at, JSON.stringify(all)).toHaveLength(1);
  return at[0]!;
}

describe('spectrum keys: refusals with the key path and what was expected', () => {
  it('neither wavelength nor spectrum: at wavelength, naming both', () => {
    const p = refusedAt(HEAD, 'wavelength');
    expect(p.message).toMatch(/^missing: expected a positive length/);
    expect(p.message).toMatch(/spectrum/);
  });

  it('both wavelength and spectrum: at spectrum', () => {
    expect(refusedAt(HEAD + 'wavelength: 633 nm\n' + LINES, 'spectrum').message).toMatch(/^expected either wavelength or spectrum, not both/);
  });

  it('two forms at once (lines and band): at the second, naming both', () => {
    const p = refusedAt(HEAD + 'spectrum: {lines: [{wavelength: 500 nm}], band: {from: 400 nm, to: 700 nm}}\n', 'spectrum.band');
    expect(p.message).toMatch(/^expected one of lines, band, blackbody or file, not both lines and band/);
  });

  it('a spectrum of no form: at spectrum', () => {
    expect(refusedAt(HEAD + 'spectrum: {samples: 5}\n', 'spectrum').message).toMatch(/^expected one of lines, band, blackbody or file/);
  });

  it('samples with lines: at spectrum.samples', () => {
    expect(refusedAt(HEAD + 'spectrum: {lines: [{wavelength: 500 nm}], samples: 5}\n', 'spectrum.samples').message).toMatch(/^expected no samples with lines/);
  });

  it('samples with a file: at spectrum.samples (its rows are the samples); a blackbody and a file at once: at file', () => {
    expect(refusedAt(HEAD + 'spectrum: {file: lamp.csv, samples: 5}\n', 'spectrum.samples').message).toMatch(/^expected no samples with a file/);
    expect(refusedAt(HEAD + 'spectrum: {blackbody: {temperature: 3000, from: 400 nm, to: 700 nm}, file: lamp.csv}\n', 'spectrum.file').message).toMatch(/not both blackbody and file/);
  });

  it("a band with 'to' not longer than 'from': at spectrum.band.to (also for a blackbody)", () => {
    expect(refusedAt(HEAD + 'spectrum: {band: {from: 700 nm, to: 400 nm}}\n', 'spectrum.band.to').message).toMatch(/^expected 'to' longer than 'from'/);
    expect(refusedAt(HEAD + 'spectrum: {band: {from: 700 nm, to: 700 nm}}\n', 'spectrum.band.to').message).toMatch(/^expected 'to' longer than 'from'/);
    expect(refusedAt(HEAD + 'spectrum: {blackbody: {temperature: 3000, from: 700 nm, to: 400 nm}}\n', 'spectrum.blackbody.to').message).toMatch(/^expected 'to' longer than 'from'/);
  });

  it('a bad temperature: too cold, too hot, the wrong unit; a good one with K loads', () => {
    for (const t of ['50', '1e6', "'3000 C'", "'hot'"]) {
      const p = refusedAt(HEAD + `spectrum: {blackbody: {temperature: ${t}, from: 400 nm, to: 700 nm}}\n`, 'spectrum.blackbody.temperature');
      expect(p.message).toMatch(/^expected a temperature in kelvin from 100 K to 100000 K/);
    }
    const ok = parseJobText(HEAD + "spectrum: {blackbody: {temperature: '3000 K', from: 400 nm, to: 700 nm}}\n").spec;
    expect(spectrumOf(ok)).toMatchObject({ kind: 'blackbody', temperature: 3000 });
  });

  it('an empty list of lines: at spectrum.lines', () => {
    expect(refusedAt(HEAD + 'spectrum: {lines: []}\n', 'spectrum.lines').message).toMatch(/^expected a list of 1 to 1000 lines/);
  });

  it('a line of power 0 (or below): at that line\'s power', () => {
    expect(refusedAt(HEAD + 'spectrum: {lines: [{wavelength: 500 nm}, {wavelength: 600 nm, power: 0}]}\n', 'spectrum.lines[1].power').message).toMatch(/^expected a relative power: a number above 0/);
    expect(refusedAt(HEAD + 'spectrum: {lines: [{wavelength: 500 nm, power: -1}]}\n', 'spectrum.lines[0].power').message).toMatch(/^expected a relative power/);
  });

  it('a line without a wavelength or with a bad one: at that line\'s wavelength', () => {
    expect(problems(HEAD + 'spectrum: {lines: [{power: 1}]}\n').map((p) => p.path)).toContain('spectrum.lines[0].wavelength');
    expect(problems(HEAD + 'spectrum: {lines: [{wavelength: -5 nm}]}\n').map((p) => p.path)).toContain('spectrum.lines[0].wavelength');
  });

  it('a spectrum with planes in sequence: at spectrum, saying why', () => {
    const p = refusedAt(HEAD + LINES + "planes: [{after: '10 mm', element: {shape: circle, diameter: 1 mm}}]\n", 'spectrum');
    expect(p.message).toMatch(/^expected a single wavelength with planes in sequence/);
  });

  it('a spectrum with a search: at the search, saying it is made at one wavelength', () => {
    expect(refusedAt(HEAD + LINES + "search: {smallest-spot: {between: ['10 um', '1 mm']}}\n", 'search.smallest-spot').message).toMatch(/one wavelength/);
  });

  it('a spectrum with a point source (or any source at a distance): at illumination.kind', () => {
    const p = refusedAt(HEAD + LINES + "illumination: {kind: point, distance: '1 m'}\n", 'illumination.kind');
    expect(p.message).toMatch(/^expected plane light or a Gaussian beam with its waist at the aperture with a spectrum/);
    refusedAt(HEAD + LINES + "illumination: {kind: extended, shape: disc, size: '0.5 mm', distance: '300 mm'}\n", 'illumination.kind');
    refusedAt(HEAD + LINES + "illumination: {kind: gaussian, waist: '0.4 mm', waist_distance: '200 mm'}\n", 'illumination.kind');
  });

  it('plane light and a Gaussian beam with its waist at the aperture load with a spectrum', () => {
    expect(() => parseJobText(HEAD + LINES + "illumination: {kind: gaussian, waist: '0.4 mm'}\n")).not.toThrow();
    expect(() => parseJobText(HEAD + LINES + 'illumination: {kind: plane, tilt: [1 deg, 0]}\n')).not.toThrow();
  });
});

describe('a spectrum from a CSV file, read relative to the job file', () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'spotcast-spectrum-'));
    await mkdir(join(dir, 'lamps'));
    await mkdir(join(dir, 'lamps', 'folder.csv'));
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  /** Writes lamps/<name>.csv (unless `csv` is null) and a job naming it; returns the job's path. */
  async function job(name: string, csv: string | null, file = `lamps/${name}.csv`): Promise<string> {
    if (csv !== null) await writeFile(join(dir, 'lamps', `${name}.csv`), csv);
    const path = join(dir, `${name}.yaml`);
    await writeFile(path, `${HEAD}spectrum: {file: ${file}}\n`);
    return path;
  }

  async function refusal(path: string): Promise<Problem> {
    try {
      await loadJobFile(path);
    } catch (e) {
      expect(e).toBeInstanceOf(JobError);
      const ps = (e as JobError).problems;
      expect(ps).toHaveLength(1);
      expect(ps[0]!.path).toBe('spectrum.file');
      // The key's line in the job file (line 4: HEAD has three).
      expect(ps[0]!.line).toBe(4);
      return ps[0]!;
    }
    throw new Error(`expected ${path} to be refused`);
  }

  it('a good file: its table attached in SI, the case\'s spectrum a table, lines summing to 1 by the trapezoid rule', async () => {
    const path = await job('good', '# an invented lamp\nwavelength_nm,power\n500,1\n510,2\n530,1\n');
    const loaded = await loadJobFile(path);
    const table = (loaded.spec.spectrum as { table?: { wavelengths: number[]; density: number[] } }).table!;
    expect(table.wavelengths).toEqual([500e-9, 510e-9, 530e-9].map((w) => expect.closeTo(w, 20)));
    expect(table.density).toEqual([1, 2, 1]);
    const cases = expandJob(loaded.spec);
    expect(cases).toHaveLength(1);
    const s = cases[0]!.spectrum!;
    expect(s.kind).toBe('table');
    const lines = spectrumLines(s);
    expect(lines.reduce((t, l) => t + l.weight, 0)).toBeCloseTo(1, 14);
    // Trapezoid widths 5, 15, 10 nm times the densities: 5, 30, 10 of 45 (worked by hand).
    expect(lines.map((l) => l.weight)).toEqual([5 / 45, 30 / 45, 10 / 45].map((w) => expect.closeTo(w, 12)));
    // The case's wavelength is the weighted mean: (500·5 + 510·30 + 530·10)/45 nm.
    expect(cases[0]!.wavelength).toBeCloseTo(((500 * 5 + 510 * 30 + 530 * 10) / 45) * 1e-9, 18);
  });

  it('a header in micrometres scales the wavelengths', async () => {
    const loaded = await loadJobFile(await job('micro', 'wavelength_um;power\n0.5;1\n0.6;1\n'));
    const table = (loaded.spec.spectrum as { table?: { wavelengths: number[] } }).table!;
    expect(table.wavelengths[0]).toBeCloseTo(0.5e-6, 18);
    expect(table.wavelengths[1]).toBeCloseTo(0.6e-6, 18);
  });

  it('a file saved with Windows line ends and a byte-order mark (as spreadsheets save CSV) loads the same', async () => {
    const loaded = await loadJobFile(await job('crlf', '\uFEFFwavelength_nm,power\r\n500,1\r\n510,2\r\n530,1\r\n'));
    const table = (loaded.spec.spectrum as { table?: { wavelengths: number[]; density: number[] } }).table!;
    expect(table.density).toEqual([1, 2, 1]);
    expect(table.wavelengths).toHaveLength(3);
  });

  it('no header, or a header without a unit: expected a header naming the unit', async () => {
    for (const [name, csv] of [['noheader', '500,1\n510,2\n'], ['nounit', 'wavelength,power\n500,1\n510,2\n']] as const) {
      const p = await refusal(await job(name, csv));
      expect(p.message).toContain(`lamps/${name}.csv`);
      expect(p.message).toMatch(/expected a header row naming the wavelength's unit, such as wavelength_nm,power/);
    }
  });

  it('rows out of order: the row, and that wavelengths must increase', async () => {
    const p = await refusal(await job('order', 'wavelength_nm,power\n500,1\n490,1\n510,1\n'));
    expect(p.message).toMatch(/row 3 \('490,1'\): expected wavelengths in increasing order/);
  });

  it('a repeated wavelength: the same refusal', async () => {
    const p = await refusal(await job('repeat', 'wavelength_nm,power\n500,1\n500,2\n'));
    expect(p.message).toMatch(/row 3 .*expected wavelengths in increasing order/);
  });

  it('a negative power: the row, and a power of 0 or more', async () => {
    const p = await refusal(await job('negative', 'wavelength_nm,power\n500,1\n510,-2\n'));
    expect(p.message).toMatch(/row 3 \('510,-2'\): expected a power of 0 or more/);
  });

  it('a non-number: the row, and two numbers expected', async () => {
    const p = await refusal(await job('word', 'wavelength_nm,power\n500,1\n510,bright\n'));
    expect(p.message).toMatch(/row 3 \('510,bright'\): expected two numbers, a wavelength and a power/);
    const q = await refusal(await job('short', 'wavelength_nm,power\n500,1\n510\n'));
    expect(q.message).toMatch(/row 3 .*expected two numbers/);
  });

  it('no power anywhere, or a single row: refused', async () => {
    expect((await refusal(await job('dark', 'wavelength_nm,power\n500,0\n510,0\n'))).message).toMatch(/expected some power/);
    expect((await refusal(await job('one', 'wavelength_nm,power\n500,1\n'))).message).toMatch(/expected at least two rows/);
  });

  it('a missing file: the message names the file and the key spectrum.file', async () => {
    const path = await job('missing', null);
    const p = await refusal(path);
    expect(p.message).toMatch(/^cannot read 'lamps\/missing\.csv'/);
    expect(p.message).toContain(join(dir, 'lamps', 'missing.csv'));
    try {
      await loadJobFile(path);
    } catch (e) {
      expect((e as Error).message).toContain(`${path}:4:`);
      expect((e as Error).message).toContain('spectrum.file: ');
    }
  });

  it('a folder instead of a file: refused with the key spectrum.file', async () => {
    const p = await refusal(await job('folder', null, 'lamps/folder.csv'));
    expect(p.message).toMatch(/^cannot read 'lamps\/folder\.csv'/);
  });
});

describe('expandJob with a spectrum', () => {
  it('one case per distance, no wavelength sweep; the case\'s wavelength the power-weighted mean', () => {
    const text = "name: t\ndistance: ['0.5 m', '1 m', '2 m']\naperture: {shape: slit, width: 100 um}\nspectrum: {lines: [{wavelength: 500 nm, power: 3}, {wavelength: 600 nm, power: 1}]}\n";
    const cases = expandJob(parseJobText(text).spec);
    expect(cases).toHaveLength(3);
    expect(cases.map((c) => c.distance)).toEqual([0.5, 1, 2]);
    // (3·500 + 1·600)/4 = 525 nm.
    for (const c of cases) {
      expect(c.wavelength).toBeCloseTo(525e-9, 18);
      expect(c.spectrum).toEqual({ kind: 'lines', lines: [{ wavelength: expect.closeTo(500e-9, 20), power: 3 }, { wavelength: expect.closeTo(600e-9, 20), power: 1 }] });
      expect(Object.keys(c.swept)).not.toContain('wavelength');
    }
  });

  it('a band keeps its default samples (31) and its mean is its middle', () => {
    const [c] = expandJob(parseJobText("name: t\ndistance: 1 m\naperture: {shape: slit, width: 100 um}\nspectrum: {band: {from: 400 nm, to: 700 nm}}\n").spec);
    expect(c!.spectrum).toEqual({ kind: 'band', from: expect.closeTo(400e-9, 20), to: expect.closeTo(700e-9, 20), samples: 31 });
    expect(c!.wavelength).toBeCloseTo(550e-9, 18);
  });
});
