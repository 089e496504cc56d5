// Physical bounds at load time: every length, angle and count a job may hold is checked before any
// work, and a refusal names the file, line, key path and the range expected. The bounds are the
// project's choice (common practice for a scalar-diffraction tool: atom-sized to 10 km, 1 nm to
// 1 mm light), stated in src/job/schema.ts; the extremes below are the inputs of issue 10.
import { describe, expect, it } from 'vitest';
import { JobError, MAX_PROBLEMS, formatWarning, parseJobText, validateJob, type JobProblem } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';

const HEAD = 'name: pin\nwavelength: 633 nm\ndistance: 1 m\n';
const CIRCLE = 'aperture: {shape: circle, diameter: 50 um}\n';

function refusal(text: string, file = 'job.yaml'): JobError {
  try {
    parseJobText(text, file);
  } catch (e) {
    expect(e).toBeInstanceOf(JobError);
    return e as JobError;
  }
  throw new Error(`expected the job to be refused:\n${text}`);
}

function problems(text: string): JobProblem[] {
  return refusal(text).problems;
}

/** Every key that holds a length, with a job template (X is replaced) and the path it is named by. */
const LENGTH_KEYS: { path: string; job: string }[] = [
  { path: 'distance', job: 'name: pin\nwavelength: 633 nm\ndistance: X\n' + CIRCLE },
  { path: 'aperture.diameter', job: HEAD + 'aperture: {shape: circle, diameter: X}\n' },
  { path: 'aperture.width', job: HEAD + 'aperture: {shape: rectangle, width: X, height: 40 um}\n' },
  { path: 'aperture.height', job: HEAD + 'aperture: {shape: rectangle, width: 40 um, height: X}\n' },
  { path: 'aperture.width', job: HEAD + 'aperture: {shape: slit, width: X}\n' },
  { path: 'aperture.length', job: HEAD + 'aperture: {shape: slit, width: 1e-10 m, length: X}\n' },
  { path: 'aperture.outer', job: HEAD + 'aperture: {shape: annulus, outer: X, inner: 1e-10 m}\n' },
  { path: 'aperture.inner', job: HEAD + 'aperture: {shape: annulus, outer: 1e4 m, inner: X}\n' },
  { path: 'aperture.width', job: HEAD + 'aperture: {shape: slits, count: 3, width: X, period: 1e4 m}\n' },
  { path: 'aperture.period', job: HEAD + 'aperture: {shape: slits, count: 3, width: 1e-10 m, period: X}\n' },
  { path: 'aperture.length', job: HEAD + 'aperture: {shape: slits, count: 3, width: 1 um, period: 2 um, length: X}\n' },
  { path: 'illumination.waist', job: HEAD + CIRCLE + 'illumination: {kind: gaussian, waist: X}\n' },
  { path: 'grid.pitch', job: HEAD + CIRCLE + 'grid: {pitch: X}\n' },
  { path: 'window', job: HEAD + CIRCLE + 'window: X\n' },
  { path: 'window[1]', job: HEAD + CIRCLE + 'window: [1 mm, X]\n' },
  { path: 'detector.size', job: HEAD + CIRCLE + 'detector: {kind: pinhole, size: X}\n' },
  { path: 'detector[1].size', job: HEAD + CIRCLE + 'detector: [{kind: square, size: 5 um}, {kind: pinhole, size: X}]\n' },
  { path: 'search.smallest-spot.between[0]', job: HEAD + CIRCLE + "search: {smallest-spot: {between: [X, '1e4 m']}}\n" },
  { path: 'orders.overlap', job: HEAD + CIRCLE + 'orders: {overlap: X}\n' },
  { path: 'output.zoom.width', job: HEAD + CIRCLE + "output: {zoom: {centre: ['0 mm', '0 mm'], width: X}}\n" },
  { path: 'distance.from', job: 'name: pin\nwavelength: 633 nm\ndistance: {from: X, to: 1 m, count: 3}\n' + CIRCLE },
  { path: 'distance[1]', job: 'name: pin\nwavelength: 633 nm\ndistance: [1 m, X]\n' + CIRCLE },
  { path: 'aperture.diameter.to', job: HEAD + 'aperture: {shape: circle, diameter: {from: 1 um, to: X, count: 3, spacing: log}}\n' },
];

