/*
 * spotcast's native FFT kernel: the 2-D complex FFT of src/optics/fft-fast.ts (same sign, inverse
 * scaled by 1/n per axis, sizes 2^a·3^b·5^c, ny = 1 for a 1-D transform) in C, with 256-bit
 * vectors where the processor has AVX2 and FMA (chosen at run time), for Node through Node-API.
 * Built by native/build.mjs from `npm run build` when a C compiler and Node's headers are there;
 * optional: without it the program uses the WebAssembly kernel.
 *
 * Both passes work on blocks of LANES rows or LANES adjacent columns: a block is gathered from the
 * caller's interleaved array into a small scratch buffer (in the permuted input order), LANES
 * transforms run there side by side as plain vector arithmetic, and the result is written back
 * in place, scaled. A team of threads (pthreads, inside one call) shares each pass by blocks.
 */
#include <node_api.h>
#if defined(__x86_64__) || defined(__i386__)
#include <immintrin.h>
#endif
#include <math.h>
#include <pthread.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include <sys/mman.h>
#include <unistd.h>

/* Transforms side by side in the scratch: 8 doubles = two 256-bit vectors per plane and point. */
#define LANES 8
/* Points per chunk of the early stages (a power of two; 8 lanes: 128 bytes per point, 32 KB). */
#ifndef CHUNK
#define CHUNK 256
#endif
#if CHUNK < 4 || (CHUNK & (CHUNK - 1))
#error "CHUNK must be a power of two of at least 4 (the first stage takes 4 points)"
#endif
/* Rows ahead that the column gather prefetches. */
#define COL_AHEAD 8
/* Column blocks gathered together in one visit of each row (AVX2 path). */
#ifndef COL_GROUP
#define COL_GROUP 2
#endif

typedef struct Plan {
  int n;
  int P; /* the power of two in n */
  int nodd;
  int odd[64]; /* the odd radices in the order they run: the 3s, then the 5s */
  uint32_t *rev;
  uint32_t *inv; /* its inverse (rev itself for a power of two) */
  double *tw;
} Plan;

/* sin(π/3), cos(2π/5), cos(4π/5), sin(2π/5), sin(4π/5) */
#define S3 0.86602540378443864676
#define C51 0.30901699437494742410
#define C52 (-0.80901699437494742410)
#define S51 0.95105651629515357212
#define S52 0.58778525229247312917

#if defined(__x86_64__) || defined(__i386__)
#pragma GCC push_options
#pragma GCC target("avx2,fma")
#define VL 4
#define NAME(x) x##_avx2
#include "lanes.h"
#undef VL
#undef NAME
#pragma GCC pop_options
#define HAVE_AVX2_PATH 1
#endif

#define VL 2
#define NAME(x) x##_plain
#include "lanes.h"
#undef VL
#undef NAME

static int use_avx2(void) {
#ifdef HAVE_AVX2_PATH
  static int known = -1;
  if (known < 0) {
    /* SPOTCAST_NATIVE_GENERIC=1 runs the generic path here too (for its tests) */
    const char *force = getenv("SPOTCAST_NATIVE_GENERIC");
    __builtin_cpu_init();
    known = !(force && strcmp(force, "1") == 0) && __builtin_cpu_supports("avx2") && __builtin_cpu_supports("fma");
  }
  return known;
#else
  return 0;
#endif
}

/* ---- plans: the permutation and twiddles of size n, built once and kept ------------------------ */

static int is_fast_size(int n) {
  if (n < 2) return 0;
  while (n % 2 == 0) n /= 2;
  while (n % 3 == 0) n /= 3;
  while (n % 5 == 0) n /= 5;
  return n == 1;
}

/* e^{-2πi j/m} with j reduced mod m first */
static void unit_root(long j, long m, double *c, double *s) {
  double a = (-2 * M_PI * (double)(j % m)) / (double)m;
  *c = cos(a);
  *s = sin(a);
}

