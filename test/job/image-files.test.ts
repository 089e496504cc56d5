// Image masks at load time: the loader reads the PNGs an image element names, relative to the job
// file's folder, like the job file itself (special files refused at once, capped in size), decodes
// them (src/job/grey-png.ts), and every problem names the job file, line and column, the key path
// and the image. The PNG formats are written with pngjs (test/mask-png.ts) or, where pngjs does
// not write them (palettes, 1-bit grey), chunk by chunk as the PNG specification (ISO/IEC 15948)
// lays them out.
import { execFileSync } from 'node:child_process';
import { mkdir, mkdtemp, rm, truncate, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JobError, loadJobFile, parseJobText } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';
import { decodeGreyPng, MAX_IMAGE_BYTES, MAX_IMAGE_PIXELS } from '../../src/job/grey-png.js';
import { describe as describeAperture } from '../../src/elements/registry.js';
import { maskPng, rawPng, writeMaskPng } from '../mask-png.js';

const HEAD = 'name: img\nwavelength: 633 nm\ndistance: 1 m\n';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-image-'));
  await mkdir(join(dir, 'jobs', 'masks'), { recursive: true });
  await mkdir(join(dir, 'shared'), { recursive: true });
  // A 4 × 3 image: an open 2 × 1 bar in the middle row.
  await writeMaskPng(join(dir, 'jobs', 'masks', 'bar.png'), 4, 3, (i, k) => [k === 1 && (i === 1 || i === 2) ? 255 : 0]);
  await writeMaskPng(join(dir, 'shared', 'bar.png'), 4, 3, (i, k) => [k === 1 && i === 1 ? 255 : 0]);
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** Writes a job whose fourth line is the aperture, returns its path. */
async function job(name: string, aperture: string): Promise<string> {
  const path = join(dir, 'jobs', `${name}.yaml`);
  await writeFile(path, `${HEAD}aperture: ${aperture}\n`);
  return path;
}

async function refusal(path: string): Promise<JobError> {
  try {
    await loadJobFile(path);
  } catch (e) {
    expect(e).toBeInstanceOf(JobError);
    return e as JobError;
  }
  throw new Error(`expected ${path} to be refused`);
}

/** "file:4:col: aperture.<key>: " with col the 1-based column of `at` in the aperture line. */
function where(path: string, key: string, line: string, at: string): string {
  return `${path}:4:${`aperture: ${line}`.indexOf(at) + 1}: aperture.${key}: `;
}

