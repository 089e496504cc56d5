// AssemblyScript source of the WebAssembly FFT kernel used by src/optics/fft-fast.ts, compiled by
// `npm run build:wasm` to dist/src/optics/wasm/fft.wasm (tsc skips this folder: see tsconfig.json).
// 128-bit SIMD, two f64 lanes per vector.
//
// Every routine works on raw pointers into this module's memory; the JavaScript side lays out the
// data, the per-size tables (input permutation and twiddles, computed there once: tablesFor in
// fft-fast.ts) and the scratch, and calls in. Complex numbers are split into a real and an
// imaginary plane. Sizes n = P·3^b·5^c, P a power of two: radix-4 (and one radix-2) stages make
// the length-P transforms, then radix-3 stages, then radix-5 stages combine them.
//
// The core is `lanes`: W independent transforms of the same length n at once, stored "point-major"
// (point p of all W transforms is W contiguous f64 at byte p*W*8). Each butterfly loads its
// twiddles once and applies them to W/2 vectors. Rows are brought into this layout R at a time
// (a small transpose, fused with the bit-reversal permutation), columns B adjacent ones at a time
// (a plain copy of B contiguous f64 per row, so every cache line read is used whole).
//
// Forward transform: X[k] = Σ x[j] e^{-2πi jk/n}. The inverse is the forward transform with the
// real and imaginary planes exchanged (`swap`), then the 1/n factor (`scale`), which the scatter
// routines apply.

/** First free byte after the module's own static data: the JavaScript side allocates from here. */
export function heapBase(): usize {
  return __heap_base;
}

/** The first stage (radix-2 when log2 n is odd, else radix-4) over n points, no twiddles. */
@inline
function firstStage(re: usize, im: usize, n: i32, pb: usize): void {
  const total = (<usize>n) * pb;
  if (ctz(n) & 1) {
    for (let o: usize = 0; o < total; o += pb << 1) {
      for (let v: usize = 0; v < pb; v += 16) {
        const a = o + v;
        const b = a + pb;
        const ar = v128.load(re + a), ai = v128.load(im + a);
        const br = v128.load(re + b), bi = v128.load(im + b);
        v128.store(re + a, f64x2.add(ar, br));
        v128.store(im + a, f64x2.add(ai, bi));
        v128.store(re + b, f64x2.sub(ar, br));
        v128.store(im + b, f64x2.sub(ai, bi));
      }
    }
  } else {
    for (let o: usize = 0; o < total; o += pb << 2) {
      for (let v: usize = 0; v < pb; v += 16) {
        const i0 = o + v;
        const i2 = i0 + pb;
        const i1 = i2 + pb;
        const i3 = i1 + pb;
        const b0r = v128.load(re + i0), b0i = v128.load(im + i0);
        const b2r = v128.load(re + i2), b2i = v128.load(im + i2);
        const b1r = v128.load(re + i1), b1i = v128.load(im + i1);
        const b3r = v128.load(re + i3), b3i = v128.load(im + i3);
        const t0r = f64x2.add(b0r, b2r), t0i = f64x2.add(b0i, b2i);
        const t1r = f64x2.sub(b0r, b2r), t1i = f64x2.sub(b0i, b2i);
        const t2r = f64x2.add(b1r, b3r), t2i = f64x2.add(b1i, b3i);
        const t3r = f64x2.sub(b1r, b3r), t3i = f64x2.sub(b1i, b3i);
        v128.store(re + i0, f64x2.add(t0r, t2r));
        v128.store(im + i0, f64x2.add(t0i, t2i));
        v128.store(re + i1, f64x2.sub(t0r, t2r));
        v128.store(im + i1, f64x2.sub(t0i, t2i));
        v128.store(re + i2, f64x2.add(t1r, t3i));
        v128.store(im + i2, f64x2.sub(t1i, t3r));
        v128.store(re + i3, f64x2.sub(t1r, t3i));
        v128.store(im + i3, f64x2.add(t1i, t3r));
      }
    }
  }
}

/**
 * A radix-4 butterfly without twiddles at byte i0, the inputs q bytes apart in bit-reversed order
 * (offsets 0, 2, 1, 3 hold residues 0, 1, 2, 3), the outputs in natural order.
 */
