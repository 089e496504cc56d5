// Job validation: every problem names the file, the key path, the value given and what is expected,
// with line and column when the job came from text. The positions below are counted by hand from
// the job texts (1-based lines and columns, the convention of compilers and editors: common practice).
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JobError, loadJobFile, parseJobText, validateJob, type JobProblem } from '../../src/job/load.js';
import { SHAPE_NAMES } from '../../src/elements/registry.js';

/** Every registered shape, as the messages list them (the list grows with the element registry). */
const SHAPES = SHAPE_NAMES.join(', ');

/** The problems a job text raises (fails the test if it is accepted). */
function problems(text: string, file = 'job.yaml'): JobProblem[] {
  try {
    parseJobText(text, file);
  } catch (e) {
    expect(e).toBeInstanceOf(JobError);
    const err = e as JobError;
    expect(err.file).toBe(file);
    return err.problems;
  }
  throw new Error(`expected the job to be refused:\n${text}`);
}

function messageOf(text: string, file = 'job.yaml'): string {
  try {
    parseJobText(text, file);
  } catch (e) {
    return (e as Error).message;
  }
  throw new Error(`expected the job to be refused:\n${text}`);
}

const HEAD = 'name: pin\nwavelength: 633 nm\ndistance: 1 m\n';

describe('a bad value names file, line, column, key path, the value and what is expected', () => {
  const text = HEAD + 'aperture:\n  shape: circle\n  diameter: -3 mm\n';

  it('reports the exact pieces', () => {
    const [p, ...rest] = problems(text, 'jobs/pin.yaml');
    expect(rest).toEqual([]);
    // Line 6 is "  diameter: -3 mm"; the value starts after "  diameter: " (12 characters): column 13.
    expect(p).toEqual({
      path: 'aperture.diameter',
      message: "expected a positive length such as '50 um', got '-3 mm'",
      line: 6,
      column: 13,
    });
  });

  it('formats them as file:line:column: path: message', () => {
    expect(messageOf(text, 'jobs/pin.yaml')).toBe(
      "jobs/pin.yaml:6:13: aperture.diameter: expected a positive length such as '50 um', got '-3 mm'",
    );
  });

  it('adds the parser reason after the value for an unreadable unit', () => {
    const [p] = problems(HEAD.replace('1 m', '1 furlong') + 'aperture: {shape: circle, diameter: 50 um}\n');
    expect(p!.path).toBe('distance');
    expect(p!.line).toBe(3);
    expect(p!.column).toBe(11);
    expect(p!.message).toMatch(/^expected a positive length such as '50 um', got '1 furlong': unknown length unit 'furlong'/);
  });

  it('reports zero, a plain number, for a positive length', () => {
    const [p] = problems('name: pin\nwavelength: 633 nm\ndistance: 0\naperture: {shape: circle, diameter: 50 um}\n');
    expect(p).toMatchObject({ path: 'distance', message: "expected a positive length such as '50 um', got 0", line: 3 });
  });

  it('reports every problem of a job, not just the first', () => {
    const ps = problems('name: pin\nwavelength: -1 nm\ndistance: 0\naperture: {shape: circle, diameter: 50 um}\n');
    expect(ps.map((p) => p.path).sort()).toEqual(['distance', 'wavelength']);
  });

  it('explains non-numeric types in a numeric place', () => {
    const ps = problems(HEAD + 'aperture: {shape: slits, count: 2.5, width: 1 um, period: 5 um}\n');
    expect(ps).toEqual([
      // The upper bound (1e6 slits) came with the physical bounds on every count.
      expect.objectContaining({ path: 'aperture.count', message: 'expected a whole number from 1 to 1000000, or a list of them, got 2.5' }),
    ]);
    const [empty] = problems(HEAD + 'aperture:\n  shape: circle\n  diameter:\n');
    expect(empty!.message).toBe("expected a positive length such as '50 um', got null: an empty value is not a length");
    const [grid] = problems(HEAD + 'aperture: {shape: circle, diameter: 50 um}\ngrid: 64\n');
    expect(grid).toMatchObject({ path: 'grid', line: 5, column: 7 });
    expect(grid!.message).toMatch(/^expected a mapping such as .*, got 64$/);
  });

  it('never falls back to a generic message', () => {
    const bad = [
      'aperture: {shape: slits, count: three, width: 1 um, period: 5 um}',
      'aperture: {shape: slits, count: 0, width: 1 um, period: 5 um}',
      'aperture: {shape: circle, diameter: []}',
      'aperture: {shape: circle, diameter: true}',
      'aperture: {shape: circle, diameter: 50 um}\nwindow: [1 mm]',
      'aperture: {shape: circle, diameter: 50 um}\noutput: float32',
      'aperture: {shape: circle, diameter: 50 um}\nillumination: {kind: plane, tilt: 2 deg}',
    ];
    for (const b of bad) {
      for (const p of problems(HEAD + b + '\n')) {
        expect(p.message, b).toMatch(/^(missing: )?expected /);
        expect(p.message, b).not.toMatch(/Invalid input/);
        expect(p.message, b).toMatch(/, got /);
      }
    }
  });
});

