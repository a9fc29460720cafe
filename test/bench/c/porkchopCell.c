/*
 * C reference for test/bench/porkchop.bench.ts: the per-cell work of core/search/porkchop.ts
 * for two bodies orbiting the same parent, in time-of-flight mode, single revolution — the
 * departure body's state once per row, per cell the arrival body's state from the conic
 * ephemeris (core/system/ephemeris.ts: Kepler's equation by Halley iteration from Mikkola's
 * starter as in core/orbit/anomaly.ts), one Lambert arc (lambert_core.h, Izzo 2015), the
 * periapsis burns v_p = sqrt(v_inf^2 + 2 mu / r_p) minus the orbit speed (Curtis, Orbital
 * Mechanics for Engineering Students, sections 8.7-8.9), and the grid's eight planes stored
 * as core/search/planes.ts stores them (six float, two int8).
 * Usage: porkchopCell IN OUT REPS — IN: 14 doubles (mu, muFrom, rPark, vPark, muTo, rArrive,
 * vTarget, flyby, depStart, depEnd, depN, tofStart, tofEnd, tofN) then the two bodies' 14-double
 * ephemeris rows (EPHEMERIS_STRIDE layout); OUT: dvDepart, dvArrive per cell (row-major).
 * Prints cells per second, the median of REPS timed grids after one warm-up, by the wall clock
 * and by the process's CPU time (the steadier figure on a busy machine).
 */
#include <stdio.h>
#include <stdlib.h>
#include <time.h>
#include "lambert_core.h"

#define EPS 2.220446049250313e-16
#define TINY (4 * 4.9406564584124654e-324)
#define LOW_E 0.3

static double sin_out, cos_out;

static double x_minus_sin(double x) {
  if (fabs(x) >= 0.5) return x - sin(x);
  double x2 = x * x;
  return x * x2 * (1.0 / 6 - x2 * (1.0 / 120 - x2 * (1.0 / 5040 - x2 * (1.0 / 362880 - x2 * (1.0 / 39916800 - x2 * (1.0 / 6227020800 - x2 / 1307674368000))))));
}

static double with_sin_cos(double E) {
  sin_out = sin(E);
  cos_out = cos(E);
  return E;
}

/* E - e sin E = m for m in (0, pi]; leaves sin E, cos E in sin_out, cos_out. */
static double kepler_reduced(double m, double e) {
  double lin = m / (1 - e);
  if (e * lin * lin < 6 * EPS * (1 - e)) return with_sin_cos(lin);
  double lo = m, hi = fmin(M_PI, m + e), E;
  if (e < LOW_E) E = m;
  else {
    double denom = 4 * e + 0.5, alpha = (1 - e) / denom, beta = (0.5 * m) / denom;
    double z = cbrt(beta + sqrt(alpha * alpha * alpha + beta * beta));
    double s = (2 * beta) / (z * z + alpha + (alpha * alpha) / (z * z));
    double s5 = s * s * s * s * s;
    s -= (0.078 * s5) / (1 + e);
    E = m + e * (3 * s - 4 * s * s * s);
    if (!(E > lo && E < hi)) E = 0.5 * (lo + hi);
  }
  double q = e / (1 - e), cube_bound = 2 * (0.25 * q * q + q / 6);
  for (int it = 0; it < 100; it++) {
    double sE = sin(E), cE = cos(E), f, fp;
    if (e < LOW_E) {
      f = E - e * sE - m;
      fp = 1 - e * cE;
    } else {
      f = (E >= 0.5 ? (1 - e) * E + e * (E - sE) : (1 - e) * E + e * x_minus_sin(E)) - m;
      fp = cE > 0 ? 1 - e + (e * sE * sE) / (1 + cE) : 1 - e * cE;
    }
    if (f == 0) { sin_out = sE; cos_out = cE; return E; }
    if (f < 0) lo = E; else hi = E;
    double den = fp * fp - 0.5 * f * e * sE;
    double step = den > 0 ? (-f * fp) / den : -f / fp;
    double a = fabs(step);
    if (a <= 1e-11 * E + TINY || (a < 1e-3 && cube_bound * a * a * a <= 0.25 * EPS * E)) {
      double s2 = step * step, cs = 1 - s2 * (0.5 - s2 / 24), sn = step * (1 - s2 * (1.0 / 6 - s2 / 120));
      sin_out = sE * cs + cE * sn;
      cos_out = cE * cs - sE * sn;
      return E + step;
    }
    double En = E + step;
    if (!(En > lo && En < hi)) {
      En = 0.5 * (lo + hi);
      if (hi - lo <= 4 * EPS * hi + TINY) return with_sin_cos(En);
    }
    E = En;
  }
  return NAN;
}

/* State relative to the parent from an ephemeris row (a, b, e, sqrt(1-e^2), n, M0, P, Q, n a, mu). */
static void body_state(const double *k, double t, double *out) {
  double e = k[2], M = k[5] + k[4] * t;
  M = M - 2 * M_PI * floor(M / (2 * M_PI) + 0.5); /* JS Math.round: halves go up */
  double m = fabs(M);
  if (m == 0) { sin_out = 0; cos_out = 1; } else kepler_reduced(m, e);
  double sE = M < 0 ? -sin_out : sin_out, cE = cos_out;
  double px = k[0] * (cE - e), qy = k[1] * sE;
  out[0] = px * k[6] + qy * k[9];
  out[1] = px * k[7] + qy * k[10];
  out[2] = px * k[8] + qy * k[11];
  double f = k[12] / (1 - e * cE), vp = -sE * f, vq = k[3] * cE * f;
  out[3] = vp * k[6] + vq * k[9];
  out[4] = vp * k[7] + vq * k[10];
  out[5] = vp * k[8] + vq * k[11];
}

