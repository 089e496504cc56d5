/*
 * The transform kernel, included twice by fft.c: once compiled for AVX2 + FMA (VL = 4 doubles per
 * vector) and once for any machine (VL = 2, the compiler's generic vectors). NAME(x) gives each copy
 * its own names; V is the vector type of the copy.
 *
 * Data in the scratch buffer: LANES independent transforms of length n side by side, "block-split":
 * point p of all lanes is 2·LANES doubles at p·2·LANES, the LANES real parts, then the LANES
 * imaginary parts. The butterflies are then plain vector arithmetic on whole vectors with broadcast
 * twiddles, no shuffles. The algorithm is that of src/optics/fft-fast.ts (decimation in time, input
 * permuted while gathering, radix-4 stages with one radix-2 stage first when log2 of the power of
 * two is odd, then radix-3, then radix-5 stages), on the same tables.
 */

typedef double NAME(vec) __attribute__((vector_size(VL * 8), aligned(VL * 8)));
typedef double NAME(uvec) __attribute__((vector_size(VL * 8), aligned(8)));
#define V NAME(vec)
#define VU NAME(uvec)
#define NV (LANES / VL)
#define PS (2 * LANES) /* doubles per point */

static inline V NAME(splat)(double x) {
  V v;
  for (int i = 0; i < VL; i++) v[i] = x;
  return v;
}

/* The first stage, no twiddles: radix 2 on pairs of points, or radix 4 on quadruples. */
static void NAME(first)(double *re, double *im, int n, int radix4) {
  if (!radix4) {
    for (int p = 0; p < n; p += 2) {
      for (int v = 0; v < NV; v++) {
        V *ar = (V *)(re + p * PS) + v, *ai = (V *)(im + p * PS) + v;
        V *br = (V *)(re + (p + 1) * PS) + v, *bi = (V *)(im + (p + 1) * PS) + v;
        V xr = *ar, xi = *ai, yr = *br, yi = *bi;
        *ar = xr + yr;
        *ai = xi + yi;
        *br = xr - yr;
        *bi = xi - yi;
      }
    }
    return;
  }
  for (int p = 0; p < n; p += 4) {
    for (int v = 0; v < NV; v++) {
      V *r0 = (V *)(re + p * PS) + v, *i0 = (V *)(im + p * PS) + v;
      V *r2 = (V *)(re + (p + 1) * PS) + v, *i2 = (V *)(im + (p + 1) * PS) + v;
      V *r1 = (V *)(re + (p + 2) * PS) + v, *i1 = (V *)(im + (p + 2) * PS) + v;
      V *r3 = (V *)(re + (p + 3) * PS) + v, *i3 = (V *)(im + (p + 3) * PS) + v;
      V b0r = *r0, b0i = *i0, b2r = *r2, b2i = *i2, b1r = *r1, b1i = *i1, b3r = *r3, b3i = *i3;
      V t0r = b0r + b2r, t0i = b0i + b2i, t1r = b0r - b2r, t1i = b0i - b2i;
      V t2r = b1r + b3r, t2i = b1i + b3i, t3r = b1r - b3r, t3i = b1i - b3i;
      *r0 = t0r + t2r;
      *i0 = t0i + t2i;
      *r1 = t0r - t2r;
      *i1 = t0i - t2i;
      *r2 = t1r + t3i;
      *i2 = t1i - t3r;
      *r3 = t1r - t3i;
      *i3 = t1i + t3r;
    }
  }
}