describe('YAML syntax errors give line and column', () => {
  it('a duplicated key, at the second occurrence', () => {
    expect(problems(HEAD + 'wavelength: 500 nm\n')).toEqual([
      { path: '', message: 'syntax error: Map keys must be unique', line: 4, column: 1 },
    ]);
  });

  it('a tab used as indentation', () => {
    const [p] = problems('name: pin\nwavelength: 633 nm\n\tdistance: 1 m\n');
    expect(p).toMatchObject({ path: '', line: 3, column: 1 });
    expect(p!.message).toMatch(/^syntax error: .*[Tt]ab/);
  });

  it('formats as file:line:column: syntax error', () => {
    expect(messageOf(HEAD + 'wavelength: 500 nm\n', 'a.yaml')).toBe('a.yaml:4:1: syntax error: Map keys must be unique');
  });

  it('a JSON job with a stray comma', () => {
    // Column 39 is the second comma of '..."633 nm",,'.
    const [p] = problems('{"name": "t1", "wavelength": "633 nm",, "distance": "1 m"}', 'j.json');
    expect(p).toMatchObject({ path: '', line: 1, column: 39 });
    expect(p!.message).toMatch(/^syntax error: /);
  });

  it('refuses a document that is not a mapping', () => {
    for (const t of ['', '- 1\n- 2\n', '42\n', 'just words\n']) {
      expect(problems(t)).toEqual([
        { path: '', message: 'expected a job: a mapping of keys such as name, wavelength, distance, aperture' },
      ]);
    }
  });
});

describe('unknown keys suggest the closest valid key, at the line of the key', () => {
  it('diamter -> diameter', () => {
    const ps = problems(HEAD + 'aperture:\n  shape: circle\n  diamter: 50 um\n');
    const unknown = ps.find((p) => p.message.startsWith('unknown key'));
    expect(unknown).toEqual({
      path: 'aperture',
      message: "unknown key 'diamter' (did you mean 'diameter'?); known keys here: shape, diameter, opaque",
      line: 6,
      column: 3,
    });
    // The key it was meant to be is then missing too, and says so.
    expect(ps.find((p) => p.path === 'aperture.diameter')?.message).toBe(
      "missing: expected a positive length such as '50 um'",
    );
  });

  it('at the top level, with the job keys listed', () => {
    const ps = problems(HEAD + 'aperture: {shape: circle, diameter: 50 um}\nilumination: {kind: plane}\n');
    expect(ps).toHaveLength(1);
    expect(ps[0]!.path).toBe('');
    expect(ps[0]!.line).toBe(5);
    expect(ps[0]!.column).toBe(1);
    expect(ps[0]!.message).toMatch(/^unknown key 'ilumination' \(did you mean 'illumination'\?\); known keys here: name, /);
  });

  it('inside a range, the range keys', () => {
    const ps = problems(HEAD + 'aperture:\n  shape: circle\n  diameter: {from: 10 um, to: 20 um, cuont: 3}\n');
    const p = ps.find((q) => q.message.startsWith('unknown key'));
    expect(p!.path).toBe('aperture.diameter');
    expect(p!.message).toBe("unknown key 'cuont' (did you mean 'count'?); known keys here: from, to, count, spacing");
    expect(p!.line).toBe(6);
  });

  it('no suggestion for a word nothing like a key', () => {
    const [p] = problems(HEAD + 'aperture: {shape: circle, diameter: 50 um}\nzebra: 1\n');
    expect(p!.message).toMatch(/^unknown key 'zebra'; known keys here: /);
  });

  it('a key valid for another shape is unknown for this one', () => {
    const ps = problems(HEAD + 'aperture: {shape: circle, diameter: 50 um, width: 20 um}\n');
    expect(ps.map((p) => p.message)).toEqual([
      "unknown key 'width'; known keys here: shape, diameter, opaque",
    ]);
  });
});