describe('an image mask loads from a PNG named relative to the job file', () => {
  it('reads it, and the case carries its pixels, size and digest', async () => {
    const path = await job('bar', '{shape: image, file: masks/bar.png, pitch: 2 um}');
    const loaded = await loadJobFile(path);
    const [c] = expandJob(loaded.spec);
    const a = c!.aperture;
    if (a.shape !== 'image') throw new Error('not an image');
    expect(a.pitch).toBe(2e-6);
    expect(a.center).toEqual([0, 0]);
    expect(a.pixels.width).toBe(4);
    expect(a.pixels.height).toBe(3);
    expect(Array.from(a.pixels.planes.get('amplitude')!)).toEqual([0, 0, 0, 0, 0, 1, 1, 0, 0, 0, 0, 0]);
    expect(a.pixels.planes.has('phase')).toBe(false);
    expect(a.pixels.digest).toMatch(/^[0-9a-f]{32}$/);
    expect(describeAperture(a)).toBe("image mask 'masks/bar.png', 4 × 3 pixels of 2 µm (8 µm × 6 µm)");
    // JSON (result.json, the case hash) carries the digest and the size, not the pixels.
    expect(JSON.stringify(a)).not.toMatch(/"0":/);
    expect(JSON.stringify(a)).toContain(a.pixels.digest);
  });

  it('the digest follows the files\' contents, so a finished case is computed again when its image changes', async () => {
    const path = await job('digest', '{shape: image, file: masks/changing.png, pitch: 2 um}');
    const digest = async () => {
      const a = expandJob((await loadJobFile(path)).spec)[0]!.aperture;
      if (a.shape !== 'image') throw new Error('not an image');
      return a.pixels.digest;
    };
    await writeMaskPng(join(dir, 'jobs', 'masks', 'changing.png'), 4, 3, (i) => [i === 1 ? 255 : 0]);
    const first = await digest();
    expect(await digest()).toBe(first);
    await writeMaskPng(join(dir, 'jobs', 'masks', 'changing.png'), 4, 3, (i) => [i === 2 ? 255 : 0]);
    expect(await digest()).not.toBe(first);
  });

  it('takes paths that leave the job folder, and absolute paths, like any file a person names', async () => {
    const up = await loadJobFile(await job('up', '{shape: image, file: ../shared/bar.png, pitch: 2 um}'));
    const abs = await loadJobFile(await job('abs', `{shape: image, file: '${join(dir, 'shared', 'bar.png')}', pitch: 2 um}`));
    for (const l of [up, abs]) {
      const a = expandJob(l.spec)[0]!.aperture;
      if (a.shape !== 'image') throw new Error('not an image');
      expect(Array.from(a.pixels.planes.get('amplitude')!)).toEqual([0, 0, 0, 0, 0, 1, 0, 0, 0, 0, 0, 0]);
    }
  });

  it('sweeps the pitch (folder token "pitch"), sharing one decoded image', async () => {
    const cases = expandJob((await loadJobFile(await job('sweep', '{shape: image, file: masks/bar.png, pitch: [1 um, 3 um]}'))).spec);
    expect(cases.map((c) => c.id)).toEqual(['1_pitch-1um', '2_pitch-3um']);
    const [a, b] = cases.map((c) => c.aperture);
    if (a!.shape !== 'image' || b!.shape !== 'image') throw new Error('not images');
    expect(a!.pixels.planes.get('amplitude')).toBe(b!.pixels.planes.get('amplitude'));
  });

  it('maps the phase image through phase-range (default 0 to 2π)', async () => {
    await writeMaskPng(join(dir, 'jobs', 'masks', 'ramp.png'), 4, 3, (i) => [i * 85]);
    const load = async (extra: string) => {
      const l = await loadJobFile(await job('ph', `{shape: image, file: masks/bar.png, pitch: 2 um, phase: masks/ramp.png${extra}}`));
      const a = expandJob(l.spec)[0]!.aperture;
      if (a.shape !== 'image') throw new Error('not an image');
      return Array.from(a.pixels.planes.get('phase')!.slice(0, 4));
    };
    const full = await load('');
    [0, 1, 2, 3].forEach((i) => expect(full[i]).toBeCloseTo((2 * Math.PI * i) / 3, 6));
    const half = await load(", phase-range: ['90 deg', '270 deg']");
    [0, 1, 2, 3].forEach((i) => expect(half[i]).toBeCloseTo(Math.PI / 2 + (Math.PI * i) / 3, 6));
  });

  it('a job given as text reads no file: expanding it says to load it from its file', () => {
    const { spec } = parseJobText(`${HEAD}aperture: {shape: image, file: masks/bar.png, pitch: 2 um}\n`);
    expect(() => expandJob(spec)).toThrow(/^aperture\.file: the image 'masks\/bar\.png' has not been read: load the job from its file \(loadJobFile\)/);
  });
});