/* One radix-4 stage: groups of four length-L transforms become one of length 4L. */
static void NAME(radix4)(double *re, double *im, int n, int L, const double *tw) {
  const int q = L * PS;
  for (int base = 0; base < n; base += 4 * L) {
    const double *t = tw;
    for (int k = 0; k < L; k++, t += 6) {
      V w1r = NAME(splat)(t[0]), w1i = NAME(splat)(t[1]), w2r = NAME(splat)(t[2]);
      V w2i = NAME(splat)(t[3]), w3r = NAME(splat)(t[4]), w3i = NAME(splat)(t[5]);
      double *pr = re + (base + k) * PS, *pi = im + (base + k) * PS;
      for (int v = 0; v < NV; v++) {
        V *r0 = (V *)pr + v, *i0 = (V *)pi + v;
        V *r2 = (V *)(pr + q) + v, *i2 = (V *)(pi + q) + v;
        V *r1 = (V *)(pr + 2 * q) + v, *i1 = (V *)(pi + 2 * q) + v;
        V *r3 = (V *)(pr + 3 * q) + v, *i3 = (V *)(pi + 3 * q) + v;
        V b0r = *r0, b0i = *i0;
        V xr = *r1, xi = *i1;
        V b1r = xr * w1r - xi * w1i, b1i = xr * w1i + xi * w1r;
        xr = *r2;
        xi = *i2;
        V b2r = xr * w2r - xi * w2i, b2i = xr * w2i + xi * w2r;
        xr = *r3;
        xi = *i3;
        V b3r = xr * w3r - xi * w3i, b3i = xr * w3i + xi * w3r;
        V t0r = b0r + b2r, t0i = b0i + b2i, t1r = b0r - b2r, t1i = b0i - b2i;
        V t2r = b1r + b3r, t2i = b1i + b3i, t3r = b1r - b3r, t3i = b1i - b3i;
        *r0 = t0r + t2r;
        *i0 = t0i + t2i;
        *r1 = t0r - t2r;
        *i1 = t0i - t2i;
        *r2 = t1r + t3i;
        *i2 = t1i - t3r;
        *r3 = t1r - t3i;
        *i3 = t1i + t3r;
      }
    }
  }
}

/* One radix-3 stage: y_m[k + mL] = Σ_j w^{jk} e^{-2πi jm/3} x_j[k], w = e^{-2πi/3L}. */
static void NAME(radix3)(double *re, double *im, int n, int L, const double *tw) {
  const int q = L * PS;
  const V h = NAME(splat)(0.5), s3 = NAME(splat)(S3);
  for (int base = 0; base < n; base += 3 * L) {
    const double *t = tw;
    for (int k = 0; k < L; k++, t += 4) {
      V w1r = NAME(splat)(t[0]), w1i = NAME(splat)(t[1]), w2r = NAME(splat)(t[2]), w2i = NAME(splat)(t[3]);
      double *pr = re + (base + k) * PS, *pi = im + (base + k) * PS;
      for (int v = 0; v < NV; v++) {
        V *r0 = (V *)pr + v, *i0 = (V *)pi + v;
        V *r1 = (V *)(pr + q) + v, *i1 = (V *)(pi + q) + v;
        V *r2 = (V *)(pr + 2 * q) + v, *i2 = (V *)(pi + 2 * q) + v;
        V ar = *r0, ai = *i0;
        V xr = *r1, xi = *i1;
        V br = xr * w1r - xi * w1i, bi = xr * w1i + xi * w1r;
        xr = *r2;
        xi = *i2;
        V cr = xr * w2r - xi * w2i, ci = xr * w2i + xi * w2r;
        V sr = br + cr, si = bi + ci, dr = br - cr, di = bi - ci;
        V mr = ar - h * sr, mi = ai - h * si;
        *r0 = ar + sr;
        *i0 = ai + si;
        *r1 = mr + s3 * di;
        *i1 = mi - s3 * dr;
        *r2 = mr - s3 * di;
        *i2 = mi + s3 * dr;
      }
    }
  }
}