describe('a wrong shape or kind names the choices', () => {
  it('misspelt shape', () => {
    const [p] = problems(HEAD + 'aperture:\n  shape: circel\n  diameter: 50 um\n');
    expect(p).toEqual({
      path: 'aperture.shape',
      message: `expected one of ${SHAPES} (did you mean 'circle'?), got 'circel'`,
      line: 5,
      column: 10,
    });
  });

  it('a shape that is nothing like one', () => {
    const [p] = problems(HEAD + 'aperture: {shape: hexagon, side: 5 um}\n');
    expect(p!.message).toBe(`expected one of ${SHAPES}, got 'hexagon'`);
  });

  it('missing shape', () => {
    const [p] = problems(HEAD + 'aperture: {diameter: 50 um}\n');
    expect(p).toMatchObject({ path: 'aperture.shape', message: `missing: expected one of ${SHAPES}` });
  });

  it('a shape or kind given as a word instead of a mapping', () => {
    const [a] = problems(HEAD + 'aperture: circle\n');
    expect(a).toMatchObject({
      path: 'aperture',
      message: `expected a mapping such as {shape: circle, diameter: '50 um'} (shape: one of ${SHAPES}), got 'circle'`,
      line: 4,
      column: 11,
    });
    const [i] = problems(HEAD + 'aperture: {shape: circle, diameter: 50 um}\nillumination: plane\n');
    expect(i!.message).toBe("expected a mapping such as {kind: plane} (kind: one of plane, gaussian, point, points, extended), got 'plane'");
  });

  it('illumination kind', () => {
    const [p] = problems(HEAD + 'aperture: {shape: circle, diameter: 50 um}\nillumination: {kind: gausian, waist: 1 mm}\n');
    expect(p).toMatchObject({
      path: 'illumination.kind',
      message: "expected one of plane, gaussian, point, points, extended (did you mean 'gaussian'?), got 'gausian'",
      line: 5,
    });
  });

  it('an enumerated option', () => {
    const [p] = problems(HEAD + 'aperture: {shape: circle, diameter: 50 um}\nmethod: fast\n');
    expect(p!.message).toBe("expected one of auto, angular-spectrum, fresnel, fraunhofer, rayleigh-sommerfeld, got 'fast'");
  });
});

describe('missing required keys', () => {
  it('each missing key is named with what it expects', () => {
    const ps = problems('name: pin\n');
    const byPath = Object.fromEntries(ps.map((p) => [p.path, p.message]));
    expect(byPath).toMatchObject({
      wavelength: "missing: expected a positive length such as '50 um' (or, for light of several wavelengths, a spectrum: lines, a band, a blackbody or a file)",
      distance: "missing: expected a positive length such as '50 um'",
    });
    expect(byPath.aperture).toMatch(/^(missing: )?expected /);
  });

  it('a missing name', () => {
    const ps = problems('wavelength: 633 nm\ndistance: 1 m\naperture: {shape: circle, diameter: 50 um}\n');
    expect(ps).toHaveLength(1);
    expect(ps[0]!.path).toBe('name');
    expect(ps[0]!.message).toMatch(/^missing: expected a name of letters, digits/);
  });

  it('a missing shape-specific key (rectangle height)', () => {
    const ps = problems(HEAD + 'aperture: {shape: rectangle, width: 50 um}\n');
    expect(ps).toEqual([expect.objectContaining({ path: 'aperture.height', message: "missing: expected a positive length such as '50 um'" })]);
  });
});