static Plan *build_plan(int n) {
  Plan *pl = calloc(1, sizeof *pl);
  if (!pl) return NULL;
  pl->n = n;
  int P = n & -n, bits = 0;
  while ((1 << bits) < P) bits++;
  pl->P = P;
  int q = n / P;
  while (q % 3 == 0) pl->odd[pl->nodd++] = 3, q /= 3;
  while (q % 5 == 0) pl->odd[pl->nodd++] = 5, q /= 5;
  uint32_t *rev = malloc(sizeof(uint32_t) * n), *next = malloc(sizeof(uint32_t) * n);
  if (!rev || !next) goto fail;
  for (int i = 0; i < P; i++) {
    uint32_t r = 0;
    for (int b = 0, x = i; b < bits; b++, x >>= 1) r = (r << 1) | (x & 1);
    rev[i] = r;
  }
  /* each odd stage of radix p: position m·L + i holds point m + p·(the length-L transform's point at i) */
  int L = P;
  for (int s = 0; s < pl->nodd; s++) {
    int p = pl->odd[s];
    for (int m = 0; m < p; m++)
      for (int i = 0; i < L; i++) next[m * L + i] = m + p * rev[i];
    memcpy(rev, next, sizeof(uint32_t) * p * L);
    L *= p;
  }
  free(next);
  next = NULL;
  pl->rev = rev;
  if (pl->nodd == 0) pl->inv = rev;
  else {
    pl->inv = malloc(sizeof(uint32_t) * n);
    if (!pl->inv) goto fail;
    for (int i = 0; i < n; i++) pl->inv[rev[i]] = i;
  }
  long len = 0;
  if (P > 1)
    for (int L4 = (bits & 1) ? 2 : 4; L4 < P; L4 *= 4) len += 6 * L4;
  L = P;
  for (int s = 0; s < pl->nodd; s++) len += 2 * (pl->odd[s] - 1) * L, L *= pl->odd[s];
  pl->tw = malloc(sizeof(double) * (len ? len : 1));
  if (!pl->tw) goto fail;
  long o = 0;
  if (P > 1) {
    for (int L4 = (bits & 1) ? 2 : 4; L4 < P; L4 *= 4) {
      for (int k = 0; k < L4; k++) {
        for (int m = 1; m <= 3; m++) unit_root((long)m * k, 4L * L4, &pl->tw[o], &pl->tw[o + 1]), o += 2;
      }
    }
  }
  L = P;
  for (int s = 0; s < pl->nodd; s++) {
    int p = pl->odd[s];
    for (int k = 0; k < L; k++)
      for (int m = 1; m < p; m++) unit_root((long)m * k, (long)p * L, &pl->tw[o], &pl->tw[o + 1]), o += 2;
    L *= p;
  }
  return pl;
fail:
  if (pl->inv != rev) free(pl->inv);
  free(pl->tw);
  free(rev);
  free(next);
  free(pl);
  return NULL;
}

#define MAX_PLANS 256
static Plan *plans[MAX_PLANS];
static int nplans;
static pthread_mutex_t plan_lock = PTHREAD_MUTEX_INITIALIZER;

/* The plan of size n, shared by all threads of the process (a memo of a pure function). */
static const Plan *plan_for(int n) {
  pthread_mutex_lock(&plan_lock);
  Plan *found = NULL;
  for (int i = 0; i < nplans; i++)
    if (plans[i]->n == n) found = plans[i];
  if (!found) {
    found = build_plan(n);
    if (found && nplans < MAX_PLANS) plans[nplans++] = found;
    /* past MAX_PLANS sizes a plan is not kept: it leaks, which only a pathological caller sees */
  }
  pthread_mutex_unlock(&plan_lock);
  return found;
}

/* ---- the passes, shared by a team of threads ----------------------------------------------------- */

typedef struct Job {
  double *data;
  long nx, ny;
  int inverse;
  const Plan *px, *py;
  /* rows [r0, r1) of the row pass, columns [c0, c1) of the column pass, per thread */
  int what; /* 0: rows, 1: columns */
  long a, b;
  long c0; /* the column pass covers columns c0 + [a, b) */
  long first; /* the first block's size (the others: LANES), so that the others start on a cache line */
  int failed;
} Job;