@inline
function butterfly4(re: usize, im: usize, i0: usize, q: usize): void {
  const i2 = i0 + q;
  const i1 = i2 + q;
  const i3 = i1 + q;
  const b0r = v128.load(re + i0), b0i = v128.load(im + i0);
  const b2r = v128.load(re + i2), b2i = v128.load(im + i2);
  const b1r = v128.load(re + i1), b1i = v128.load(im + i1);
  const b3r = v128.load(re + i3), b3i = v128.load(im + i3);
  const t0r = f64x2.add(b0r, b2r), t0i = f64x2.add(b0i, b2i);
  const t1r = f64x2.sub(b0r, b2r), t1i = f64x2.sub(b0i, b2i);
  const t2r = f64x2.add(b1r, b3r), t2i = f64x2.add(b1i, b3i);
  const t3r = f64x2.sub(b1r, b3r), t3i = f64x2.sub(b1i, b3i);
  v128.store(re + i0, f64x2.add(t0r, t2r));
  v128.store(im + i0, f64x2.add(t0i, t2i));
  v128.store(re + i1, f64x2.sub(t0r, t2r));
  v128.store(im + i1, f64x2.sub(t0i, t2i));
  v128.store(re + i2, f64x2.add(t1r, t3i));
  v128.store(im + i2, f64x2.sub(t1i, t3r));
  v128.store(re + i3, f64x2.sub(t1r, t3i));
  v128.store(im + i3, f64x2.add(t1i, t3r));
}

/**
 * The radix-4 stages of half-size L = from, 4·from, … while 4L ≤ P, over the length-P transforms
 * held one after another in `total` bytes. `t` points at the twiddles of stage `from`: for each
 * stage in turn, L records of six f64, w^k, w^2k, w^3k (re, im) with w = e^{-2πi/(4L)}.
 */
function radix4Stages(re: usize, im: usize, total: usize, P: i32, pb: usize, from: i32, t: usize): void {
  let L = from;
  while (L < P) {
    const q = (<usize>L) * pb; // bytes from one quarter to the next
    for (let base: usize = 0; base < total; base += q << 2) {
      // k = 0: the twiddles are 1
      for (let v: usize = 0; v < pb; v += 16) butterfly4(re, im, base + v, q);
      let tk = t + 48;
      const end = base + q;
      for (let p = base + pb; p < end; p += pb) {
        const w1r = f64x2.splat(load<f64>(tk)), w1i = f64x2.splat(load<f64>(tk, 8));
        const w2r = f64x2.splat(load<f64>(tk, 16)), w2i = f64x2.splat(load<f64>(tk, 24));
        const w3r = f64x2.splat(load<f64>(tk, 32)), w3i = f64x2.splat(load<f64>(tk, 40));
        tk += 48;
        for (let v: usize = 0; v < pb; v += 16) {
          const i0 = p + v;
          const i2 = i0 + q;
          const i1 = i2 + q;
          const i3 = i1 + q;
          const b0r = v128.load(re + i0), b0i = v128.load(im + i0);
          let xr = v128.load(re + i1), xi = v128.load(im + i1);
          const b1r = f64x2.sub(f64x2.mul(xr, w1r), f64x2.mul(xi, w1i));
          const b1i = f64x2.add(f64x2.mul(xr, w1i), f64x2.mul(xi, w1r));
          xr = v128.load(re + i2);
          xi = v128.load(im + i2);
          const b2r = f64x2.sub(f64x2.mul(xr, w2r), f64x2.mul(xi, w2i));
          const b2i = f64x2.add(f64x2.mul(xr, w2i), f64x2.mul(xi, w2r));
          xr = v128.load(re + i3);
          xi = v128.load(im + i3);
          const b3r = f64x2.sub(f64x2.mul(xr, w3r), f64x2.mul(xi, w3i));
          const b3i = f64x2.add(f64x2.mul(xr, w3i), f64x2.mul(xi, w3r));
          const t0r = f64x2.add(b0r, b2r), t0i = f64x2.add(b0i, b2i);
          const t1r = f64x2.sub(b0r, b2r), t1i = f64x2.sub(b0i, b2i);
          const t2r = f64x2.add(b1r, b3r), t2i = f64x2.add(b1i, b3i);
          const t3r = f64x2.sub(b1r, b3r), t3i = f64x2.sub(b1i, b3i);
          v128.store(re + i0, f64x2.add(t0r, t2r));
          v128.store(im + i0, f64x2.add(t0i, t2i));
          v128.store(re + i1, f64x2.sub(t0r, t2r));
          v128.store(im + i1, f64x2.sub(t0i, t2i));
          v128.store(re + i2, f64x2.add(t1r, t3i));
          v128.store(im + i2, f64x2.sub(t1i, t3r));
          v128.store(re + i3, f64x2.sub(t1r, t3i));
          v128.store(im + i3, f64x2.add(t1i, t3r));
        }
      }
    }
    t += (<usize>L) * 48;
    L <<= 2;
  }
}

