// The command line as users meet it: the built CLI (dist/src/cli.js) run as a child process on tiny
// far-field jobs, with a temporary folder for --out. The build runs once in beforeAll; set
// SPOTCAST_TEST_NO_BUILD=1 to use an existing dist/ instead.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, readdir, readFile, rm, symlink, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { decodeNpy } from '../../src/output/npy.js';

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const cli = join(repo, 'dist', 'src', 'cli.js');
let work: string;

interface Ran {
  status: number | null;
  stdout: string;
  stderr: string;
}

function spotcast(...args: string[]): Ran {
  const r = spawnSync(process.execPath, [cli, ...args], { cwd: work, encoding: 'utf8', timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** All paths under dir, relative, sorted. */
async function tree(dir: string): Promise<string[]> {
  if (!existsSync(dir)) return [];
  const entries = await readdir(dir, { recursive: true });
  return entries.map(String).sort();
}

// Invented demo jobs: a 50 µm pinhole and a 20 µm slit lit at 633 nm, screen at 1 m.
const PINHOLE = 'name: pinhole-50um\nwavelength: 633 nm\ndistance: 1 m\naperture:\n  shape: circle\n  diameter: 50 um\n';
const SLIT = 'name: slit-20um\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: slit, width: 20 um}\n';
const BAD = 'name: bad-value\nwavelength: 633 nm\ndistance: 1 m\naperture:\n  shape: circle\n  diameter: -3 mm\n';
const SWEEP =
  'name: slit-sweep\nwavelength: 633 nm\ndistance: [1 m, 2 m]\naperture: {shape: slit, width: [20 um, 40 um]}\n';

beforeAll(async () => {
  if (process.env.SPOTCAST_TEST_NO_BUILD !== '1') {
    execFileSync('npm', ['run', 'build'], { cwd: repo, stdio: 'pipe' });
  }
  if (!existsSync(cli)) throw new Error(`${cli} is missing: run npm run build`);
  work = await mkdtemp(join(tmpdir(), 'spotcast-cli-'));
  await writeFile(join(work, 'pinhole.yaml'), PINHOLE);
  await writeFile(join(work, 'slit.yaml'), SLIT);
  await writeFile(join(work, 'bad.yaml'), BAD);
  await writeFile(join(work, 'sweep.yaml'), SWEEP);
});

afterAll(async () => {
  if (work) await rm(work, { recursive: true, force: true });
});

describe('spotcast plan', () => {
  it('prints regime, method and reasons for a small job and exits 0', () => {
    const r = spotcast('plan', 'slit.yaml');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^job slit-20um \(slit\.yaml\): 1 case$/m);
    const regime = /^\s*regime\s+(\S+), N_F = (\S+)$/m.exec(r.stdout);
    expect(regime, r.stdout).not.toBeNull();
    // N_F = a²/(λz) with a the half-width (Goodman, Introduction to Fourier Optics; DESIGN.md §3):
    // (10 µm)² / (633 nm · 1 m) = 1.5798e-4, far below 1: far field. Printed to 3 significant digits.
    expect(regime![1]).toBe('far-field');
    expect(Number(regime![2]) / (1e-10 / 633e-9)).toBeCloseTo(1, 2);
    expect(r.stdout).toMatch(/^\s*method\s+\S.*$/m);
    const why = r.stdout.split('\n').filter((l) => /^\s+- /.test(l));
    expect(why.length).toBeGreaterThan(0);
    expect(why.join('\n')).toMatch(/Fresnel number/);
  });

  it('--json gives the same plan as data', () => {
    const r = spotcast('plan', '--json', 'slit.yaml');
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout) as { file: string; job: string; plans: Record<string, any>[] }[];
    expect(out).toHaveLength(1);
    expect(out[0]!.job).toBe('slit-20um');
    const plan = out[0]!.plans[0]!;
    expect(plan.regime).toBe('far-field');
    expect(['fraunhofer', 'fresnel', 'angular-spectrum']).toContain(plan.method);
    expect(plan.checks.fresnelNumbers[0] / (1e-10 / 633e-9)).toBeCloseTo(1, 10);
    expect(plan.reasons.length).toBeGreaterThan(0);
  });

  it('a bad job file: the message on stderr, exit 1', () => {
    const r = spotcast('plan', 'bad.yaml', 'slit.yaml');
    expect(r.status).toBe(1);
    expect(r.stderr).toContain("bad.yaml:6:13: aperture.diameter: expected a positive length such as '50 um', got '-3 mm'");
    expect(r.stdout).toMatch(/job slit-20um/); // the good file is still planned
  });
});

describe('spotcast run: outputs of a small 2-D job (DESIGN.md §5)', () => {
  let out: string;
  let caseDir: string;
  let ran: Ran;
  let result: Record<string, any>;
  let npy: ReturnType<typeof decodeNpy>;

  beforeAll(async () => {
    out = join(work, 'out-pinhole');
    ran = spotcast('run', 'pinhole.yaml', '--out', out);
    caseDir = join(out, 'pinhole-50um', '1');
    if (ran.status === 0) {
      result = JSON.parse(await readFile(join(caseDir, 'result.json'), 'utf8'));
      npy = decodeNpy(new Uint8Array(await readFile(join(caseDir, 'intensity.npy'))));
    }
  });

  it('exits 0 and writes the job and case files, with no temporary files left', async () => {
    expect(ran.stderr).toBe('');
    expect(ran.status).toBe(0);
    const files = await tree(out);
    for (const f of ['summary.csv', 'job.json', '1/intensity.npy', '1/result.json', '1/intensity.png', '1/profile-x.csv']) {
      expect(files).toContain(join('pinhole-50um', f));
    }
    expect(files.filter((f) => /(^|\/)\.|partial|\.tmp$|\.old-/.test(f))).toEqual([]);
  });

  it('job.json holds the job as written', async () => {
    const job = JSON.parse(await readFile(join(out, 'pinhole-50um', 'job.json'), 'utf8'));
    expect(job).toEqual({
      file: 'pinhole.yaml',
      job: { name: 'pinhole-50um', wavelength: '633 nm', distance: '1 m', aperture: { shape: 'circle', diameter: '50 um' } },
    });
  });

  it('result.json has the keys the output contract requires, in SI units', () => {
    for (const k of ['wavelength', 'distance', 'pixelPitch', 'center', 'shape', 'fresnelNumber', 'regime', 'method', 'warnings', 'metrics', 'parameters']) {
      expect(result, `key ${k}`).toHaveProperty(k);
    }
    expect(result.wavelength).toBeCloseTo(633e-9, 20);
    expect(result.distance).toBe(1);
    // N_F = a²/(λz) (DESIGN.md §3) = (25 µm)²/(633 nm · 1 m).
    expect(result.fresnelNumber / (625e-12 / 633e-9)).toBeCloseTo(1, 10);
    expect(result.regime).toBe('far-field');
    expect(typeof result.method).toBe('string');
    expect(Array.isArray(result.warnings)).toBe(true);
    for (const w of result.warnings) expect(Object.keys(w).sort()).toEqual(['code', 'message']);
    expect(typeof result.metrics).toBe('object');
    expect(result.parameters.aperture).toMatchObject({ shape: 'circle' });
    expect(result.parameters.aperture.diameter).toBeCloseTo(50e-6, 18);
    expect(result.pixelPitch).toHaveLength(2);
    expect(result.pixelPitch[0]).toBeGreaterThan(0);
    expect(result.pixelPitch[1]).toBeGreaterThan(0);
  });

  it('shape, center and pixelPitch agree with intensity.npy', () => {
    // .npy is [row][col] = [y][x]; shape is [rows, cols]; center is [col, row].
    expect(npy.shape).toEqual(result.shape);
    expect(npy.shape).toHaveLength(2);
    const [rows, cols] = npy.shape as [number, number];
    expect(npy.data.length).toBe(rows * cols);
    let best = 0;
    for (let i = 1; i < npy.data.length; i++) if (npy.data[i]! > npy.data[best]!) best = i;
    const [cx, cy] = result.center as [number, number];
    // The maximum of a centred far-field spot sits on the optical axis, at `center`.
    expect(best % cols).toBe(Math.round(cx));
    expect(Math.floor(best / cols)).toBe(Math.round(cy));
    expect(Math.abs(cx - Math.round(cx))).toBeLessThan(1e-6);
    expect(Math.abs(cy - Math.round(cy))).toBeLessThan(1e-6);
    // Peak of a circular aperture in the far field, intensity relative to the incident irradiance:
    // I0 = (πa²/(λz))² (DESIGN.md §3; Born & Wolf, Principles of Optics, §8.5.2). The sample sits on the
    // axis, so only the method's own error remains; 1 % allows for it.
    const i0 = ((Math.PI * 625e-12) / 633e-9) ** 2;
    expect(npy.data[best]! / i0).toBeCloseTo(1, 2);
    expect(result.metrics.peakIntensity).toBe(npy.data[best]);
  });

  it('pixelPitch is calibrated: the first dark ring lies at r = 1.21967 λz/D (Born & Wolf §8.5.2)', () => {
    const [, cols] = npy.shape as [number, number];
    const row = Math.round(result.center[1]);
    const col = Math.round(result.center[0]);
    const at = (c: number) => npy.data[row * cols + c]!;
    let c = col + 1;
    while (c + 1 < cols && at(c + 1) < at(c)) c++;
    const rFound = (c - col) * result.pixelPitch[0];
    const rExpected = (1.21967 * 633e-9 * 1) / 50e-6; // 15.44 mm
    // The sampled minimum is within one pixel of the true zero.
    expect(Math.abs(rFound - rExpected)).toBeLessThanOrEqual(result.pixelPitch[0]);
  });

  it('profile-x.csv is the row through the axis, on the same coordinates', async () => {
    const lines = (await readFile(join(caseDir, 'profile-x.csv'), 'utf8')).trimEnd().split('\n');
    expect(lines[0]).toBe('x_m,intensity');
    const [, cols] = npy.shape as [number, number];
    expect(lines.length - 1).toBe(cols);
    const row = Math.round(result.center[1]);
    const data = lines.slice(1).map((l) => l.split(',').map(Number));
    const dx = result.pixelPitch[0];
    data.forEach(([x, v], i) => {
      // x = 0 on the optical axis: x_i = (i − center_x)·dx.
      expect(Math.abs(x! - (i - result.center[0]) * dx)).toBeLessThan(1e-9 * dx * cols);
      expect(v).toBe(npy.data[row * cols + i]);
    });
  });

  it('intensity.png is a PNG (signature and IHDR chunk, PNG spec ISO/IEC 15948 §5.2, §11.2.2)', async () => {
    const png = await readFile(join(caseDir, 'intensity.png'));
    expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(png.subarray(12, 16).toString('ascii')).toBe('IHDR');
    expect(png.readUInt32BE(16)).toBeGreaterThan(0);
    expect(png.readUInt32BE(20)).toBeGreaterThan(0);
  });

  it('summary.csv has a header and one done row', async () => {
    const lines = (await readFile(join(out, 'pinhole-50um', 'summary.csv'), 'utf8')).trimEnd().split('\n');
    expect(lines).toHaveLength(2);
    const header = lines[0]!.split(',');
    const row = lines[1]!.split(',');
    expect(row[header.indexOf('case')]).toBe('1');
    expect(row[header.indexOf('status')]).toBe('done');
    expect(Number(row[header.indexOf('peak_intensity')])).toBe(npy.data[Math.round(result.center[1]) * npy.shape[1]! + Math.round(result.center[0])]);
  });
});

describe('spotcast run: sweeps and 1-D jobs', () => {
  it('writes one folder per case and a summary row per case', async () => {
    const out = join(work, 'out-sweep');
    const r = spotcast('run', 'sweep.yaml', '--out', out, '--quiet');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const jobDir = join(out, 'slit-sweep');
    const all = (await readdir(jobDir, { withFileTypes: true })).filter((d) => d.isDirectory()).map((d) => d.name).sort();
    // Case folders, and the job's plots folder beside them.
    expect(all).toContain('plots');
    const dirs = all.filter((d) => d !== 'plots');
    expect(dirs).toEqual(['1_w-20um_z-1m', '2_w-20um_z-2m', '3_w-40um_z-1m', '4_w-40um_z-2m']);
    for (const f of ['report.html', 'contact-sheet.png', 'summary.json', 'job.json']) expect(existsSync(join(jobDir, f))).toBe(true);
    const summary = (await readFile(join(jobDir, 'summary.csv'), 'utf8')).trimEnd().split('\n');
    expect(summary).toHaveLength(5);
    expect(summary.slice(1).map((l) => l.split(',')[0])).toEqual(dirs);
    for (const d of dirs) {
      const res = JSON.parse(await readFile(join(jobDir, d, 'result.json'), 'utf8'));
      const w = res.parameters.swept['aperture.width'];
      const z = res.parameters.swept.distance;
      expect(res.distance).toBe(z);
      const m = decodeNpy(new Uint8Array(await readFile(join(jobDir, d, 'intensity.npy'))));
      expect(m.shape).toEqual(res.shape);
      const [rows, cols] = m.shape as [number, number];
      // A slit with no length is a 1-D problem: one row.
      expect(rows).toBe(1);
      const cx = Math.round(res.center[0]);
      let best = 0;
      for (let i = 1; i < cols; i++) if (m.data[i]! > m.data[best]!) best = i;
      expect(best).toBe(cx);
      // sinc² zeros at x = mλz/w (Goodman, ch. 4; DESIGN.md §4): the first within one pixel.
      let c = cx + 1;
      while (c + 1 < cols && m.data[c + 1]! < m.data[c]!) c++;
      expect(Math.abs((c - cx) * res.pixelPitch[0] - (633e-9 * z) / w)).toBeLessThanOrEqual(res.pixelPitch[0]);
    }
  });

  it('running again replaces the results whole, leaving no partial or old folders', async () => {
    const out = join(work, 'out-again');
    expect(spotcast('run', 'slit.yaml', '--out', out, '--quiet').status).toBe(0);
    const first = await tree(out);
    expect(spotcast('run', 'slit.yaml', '--out', out, '--quiet').status).toBe(0);
    expect(await tree(out)).toEqual(first);
  });
});

describe('spotcast run: bad input', () => {
  it('a bad job file gets file:line:column on stderr and does not stop the other job files', async () => {
    const out = join(work, 'out-mixed');
    const r = spotcast('run', 'bad.yaml', 'slit.yaml', '--out', out);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain("bad.yaml:6:13: aperture.diameter: expected a positive length such as '50 um', got '-3 mm'");
    const files = await tree(out);
    expect(files).toContain(join('slit-20um', 'summary.csv'));
    expect(files).toContain(join('slit-20um', '1', 'result.json'));
    expect(files).toContain(join('slit-20um', '1', 'intensity.npy'));
    // Nothing at all for the refused job.
    expect(files.filter((f) => f.startsWith('bad-value'))).toEqual([]);
  });

  it('a missing job file is reported and the others still run', async () => {
    const out = join(work, 'out-missing');
    const r = spotcast('run', 'nowhere.yaml', 'slit.yaml', '--out', out, '--quiet');
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('nowhere.yaml: cannot read the job file: no such file');
    expect(await tree(out)).toContain(join('slit-20um', '1', 'result.json'));
  });

  it('--out naming a file: refused with a clear message, the file untouched', async () => {
    const file = join(work, 'not-a-folder.txt');
    await writeFile(file, 'precious\n');
    const r = spotcast('run', 'slit.yaml', '--out', file, '--quiet');
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`slit.yaml: cannot write to ${join(file, 'slit-20um')}: ${file} is a file, not a folder`);
    expect(await readFile(file, 'utf8')).toBe('precious\n');
  });

  it('a job name that would escape the output folder is refused, nothing written outside', async () => {
    const sandbox = join(work, 'sandbox');
    const out = join(sandbox, 'out');
    await mkdir(sandbox, { recursive: true });
    await writeFile(join(work, 'escape.yaml'), SLIT.replace('name: slit-20um', 'name: ../escape'));
    await writeFile(join(work, 'escape2.yaml'), SLIT.replace('name: slit-20um', 'name: /tmp/escape'));
    const r = spotcast('run', 'escape.yaml', 'escape2.yaml', '--out', out);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/escape\.yaml:1:7: name: expected a name of letters, digits, - and _ .*got '\.\.\/escape'/);
    expect(r.stderr).toMatch(/escape2\.yaml:1:7: name: expected a name .*got '\/tmp\/escape'/);
    expect(await tree(sandbox)).toEqual([]);
  });

  it('a job folder that is a link to elsewhere is refused, and the next job file still runs', async () => {
    const out = join(work, 'out-link');
    const elsewhere = await mkdtemp(join(tmpdir(), 'spotcast-elsewhere-'));
    try {
      await mkdir(out, { recursive: true });
      await symlink(elsewhere, join(out, 'pinhole-50um'));
      const r = spotcast('run', 'pinhole.yaml', 'slit.yaml', '--out', out, '--quiet');
      expect(r.status).toBe(1);
      expect(r.stderr).toMatch(/pinhole\.yaml: refusing to write through the link .*pinhole-50um/);
      expect(await readdir(elsewhere)).toEqual([]);
      expect(await tree(out)).toContain(join('slit-20um', '1', 'result.json'));
    } finally {
      await rm(elsewhere, { recursive: true, force: true });
    }
  });
});

