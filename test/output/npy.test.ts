// .npy files, checked against the format description in NumPy's documentation ("numpy.lib.format",
// format version 1.0): the magic string \x93NUMPY, major version 1, minor 0, a little-endian
// unsigned short header length, an ASCII Python-literal dict with keys descr, fortran_order and
// shape, padded with spaces and ended by '\n' so that the data starts at a multiple of 64 bytes,
// then the data in C order. When numpy is installed on the machine (it is not a project
// dependency), the files are also read by numpy itself, and files numpy writes are read by us.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { decodeNpy, encodeNpy } from '../../src/output/npy.js';

function headerOf(bytes: Uint8Array) {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const headerLength = view.getUint16(8, true);
  const header = new TextDecoder('ascii').decode(bytes.subarray(10, 10 + headerLength));
  return { headerLength, header, dataStart: 10 + headerLength };
}

const sample = Float64Array.from({ length: 12 }, (_, i) => (i - 5.5) * 0.1 + (i === 7 ? 1e-300 : 0));

describe('.npy layout (numpy.lib.format, version 1.0)', () => {
  it('magic, version and little-endian header length', () => {
    const bytes = encodeNpy(sample, [3, 4]);
    expect([...bytes.subarray(0, 6)]).toEqual([0x93, ...Buffer.from('NUMPY', 'ascii')]);
    expect(bytes[6]).toBe(1); // major
    expect(bytes[7]).toBe(0); // minor
    const { headerLength } = headerOf(bytes);
    expect(bytes[8]! + 256 * bytes[9]!).toBe(headerLength); // little-endian uint16, by hand
  });

  it('the header dict, padded with spaces, ends in a newline and the data starts at a multiple of 64', () => {
    for (const [shape, text] of [
      [[3, 4], '(3, 4)'],
      [[12], '(12,)'], // a one-element Python tuple keeps its comma
      [[1, 12], '(1, 12)'],
      [[2, 2, 3], '(2, 2, 3)'],
      [[1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 12], null], // a header longer than 64 bytes
    ] as [number[], string | null][]) {
      for (const dtype of ['float64', 'float32'] as const) {
        const bytes = encodeNpy(sample, shape, dtype);
        const { header, dataStart } = headerOf(bytes);
        expect(dataStart % 64, `shape ${shape}`).toBe(0);
        expect(header.endsWith('\n')).toBe(true);
        expect(/^[\x20-\x7e]*\n$/.test(header)).toBe(true); // ASCII, one line
        const dict = header.trimEnd();
        expect(header.slice(dict.length, -1)).toMatch(/^ *$/);
        const descr = dtype === 'float64' ? '<f8' : '<f4';
        const shapeText = text ?? `(${shape.join(', ')})`;
        expect(dict).toBe(`{'descr': '${descr}', 'fortran_order': False, 'shape': ${shapeText}, }`);
        expect(bytes.length - dataStart).toBe(12 * (dtype === 'float64' ? 8 : 4));
      }
    }
  });

  it('float64 data: little-endian IEEE 754 doubles, C order, bit for bit', () => {
    const bytes = encodeNpy(sample, [3, 4], 'float64');
    const { dataStart } = headerOf(bytes);
    const view = new DataView(bytes.buffer, bytes.byteOffset + dataStart);
    for (let i = 0; i < 12; i++) expect(Object.is(view.getFloat64(8 * i, true), sample[i])).toBe(true);
  });

  it('float32 data: each value rounded to the nearest single (Math.fround)', () => {
    const bytes = encodeNpy(sample, [3, 4], 'float32');
    const { dataStart } = headerOf(bytes);
    const view = new DataView(bytes.buffer, bytes.byteOffset + dataStart);
    for (let i = 0; i < 12; i++) expect(view.getFloat32(4 * i, true)).toBe(Math.fround(sample[i]!));
  });

  it('round trip through decodeNpy', () => {
    const d = decodeNpy(encodeNpy(sample, [3, 4], 'float64'));
    expect(d.shape).toEqual([3, 4]);
    expect(d.dtype).toBe('float64');
    expect([...d.data]).toEqual([...sample]);
    const s = decodeNpy(encodeNpy(sample, [12], 'float32'));
    expect(s.shape).toEqual([12]);
    expect(s.dtype).toBe('float32');
    expect([...s.data]).toEqual([...sample].map(Math.fround));
    // Special values survive (NumPy stores IEEE 754 bit patterns).
    const special = Float64Array.from([0, -0, Infinity, -Infinity, NaN, Number.MIN_VALUE, Number.MAX_VALUE]);
    const back = decodeNpy(encodeNpy(special, [7])).data;
    special.forEach((v, i) => expect(Object.is(back[i], v)).toBe(true));
  });

  it('decodeNpy refuses what is not a .npy file', () => {
    expect(() => decodeNpy(new TextEncoder().encode('x_m,intensity\n0,1\n'))).toThrow(/not a \.npy file/);
  });
});