const SIZE_RANGE = 'expected a length from 0.1 nm to 10 km (1e-10 m to 1e4 m)';

describe('every length is finite and within 1e-10 m – 1e4 m, refused with its key and the range', () => {
  // 1e308 m and 9007199254740993 m overflow products of lengths; 1e-308 m and 5e-324 m underflow
  // them to denormals or 0; 1e5 m and 1e-11 m are just past the bounds.
  const tooSmall = ["'1e-308 m'", '5e-324', "'1e-11 m'", "'0.09 nm'"];
  const tooLarge = ["'1e308 m'", '1e+308', '9007199254740993', "'1e5 m'", "'10001 m'", '1e4000'];

  for (const { path, job } of LENGTH_KEYS) {
    it(`${path} in ${job.match(/shape: (\w+)/)?.[1] ?? 'a job'}`, () => {
      for (const x of [...tooSmall, ...tooLarge]) {
        const ps = problems(job.replace('X', x));
        const p = ps.find((q) => q.path === path);
        expect(p, `${path} = ${x}: ${JSON.stringify(ps)}`).toBeDefined();
        expect(p!.line, `${path} = ${x}`).toBeGreaterThan(0);
        expect(p!.column).toBeGreaterThan(0);
        // 1e4000 is Infinity once read: refused as not finite, with the usual expectation.
        if (x === '1e4000') expect(p!.message).toMatch(/not a finite number/);
        else expect(p!.message, x).toContain(SIZE_RANGE);
      }
      // The ends of the range load (the annulus and slits templates hold their partner at an end).
      for (const x of ["'1e4 m'", "'0.1 nm'", "'2.5 mm'"]) {
        if ((path === 'aperture.outer' || path === 'aperture.period') && x === "'0.1 nm'") continue;
        if ((path === 'aperture.inner' || path === 'aperture.width') && x === "'1e4 m'" && /annulus|slits/.test(job)) continue;
        if (path === 'search.smallest-spot.between[0]' && x === "'1e4 m'") continue;
        if (path === 'aperture.diameter.to' && x === "'1e4 m'") continue;
        if (path === 'aperture.length' && /slits/.test(job) && x === "'0.1 nm'") continue;
        expect(() => parseJobText(job.replace('X', x)), `${path} = ${x}`).not.toThrow();
      }
    });
  }

  it('the issue inputs, one by one, with file:line:column: key: range in the message', () => {
    const cases: [string, string, RegExp][] = [
      [HEAD + 'aperture: {shape: rectangle, width: 9007199254740993, height: 40 um}\n', 'aperture.width', /^j\.yaml:4:\d+: aperture\.width: expected a length from 0\.1 nm to 10 km .*got 9007199254740992: 9\.007e15 m is too large$/],
      ['name: pin\nwavelength: 633 nm\ndistance: "1e308 m"\n' + CIRCLE, 'distance', /^j\.yaml:3:11: distance: expected a length .*, got '1e308 m': 1e308 m is too large$/],
      [HEAD + CIRCLE + 'grid: {pitch: 9007199254740993}\n', 'grid.pitch', /^j\.yaml:5:\d+: grid\.pitch: expected a length .* is too large$/],
      ['name: pin\nwavelength: 1e+308\ndistance: 1 m\n' + CIRCLE, 'wavelength', /^j\.yaml:2:13: wavelength: expected a wavelength from 1 nm to 1 mm, got 1e\+308: 1e308 m is too large$/],
      [HEAD + 'aperture: {shape: rectangle, width: "1e-308 m", height: 40 um}\n', 'aperture.width', /^j\.yaml:4:\d+: aperture\.width: expected a length .*got '1e-308 m': 1e-308 m is too small$/],
      ['name: pin\nwavelength: 633 nm\ndistance: {from: 1 m, to: 5e-324, count: 3}\n' + CIRCLE, 'distance.to', /^j\.yaml:3:\d+: distance\.to: expected a length .*got 5e-324: 5e-324 m is too small$/],
      // A wavelength written as a bare number meant nanometres: 633 m is refused by the bounds.
      ['name: pin\nwavelength: 633\ndistance: 1 m\n' + CIRCLE, 'wavelength', /^j\.yaml:2:13: wavelength: expected a wavelength from 1 nm to 1 mm, got 633: 633 m is too large$/],
    ];
    for (const [text, path, re] of cases) {
      const err = refusal(text, 'j.yaml');
      expect(err.problems.map((p) => p.path), text).toContain(path);
      const line = err.message.split('\n').find((l) => l.includes(` ${path}: `));
      expect(line, text).toMatch(re);
    }
  });
});