describe('PNG formats: grey level × alpha over the largest value of the bit depth', () => {
  const levels = (buf: Buffer) => Array.from(decodeGreyPng(buf).levels);
  it('8- and 16-bit grey', () => {
    expect(levels(maskPng(3, 1, (i) => [[0, 51, 255][i]!]))).toEqual([0, Math.fround(0.2), 1]);
    expect(levels(maskPng(3, 1, (i) => [[0, 13107, 65535][i]!], { bitDepth: 16 }))).toEqual([0, Math.fround(0.2), 1]);
  });
  it('grey + alpha (a transparent pixel passes nothing: it is what shows over black)', () => {
    expect(levels(maskPng(3, 1, (i) => [[255, 255, 102][i]!, [255, 0, 255][i]!], { colorType: 4 }))).toEqual([1, 0, Math.fround(0.4)]);
    expect(levels(maskPng(2, 1, (i) => [65535, [65535, 32768][i]!], { colorType: 4, bitDepth: 16 }))[1]).toBeCloseTo(32768 / 65535, 7);
  });
  it('RGB and RGBA whose pixels are grey, palettes of greys (their transparency too), 1-bit grey', () => {
    expect(levels(maskPng(2, 1, (i) => [i * 255, i * 255, i * 255], { colorType: 2 }))).toEqual([0, 1]);
    expect(levels(maskPng(2, 1, (i) => [255, 255, 255, i * 255], { colorType: 6 }))).toEqual([0, 1]);
    const pal = rawPng({ width: 3, height: 1, depth: 8, colorType: 3, rows: [Buffer.from([0, 1, 2])], palette: [[0, 0, 0], [51, 51, 51], [255, 255, 255]], alphas: [255, 255, 0] });
    expect(levels(pal)).toEqual([0, Math.fround(0.2), 0]);
    const bits = rawPng({ width: 10, height: 1, depth: 1, colorType: 0, rows: [Buffer.from([0b10110000, 0b01000000])] });
    expect(levels(bits)).toEqual([1, 0, 1, 1, 0, 0, 0, 0, 0, 1]);
  });
  it('colour is refused, naming the first colour pixel', () => {
    expect(() => decodeGreyPng(maskPng(3, 2, (i, k) => (i === 2 && k === 1 ? [10, 20, 30] : [0, 0, 0]), { colorType: 2 }))).toThrow(
      'is in colour (the pixel at column 2, row 1 from the top left is R 10, G 20, B 30): save it as greyscale, whose grey level is the transmission',
    );
    const pal = rawPng({ width: 2, height: 1, depth: 8, colorType: 3, rows: [Buffer.from([0, 1])], palette: [[0, 0, 0], [200, 0, 0]] });
    expect(() => decodeGreyPng(pal)).toThrow(/^is in colour \(the pixel at column 1, row 0/);
  });
});

describe('load errors name the job file, line and column, the key and the image', () => {
  it('a missing file, with the path it was looked for at', async () => {
    const line = '{shape: image, file: masks/none.png, pitch: 2 um}';
    const path = await job('missing', line);
    const e = await refusal(path);
    expect(e.message).toBe(`${where(path, 'file', line, 'masks/none.png')}cannot read 'masks/none.png' (${join(dir, 'jobs', 'masks', 'none.png')}): no such file`);
  });

  it('a file that is not a PNG, and a PNG cut short', async () => {
    await writeFile(join(dir, 'jobs', 'masks', 'notes.png'), 'just some text, not an image\n');
    const line = '{shape: image, file: masks/notes.png, pitch: 2 um}';
    const path = await job('text', line);
    expect((await refusal(path)).message).toBe(`${where(path, 'file', line, 'masks/notes.png')}'masks/notes.png' is not a PNG image (it does not start with the PNG signature)`);
    const whole = maskPng(16, 16, (i, k) => [(i * k) % 256]);
    await writeFile(join(dir, 'jobs', 'masks', 'cut.png'), whole.subarray(0, whole.length - 20));
    const cut = await job('cut', '{shape: image, file: masks/cut.png, pitch: 2 um}');
    expect((await refusal(cut)).message).toMatch(/:4:\d+: aperture\.file: 'masks\/cut\.png' is not a readable PNG image: /);
  });

  it('a folder, and a FIFO (refused from its stat at once, never opened)', async () => {
    const line = '{shape: image, file: masks, pitch: 2 um}';
    const path = await job('folder', line);
    expect((await refusal(path)).message).toBe(`${where(path, 'file', line, 'masks')}cannot read 'masks' (${join(dir, 'jobs', 'masks')}): is a folder, not a PNG image`);
    execFileSync('mkfifo', [join(dir, 'jobs', 'masks', 'pipe.png')]);
    const fifo = await job('fifo', '{shape: image, file: masks/pipe.png, pitch: 2 um}');
    expect((await refusal(fifo)).message).toMatch(/aperture\.file: cannot read 'masks\/pipe\.png' \(.*\): is a FIFO \(named pipe\), not a regular file$/);
  });

  it('a file over the 32 MiB cap (from its size, unread), and an image over 2^22 pixels (from its header, undecoded)', async () => {
    expect(MAX_IMAGE_BYTES).toBe(32 * 1024 * 1024);
    expect(MAX_IMAGE_PIXELS).toBe(4_194_304);
    const big = join(dir, 'jobs', 'masks', 'big.png');
    await writeFile(big, maskPng(2, 2, () => [255]));
    await truncate(big, MAX_IMAGE_BYTES + 1);
    const line = '{shape: image, file: masks/big.png, pitch: 2 um}';
    const path = await job('big', line);
    expect((await refusal(path)).message).toBe(`${where(path, 'file', line, 'masks/big.png')}cannot read 'masks/big.png' (${big}): is 32 MiB (33554433 bytes), more than the 32 MiB a PNG image may hold`);
    // A small file whose header declares 4096 × 1025 pixels (its data would never be read).
    const wide = Buffer.from(maskPng(2, 2, () => [255]));
    wide.writeUInt32BE(4096, 16);
    wide.writeUInt32BE(1025, 20);
    await writeFile(join(dir, 'jobs', 'masks', 'wide.png'), wide);
    const w = await job('wide', '{shape: image, file: masks/wide.png, pitch: 2 um}');
    expect((await refusal(w)).message).toMatch(/aperture\.file: 'masks\/wide\.png' is 4096 × 1025 pixels, more than the 4194304 pixels \(16384 a side\) an image mask may hold$/);
  });

  it('an interlaced PNG (its decompression would not be bounded) and a black image', async () => {
    const inter = Buffer.from(maskPng(2, 2, () => [255]));
    inter[28] = 1;
    await writeFile(join(dir, 'jobs', 'masks', 'inter.png'), inter);
    const i = await job('inter', '{shape: image, file: masks/inter.png, pitch: 2 um}');
    expect((await refusal(i)).message).toMatch(/aperture\.file: 'masks\/inter\.png' is an interlaced \(Adam7\) PNG, which is not read: save it without interlacing$/);
    await writeMaskPng(join(dir, 'jobs', 'masks', 'black.png'), 5, 5, () => [0]);
    const b = await job('black', '{shape: image, file: masks/black.png, pitch: 2 um}');
    expect((await refusal(b)).message).toMatch(/aperture\.file: 'masks\/black\.png' is black everywhere: expected some pixels that pass light \(grey level above 0\)$/);
  });

  it('a phase image of another size, at the phase key; problems with both files are listed together', async () => {
    await writeMaskPng(join(dir, 'jobs', 'masks', 'small.png'), 2, 2, () => [128]);
    const line = '{shape: image, file: masks/bar.png, pitch: 2 um, phase: masks/small.png}';
    const path = await job('size', line);
    expect((await refusal(path)).message).toBe(`${where(path, 'phase', line, 'masks/small.png')}'masks/small.png' is 2 × 2 pixels: expected the size of the amplitude image, 4 × 3`);
    const two = await job('two', '{shape: image, file: masks/a.png, pitch: 2 um, phase: masks/b.png}');
    const e = await refusal(two);
    expect(e.problems.map((p) => p.path)).toEqual(['aperture.file', 'aperture.phase']);
    expect(e.problems.map((p) => p.message)).toEqual([expect.stringMatching(/^cannot read 'masks\/a\.png' .*: no such file$/), expect.stringMatching(/^cannot read 'masks\/b\.png' .*: no such file$/)]);
  });

  it('keys the schema checks: opaque, a phase-range without a phase image, a missing pitch, an unknown key', () => {
    const refuse = (line: string) => {
      try {
        parseJobText(`${HEAD}aperture: ${line}\n`, 'j.yaml');
      } catch (e) {
        return (e as JobError).message;
      }
      throw new Error('accepted');
    };
    expect(refuse('{shape: image, file: a.png, pitch: 2 um, opaque: true}')).toMatch(/^j\.yaml:4:\d+: aperture\.opaque: expected false \(an image cannot be an obstacle: .*\), got true$/);
    expect(refuse("{shape: image, file: a.png, pitch: 2 um, phase-range: ['0 deg', '90 deg']}")).toMatch(/^j\.yaml:4:\d+: aperture\.phase-range: expected a phase image/);
    expect(refuse('{shape: image, file: a.png}')).toMatch(/^j\.yaml:4:\d+: aperture\.pitch: /);
    expect(refuse('{shape: image, file: a.png, pitch: 2 um, pich: 3}')).toMatch(/unknown key 'pich' \(did you mean 'pitch'\?\); known keys here: shape, file, pitch, phase, phase-range, center, opaque/);
    expect(refuse("{shape: image, file: '', pitch: 2 um}")).toMatch(/aperture\.file: expected the path of a PNG image such as 'masks\/reticle\.png'/);
  });
});