static void *run_job(void *arg) {
  Job *j = arg;
  const Plan *pl = j->what == 0 ? j->px : j->py;
  double *s = aligned_alloc(64, sizeof(double) * 2 * LANES * (size_t)pl->n * (j->what == 1 ? COL_GROUP : 1));
  if (!s) {
    j->failed = 1;
    return NULL;
  }
  const int avx = use_avx2();
  if (j->what == 0) {
    const double scale = j->inverse ? 1.0 / j->nx : 1.0;
    for (long r = j->a; r < j->b; r += LANES) {
      int count = j->b - r < LANES ? (int)(j->b - r) : LANES;
      double *row = j->data + 2 * r * j->nx;
      long left = j->b - r - LANES;
      int ahead = left <= 0 ? 0 : left < LANES ? (int)left : LANES;
#ifdef HAVE_AVX2_PATH
      if (avx) rowBlock_avx2(row, 2 * j->nx, count, pl, s, j->inverse, scale, ahead);
      else
#endif
        rowBlock_plain(row, 2 * j->nx, count, pl, s, j->inverse, scale, ahead);
    }
  } else {
    const double scale = j->inverse ? 1.0 / j->ny : 1.0;
    for (long c = j->a, count; c < j->b; c += count) {
      count = c < j->first ? j->first - c : LANES;
      if (count > j->b - c) count = j->b - c;
      int ahead = j->b - c >= 2 * LANES;
#ifdef HAVE_AVX2_PATH
      if (avx && COL_GROUP > 1 && c >= j->first && j->b - c >= COL_GROUP * LANES) {
        colGroup_avx2(j->data, j->nx, (int)(j->c0 + c), pl, s, j->inverse, scale);
        count = COL_GROUP * LANES;
        continue;
      }
      if (avx) colBlock_avx2(j->data, j->nx, (int)(j->c0 + c), count, pl, s, j->inverse, scale, ahead);
      else
#endif
        colBlock_plain(j->data, j->nx, (int)(j->c0 + c), count, pl, s, j->inverse, scale, ahead);
    }
  }
  (void)avx;
  free(s);
  return NULL;
}

#define MAX_THREADS 64

/*
 * One pass over [0, total) (rows or columns) by `threads` threads: contiguous shares of whole
 * blocks, this thread taking the first. A thread that cannot be started has its share done here.
 */
static int run_pass(Job proto, long total, int threads) {
  const long first = proto.first > 0 && proto.first < total ? proto.first : LANES;
  proto.first = first;
  long blocks = 1 + (total - first + LANES - 1) / LANES;
  if (threads > blocks) threads = (int)blocks;
  if (threads < 1) threads = 1;
  if (threads > MAX_THREADS) threads = MAX_THREADS;
  Job jobs[MAX_THREADS];
  pthread_t ids[MAX_THREADS];
  int started[MAX_THREADS];
  for (int t = 0; t < threads; t++) {
    jobs[t] = proto;
    long b0 = blocks * t / threads, b1 = blocks * (t + 1) / threads;
    jobs[t].a = b0 == 0 ? 0 : first + (b0 - 1) * LANES;
    jobs[t].b = b1 == 0 ? 0 : first + (b1 - 1) * LANES;
    if (jobs[t].a > total) jobs[t].a = total;
    if (jobs[t].b > total) jobs[t].b = total;
    jobs[t].failed = 0;
    started[t] = 0;
  }
  for (int t = 1; t < threads; t++) started[t] = pthread_create(&ids[t], NULL, run_job, &jobs[t]) == 0;
  run_job(&jobs[0]);
  int failed = jobs[0].failed;
  for (int t = 1; t < threads; t++) {
    if (started[t]) pthread_join(ids[t], NULL);
    else run_job(&jobs[t]);
    failed |= jobs[t].failed;
  }
  return failed ? -1 : 0;
}

/*
 * The pages of an array that are not in memory yet (a large array fresh from the allocator, which
 * the system maps on first touch) are touched here, by this thread, before a pass shares the array
 * between threads. Measured on the 2-core machines this was written on, first-touch page faults
 * taken by two threads at once cost about five times the same faults taken by one: the row pass
 * of a fresh 4096² array took 1.3-1.5 s on two threads against 0.3 s on one. mincore() says which
 * pages are in memory (about a millisecond for 256 MB), so arrays already in use cost nothing more.
 * Each touched value is read and written back unchanged before any other thread starts.
 */