describe('wavelengths: 1 nm – 1 mm, with a warning outside 100 nm – 20 µm', () => {
  const job = (wl: string) => `name: pin\nwavelength: ${wl}\ndistance: 1 m\n` + CIRCLE;

  it('refuses outside 1 nm – 1 mm', () => {
    for (const wl of ['0.99 nm', '1.001 mm', '5e-324', "'1e308 m'", '[633 nm, 2 mm]', '{from: 0.5 nm, to: 600 nm, count: 3}']) {
      const [p] = problems(job(wl));
      expect(p!.path, wl).toMatch(/^wavelength/);
      expect(p!.message, wl).toContain('expected a wavelength from 1 nm to 1 mm');
    }
  });

  it('loads 1 nm and 1 mm, warning that they are unusual, with the key and line', () => {
    for (const wl of ['1 nm', '1 mm', '50 nm', '25 um']) {
      const { warnings } = parseJobText(job(wl));
      expect(warnings, wl).toHaveLength(1);
      expect(warnings[0]).toMatchObject({ path: 'wavelength', line: 2, column: 13 });
      expect(warnings[0]!.message).toMatch(/outside 100 nm – 20 µm/);
    }
    for (const wl of ['100 nm', '633 nm', '20 um', '[405 nm, 10.6 um]']) expect(parseJobText(job(wl)).warnings, wl).toEqual([]);
  });
});

describe('a number without a unit is metres (or radians), with a warning naming the key', () => {
  it('distance: 2 warns "taken as 2 m; write \'2 m\'"', () => {
    const { spec, warnings } = parseJobText('name: pin\nwavelength: 633 nm\ndistance: 2\n' + CIRCLE, 'd.yaml');
    expect(spec.distance.values).toEqual([2]);
    expect(warnings).toEqual([
      {
        path: 'distance',
        message: "taken as 2 m, as a number without a unit is in metres; write '2 m' to silence this",
        line: 3,
        column: 11,
      },
    ]);
    expect(formatWarning('d.yaml', warnings[0]!)).toBe(
      "d.yaml:3:11: distance: warning: taken as 2 m, as a number without a unit is in metres; write '2 m' to silence this",
    );
  });

  it('says the value in readable units, once per key, for quoted bare numbers too', () => {
    const { warnings } = parseJobText(
      'name: pin\nwavelength: 6.33e-7\ndistance: [0.5, 1, "2"]\naperture: {shape: circle, diameter: 5e-5}\nillumination: {kind: plane, tilt: [0.01, 0]}\n',
    );
    const byPath = Object.fromEntries(warnings.map((w) => [w.path, w.message]));
    expect(Object.keys(byPath).sort()).toEqual(['aperture.diameter', 'distance[0]', 'illumination.tilt[0]', 'wavelength']);
    expect(byPath.wavelength).toBe("taken as 6.33e-7 m (633 nm), as a number without a unit is in metres; write '6.33e-7 m' to silence this");
    expect(byPath['illumination.tilt[0]']).toMatch(/^taken as 0\.01 rad \(0\.5730°\)|^taken as 0\.01 rad \(0\.573°\)/);
  });

  it('no warning for zero (it has no unit) or for values with units', () => {
    const { warnings } = parseJobText(HEAD + CIRCLE + "detector: {kind: pinhole, size: 2 mm, at: [0, '0 mm']}\nillumination: {kind: plane, tilt: [0, 0]}\n");
    expect(warnings).toEqual([]);
  });
});

