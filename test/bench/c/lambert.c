/*
 * C reference for test/bench/lambert.bench.ts: the single-revolution Lambert method of
 * core/orbit/lambert.ts (Izzo 2015, see lambert_core.h) on the bench's cases.
 * Usage: lambert IN OUT REPS — IN holds n·7 doubles (r1, r2, tof per case); OUT receives n·7
 * doubles (v1, v2, iterations or -1 per case). Prints "solves_per_s iterations_per_solve",
 * the median of 5 timed runs of REPS solves cycling through the cases (n a power of two).
 */
#include <stdio.h>
#include <stdlib.h>
#include <time.h>
#include "lambert_core.h"

static double now_s(void) {
  struct timespec ts;
  clock_gettime(CLOCK_MONOTONIC, &ts);
  return ts.tv_sec + ts.tv_nsec * 1e-9;
}

static int cmp(const void *a, const void *b) {
  double x = *(const double *)a, y = *(const double *)b;
  return (x > y) - (x < y);
}

int main(int argc, char **argv) {
  if (argc < 4) return 2;
  const double MU = 1.32712440018e20;
  FILE *f = fopen(argv[1], "rb");
  if (!f) return 2;
  fseek(f, 0, SEEK_END);
  long bytes = ftell(f);
  fseek(f, 0, SEEK_SET);
  size_t n = (size_t)bytes / (7 * sizeof(double));
  double *P = malloc(n * 7 * sizeof(double));
  double *O = malloc(n * 7 * sizeof(double));
  if (fread(P, sizeof(double), n * 7, f) != n * 7) return 2;
  fclose(f);
  for (size_t i = 0; i < n; i++) {
    O[7 * i + 6] = lambert_single(MU, P + 7 * i, P + 7 * i + 3, P[7 * i + 6], O + 7 * i, O + 7 * i + 3);
  }
  f = fopen(argv[2], "wb");
  fwrite(O, sizeof(double), n * 7, f);
  fclose(f);
  long reps = atol(argv[3]);
  double v1[3], v2[3], times[5];
  long iters = 0;
  for (int r = -1; r < 5; r++) {
    iters = 0;
    double t0 = now_s();
    for (long k = 0; k < reps; k++) {
      const double *p = P + 7 * (k & (long)(n - 1));
      iters += lambert_single(MU, p, p + 3, p[6], v1, v2);
    }
    if (r >= 0) times[r] = now_s() - t0;
  }
  qsort(times, 5, sizeof(double), cmp);
  printf("%.6e %.6f\n", reps / times[2], (double)iters / reps);
  return 0;
}