describe('two job files with the same name in one run', () => {
  it('the second is refused (it would overwrite the first), the first is kept, exit 1', async () => {
    const out = join(work, 'out-dup');
    await writeFile(join(work, 'slit-again.yaml'), SLIT.replace('width: 20 um', 'width: 30 um'));
    const r = spotcast('run', 'slit.yaml', 'slit-again.yaml', '--out', out, '--quiet');
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/slit-again\.yaml: the job name 'slit-20um' is already used by slit\.yaml/);
    const job = JSON.parse(await readFile(join(out, 'slit-20um', 'job.json'), 'utf8'));
    expect(job.file).toBe('slit.yaml');
  });
});

describe('usage errors exit 2', () => {
  it.each([
    [['frobnicate', 'slit.yaml'], /Unknown argument/],
    [['run', 'slit.yaml', '--bogus'], /Unknown argument: bogus/],
    [['plan', 'slit.yaml', '--frobnicate=3'], /Unknown argument: frobnicate/],
    [[], /name a command: run, plan or gather/],
    [['run'], /run: name at least one job file/],
  ])('spotcast %j', (args, message) => {
    const r = spotcast(...args);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(message);
    expect(r.stderr).toMatch(/spotcast --help/);
  });

  it('--version prints the version and exits 0', async () => {
    const pkg = JSON.parse(await readFile(join(repo, 'package.json'), 'utf8'));
    const r = spotcast('--version');
    expect(r.status).toBe(0);
    expect(r.stdout.trim()).toBe(pkg.version);
  });

  it('a bad --max-memory value is a usage error: exit 2', () => {
    const r = spotcast('plan', 'slit.yaml', '--max-memory', 'lots');
    expect(r.status).toBe(2);
    expect(r.stderr).toContain("--max-memory: expected a size from 64MiB to 1TiB, such as 4GiB or 512MB, got 'lots'");
  });
});