/* One radix-5 stage, as radix3 with five length-L transforms. */
static void NAME(radix5)(double *re, double *im, int n, int L, const double *tw) {
  const int q = L * PS;
  const V c51 = NAME(splat)(C51), c52 = NAME(splat)(C52), s51 = NAME(splat)(S51), s52 = NAME(splat)(S52);
  for (int base = 0; base < n; base += 5 * L) {
    const double *t = tw;
    for (int k = 0; k < L; k++, t += 8) {
      V w1r = NAME(splat)(t[0]), w1i = NAME(splat)(t[1]), w2r = NAME(splat)(t[2]), w2i = NAME(splat)(t[3]);
      V w3r = NAME(splat)(t[4]), w3i = NAME(splat)(t[5]), w4r = NAME(splat)(t[6]), w4i = NAME(splat)(t[7]);
      double *pr = re + (base + k) * PS, *pi = im + (base + k) * PS;
      for (int v = 0; v < NV; v++) {
        V *r0 = (V *)pr + v, *i0 = (V *)pi + v;
        V *r1 = (V *)(pr + q) + v, *i1 = (V *)(pi + q) + v;
        V *r2 = (V *)(pr + 2 * q) + v, *i2 = (V *)(pi + 2 * q) + v;
        V *r3 = (V *)(pr + 3 * q) + v, *i3 = (V *)(pi + 3 * q) + v;
        V *r4 = (V *)(pr + 4 * q) + v, *i4 = (V *)(pi + 4 * q) + v;
        V ar = *r0, ai = *i0;
        V xr = *r1, xi = *i1;
        V b1r = xr * w1r - xi * w1i, b1i = xr * w1i + xi * w1r;
        xr = *r2;
        xi = *i2;
        V b2r = xr * w2r - xi * w2i, b2i = xr * w2i + xi * w2r;
        xr = *r3;
        xi = *i3;
        V b3r = xr * w3r - xi * w3i, b3i = xr * w3i + xi * w3r;
        xr = *r4;
        xi = *i4;
        V b4r = xr * w4r - xi * w4i, b4i = xr * w4i + xi * w4r;
        V s1r = b1r + b4r, s1i = b1i + b4i, d1r = b1r - b4r, d1i = b1i - b4i;
        V s2r = b2r + b3r, s2i = b2i + b3i, d2r = b2r - b3r, d2i = b2i - b3i;
        V a1r = ar + c51 * s1r + c52 * s2r, a1i = ai + c51 * s1i + c52 * s2i;
        V a2r = ar + c52 * s1r + c51 * s2r, a2i = ai + c52 * s1i + c51 * s2i;
        V u1r = s51 * d1r + s52 * d2r, u1i = s51 * d1i + s52 * d2i;
        V u2r = s52 * d1r - s51 * d2r, u2i = s52 * d1i - s51 * d2i;
        *r0 = ar + s1r + s2r;
        *i0 = ai + s1i + s2i;
        *r1 = a1r + u1i;
        *i1 = a1i - u1r;
        *r4 = a1r - u1i;
        *i4 = a1i + u1r;
        *r2 = a2r + u2i;
        *i2 = a2i - u2r;
        *r3 = a2r - u2i;
        *i3 = a2i + u2r;
      }
    }
  }
}

/* LANES transforms of length n in the scratch (re, im: the planes, exchanged for the inverse). */
static void NAME(lanes)(double *re, double *im, const Plan *pl) {
  const int n = pl->n, P = pl->P;
  const double *tw = pl->tw;
  if (P > 1) {
    int l2 = 0;
    while ((1 << l2) < P) l2++;
    /* The stages that combine at most CHUNK points run chunk by chunk, each chunk staying in the
       first-level cache through them; the later stages then go over the whole scratch. */
    int C = P < CHUNK ? P : CHUNK;
    int Lend = (l2 & 1) ? 2 : 4;
    while (4 * Lend <= C) Lend *= 4;
    for (int o = 0; o < n; o += C) {
      const double *t = tw;
      NAME(first)(re + o * PS, im + o * PS, C, !(l2 & 1));
      for (int L = (l2 & 1) ? 2 : 4; L < Lend; L *= 4) {
        NAME(radix4)(re + o * PS, im + o * PS, C, L, t);
        t += 6 * L;
      }
    }
    for (int L = (l2 & 1) ? 2 : 4; L < P; L *= 4) {
      if (L >= Lend) NAME(radix4)(re, im, n, L, tw);
      tw += 6 * L;
    }
  }
  int L = P;
  for (int s = 0; s < pl->nodd; s++) {
    if (pl->odd[s] == 3) {
      NAME(radix3)(re, im, n, L, tw);
      tw += 4 * L;
      L *= 3;
    } else {
      NAME(radix5)(re, im, n, L, tw);
      tw += 8 * L;
      L *= 5;
    }
  }
}

