/*
 * Outside yardstick for bench/fft.mjs (not part of the program, never built by it): FFTW's in-place
 * 2-D complex transform, double precision, planned with FFTW_MEASURE, forward, n×n. bench/fft.mjs
 * compiles this file at bench time into a temporary directory when a C compiler and FFTW's headers
 * are present (cc -O3 fft2.c -lfftw3_threads -lfftw3 -lm) and skips it otherwise.
 *
 *   fft2 N THREADS
 *
 * Plans, then transforms the same pseudo-random data as bench/fft.mjs once and prints one line of
 * JSON: {"n":…,"threads":…,"planMs":…,"x1":[re, im of X[0,1]],"version":"…"}. Then, for each line
 * read on stdin, restores the data (outside the timing, as bench/fft.mjs does), times one
 * transform and prints the milliseconds of wall-clock and of processor time (all threads) on a
 * line of its own; it ends at end of input. So the
 * bench can run FFTW in the same rounds as its own variants, one after another.
 */
#include <fftw3.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

static double clock_ms(clockid_t c) {
  struct timespec t;
  clock_gettime(c, &t);
  return t.tv_sec * 1e3 + t.tv_nsec * 1e-6;
}
static double now_ms(void) { return clock_ms(CLOCK_MONOTONIC); }

int main(int argc, char **argv) {
  if (argc < 3) {
    fprintf(stderr, "usage: fft2 N THREADS\n");
    return 2;
  }
  int n = atoi(argv[1]), threads = atoi(argv[2]);
  if (n < 2 || threads < 1) return 2;
  size_t N = (size_t)n * n;
  if (threads > 1) {
    if (!fftw_init_threads()) return 3;
    fftw_plan_with_nthreads(threads);
  }
  fftw_complex *a = fftw_alloc_complex(N);
  double *orig = malloc(2 * N * sizeof(double));
  if (!a || !orig) return 4;
  /* the generator of bench/fft.mjs */
  unsigned int seed = 12345;
  for (size_t i = 0; i < 2 * N; i++) {
    seed = seed * 1103515245u + 12345u;
    orig[i] = seed / 4294967296.0 - 0.5;
  }
  double t0 = now_ms();
  fftw_plan p = fftw_plan_dft_2d(n, n, a, a, FFTW_FORWARD, FFTW_MEASURE);
  double planMs = now_ms() - t0;
  if (!p) return 5;
  memcpy(a, orig, 2 * N * sizeof(double));
  fftw_execute(p);
  printf("{\"n\":%d,\"threads\":%d,\"planMs\":%.1f,\"x1\":[%.17g,%.17g],\"version\":\"%s\"}\n",
         n, threads, planMs, ((double *)a)[2], ((double *)a)[3], fftw_version);
  fflush(stdout);
  char line[64];
  while (fgets(line, sizeof line, stdin)) {
    memcpy(a, orig, 2 * N * sizeof(double));
    double s = now_ms(), c = clock_ms(CLOCK_PROCESS_CPUTIME_ID);
    fftw_execute(p);
    double wall = now_ms() - s;
    printf("%.4f %.4f\n", wall, clock_ms(CLOCK_PROCESS_CPUTIME_ID) - c);
    fflush(stdout);
  }
  fftw_destroy_plan(p);
  fftw_free(a);
  free(orig);
  if (threads > 1) fftw_cleanup_threads();
  return 0;
}
