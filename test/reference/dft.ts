// The discrete Fourier transform by its definition, X[k] = Σ_j x[j] e^{∓2πi jk/n} (÷ n for the
// inverse), summed directly: O(n²) per line, rows then columns in 2-D (the 2-D sum factorises).
// Test code only, nothing shared with src/; the reference for FFT sizes fft.js does not take.

/**
 * The DFT definition on `count` lines of n points (point j of line l at 2·(l·lineStep + j·pointStep)), summed directly; e^{∓2πi jk/n} from a table of the n roots, the exponent reduced
 * mod n in integers.
 */
function directLines(x: Float64Array, n: number, count: number, lineStep: number, pointStep: number, inverse: boolean): void {
  const c = new Float64Array(n), s = new Float64Array(n);
  const sign = inverse ? 1 : -1;
  for (let j = 0; j < n; j++) {
    c[j] = Math.cos((2 * Math.PI * j) / n);
    s[j] = sign * Math.sin((2 * Math.PI * j) / n);
  }
  const scale = inverse ? 1 / n : 1;
  const re = new Float64Array(n), im = new Float64Array(n);
  for (let l = 0; l < count; l++) {
    for (let j = 0; j < n; j++) {
      const i = 2 * (l * lineStep + j * pointStep);
      re[j] = x[i]!;
      im[j] = x[i + 1]!;
    }
    for (let k = 0; k < n; k++) {
      let sr = 0, si = 0;
      for (let j = 0, e = 0; j < n; j++, e = (e + k) % n) {
        sr += re[j]! * c[e]! - im[j]! * s[e]!;
        si += re[j]! * s[e]! + im[j]! * c[e]!;
      }
      const i = 2 * (l * lineStep + k * pointStep);
      x[i] = sr * scale;
      x[i + 1] = si * scale;
    }
  }
}

/** The 2-D DFT definition (rows, then columns: the sum factorises), ny = 1 for 1-D. */
export function directDft(x: Float64Array, nx: number, ny: number, inverse: boolean): Float64Array {
  const y = x.slice();
  directLines(y, nx, ny, nx, 1, inverse);
  if (ny > 1) directLines(y, ny, nx, 1, nx, inverse);
  return y;
}