/*
 * Gathers `count` ≤ LANES rows of interleaved data (row j at src + j·rowStride doubles) into the
 * scratch in the permuted order, transforms them and scatters them back scaled by `scale`.
 * Lanes past `count` are zero and not written back.
 */
static void NAME(rowBlock)(double *src, long rowStride, int count, const Plan *pl, double *s, int inverse, double scale, int ahead) {
  const int n = pl->n;
  const uint32_t *rev = pl->rev;
  double *re = s, *im = s + LANES;
  if (count == LANES) {
#if VL == 4 && LANES == 8
    /* Two rows' points into one vector, then re and im apart: lanes land in the order 0 2 1 3
       (and 4 6 5 7), which the scatter below undoes. */
    /* The rows are read in order (streams the hardware prefetches), the points written to their
       permuted places in the scratch (which is in cache). */
    const uint32_t *inv = pl->inv;
    for (int j = 0; j < n; j++) {
      const double *f = src + 2 * (long)j;
      double *to = s + inv[j] * PS;
      __m256d a = _mm256_loadu2_m128d(f + rowStride, f), b = _mm256_loadu2_m128d(f + 3 * rowStride, f + 2 * rowStride);
      __m256d c = _mm256_loadu2_m128d(f + 5 * rowStride, f + 4 * rowStride), d = _mm256_loadu2_m128d(f + 7 * rowStride, f + 6 * rowStride);
      _mm256_store_pd(to, _mm256_unpacklo_pd(a, b));
      _mm256_store_pd(to + 4, _mm256_unpacklo_pd(c, d));
      _mm256_store_pd(to + 8, _mm256_unpackhi_pd(a, b));
      _mm256_store_pd(to + 12, _mm256_unpackhi_pd(c, d));
    }
#else
    for (int i = 0; i < n; i++) {
      const double *from = src + 2 * (long)rev[i];
      double *to = s + i * PS;
      for (int l = 0; l < LANES; l++) {
        to[l] = from[l * rowStride];
        to[LANES + l] = from[l * rowStride + 1];
      }
    }
#endif
  } else {
    for (int i = 0; i < n; i++) {
      const double *from = src + 2 * (long)rev[i];
      double *to = s + i * PS;
      for (int l = 0; l < LANES; l++) {
        to[l] = l < count ? from[l * rowStride] : 0;
        to[LANES + l] = l < count ? from[l * rowStride + 1] : 0;
      }
    }
  }
  if (inverse) NAME(lanes)(im, re, pl);
  else NAME(lanes)(re, im, pl);
#if VL == 4 && LANES == 8
  if (count == LANES) {
    const __m256d k = _mm256_set1_pd(scale);
    for (int i = 0; i < n; i++) {
      const double *from = s + i * PS;
      double *t = src + 2 * (long)i;
      if (ahead && (i & 3) == 0)
        for (int l = 0; l < ahead; l++) __builtin_prefetch(t + (LANES + l) * rowStride, 0, 3);
      __m256d r0 = _mm256_load_pd(from), r1 = _mm256_load_pd(from + 4), i0 = _mm256_load_pd(from + 8), i1 = _mm256_load_pd(from + 12);
      if (scale != 1) r0 *= k, r1 *= k, i0 *= k, i1 *= k;
      __m256d a = _mm256_unpacklo_pd(r0, i0), b = _mm256_unpackhi_pd(r0, i0);
      __m256d c = _mm256_unpacklo_pd(r1, i1), d = _mm256_unpackhi_pd(r1, i1);
      _mm256_storeu2_m128d(t + rowStride, t, a);
      _mm256_storeu2_m128d(t + 3 * rowStride, t + 2 * rowStride, b);
      _mm256_storeu2_m128d(t + 5 * rowStride, t + 4 * rowStride, c);
      _mm256_storeu2_m128d(t + 7 * rowStride, t + 6 * rowStride, d);
    }
    return;
  }
#endif
  for (int i = 0; i < n; i++) {
    const double *from = s + i * PS;
    double *to = src + 2 * (long)i;
    if (ahead && (i & 3) == 0)
      for (int l = 0; l < ahead; l++) __builtin_prefetch(to + (LANES + l) * rowStride, 0, 3);
    for (int l = 0; l < count; l++) {
      to[l * rowStride] = from[l] * scale;
      to[l * rowStride + 1] = from[LANES + l] * scale;
    }
  }
}

