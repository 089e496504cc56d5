/*
 * Outside yardstick for bench/fft.mjs (not part of the program, never built by it): times FFTW's
 * in-place 2-D complex transform, double precision, planned with FFTW_MEASURE, forward, n×n.
 * bench/fft.mjs compiles this file at bench time into a temporary directory when a C compiler and
 * FFTW's headers are present (cc -O3 fft2.c -lfftw3 -lfftw3_threads -lm) and skips it otherwise.
 *
 *   fft2 N RUNS THREADS   ->  one line of JSON: {"n":…,"threads":…,"median":ms,"min":ms,"planMs":ms,"version":"…"}
 *
 * The data is filled with the same pseudo-random values as bench/fft.mjs (restored before every
 * run, outside the timing, as there), after planning (FFTW_MEASURE overwrites the array).
 */
#include <fftw3.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

static double now_ms(void) {
  struct timespec t;
  clock_gettime(CLOCK_MONOTONIC, &t);
  return t.tv_sec * 1e3 + t.tv_nsec * 1e-6;
}

static int cmp(const void *a, const void *b) {
  double x = *(const double *)a, y = *(const double *)b;
  return x < y ? -1 : x > y;
}

int main(int argc, char **argv) {
  if (argc < 4) {
    fprintf(stderr, "usage: fft2 N RUNS THREADS\n");
    return 2;
  }
  int n = atoi(argv[1]), runs = atoi(argv[2]), threads = atoi(argv[3]);
  if (n < 2 || runs < 1 || threads < 1) return 2;
  size_t N = (size_t)n * n;
  if (threads > 1) {
    if (!fftw_init_threads()) return 3;
    fftw_plan_with_nthreads(threads);
  }
  fftw_complex *a = fftw_alloc_complex(N);
  double *orig = malloc(2 * N * sizeof(double));
  if (!a || !orig) return 4;
  unsigned int seed = 12345;
  for (size_t i = 0; i < 2 * N; i++) {
    seed = seed * 1103515245u + 12345u;
    orig[i] = seed / 4294967296.0 - 0.5;
  }
  double t0 = now_ms();
  fftw_plan p = fftw_plan_dft_2d(n, n, a, a, FFTW_FORWARD, FFTW_MEASURE);
  double planMs = now_ms() - t0;
  if (!p) return 5;
  double *ts = malloc((runs + 2) * sizeof(double));
  for (int r = 0; r < runs + 2; r++) {
    memcpy(a, orig, 2 * N * sizeof(double));
    double s = now_ms();
    fftw_execute(p);
    ts[r] = now_ms() - s;
  }
  /* the first two runs warm up, as in bench/fft.mjs */
  double *k = ts + 2;
  qsort(k, runs, sizeof(double), cmp);
  double median = runs % 2 ? k[runs / 2] : (k[runs / 2 - 1] + k[runs / 2]) / 2;
  /* a checksum of the result, so that bench/fft.mjs can check it is the same transform */
  printf("{\"n\":%d,\"threads\":%d,\"median\":%.4f,\"min\":%.4f,\"planMs\":%.1f,\"x1\":[%.17g,%.17g],\"version\":\"%s\"}\n",
         n, threads, median, k[0], planMs, ((double *)a)[2], ((double *)a)[3], fftw_version);
  fftw_destroy_plan(p);
  fftw_free(a);
  free(orig);
  free(ts);
  if (threads > 1) fftw_cleanup_threads();
  return 0;
}