describe('angles, positions and counts', () => {
  const tilt = (t: string) => HEAD + CIRCLE + `illumination: {kind: plane, tilt: ${t}}\n`;
  const at = (x: string) => HEAD + CIRCLE + `detector: {kind: pinhole, size: 20 um, at: [${x}, 0]}\n`;
  const slits = (n: string) => HEAD + `aperture: {shape: slits, count: ${n}, width: 1 um, period: 2 um}\n`;

  it('tilts: |θ| < 90°', () => {
    for (const t of ['[90 deg, 0]', '[0, -90 deg]', '[1.6 rad, 0]', '[0, 1e308 deg]', '[6e3 arcmin, 0]']) {
      const [p] = problems(tilt(t));
      expect(p!.path, t).toMatch(/^illumination\.tilt\[[01]\]$/);
      expect(p!.message, t).toContain('expected an angle between -90° and 90° (not including them)');
      expect(p!.line).toBe(5);
    }
    for (const t of ['[89.9 deg, 0]', '[0, -1.5 rad]', '[-30 deg, 12 deg]', '[44.9 deg, -45 deg]']) expect(() => parseJobText(tilt(t)), t).not.toThrow();
  });

  it('tilts together: the direction they make must exist (sin²θx + sin²θy < 1; found by the fuzz test)', () => {
    for (const t of ['[52.67 deg, -85.31 deg]', '[45.01 deg, 45 deg]', '[60 deg, 60 deg]']) {
      const [p] = problems(tilt(t));
      expect(p, t).toMatchObject({ path: 'illumination.tilt', line: 5 });
      expect(p!.message, t).toMatch(/^expected tilts \[θx, θy\] that make one direction, sin²θx \+ sin²θy < 1 \(these make 1(\.\d+)?\)/);
    }
  });

  it('detector positions: finite, |x| ≤ 1e4 m, zero and negative allowed', () => {
    for (const x of ["'1e5 m'", "'-10001 m'", '1e308', '-9007199254740993']) {
      const [p] = problems(at(x));
      expect(p).toMatchObject({ path: 'detector.at[0]', line: 5 });
      expect(p!.message).toContain('expected a position within ±10 km');
    }
    for (const x of ['0', "'-1e4 m'", "'1e4 m'", "'-3 mm'"]) expect(() => parseJobText(at(x)), x).not.toThrow();
  });

  it('slit counts: whole numbers from 1 to 1e6', () => {
    for (const n of ['1000001', '9007199254740993', '1e308', '0', '2.5', '[3, 2000000]']) {
      const [p] = problems(slits(n));
      expect(p!.path, n).toMatch(/^aperture\.count/);
      expect(p!.message, n).toContain('expected a whole number from 1 to 1000000');
    }
    expect(parseJobText(slits('1000000')).spec.aperture).toMatchObject({ count: { values: [1_000_000] } });
  });

  it('grid sizes: powers of two up to 2^24; sweeps and lists up to 100 000 values; at most 100 detectors', () => {
    expect(problems(HEAD + CIRCLE + `grid: {size: ${2 ** 25}}\n`)[0]).toMatchObject({ path: 'grid.size' });
    expect(problems(HEAD + CIRCLE + 'grid: {size: 9007199254740993}\n')[0]).toMatchObject({ path: 'grid.size' });
    const [count] = problems('name: pin\nwavelength: 633 nm\ndistance: {from: 1 m, to: 2 m, count: 100001}\n' + CIRCLE);
    expect(count).toMatchObject({ path: 'distance.count', message: 'expected at most 100000 values, got 100001' });
    // Compact (2 bytes a value), to stay under the 256 KiB a job file may hold.
    const list = `[${Array.from({ length: 100_001 }, () => '1').join(',')}]`;
    const [long] = problems(`name: pin\nwavelength: 633 nm\ndistance: ${list}\n` + CIRCLE);
    expect(long!.path).toBe('distance');
    expect(long!.message).toMatch(/^expected at most 100000 values in the list, got \[1,1,1.{0,80}$/);
    const many = `[${Array.from({ length: 101 }, () => '{kind: pinhole, size: 5 um}').join(', ')}]`;
    const [det] = problems(HEAD + CIRCLE + `detector: ${many}\n`);
    expect(det!.path).toBe('detector');
  });

  it('descriptions: at most 1000 characters, no control characters', () => {
    expect(problems(HEAD + CIRCLE + `description: ${'x'.repeat(1001)}\n`)[0]!.path).toBe('description');
    const [esc] = problems(HEAD + CIRCLE + 'description: "red \\e[31m text"\n');
    expect(esc!.path).toBe('description');
    expect(esc!.message).toContain("got 'red \\x1b[31m text'");
    expect(parseJobText(HEAD + CIRCLE + 'description: "two\\tcolumns\\nand lines"\n').spec.description).toBe('two\tcolumns\nand lines');
  });
});

describe('ranges', () => {
  const dist = (r: string) => `name: pin\nwavelength: 633 nm\ndistance: ${r}\n` + CIRCLE;

  it('run downwards deliberately, in the order written, with both ends exact', () => {
    const { spec } = parseJobText(dist('{from: 2 m, to: 0.1 m, count: 4, spacing: log}'));
    expect(spec.distance.values[0]).toBe(2);
    expect(spec.distance.values[3]).toBe(0.1);
    for (let i = 1; i < 4; i++) expect(spec.distance.values[i]!).toBeLessThan(spec.distance.values[i - 1]!);
  });

  it('equal ends are refused at "to"; steps too fine to tell apart at "count"', () => {
    const [same] = problems(dist('{from: 1 m, to: 1 m, count: 3}'));
    expect(same).toMatchObject({ path: 'distance.to', line: 3 });
    expect(same!.message).toMatch(/^expected 'to' to differ from 'from' \(1 m\)/);
    const [fine] = problems(dist('{from: 1 m, to: 1.0000000000000002 m, count: 5}'));
    expect(fine).toMatchObject({ path: 'distance.count' });
    expect(fine!.message).toMatch(/too fine to tell apart/);
  });

  it('the widest log range expands to finite, normal values within the bounds, ends exact', () => {
    const { spec } = parseJobText(dist('{from: 1e-10 m, to: 1e4 m, count: 100000, spacing: log}'));
    const v = spec.distance.values;
    expect(v).toHaveLength(100_000);
    expect(v[0]).toBe(1e-10);
    expect(v[v.length - 1]).toBe(1e4);
    for (const x of v) {
      expect(Number.isFinite(x) && x >= 1e-10 && x <= 1e4).toBe(true);
    }
    const cases = expandJob(spec);
    expect(cases).toHaveLength(100_000);
    expect(cases.every((c) => Number.isFinite(c.distance) && c.distance >= 1e-10 && c.distance <= 1e4)).toBe(true);
  });
});

describe('expansion of a spec that skipped the loader', () => {
  it('refuses a swept value that is not a positive finite number, naming the key', () => {
    const { spec } = parseJobText(HEAD + CIRCLE);
    for (const bad of [NaN, 0, -1, Infinity]) {
      const hand = { ...spec, distance: { values: [1, bad], spacing: 'list' as const } };
      expect(() => expandJob(hand), String(bad)).toThrow(new RegExp(`^distance: ${bad} is not a positive finite number`));
    }
  });
});

describe('bounded work and bounded messages', () => {
  it('100 000 unknown keys: as text, refused for its size at once; as an object, 20 described and the rest counted', () => {
    const keys = Array.from({ length: 100_000 }, (_, i) => `k${i}`);
    keys[0] = 'wavelenght';
    let t0 = performance.now();
    const [size] = problems(HEAD + CIRCLE + keys.map((k) => `${k}: 1\n`).join(''));
    expect(size!.message).toMatch(/^the job text is \d+ characters, more than the 262144 \(256 KiB\) a job may hold$/);
    expect((performance.now() - t0) / 1000).toBeLessThan(10);
    // The same through validateJob (a scripted job has no size cap): the suggestion search and the
    // list are bounded, not the keys.
    const job: Record<string, unknown> = { name: 'pin', wavelength: '633 nm', distance: '1 m', aperture: { shape: 'circle', diameter: '50 um' } };
    for (const k of keys) job[k] = 1;
    t0 = performance.now();
    let err: JobError | undefined;
    try {
      validateJob(job, 'script');
    } catch (e) {
      err = e as JobError;
    }
    expect((performance.now() - t0) / 1000).toBeLessThan(10);
    expect(err).toBeInstanceOf(JobError);
    expect(err!.problems).toHaveLength(MAX_PROBLEMS + 1);
    expect(err!.problems[0]!.message).toMatch(/^unknown key 'wavelenght' \(did you mean 'wavelength'\?\)/);
    expect(err!.problems[MAX_PROBLEMS]!.message).toBe(`and ${100_000 - MAX_PROBLEMS} more problems (the first ${MAX_PROBLEMS} are listed)`);
    expect(err!.message.length).toBeLessThan(8000);
  });

  it('as many unknown keys as 256 KiB holds (25 000), as text: 20 described at their lines, well under 10 s', () => {
    const lines = Array.from({ length: 25_000 }, (_, i) => `k${i}: 1\n`).join('').replace('k0:', 'wavelenght:');
    const t0 = performance.now();
    const err = refusal(HEAD + CIRCLE + lines);
    expect((performance.now() - t0) / 1000).toBeLessThan(10);
    expect(err.problems).toHaveLength(MAX_PROBLEMS + 1);
    expect(err.problems[0]).toMatchObject({ path: '', line: 5, column: 1 });
    expect(err.problems[1]).toMatchObject({ path: '', line: 6, column: 1 });
    expect(err.problems[0]!.message).toMatch(/^unknown key 'wavelenght' \(did you mean 'wavelength'\?\)/);
    expect(err.problems[MAX_PROBLEMS]!.message).toBe(`and ${25_000 - MAX_PROBLEMS} more problems (the first ${MAX_PROBLEMS} are listed)`);
    expect(err.message.length).toBeLessThan(8000);
  });

  it('a repeated key among 25 000 keys is found at its line, well under 10 s', () => {
    const lines = Array.from({ length: 25_000 }, (_, i) => `k${i}: 1\n`).join('');
    const t0 = performance.now();
    const [p, ...rest] = problems(HEAD + CIRCLE + lines + 'k7: 2\n');
    expect((performance.now() - t0) / 1000).toBeLessThan(10);
    expect(rest).toEqual([]);
    expect(p).toEqual({ path: '', message: 'syntax error: Map keys must be unique', line: 25_005, column: 1 });
  });

  it('control characters in keys and values are escaped; long ones cut with their length', () => {
    const err = refusal(HEAD + CIRCLE + `"bad\\e]0;owned\\akey": 1\nmethod: "fast\\0\\e[2J"\n`);
    for (const line of err.message.split('\n')) expect(line).not.toMatch(/[\u0000-\u001f\u007f-\u009f]/);
    expect(err.message).toContain("unknown key 'bad\\x1b]0;owned\\x07key'");
    expect(err.message).toContain("got 'fast\\x00\\x1b[2J'");
    const huge = 'n'.repeat(100_000);
    // A key over 1024 characters must be written as an explicit key ('? key') in YAML.
    const named = refusal(`name: ${huge}\nwavelength: 633 nm\ndistance: 1 m\n${CIRCLE}? ${huge}k\n: 1\n`);
    expect(named.message.length).toBeLessThan(4000);
    expect(named.message).toContain('…(100000 characters)');
    expect(named.message).toContain('…(100001 characters)');
    const unit = refusal(`name: pin\nwavelength: 633 nm\ndistance: '${'9'.repeat(100_000)} m'\n${CIRCLE}`);
    expect(unit.message).toMatch(/distance: .*got '9{80}…\(100002 characters\)': 100002 characters is too long for a number with a unit$/);
  });
});

describe('the zoomed picture\'s region (output.zoom)', () => {
  it('takes a centre and a width, and says what it expected where either is missing or wrong', () => {
    const cases = expandJob(parseJobText(HEAD + CIRCLE + "output: {zoom: {centre: ['-1 mm', '0.5 mm'], width: '200 um'}}\n").spec);
    const zoom = cases[0]!.output.zoom!;
    expect(zoom.centre[0]).toBeCloseTo(-1e-3, 15);
    expect(zoom.centre[1]).toBeCloseTo(0.5e-3, 15);
    expect(zoom.width).toBeCloseTo(200e-6, 15);
    const p = problems(HEAD + CIRCLE + "output: {zoom: {width: '200 um'}}\n");
    expect(p.map((x) => x.path)).toEqual(['output.zoom.centre']);
    const q = problems(HEAD + CIRCLE + "output: {zoom: '200 um'}\n");
    expect(q[0]!.path).toBe('output.zoom');
    expect(q[0]!.message).toMatch(/centre: \['0 mm', '0 mm'\], width: '200 um'/);
  });
});