static void touch_fresh_pages(double *data, size_t values) {
  const long ps = sysconf(_SC_PAGESIZE);
  if (ps <= 0 || values == 0) return;
  const uintptr_t lo = (uintptr_t)data, hi = lo + values * sizeof(double);
  const uintptr_t start = lo & ~(uintptr_t)(ps - 1);
  const size_t pages = (hi - start + (uintptr_t)ps - 1) / (uintptr_t)ps;
  unsigned char *in = malloc(pages);
  if (!in) return;
  if (mincore((void *)start, hi - start, in) == 0) {
    for (size_t k = 0; k < pages; k++) {
      if (in[k] & 1) continue;
      uintptr_t at = start + k * (uintptr_t)ps;
      if (at < lo) at = lo; /* the first page may begin before the array */
      volatile double *v = (volatile double *)at;
      *v = *v;
    }
  }
  free(in);
}

/* Row pass over `rows` rows of nx points (in place), then, when cols, the column pass over [c0, c1). */
static int transform(double *data, long nx, long ny, int inverse, int threads, int rows, long c0, long c1) {
  Job j = {0};
  j.data = data;
  j.nx = nx;
  j.ny = ny;
  j.inverse = inverse;
  if (threads > 1) touch_fresh_pages(data, (size_t)(2 * nx * ny));
  if (rows) {
    j.px = plan_for((int)nx);
    if (!j.px) return -1;
    j.what = 0;
    if (run_pass(j, ny, threads)) return -1;
  }
  if (c1 > c0 && ny > 1) {
    j.py = plan_for((int)ny);
    if (!j.py) return -1;
    j.what = 1;
    j.c0 = c0;
    /* columns before the first that starts a cache line (when the data is 16-byte aligned) */
    uintptr_t at = (uintptr_t)(data + 2 * c0);
    j.first = (at & 15) == 0 && (at & 63) != 0 ? (long)((64 - (at & 63)) / 16) : LANES;
    if (run_pass(j, c1 - c0, threads)) return -1;
  }
  return 0;
}

/* ---- Node-API ----------------------------------------------------------------------------------- */

static napi_value fail(napi_env env, const char *msg) {
  napi_throw_error(env, NULL, msg);
  return NULL;
}

static int get_int(napi_env env, napi_value v, long *out) {
  double d;
  if (napi_get_value_double(env, v, &d) != napi_ok || d != floor(d) || d < 0 || d > 2147483647.0) return 0;
  *out = (long)d;
  return 1;
}

static int get_f64(napi_env env, napi_value v, double **data, size_t *length) {
  bool is;
  if (napi_is_typedarray(env, v, &is) != napi_ok || !is) return 0;
  napi_typedarray_type type;
  void *p;
  if (napi_get_typedarray_info(env, v, &type, length, &p, NULL, NULL) != napi_ok || type != napi_float64_array) return 0;
  *data = p;
  return 1;
}

/* fft2(data: Float64Array, nx, ny, inverse: boolean, threads): in place, ny×nx interleaved complex */
static napi_value js_fft2(napi_env env, napi_callback_info info) {
  size_t argc = 5;
  napi_value argv[5];
  napi_get_cb_info(env, info, &argc, argv, NULL, NULL);
  if (argc < 5) return fail(env, "fft2(data, nx, ny, inverse, threads): 5 arguments");
  double *data;
  size_t length;
  long nx, ny, threads;
  bool inverse;
  if (!get_f64(env, argv[0], &data, &length)) return fail(env, "fft2: data must be a Float64Array");
  if (!get_int(env, argv[1], &nx) || !get_int(env, argv[2], &ny) || !get_int(env, argv[4], &threads))
    return fail(env, "fft2: nx, ny and threads must be whole numbers");
  if (napi_get_value_bool(env, argv[3], &inverse) != napi_ok) return fail(env, "fft2: inverse must be a boolean");
  if (!is_fast_size((int)nx) || (ny != 1 && !is_fast_size((int)ny))) return fail(env, "fft2: sizes must be 2^a·3^b·5^c ≥ 2 (ny may be 1)");
  if ((long)length != 2 * nx * ny) return fail(env, "fft2: data must hold 2·nx·ny values");
  if (transform(data, nx, ny, inverse, (int)(threads < 1 ? 1 : threads), 1, 0, nx)) return fail(env, "fft2: out of memory");
  return NULL;
}