/** Bytes of scratch that the first stages of one chunk may use (both planes): well inside L1. */
const CHUNK_BYTES: usize = 16384;

/**
 * W independent length-n transforms at once, in place, input already in the permuted order of the
 * tables: the power-of-two part P of n by radix-4 decimation in time (one radix-2 stage first when
 * log2 P is odd), then the radix-3 stages, then the radix-5 ones. The radix-4 stages run chunk by
 * chunk while they can (a chunk of C points is itself a length-C transform of the same stage
 * pattern, so it stays in L1 through them), the rest over all n points.
 */
export function lanes(re: usize, im: usize, n: i32, W: i32, tw: usize): void {
  if (n < 2) return;
  const pb = (<usize>W) << 3;
  const total = (<usize>n) * pb;
  const P = n & -n;
  let t = tw;
  if (P > 1) {
    // the largest chunk of the same parity of log2 as P that fits
    let C = P;
    while (C > 4 && (<usize>C) * pb * 2 > CHUNK_BYTES) C >>= 2;
    const first = ctz(P) & 1 ? 2 : 4;
    const chunkBytes = (<usize>C) * pb;
    for (let o: usize = 0; o < total; o += chunkBytes) {
      firstStage(re + o, im + o, C, pb);
      radix4Stages(re + o, im + o, chunkBytes, C, pb, first, tw);
    }
    // twiddles of the stages done so far: 6·(first + 4·first + … ) f64 for stages below C
    let L = first;
    while (L < C) {
      t += (<usize>L) * 48;
      L <<= 2;
    }
    radix4Stages(re, im, total, P, pb, L, t);
    while (L < P) {
      t += (<usize>L) * 48;
      L <<= 2;
    }
  }
  let L = P;
  let q = n / P;
  while (q % 3 == 0) {
    radix3Stage(re, im, total, pb, L, t);
    t += (<usize>L) * 32;
    L *= 3;
    q /= 3;
  }
  while (q % 5 == 0) {
    radix5Stage(re, im, total, pb, L, t);
    t += (<usize>L) * 64;
    L *= 5;
    q /= 5;
  }
}

/** sin(π/3), cos(2π/5), cos(4π/5), sin(2π/5), sin(4π/5): the same values as fft-fast.ts computes. */
const S3: f64 = 0.8660254037844386;
const C51: f64 = 0.30901699437494745;
const C52: f64 = -0.8090169943749473;
const S51: f64 = 0.9510565162951535;
const S52: f64 = 0.5877852522924732;

/** (xr + i·xi)·(wr + i·wi), real part */
@inline
function mulRe(xr: v128, xi: v128, wr: v128, wi: v128): v128 {
  return f64x2.sub(f64x2.mul(xr, wr), f64x2.mul(xi, wi));
}

/** (xr + i·xi)·(wr + i·wi), imaginary part */
@inline
function mulIm(xr: v128, xi: v128, wr: v128, wi: v128): v128 {
  return f64x2.add(f64x2.mul(xr, wi), f64x2.mul(xi, wr));
}

/**
 * One radix-3 stage over `total` bytes: groups of three length-L transforms become one of length
 * 3L, y[k + qL] = Σ_m w^{mk} e^{-2πi mq/3} x_m[k], w = e^{-2πi/(3L)}; `t`: L records of (w^k, w^2k).
 */