describe('JSON job text works like YAML', () => {
  const yamlText = `name: pin\nwavelength: 633 nm\ndistance: [0.5 m, 1 m]\naperture:\n  shape: circle\n  diameter: 50 um\n`;
  const jsonText = JSON.stringify({
    name: 'pin',
    wavelength: '633 nm',
    distance: ['0.5 m', '1 m'],
    aperture: { shape: 'circle', diameter: '50 um' },
  });

  it('gives the same job', () => {
    const a = parseJobText(yamlText, 'a.yaml');
    const b = parseJobText(jsonText, 'a.json');
    expect(b.spec).toEqual(a.spec);
    expect(b.given).toEqual(a.given);
  });

  it('reports errors with positions in the JSON text', () => {
    const text = '{\n  "name": "pin",\n  "wavelength": "633 nm",\n  "distance": "1 m",\n  "aperture": {"shape": "circle", "diamter": "50 um"}\n}\n';
    const ps = problems(text, 'pin.json');
    const unknown = ps.find((p) => p.message.startsWith('unknown key'));
    // Line 5: '  "aperture": {"shape": "circle", "diamter": ...' — the key starts at column 35.
    expect(unknown).toMatchObject({ path: 'aperture', line: 5, column: 35 });
    expect(unknown!.message).toMatch(/did you mean 'diameter'/);
  });
});

describe('the parsed job is in SI units, with the text kept as given', () => {
  it('converts units and applies defaults', () => {
    const job = parseJobText(HEAD + 'aperture: {shape: circle, diameter: 50 um}\n', 'x.yaml');
    expect(job.file).toBe('x.yaml');
    expect(job.spec.wavelength!.values[0]).toBeCloseTo(633e-9, 20);
    expect(job.spec.distance).toEqual({ values: [1], spacing: 'single' });
    expect(job.spec.aperture).toMatchObject({ shape: 'circle', opaque: false });
    expect(job.spec.illumination).toEqual({ kind: 'plane', tilt: [0, 0] });
    expect(job.spec.method).toBe('auto');
    expect(job.given).toEqual({
      name: 'pin',
      wavelength: '633 nm',
      distance: '1 m',
      aperture: { shape: 'circle', diameter: '50 um' },
    });
  });

  it('reads tilt angles in the illumination', () => {
    const job = parseJobText(HEAD + 'aperture: {shape: circle, diameter: 50 um}\nillumination: {kind: plane, tilt: [2 deg, 0]}\n');
    expect((job.spec.illumination as { tilt: [number, number] }).tilt[0]).toBeCloseTo((2 * Math.PI) / 180, 15);
    const [p] = problems(HEAD + 'aperture: {shape: circle, diameter: 50 um}\nillumination: {kind: plane, tilt: [2 deg, 3 mm]}\n');
    expect(p!.path).toBe('illumination.tilt[1]');
    expect(p!.message).toMatch(/^expected an angle such as '2 deg', got '3 mm': unknown angle unit 'mm'/);
  });
});