static double clock_s(clockid_t id) {
  struct timespec ts;
  clock_gettime(id, &ts);
  return ts.tv_sec + ts.tv_nsec * 1e-9;
}

static int cmp(const void *a, const void *b) {
  double x = *(const double *)a, y = *(const double *)b;
  return (x > y) - (x < y);
}

static double axis(double start, double end, int n, int k) {
  return n == 1 ? start : start + ((end - start) * k) / (n - 1);
}

/* The grid's planes, as core/search/planes.ts stores them. */
typedef struct {
  float *dvDepart, *dvArrive, *dvTotal, *c3, *vInfDepart, *vInfArrive;
  signed char *revs, *branch;
} Planes;

static void grid(const double *H, const double *kf, const double *kt, double *out, Planes *P) {
  double mu = H[0], muFrom = H[1], rPark = H[2], vPark = H[3], muTo = H[4], rArr = H[5], vTarget = H[6];
  int flyby = H[7] != 0, nDep = (int)H[10], nTof = (int)H[13];
  double dep[6], arr[6], v1[3], v2[3];
  for (int i = 0; i < nDep; i++) {
    double tDep = axis(H[8], H[9], nDep, i);
    body_state(kf, tDep, dep);
    for (int j = 0; j < nTof; j++) {
      double tof = axis(H[11], H[12], nTof, j);
      body_state(kt, tDep + tof, arr);
      size_t idx = (size_t)i * nTof + j;
      double *o = out + 2 * idx;
      if (!(tof > 0) || lambert_single(mu, dep, arr, tof, v1, v2) < 0) {
        o[0] = o[1] = INFINITY;
        P->dvDepart[idx] = P->dvArrive[idx] = P->dvTotal[idx] = P->c3[idx] = P->vInfDepart[idx] = P->vInfArrive[idx] = INFINITY;
        P->revs[idx] = P->branch[idx] = -1;
        continue;
      }
      double dx = v1[0] - dep[3], dy = v1[1] - dep[4], dz = v1[2] - dep[5];
      double c3 = dx * dx + dy * dy + dz * dz;
      double dvD = sqrt(c3 + (2 * muFrom) / rPark) - vPark;
      dx = v2[0] - arr[3]; dy = v2[1] - arr[4]; dz = v2[2] - arr[5];
      double w2 = dx * dx + dy * dy + dz * dz;
      double dvA = flyby ? 0 : sqrt(w2 + (2 * muTo) / rArr) - vTarget;
      double vInfD = sqrt(c3), vInfA = sqrt(w2), total = dvD + dvA;
      int ok = fabs(total + c3 + vInfD + vInfA) < INFINITY;
      o[0] = ok ? dvD : INFINITY;
      o[1] = ok ? dvA : INFINITY;
      P->dvDepart[idx] = ok ? dvD : INFINITY;
      P->dvArrive[idx] = ok ? dvA : INFINITY;
      P->dvTotal[idx] = ok ? total : INFINITY;
      P->c3[idx] = ok ? c3 : INFINITY;
      P->vInfDepart[idx] = ok ? vInfD : INFINITY;
      P->vInfArrive[idx] = ok ? vInfA : INFINITY;
      P->revs[idx] = P->branch[idx] = ok ? 0 : -1;
    }
  }
}

int main(int argc, char **argv) {
  if (argc < 4) return 2;
  double buf[14 + 28];
  FILE *f = fopen(argv[1], "rb");
  if (!f || fread(buf, sizeof(double), 42, f) != 42) return 2;
  fclose(f);
  size_t cells = (size_t)buf[10] * (size_t)buf[13];
  double *out = malloc(2 * cells * sizeof(double));
  Planes P = {malloc(cells * sizeof(float)), malloc(cells * sizeof(float)), malloc(cells * sizeof(float)), malloc(cells * sizeof(float)),
              malloc(cells * sizeof(float)), malloc(cells * sizeof(float)), malloc(cells), malloc(cells)};
  int reps = atoi(argv[3]);
  double *times = malloc(reps * sizeof(double)), *cpu = malloc(reps * sizeof(double));
  grid(buf, buf + 14, buf + 28, out, &P);
  for (int r = 0; r < reps; r++) {
    double t0 = clock_s(CLOCK_MONOTONIC), c0 = clock_s(CLOCK_PROCESS_CPUTIME_ID);
    grid(buf, buf + 14, buf + 28, out, &P);
    times[r] = clock_s(CLOCK_MONOTONIC) - t0;
    cpu[r] = clock_s(CLOCK_PROCESS_CPUTIME_ID) - c0;
  }
  f = fopen(argv[2], "wb");
  fwrite(out, sizeof(double), 2 * cells, f);
  fclose(f);
  qsort(times, reps, sizeof(double), cmp);
  qsort(cpu, reps, sizeof(double), cmp);
  printf("%.6e %.6e\n", cells / times[reps / 2], cells / cpu[reps / 2]);
  return 0;
}