function radix3Stage(re: usize, im: usize, total: usize, pb: usize, L: i32, t: usize): void {
  const q = (<usize>L) * pb;
  const s3 = f64x2.splat(S3), half = f64x2.splat(0.5);
  for (let base: usize = 0; base < total; base += q * 3) {
    let tk = t;
    const end = base + q;
    for (let p = base; p < end; p += pb) {
      const w1r = f64x2.splat(load<f64>(tk)), w1i = f64x2.splat(load<f64>(tk, 8));
      const w2r = f64x2.splat(load<f64>(tk, 16)), w2i = f64x2.splat(load<f64>(tk, 24));
      tk += 32;
      for (let v: usize = 0; v < pb; v += 16) {
        const i0 = p + v;
        const i1 = i0 + q;
        const i2 = i1 + q;
        const ar = v128.load(re + i0), ai = v128.load(im + i0);
        let xr = v128.load(re + i1), xi = v128.load(im + i1);
        const br = mulRe(xr, xi, w1r, w1i), bi = mulIm(xr, xi, w1r, w1i);
        xr = v128.load(re + i2);
        xi = v128.load(im + i2);
        const cr = mulRe(xr, xi, w2r, w2i), ci = mulIm(xr, xi, w2r, w2i);
        const sr = f64x2.add(br, cr), si = f64x2.add(bi, ci);
        const dr = f64x2.sub(br, cr), di = f64x2.sub(bi, ci);
        const mr = f64x2.sub(ar, f64x2.mul(half, sr)), mi = f64x2.sub(ai, f64x2.mul(half, si));
        const er = f64x2.mul(s3, dr), ei = f64x2.mul(s3, di);
        v128.store(re + i0, f64x2.add(ar, sr));
        v128.store(im + i0, f64x2.add(ai, si));
        v128.store(re + i1, f64x2.add(mr, ei));
        v128.store(im + i1, f64x2.sub(mi, er));
        v128.store(re + i2, f64x2.sub(mr, ei));
        v128.store(im + i2, f64x2.add(mi, er));
      }
    }
  }
}