const numpyCheck = spawnSync('python3', ['-c', 'import numpy'], { stdio: 'ignore' });
const haveNumpy = numpyCheck.status === 0;
if (!haveNumpy) {
  console.warn('npy.test.ts: python3 with numpy is not available here; the cross-check with numpy is skipped.');
}

describe.skipIf(!haveNumpy)('cross-check with numpy (skipped when python3 + numpy are absent)', () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'spotcast-npy-'));
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  const python = (code: string, ...args: string[]) => execFileSync('python3', ['-c', code, ...args], { encoding: 'utf8' });

  it('numpy.load reads our float64 and float32 files with the right shape, dtype and values', async () => {
    const values = Float64Array.from({ length: 35 }, (_, i) => Math.sin(i) * 10 ** (i - 17));
    for (const dtype of ['float64', 'float32'] as const) {
      const file = join(dir, `ours-${dtype}.npy`);
      await writeFile(file, encodeNpy(values, [5, 7], dtype));
      // allow_pickle=False: numpy must accept the header as plain data.
      const out = JSON.parse(
        python(
          `import json, sys, numpy as np
a = np.load(sys.argv[1], allow_pickle=False)
print(json.dumps({"dtype": a.dtype.str, "shape": list(a.shape), "c": bool(a.flags["C_CONTIGUOUS"]),
  "row3col5": float(a[3, 5]), "values": [float(x) for x in a.ravel(order="C")]}))`,
          file,
        ),
      ) as { dtype: string; shape: number[]; c: boolean; row3col5: number; values: number[] };
      expect(out.dtype).toBe(dtype === 'float64' ? '<f8' : '<f4');
      expect(out.shape).toEqual([5, 7]);
      expect(out.c).toBe(true);
      const expected = dtype === 'float64' ? [...values] : [...values].map(Math.fround);
      // Python's json writes the shortest repr that round-trips a double: exact comparison.
      expect(out.values).toEqual(expected);
      expect(out.row3col5).toBe(expected[3 * 7 + 5]);
    }
  });

  it('we read files written by numpy.save', async () => {
    const file = join(dir, 'theirs.npy');
    python(
      `import sys, numpy as np
np.save(sys.argv[1], (np.arange(6, dtype=np.float64).reshape(2, 3) - 2.5) / 7)`,
      file,
    );
    const d = decodeNpy(new Uint8Array(await readFile(file)));
    expect(d.shape).toEqual([2, 3]);
    expect(d.dtype).toBe('float64');
    expect([...d.data]).toEqual([0, 1, 2, 3, 4, 5].map((i) => (i - 2.5) / 7));
    const file32 = join(dir, 'theirs32.npy');
    python(`import sys, numpy as np\nnp.save(sys.argv[1], np.array([0.1, 0.2, 0.3], dtype=np.float32))`, file32);
    const s = decodeNpy(new Uint8Array(await readFile(file32)));
    expect(s.shape).toEqual([3]);
    expect([...s.data]).toEqual([0.1, 0.2, 0.3].map(Math.fround));
  });
});
