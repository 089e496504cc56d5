// Scratch arrays kept between a thread's pictures: each case draws four or five pictures of about
// a megabyte and a half (and the resampled maps behind them), and fresh arrays of that size each
// time brought the collector round for a full mark-compact every few cases. A slot holds one array
// at a time, reused by the next picture once the last is encoded; nothing drawn into one may be
// kept after the call that asked for it returns (pictures return encoded PNG bytes, not images).

/** Arrays above this many bytes are not kept: a rare huge picture gets an array of its own. */
const KEEP_BYTES = 16 * 1024 ** 2;

const BYTES = new Map<string, Uint8Array>();
const FLOATS = new Map<string, Float64Array>();

/** `size` bytes of the slot's array, contents undefined (every byte must be written before use). */
export function scratchBytes(slot: string, size: number): Uint8Array {
  if (size > KEEP_BYTES) return new Uint8Array(size);
  let a = BYTES.get(slot);
  if (!a || a.length < size) BYTES.set(slot, (a = new Uint8Array(size)));
  return a.subarray(0, size);
}

/** `size` doubles of the slot's array, set to 0. */
export function scratchZeros(slot: string, size: number): Float64Array {
  if (size * 8 > KEEP_BYTES) return new Float64Array(size);
  let a = FLOATS.get(slot);
  if (!a || a.length < size) FLOATS.set(slot, (a = new Float64Array(size)));
  const out = a.subarray(0, size);
  out.fill(0);
  return out;
}