/** One radix-5 stage, as radix3Stage with five length-L transforms; `t`: L records of (w^k … w^4k). */
function radix5Stage(re: usize, im: usize, total: usize, pb: usize, L: i32, t: usize): void {
  const q = (<usize>L) * pb;
  const c1 = f64x2.splat(C51), c2 = f64x2.splat(C52), s1 = f64x2.splat(S51), s2 = f64x2.splat(S52);
  for (let base: usize = 0; base < total; base += q * 5) {
    let tk = t;
    const end = base + q;
    for (let p = base; p < end; p += pb) {
      const w1r = f64x2.splat(load<f64>(tk)), w1i = f64x2.splat(load<f64>(tk, 8));
      const w2r = f64x2.splat(load<f64>(tk, 16)), w2i = f64x2.splat(load<f64>(tk, 24));
      const w3r = f64x2.splat(load<f64>(tk, 32)), w3i = f64x2.splat(load<f64>(tk, 40));
      const w4r = f64x2.splat(load<f64>(tk, 48)), w4i = f64x2.splat(load<f64>(tk, 56));
      tk += 64;
      for (let v: usize = 0; v < pb; v += 16) {
        const i0 = p + v;
        const i1 = i0 + q;
        const i2 = i1 + q;
        const i3 = i2 + q;
        const i4 = i3 + q;
        const ar = v128.load(re + i0), ai = v128.load(im + i0);
        let xr = v128.load(re + i1), xi = v128.load(im + i1);
        const b1r = mulRe(xr, xi, w1r, w1i), b1i = mulIm(xr, xi, w1r, w1i);
        xr = v128.load(re + i2);
        xi = v128.load(im + i2);
        const b2r = mulRe(xr, xi, w2r, w2i), b2i = mulIm(xr, xi, w2r, w2i);
        xr = v128.load(re + i3);
        xi = v128.load(im + i3);
        const b3r = mulRe(xr, xi, w3r, w3i), b3i = mulIm(xr, xi, w3r, w3i);
        xr = v128.load(re + i4);
        xi = v128.load(im + i4);
        const b4r = mulRe(xr, xi, w4r, w4i), b4i = mulIm(xr, xi, w4r, w4i);
        // sums and differences of the conjugate pairs (1, 4) and (2, 3)
        const s1r = f64x2.add(b1r, b4r), s1i = f64x2.add(b1i, b4i);
        const d1r = f64x2.sub(b1r, b4r), d1i = f64x2.sub(b1i, b4i);
        const s2r = f64x2.add(b2r, b3r), s2i = f64x2.add(b2i, b3i);
        const d2r = f64x2.sub(b2r, b3r), d2i = f64x2.sub(b2i, b3i);
        const a1r = f64x2.add(f64x2.add(ar, f64x2.mul(c1, s1r)), f64x2.mul(c2, s2r));
        const a1i = f64x2.add(f64x2.add(ai, f64x2.mul(c1, s1i)), f64x2.mul(c2, s2i));
        const a2r = f64x2.add(f64x2.add(ar, f64x2.mul(c2, s1r)), f64x2.mul(c1, s2r));
        const a2i = f64x2.add(f64x2.add(ai, f64x2.mul(c2, s1i)), f64x2.mul(c1, s2i));
        const u1r = f64x2.add(f64x2.mul(s1, d1r), f64x2.mul(s2, d2r));
        const u1i = f64x2.add(f64x2.mul(s1, d1i), f64x2.mul(s2, d2i));
        const u2r = f64x2.sub(f64x2.mul(s2, d1r), f64x2.mul(s1, d2r));
        const u2i = f64x2.sub(f64x2.mul(s2, d1i), f64x2.mul(s1, d2i));
        v128.store(re + i0, f64x2.add(f64x2.add(ar, s1r), s2r));
        v128.store(im + i0, f64x2.add(f64x2.add(ai, s1i), s2i));
        v128.store(re + i1, f64x2.add(a1r, u1i));
        v128.store(im + i1, f64x2.sub(a1i, u1r));
        v128.store(re + i4, f64x2.sub(a1r, u1i));
        v128.store(im + i4, f64x2.add(a1i, u1r));
        v128.store(re + i2, f64x2.add(a2r, u2i));
        v128.store(im + i2, f64x2.sub(a2i, u2r));
        v128.store(re + i3, f64x2.sub(a2r, u2i));
        v128.store(im + i3, f64x2.add(a2i, u2r));
      }
    }
  }
}

// ---- rows: R rows (R even) at a time, transposed into lanes -------------------------------------

/** Row index of lane b in group g, repeating the last row when ny is not a multiple of R. */
@inline
function rowOf(g: i32, b: i32, R: i32, ny: i32): usize {
  const r = g * R + b;
  return <usize>(r < ny ? r : ny - 1);
}

/**
 * Row transforms of an ny×nx array, interleaved layout (re, im, re, im, …) at `data`, in place.
 * `swap` exchanges the planes given to the kernel (the inverse); `scale` multiplies the result.
 */