describe('sweeps', () => {
  const job = (diameter: string) => HEAD + `aperture:\n  shape: circle\n  diameter: ${diameter}\n`;

  it('a list', () => {
    const { spec } = parseJobText(job('[20 um, 50 um, 0.1 mm]'));
    expect(spec.aperture.shape).toBe('circle');
    if (spec.aperture.shape !== 'circle') return;
    expect(spec.aperture.diameter.spacing).toBe('list');
    const v = spec.aperture.diameter.values;
    expect(v).toHaveLength(3);
    [20e-6, 50e-6, 1e-4].forEach((x, i) => expect(v[i]! / x).toBeCloseTo(1, 14));
  });

  it('a list of one is a single value', () => {
    const { spec } = parseJobText(job('[50 um]'));
    if (spec.aperture.shape !== 'circle') throw new Error('shape');
    expect(spec.aperture.diameter.spacing).toBe('single');
  });

  it('a bad element of a list is named by its index', () => {
    const [p] = problems(job('[10 um, 20 um, -5 um]'));
    expect(p).toEqual({
      path: 'aperture.diameter[2]',
      message: "expected a positive length such as '50 um', got '-5 um'",
      line: 6,
      column: 28,
    });
  });

  it('an empty list', () => {
    const [p] = problems(job('[]'));
    expect(p).toMatchObject({ path: 'aperture.diameter', message: 'expected at least one value in the list, got []' });
  });

  it('linear range: from + (to - from)·i/(count - 1), both ends included (common practice, as linspace)', () => {
    const { spec } = parseJobText(job('{from: 10 um, to: 50 um, count: 5}'));
    if (spec.aperture.shape !== 'circle') throw new Error('shape');
    expect(spec.aperture.diameter.spacing).toBe('linear');
    const v = spec.aperture.diameter.values;
    const want = [10e-6, 20e-6, 30e-6, 40e-6, 50e-6];
    expect(v).toHaveLength(5);
    want.forEach((x, i) => expect(Math.abs(v[i]! - x)).toBeLessThan(1e-18));
  });

  it('log range: equal ratios, x_i = exp(ln a + (ln b − ln a)·i/(n−1)) (geometric progression, as NumPy geomspace)', () => {
    const { spec } = parseJobText(job('{from: 1 um, to: 1 mm, count: 4, spacing: log}'));
    if (spec.aperture.shape !== 'circle') throw new Error('shape');
    expect(spec.aperture.diameter.spacing).toBe('log');
    const v = spec.aperture.diameter.values;
    // Decades: 1 um, 10 um, 100 um, 1 mm.
    [1e-6, 1e-5, 1e-4, 1e-3].forEach((x, i) => expect(v[i]! / x).toBeCloseTo(1, 12));
    const { spec: s2 } = parseJobText(job('{from: 7 um, to: 3 mm, count: 9, spacing: log}'));
    if (s2.aperture.shape !== 'circle') throw new Error('shape');
    const a = 7e-6;
    const b = 3e-3;
    const w = s2.aperture.diameter.values;
    expect(w).toHaveLength(9);
    w.forEach((x, i) => expect(x / Math.exp(Math.log(a) + ((Math.log(b) - Math.log(a)) * i) / 8)).toBeCloseTo(1, 12));
    for (let i = 1; i < w.length - 1; i++) expect(w[i]! * w[i]!).toBeCloseTo(w[i - 1]! * w[i + 1]!, 20);
  });

  it('a range may run downwards', () => {
    const { spec } = parseJobText(job('{from: 50 um, to: 10 um, count: 3}'));
    if (spec.aperture.shape !== 'circle') throw new Error('shape');
    expect(spec.aperture.diameter.values.map((x) => Math.round(x * 1e7) / 10)).toEqual([50, 30, 10]);
  });

  it('count < 2, fractional or missing is an error at the count', () => {
    for (const [count, got] of [
      ['1', ', got 1'],
      ['0', ', got 0'],
      ['-3', ', got -3'],
      ['2.5', ', got 2.5'],
    ] as const) {
      const [p] = problems(job(`{from: 10 um, to: 50 um, count: ${count}}`));
      expect(p, `count ${count}`).toMatchObject({
        path: 'aperture.diameter.count',
        message: `expected a whole number of values, 2 or more${got}`,
        line: 6,
      });
    }
    const [missing] = problems(job('{from: 10 um, to: 50 um}'));
    expect(missing).toMatchObject({ path: 'aperture.diameter.count', message: 'missing: expected a whole number of values, 2 or more' });
  });

  it('spacing must be linear or log', () => {
    const [p] = problems(job('{from: 10 um, to: 50 um, count: 3, spacing: cubic}'));
    expect(p).toMatchObject({ path: 'aperture.diameter.spacing', message: "expected 'linear' or 'log', got 'cubic'" });
  });

  it('range ends are positive lengths', () => {
    const [p] = problems(job('{from: 0, to: 50 um, count: 3, spacing: log}'));
    expect(p).toMatchObject({ path: 'aperture.diameter.from', message: "expected a positive length such as '50 um', got 0" });
  });

  it('wavelength and distance sweep too', () => {
    const { spec } = parseJobText(
      'name: s\nwavelength: [450 nm, 633 nm]\ndistance: {from: 0.1 m, to: 10 m, count: 3, spacing: log}\naperture: {shape: slit, width: 20 um}\n',
    );
    expect(spec.wavelength!.values).toHaveLength(2);
    expect(spec.distance.values.map((x) => Number(x.toPrecision(12)))).toEqual([0.1, 1, 10]);
  });
});