/* rows(data, nx, ny, inverse, threads): the row pass alone over all ny rows, in place */
static napi_value js_rows(napi_env env, napi_callback_info info) {
  size_t argc = 5;
  napi_value argv[5];
  napi_get_cb_info(env, info, &argc, argv, NULL, NULL);
  if (argc < 5) return fail(env, "rows(data, nx, ny, inverse, threads): 5 arguments");
  double *data;
  size_t length;
  long nx, ny, threads;
  bool inverse;
  if (!get_f64(env, argv[0], &data, &length)) return fail(env, "rows: data must be a Float64Array");
  if (!get_int(env, argv[1], &nx) || !get_int(env, argv[2], &ny) || !get_int(env, argv[4], &threads))
    return fail(env, "rows: nx, ny and threads must be whole numbers");
  if (napi_get_value_bool(env, argv[3], &inverse) != napi_ok) return fail(env, "rows: inverse must be a boolean");
  if (!is_fast_size((int)nx) || ny < 1) return fail(env, "rows: nx must be 2^a·3^b·5^c ≥ 2");
  if ((long)length < 2 * nx * ny) return fail(env, "rows: data must hold 2·nx·ny values");
  if (transform(data, nx, ny, inverse, (int)(threads < 1 ? 1 : threads), 1, 0, 0)) return fail(env, "rows: out of memory");
  return NULL;
}

/* columns(data, nx, ny, c0, c1, inverse, threads): the column pass alone over columns [c0, c1), in place */
static napi_value js_columns(napi_env env, napi_callback_info info) {
  size_t argc = 7;
  napi_value argv[7];
  napi_get_cb_info(env, info, &argc, argv, NULL, NULL);
  if (argc < 7) return fail(env, "columns(data, nx, ny, c0, c1, inverse, threads): 7 arguments");
  double *data;
  size_t length;
  long nx, ny, c0, c1, threads;
  bool inverse;
  if (!get_f64(env, argv[0], &data, &length)) return fail(env, "columns: data must be a Float64Array");
  if (!get_int(env, argv[1], &nx) || !get_int(env, argv[2], &ny) || !get_int(env, argv[3], &c0) || !get_int(env, argv[4], &c1) ||
      !get_int(env, argv[6], &threads))
    return fail(env, "columns: nx, ny, c0, c1 and threads must be whole numbers");
  if (napi_get_value_bool(env, argv[5], &inverse) != napi_ok) return fail(env, "columns: inverse must be a boolean");
  if (nx < 1 || !is_fast_size((int)ny)) return fail(env, "columns: ny must be 2^a·3^b·5^c ≥ 2");
  if (c0 >= c1 || c1 > nx) return fail(env, "columns: need 0 ≤ c0 < c1 ≤ nx");
  if ((long)length != 2 * nx * ny) return fail(env, "columns: data must hold 2·nx·ny values");
  if (transform(data, nx, ny, inverse, (int)(threads < 1 ? 1 : threads), 0, c0, c1)) return fail(env, "columns: out of memory");
  return NULL;
}

/* isa(): which code path runs on this processor */
static napi_value js_isa(napi_env env, napi_callback_info info) {
  (void)info;
  napi_value s;
  napi_create_string_utf8(env, use_avx2() ? "avx2-fma" : "generic", NAPI_AUTO_LENGTH, &s);
  return s;
}

NAPI_MODULE_INIT() {
  napi_property_descriptor props[] = {
      {"fft2", NULL, js_fft2, NULL, NULL, NULL, napi_default, NULL},
      {"rows", NULL, js_rows, NULL, NULL, NULL, napi_default, NULL},
      {"columns", NULL, js_columns, NULL, NULL, NULL, napi_default, NULL},
      {"isa", NULL, js_isa, NULL, NULL, NULL, napi_default, NULL},
  };
  napi_define_properties(env, exports, sizeof props / sizeof props[0], props);
  return exports;
}