export function rowsInterleaved(
  data: usize, nx: i32, ny: i32, stride: i32, R: i32, rev: usize, tw: usize,
  sre: usize, sim: usize, swap: i32, scale: f64,
): void {
  const rowBytes = <usize>stride;
  const rowLen = (<usize>nx) << 4;
  const pb = (<usize>R) << 3;
  const s = f64x2.splat(scale);
  const pow2 = nx > 1 && (nx & (nx - 1)) == 0;
  const halfBytes = (<usize>nx) << 3; // bytes of half a row
  for (let g = 0; g * R < ny; g++) {
    if (pow2) {
      // Bit reversal read in source order, two points at a time: for j < n/2, point j goes to
      // position k = rev(j) (even) and point j + n/2 to k + 1, so each row is read as two
      // sequential streams and the R lanes of positions k and k + 1 are written together. (Read
      // in destination order, successive points lie n/2, n/4, … apart and share a few cache sets.)
      for (let j: usize = 0; j < halfBytes; j += 16) {
        const d = (<usize>load<u32>(rev + (j >> 2))) * pb;
        for (let b = 0; b < R; b += 2) {
          const ra = data + rowOf(g, b, R, ny) * rowBytes + j;
          const rb = data + rowOf(g, b + 1, R, ny) * rowBytes + j;
          const e = d + ((<usize>b) << 3);
          let va = v128.load(ra), vb = v128.load(rb);
          v128.store(sre + e, v128.shuffle<f64>(va, vb, 0, 2));
          v128.store(sim + e, v128.shuffle<f64>(va, vb, 1, 3));
          va = v128.load(ra + halfBytes);
          vb = v128.load(rb + halfBytes);
          v128.store(sre + e + pb, v128.shuffle<f64>(va, vb, 0, 2));
          v128.store(sim + e + pb, v128.shuffle<f64>(va, vb, 1, 3));
        }
      }
    }
    for (let b = 0; b < R && !pow2; b += 2) {
      const ra = data + rowOf(g, b, R, ny) * rowBytes;
      const rb = data + rowOf(g, b + 1, R, ny) * rowBytes;
      let d = (<usize>b) << 3;
      for (let k = 0; k < nx; k++) {
        const j = (<usize>load<u32>(rev + ((<usize>k) << 2))) << 4;
        const va = v128.load(ra + j), vb = v128.load(rb + j);
        v128.store(sre + d, v128.shuffle<f64>(va, vb, 0, 2));
        v128.store(sim + d, v128.shuffle<f64>(va, vb, 1, 3));
        d += pb;
      }
    }
    if (swap) lanes(sim, sre, nx, R, tw);
    else lanes(sre, sim, nx, R, tw);
    for (let b = 0; b < R; b += 2) {
      const r0 = g * R + b;
      if (r0 >= ny) break;
      const ra = data + (<usize>r0) * rowBytes;
      const rb = ra + rowBytes;
      const two = r0 + 1 < ny;
      let d = (<usize>b) << 3;
      for (let k: usize = 0; k < rowLen; k += 16) {
        const xr = f64x2.mul(v128.load(sre + d), s), xi = f64x2.mul(v128.load(sim + d), s);
        v128.store(ra + k, v128.shuffle<f64>(xr, xi, 0, 2));
        if (two) v128.store(rb + k, v128.shuffle<f64>(xr, xi, 1, 3));
        d += pb;
      }
    }
  }
}

/** Row transforms of an ny×nx array held as two planes `re`, `im`, in place. */
export function rowsSplit(
  re: usize, im: usize, nx: i32, ny: i32, stride: i32, R: i32, rev: usize, tw: usize,
  sre: usize, sim: usize, swap: i32, scale: f64,
): void {
  const rowBytes = <usize>stride;
  const rowLen = (<usize>nx) << 3;
  const pb = (<usize>R) << 3;
  const s = f64x2.splat(scale);
  for (let g = 0; g * R < ny; g++) {
    for (let b = 0; b < R; b += 2) {
      const oa = rowOf(g, b, R, ny) * rowBytes;
      const ob = rowOf(g, b + 1, R, ny) * rowBytes;
      let d = (<usize>b) << 3;
      for (let k = 0; k < nx; k++) {
        const j = (<usize>load<u32>(rev + ((<usize>k) << 2))) << 3;
        v128.store(sre + d, f64x2.replace_lane(f64x2.splat(load<f64>(re + oa + j)), 1, load<f64>(re + ob + j)));
        v128.store(sim + d, f64x2.replace_lane(f64x2.splat(load<f64>(im + oa + j)), 1, load<f64>(im + ob + j)));
        d += pb;
      }
    }
    if (swap) lanes(sim, sre, nx, R, tw);
    else lanes(sre, sim, nx, R, tw);
    for (let b = 0; b < R; b += 2) {
      const r0 = g * R + b;
      if (r0 >= ny) break;
      const oa = (<usize>r0) * rowBytes;
      const ob = oa + rowBytes;
      const two = r0 + 1 < ny;
      let d = (<usize>b) << 3;
      for (let k: usize = 0; k < rowLen; k += 16) {
        // points k and k+1 of rows a and b
        const r0v = v128.load(sre + d), r1v = v128.load(sre + d + pb);
        const i0v = v128.load(sim + d), i1v = v128.load(sim + d + pb);
        v128.store(re + oa + k, f64x2.mul(v128.shuffle<f64>(r0v, r1v, 0, 2), s));
        v128.store(im + oa + k, f64x2.mul(v128.shuffle<f64>(i0v, i1v, 0, 2), s));
        if (two) {
          v128.store(re + ob + k, f64x2.mul(v128.shuffle<f64>(r0v, r1v, 1, 3), s));
          v128.store(im + ob + k, f64x2.mul(v128.shuffle<f64>(i0v, i1v, 1, 3), s));
        }
        d += pb << 1;
      }
    }
  }
}