/*
 * Columns [c, c + count) (count ≤ LANES) of an ny×nx interleaved array: gathered (rows in the
 * permuted order), transformed, scattered back scaled.
 */
static void NAME(colBlock)(double *data, long nx, int c, int count, const Plan *pl, double *s, int inverse, double scale, int ahead) {
  const int n = pl->n;
  const uint32_t *rev = pl->rev;
  double *re = s, *im = s + LANES;
  if (count == LANES) {
#if VL == 4 && LANES == 8
    for (int i = 0; i < n; i++) {
      const double *f = data + 2 * ((long)rev[i] * nx + c);
      double *to = s + i * PS;
      if (i + COL_AHEAD < n) {
        /* rows come in the permuted order, which no hardware prefetcher follows */
        const double *g = data + 2 * ((long)rev[i + COL_AHEAD] * nx + c);
        __builtin_prefetch(g, 0, 3);
        __builtin_prefetch(g + 8, 0, 3);
        __builtin_prefetch(g + 15, 0, 3);
      }
      __m256d a = _mm256_loadu_pd(f), b = _mm256_loadu_pd(f + 4), cc = _mm256_loadu_pd(f + 8), d = _mm256_loadu_pd(f + 12);
      _mm256_store_pd(to, _mm256_unpacklo_pd(a, b));
      _mm256_store_pd(to + 4, _mm256_unpacklo_pd(cc, d));
      _mm256_store_pd(to + 8, _mm256_unpackhi_pd(a, b));
      _mm256_store_pd(to + 12, _mm256_unpackhi_pd(cc, d));
    }
#else
    for (int i = 0; i < n; i++) {
      const double *from = data + 2 * ((long)rev[i] * nx + c);
      double *to = s + i * PS;
      for (int l = 0; l < LANES; l++) {
        to[l] = from[2 * l];
        to[LANES + l] = from[2 * l + 1];
      }
    }
#endif
  } else {
    for (int i = 0; i < n; i++) {
      const double *from = data + 2 * ((long)rev[i] * nx + c);
      double *to = s + i * PS;
      for (int l = 0; l < LANES; l++) {
        to[l] = l < count ? from[2 * l] : 0;
        to[LANES + l] = l < count ? from[2 * l + 1] : 0;
      }
    }
  }
  if (inverse) NAME(lanes)(im, re, pl);
  else NAME(lanes)(re, im, pl);
#if VL == 4 && LANES == 8
  if (count == LANES) {
    const __m256d k = _mm256_set1_pd(scale);
    /* Whole cache lines in every row: written around the caches. The column's lines share a few
       cache sets (a power-of-two row length), so they would be evicted before the next block anyway. */
    const int stream = ((uintptr_t)(data + 2 * c) & 63) == 0 && (nx & 3) == 0;
    for (int i = 0; i < n; i++) {
      const double *from = s + i * PS;
      double *t = data + 2 * ((long)i * nx + c);
      __m256d r0 = _mm256_load_pd(from), r1 = _mm256_load_pd(from + 4), i0 = _mm256_load_pd(from + 8), i1 = _mm256_load_pd(from + 12);
      if (scale != 1) r0 *= k, r1 *= k, i0 *= k, i1 *= k;
      if (stream) {
        _mm256_stream_pd(t, _mm256_unpacklo_pd(r0, i0));
        _mm256_stream_pd(t + 4, _mm256_unpackhi_pd(r0, i0));
        _mm256_stream_pd(t + 8, _mm256_unpacklo_pd(r1, i1));
        _mm256_stream_pd(t + 12, _mm256_unpackhi_pd(r1, i1));
      } else {
        _mm256_storeu_pd(t, _mm256_unpacklo_pd(r0, i0));
        _mm256_storeu_pd(t + 4, _mm256_unpackhi_pd(r0, i0));
        _mm256_storeu_pd(t + 8, _mm256_unpacklo_pd(r1, i1));
        _mm256_storeu_pd(t + 12, _mm256_unpackhi_pd(r1, i1));
      }
    }
    if (stream) _mm_sfence();
    (void)ahead;
    return;
  }
#endif
  for (int i = 0; i < n; i++) {
    const double *from = s + i * PS;
    double *to = data + 2 * ((long)i * nx + c);
    for (int l = 0; l < count; l++) {
      to[2 * l] = from[l] * scale;
      to[2 * l + 1] = from[LANES + l] * scale;
    }
  }
}