describe('names that would leave the output folder are refused', () => {
  const withName = (n: string) => `name: ${JSON.stringify(n)}\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: circle, diameter: 50 um}\n`;

  it.each(['a/b', '..', '../up', '/abs', 'back\\slash', 'has space', '.hidden', 'dot.ted', '', 'x'.repeat(65), 'naïve'])(
    'refuses %j',
    (n) => {
      const [p] = problems(withName(n));
      expect(p!.path).toBe('name');
      expect(p!.line).toBe(1);
      expect(p!.message).toBe(
        `expected a name of letters, digits, - and _ (at most 64 characters), such as pinhole-50um, got '${n}'`,
      );
    },
  );

  it.each(['pin', 'pinhole-50um', 'Sweep_2', 'x'.repeat(64)])('accepts %j', (n) => {
    expect(parseJobText(withName(n)).spec.name).toBe(n);
  });

  it('refuses a name that is not text', () => {
    const [p] = problems('name: 123\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: circle, diameter: 50 um}\n');
    expect(p!.message).toMatch(/^expected a name .*, got 123$/);
  });
});

describe('shape-level checks', () => {
  it('annulus: inner smaller than outer, with the outer diameter in readable units', () => {
    const [p] = problems(HEAD + 'aperture: {shape: annulus, outer: 50 um, inner: 60 um}\n');
    expect(p).toMatchObject({
      path: 'aperture.inner',
      message: "expected the inner diameter to be smaller than the outer one (50 µm), got '60 um'",
    });
  });

  it('slits: width smaller than the period', () => {
    const [p] = problems(HEAD + 'aperture: {shape: slits, count: 3, width: 15 um, period: 10 um}\n');
    expect(p!.path).toBe('aperture.width');
    expect(p!.message).toMatch(/^expected the slit width to be smaller than the period.*, got '15 um'$/);
  });
});

describe('validateJob (scripted jobs) and loadJobFile', () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'spotcast-load-'));
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  it('validateJob reports path and value, without positions', () => {
    try {
      validateJob({ name: 'p', wavelength: '633 nm', distance: '-1 m', aperture: { shape: 'circle', diameter: '50 um' } }, 'script');
      throw new Error('accepted');
    } catch (e) {
      expect(e).toBeInstanceOf(JobError);
      expect((e as JobError).problems).toEqual([
        { path: 'distance', message: "expected a positive length such as '50 um', got '-1 m'" },
      ]);
      expect((e as Error).message).toBe("script: distance: expected a positive length such as '50 um', got '-1 m'");
    }
  });

  it('loadJobFile reads a file and names it in errors', async () => {
    const good = join(dir, 'good.yaml');
    await writeFile(good, HEAD + 'aperture: {shape: slit, width: 20 um}\n');
    expect((await loadJobFile(good)).spec.name).toBe('pin');
    const bad = join(dir, 'bad.yaml');
    // Line 4 is 'aperture: {shape: slit, width: 20 furlong}'; the value starts at column 32.
    await writeFile(bad, HEAD + 'aperture: {shape: slit, width: 20 furlong}\n');
    await expect(loadJobFile(bad)).rejects.toThrow(new RegExp(`^${bad.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}:4:32: aperture.width: `));
  });

  it('loadJobFile: a missing file or a folder is a JobError naming it', async () => {
    await expect(loadJobFile(join(dir, 'nope.yaml'))).rejects.toThrow(/nope\.yaml: cannot read the job file: no such file/);
    await expect(loadJobFile(dir)).rejects.toThrow(/cannot read the job file: is a folder, not a job file/);
  });
});