// ---- columns: B adjacent columns (B even, B ≤ nx) at a time --------------------------------------
//
// Gathered in destination order: position k of the lanes takes row rev[k], so the scattered
// accesses are reads of whole blocks of a row (B columns, several cache lines) and the writes into
// the lanes run in order. (Taken in row order, each row's block was written to position inv[r]:
// scattered writes, each a miss that holds up the stores behind it; measured on blocks of 16
// columns with the rows in cache, the pass took 1.2× as long at 2048 and 4096 rows.)

/** Column transforms of an ny×nx interleaved array at `data`, in place. */
export function colsInterleaved(
  data: usize, nx: i32, ny: i32, stride: i32, B: i32, rev: usize, tw: usize,
  sre: usize, sim: usize, swap: i32, scale: f64,
): void {
  const rowBytes = <usize>stride;
  const pb = (<usize>B) << 3;
  const s = f64x2.splat(scale);
  for (let c0 = 0; c0 < nx; c0 += B) {
    const col = data + ((<usize>c0) << 4);
    let d: usize = 0;
    for (let k = 0; k < ny; k++) {
      const src = col + (<usize>load<u32>(rev + ((<usize>k) << 2))) * rowBytes;
      for (let v: usize = 0; v < pb; v += 16) {
        const a = v128.load(src + (v << 1)), b = v128.load(src + (v << 1) + 16);
        v128.store(sre + d + v, v128.shuffle<f64>(a, b, 0, 2));
        v128.store(sim + d + v, v128.shuffle<f64>(a, b, 1, 3));
      }
      d += pb;
    }
    if (swap) lanes(sim, sre, ny, B, tw);
    else lanes(sre, sim, ny, B, tw);
    let dst = col;
    let o: usize = 0;
    for (let r = 0; r < ny; r++) {
      for (let v: usize = 0; v < pb; v += 16) {
        const xr = f64x2.mul(v128.load(sre + o + v), s), xi = f64x2.mul(v128.load(sim + o + v), s);
        v128.store(dst + (v << 1), v128.shuffle<f64>(xr, xi, 0, 2));
        v128.store(dst + (v << 1) + 16, v128.shuffle<f64>(xr, xi, 1, 3));
      }
      o += pb;
      dst += rowBytes;
    }
  }
}

/** Column transforms of an ny×nx array held as two planes `re`, `im`, in place. */
export function colsSplit(
  re: usize, im: usize, nx: i32, ny: i32, stride: i32, B: i32, rev: usize, tw: usize,
  sre: usize, sim: usize, swap: i32, scale: f64,
): void {
  const rowBytes = <usize>stride;
  const pb = (<usize>B) << 3;
  const s = f64x2.splat(scale);
  for (let c0 = 0; c0 < nx; c0 += B) {
    let d: usize = 0;
    for (let k = 0; k < ny; k++) {
      const src = ((<usize>c0) << 3) + (<usize>load<u32>(rev + ((<usize>k) << 2))) * rowBytes;
      for (let v: usize = 0; v < pb; v += 16) {
        v128.store(sre + d + v, v128.load(re + src + v));
        v128.store(sim + d + v, v128.load(im + src + v));
      }
      d += pb;
    }
    if (swap) lanes(sim, sre, ny, B, tw);
    else lanes(sre, sim, ny, B, tw);
    let dst = (<usize>c0) << 3;
    let o: usize = 0;
    for (let r = 0; r < ny; r++) {
      for (let v: usize = 0; v < pb; v += 16) {
        v128.store(re + dst + v, f64x2.mul(v128.load(sre + o + v), s));
        v128.store(im + dst + v, f64x2.mul(v128.load(sim + o + v), s));
      }
      o += pb;
      dst += rowBytes;
    }
  }
}
