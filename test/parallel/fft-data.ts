// Test data for the parallel FFT tests: reproducible pseudo-random complex samples, and an exact
// comparison that also tells -0 from +0 and NaNs apart (bit for bit, not ===).

export function randomComplex(n: number, seed: number, out = new Float64Array(2 * n)): Float64Array {
  let s = seed >>> 0;
  for (let i = 0; i < 2 * n; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    out[i] = s / 2 ** 32 - 0.5;
  }
  return out;
}

export function sameBits(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  const x = new BigUint64Array(a.buffer, a.byteOffset, a.length);
  const y = new BigUint64Array(b.buffer, b.byteOffset, b.length);
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false;
  return true;
}

/** Float64Array on a SharedArrayBuffer, as the team's sample allocator makes them. */
export function sharedCopy(x: Float64Array): Float64Array {
  const s = new Float64Array(new SharedArrayBuffer(x.byteLength));
  s.set(x);
  return s;
}