#if VL == 4 && LANES == 8
/*
 * COL_GROUP blocks of LANES adjacent columns from c (whole blocks), gathered in one visit of each
 * row: every row is a page or more away from the next when rows are long, so each visit costs an
 * address translation, shared here by the group. Block g lives at s + g·n·PS; each is then
 * transformed and scattered as colBlock does.
 */
static void NAME(colGroup)(double *data, long nx, int c, const Plan *pl, double *s, int inverse, double scale) {
  const int n = pl->n;
  const uint32_t *rev = pl->rev;
  const long area = (long)n * PS;
  for (int i = 0; i < n; i++) {
    const double *f = data + 2 * ((long)rev[i] * nx + c);
    if (i + COL_AHEAD < n) {
      const double *g = data + 2 * ((long)rev[i + COL_AHEAD] * nx + c);
      for (int k = 0; k <= 2 * LANES * COL_GROUP; k += 8) __builtin_prefetch(g + k, 0, 3);
    }
    for (int g = 0; g < COL_GROUP; g++, f += 2 * LANES) {
      double *to = s + g * area + i * PS;
      __m256d a = _mm256_loadu_pd(f), b = _mm256_loadu_pd(f + 4), cc = _mm256_loadu_pd(f + 8), d = _mm256_loadu_pd(f + 12);
      _mm256_store_pd(to, _mm256_unpacklo_pd(a, b));
      _mm256_store_pd(to + 4, _mm256_unpacklo_pd(cc, d));
      _mm256_store_pd(to + 8, _mm256_unpackhi_pd(a, b));
      _mm256_store_pd(to + 12, _mm256_unpackhi_pd(cc, d));
    }
  }
  for (int g = 0; g < COL_GROUP; g++) {
    double *re = s + g * area, *im = re + LANES;
    if (inverse) NAME(lanes)(im, re, pl);
    else NAME(lanes)(re, im, pl);
  }
  const __m256d k = _mm256_set1_pd(scale);
  const int stream = ((uintptr_t)(data + 2 * c) & 63) == 0 && (nx & 3) == 0;
  for (int i = 0; i < n; i++) {
    double *t = data + 2 * ((long)i * nx + c);
    for (int g = 0; g < COL_GROUP; g++, t += 2 * LANES) {
      const double *from = s + g * area + i * PS;
      __m256d r0 = _mm256_load_pd(from), r1 = _mm256_load_pd(from + 4), i0 = _mm256_load_pd(from + 8), i1 = _mm256_load_pd(from + 12);
      if (scale != 1) r0 *= k, r1 *= k, i0 *= k, i1 *= k;
      if (stream) {
        _mm256_stream_pd(t, _mm256_unpacklo_pd(r0, i0));
        _mm256_stream_pd(t + 4, _mm256_unpackhi_pd(r0, i0));
        _mm256_stream_pd(t + 8, _mm256_unpacklo_pd(r1, i1));
        _mm256_stream_pd(t + 12, _mm256_unpackhi_pd(r1, i1));
      } else {
        _mm256_storeu_pd(t, _mm256_unpacklo_pd(r0, i0));
        _mm256_storeu_pd(t + 4, _mm256_unpackhi_pd(r0, i0));
        _mm256_storeu_pd(t + 8, _mm256_unpacklo_pd(r1, i1));
        _mm256_storeu_pd(t + 12, _mm256_unpackhi_pd(r1, i1));
      }
    }
  }
  if (stream) _mm_sfence();
}
#endif

#undef V
#undef VU
#undef NV
#undef PS
