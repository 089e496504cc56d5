// NumPy .npy format, version 1.0 (the open format description in NumPy's documentation,
// "numpy.lib.format"): magic, version, little-endian header length, a Python-literal header dict
// padded with spaces to a multiple of 64 bytes and ending in '\n', then the raw C-order data.

export type NpyDtype = 'float64' | 'float32';

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

export function encodeNpy(data: Float64Array, shape: number[], dtype: NpyDtype = 'float64'): Uint8Array {
  const descr = dtype === 'float64' ? '<f8' : '<f4';
  const shapeText = shape.length === 1 ? `(${shape[0]},)` : `(${shape.join(', ')})`;
  let header = `{'descr': '${descr}', 'fortran_order': False, 'shape': ${shapeText}, }`;
  const prefix = 10; // magic (6) + version (2) + header length (2)
  const total = Math.ceil((prefix + header.length + 1) / 64) * 64;
  header = header.padEnd(total - prefix - 1, ' ') + '\n';
  const itemSize = dtype === 'float64' ? 8 : 4;
  const out = new Uint8Array(total + data.length * itemSize);
  out.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0], 0); // \x93NUMPY v1.0
  const view = new DataView(out.buffer);
  view.setUint16(8, header.length, true);
  for (let i = 0; i < header.length; i++) out[prefix + i] = header.charCodeAt(i);
  if (LITTLE_ENDIAN) {
    // The machine's own order is the file's: the values' bytes as they are (float32: rounded to
    // nearest by the typed array, as DataView's setFloat32 rounds). A copy, not a loop of setters.
    const values = dtype === 'float64' ? data : Float32Array.from(data);
    out.set(new Uint8Array(values.buffer, values.byteOffset, values.byteLength), total);
    return out;
  }
  for (let i = 0; i < data.length; i++) {
    if (dtype === 'float64') view.setFloat64(total + 8 * i, data[i]!, true);
    else view.setFloat32(total + 4 * i, data[i]!, true);
  }
  return out;
}

/** Reads back what encodeNpy writes (float32/float64, C order); for tests and tools. */
export function decodeNpy(bytes: Uint8Array): { data: Float64Array; shape: number[]; dtype: NpyDtype } {
  const magic = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59];
  if (!magic.every((b, i) => bytes[i] === b)) throw new Error('not a .npy file');
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const major = bytes[6];
  const hlen = major === 1 ? view.getUint16(8, true) : view.getUint32(8, true);
  const start = major === 1 ? 10 : 12;
  const header = new TextDecoder().decode(bytes.subarray(start, start + hlen));
  const descr = /'descr':\s*'([^']+)'/.exec(header)?.[1];
  const shapeText = /'shape':\s*\(([^)]*)\)/.exec(header)?.[1] ?? '';
  if (/'fortran_order':\s*True/.test(header)) throw new Error('Fortran-order .npy files are not supported');
  const shape = shapeText.split(',').map((s) => s.trim()).filter(Boolean).map(Number);
  const n = shape.reduce((a, b) => a * b, 1);
  const dataStart = start + hlen;
  if (descr !== '<f8' && descr !== '<f4') throw new Error(`unsupported dtype ${descr}`);
  const itemSize = descr === '<f8' ? 8 : 4;
  if (dataStart + n * itemSize > bytes.byteLength) throw new Error(`.npy data cut short: ${bytes.byteLength - dataStart} bytes for ${n} values of ${itemSize}`);
  const data = new Float64Array(n);
  if (LITTLE_ENDIAN && descr === '<f8') {
    // The file's order is the machine's: its bytes copied into the array (the report reads dozens of
    // these; a getter a value took most of the time of reading them).
    new Uint8Array(data.buffer).set(bytes.subarray(dataStart, dataStart + 8 * n));
  } else if (LITTLE_ENDIAN) {
    data.set(new Float32Array(bytes.slice(dataStart, dataStart + 4 * n).buffer));
  } else if (descr === '<f8') for (let i = 0; i < n; i++) data[i] = view.getFloat64(dataStart + 8 * i, true);
  else for (let i = 0; i < n; i++) data[i] = view.getFloat32(dataStart + 4 * i, true);
  return { data, shape, dtype: descr === '<f8' ? 'float64' : 'float32' };
}
