/*
 * Single-revolution Lambert solver in plain C: the same method and numerics as
 * core/orbit/lambert.ts (D. Izzo, "Revisiting Lambert's problem", Celestial Mechanics and
 * Dynamical Astronomy 121 (2015) 1-15; Householder iterations on x, Lancaster-Blanchard /
 * Lagrange / Battin forms of T(x)), written here as the benchmarks' C reference. Reference
 * normal +z. Shared by lambert.c and porkchopCell.c.
 */
#include <math.h>

#define LAM_TOL 1e-11
#define LAM_MAX_ITER 30
#define COLLINEAR_SIN 1e-10
#define COINCIDENT_REL 1e-14
#define BATTIN_BAND 0.01
#define LAGRANGE_BAND 0.2
#define DERIV_BAND 1e-4

typedef struct {
  double lam, T, u1[3], t1[3], u2[3], t2[3], r1n, r2n, gamma, rho, sigma, oml2, oml;
} LamGeom;

static double hyp2f1b(double z) {
  double sj = 1, cj = 1;
  for (int j = 0; j < 200; j++) {
    cj = (((cj * (3 + j) * (1 + j)) / (2.5 + j)) * z) / (j + 1);
    sj += cj;
    if (fabs(cj) < 1e-16) break;
  }
  return sj;
}

static double tof_lagrange(double x, double lam) {
  double a = 1 / (1 - x * x);
  if (a > 0) {
    double alfa = 2 * acos(x);
    double beta = 2 * asin(fmin(1, sqrt((lam * lam) / a)));
    if (lam < 0) beta = -beta;
    return (a * sqrt(a) * (alfa - sin(alfa) - (beta - sin(beta)))) / 2;
  }
  double alfa = 2 * acosh(x);
  double beta = 2 * asinh(sqrt((-lam * lam) / a));
  if (lam < 0) beta = -beta;
  return (-a * sqrt(-a) * (beta - sinh(beta) - (alfa - sinh(alfa)))) / 2;
}

static double tof_x(const LamGeom *g, double x, double lam) {
  double dist = fabs(x - 1);
  if (dist < LAGRANGE_BAND && dist > BATTIN_BAND) return tof_lagrange(x, lam);
  double E = x * x - 1;
  double rho = fabs(E);
  double z = sqrt(g->oml2 + lam * lam * x * x);
  if (dist <= BATTIN_BAND) {
    double eta = z - lam * x;
    double s1 = 0.5 * (g->oml - x * eta);
    double q = (4.0 / 3.0) * hyp2f1b(s1);
    return (eta * eta * eta * q + 4 * lam * eta) / 2;
  }
  double y = sqrt(rho);
  double lx = lam * x;
  double zml = lx > 0 ? g->oml2 / (z + lx) : z - lx;
  double d = E < 0 ? atan2(zml * y, x * z - lam * E) : asinh(y * zml);
  return (x - lam * z - d / y) / E;
}

static void dtdx(const LamGeom *g, double x, double T, double lam, double *D) {
  double l2 = lam * lam, l3 = l2 * lam, oml2 = g->oml2, umx2 = 1 - x * x;
  double y = sqrt(oml2 + l2 * x * x), y2 = y * y, y3 = y2 * y;
  double d1 = (3 * T * x - 2 + (2 * l3 * x) / y) / umx2;
  double d2 = (3 * T + 5 * x * d1 + (2 * oml2 * l3) / y3) / umx2;
  double d3 = (7 * x * d2 + 8 * d1 - (6 * oml2 * l2 * l3 * x) / (y3 * y2)) / umx2;
  D[0] = d1;
  D[1] = d2;
  D[2] = d3;
}

/* Householder on T(x) = Tt in (lo, hi), T decreasing (single revolution); NAN without convergence. */
static double solve_x(const LamGeom *g, double Tt, double x0, double lam, double lo, double hi, int *iters) {
  double x = x0, D[3];
  for (int it = 1; it <= LAM_MAX_ITER; it++) {
    double t = tof_x(g, x, lam);
    double delta = t - Tt;
    if (-delta < 0) lo = x; else hi = x;
    if (fabs(x - 1) < DERIV_BAND) {
      double xs = x < 1 ? 1 - DERIV_BAND : 1 + DERIV_BAND;
      dtdx(g, xs, tof_x(g, xs, lam), lam, D);
    } else dtdx(g, x, t, lam, D);
    double d1 = D[0], d2 = D[1], d3 = D[2], d1s = d1 * d1;
    double xn = x - (delta * (d1s - (delta * d2) / 2)) / (d1 * (d1s - delta * d2) + (d3 * delta * delta) / 6);
    double scale = fabs(x) > 1 ? fabs(x) : 1;
    if (fabs(xn - x) <= LAM_TOL * scale || delta == 0) {
      *iters = it;
      return fabs(xn - x) <= LAM_TOL * scale ? xn : x;
    }
    if (!(xn > lo && xn < hi)) {
      if (isinf(hi)) xn = x > lo ? x + 1 + fabs(x) : lo + 1 + fabs(lo);
      else xn = (lo + hi) / 2;
    }
    x = xn;
  }
  *iters = LAM_MAX_ITER;
  return NAN;
}

/* Fills g; 0 on success, 1 collinear along z, 2 coincident. */
static int lam_prepare(LamGeom *g, double mu, const double *r1, const double *r2, double tof) {
  double r1x = r1[0], r1y = r1[1], r1z = r1[2], r2x = r2[0], r2y = r2[1], r2z = r2[2];
  double r1n = sqrt(r1x * r1x + r1y * r1y + r1z * r1z);
  double r2n = sqrt(r2x * r2x + r2y * r2y + r2z * r2z);
  double cx = r2x - r1x, cy = r2y - r1y, cz = r2z - r1z;
  double c = sqrt(cx * cx + cy * cy + cz * cz);
  if (!(c > COINCIDENT_REL * (r1n + r2n))) return 2;
  double s = (r1n + r2n + c) / 2;
  double u1x = r1x / r1n, u1y = r1y / r1n, u1z = r1z / r1n;
  double u2x = r2x / r2n, u2y = r2y / r2n, u2z = r2z / r2n;
  double hx = u1y * u2z - u1z * u2y, hy = u1z * u2x - u1x * u2z, hz = u1x * u2y - u1y * u2x;
  double hn = sqrt(hx * hx + hy * hy + hz * hz);
  double px = u1x + u2x, py = u1y + u2y, pz = u1z + u2z;
  double qx = u2x - u1x, qy = u2y - u1y, qz = u2z - u1z;
  double lam = (sqrt(r1n * r2n) * sqrt(px * px + py * py + pz * pz)) / (2 * s);
  if (hn >= COLLINEAR_SIN) {
    hx /= hn; hy /= hn; hz /= hn;
    if (hz < 0) { lam = -lam; hx = -hx; hy = -hy; hz = -hz; }
  } else {
    double d = u1z;
    hx = -d * u1x; hy = -d * u1y; hz = 1 - d * u1z;
    double n = sqrt(hx * hx + hy * hy + hz * hz);
    if (!(n > 1e-8)) return 1;
    double gx = hx, gy = hy, gz = hz, k = 1 / n;
    hx *= k; hy *= k; hz *= k;
    double dg = gx * (u1y * u2z - u1z * u2y) + gy * (u1z * u2x - u1x * u2z) + gz * (u1x * u2y - u1y * u2x);
    if (dg < 0) lam = -lam;
  }
  g->lam = lam;
  g->T = sqrt((2 * mu) / (s * s * s)) * tof;
  g->u1[0] = u1x; g->u1[1] = u1y; g->u1[2] = u1z;
  g->t1[0] = hy * u1z - hz * u1y; g->t1[1] = hz * u1x - hx * u1z; g->t1[2] = hx * u1y - hy * u1x;
  g->u2[0] = u2x; g->u2[1] = u2y; g->u2[2] = u2z;
  double t2x = hy * u2z - hz * u2y, t2y = hz * u2x - hx * u2z, t2z = hx * u2y - hy * u2x;
  double t2n = sqrt(t2x * t2x + t2y * t2y + t2z * t2z);
  g->t2[0] = t2x / t2n; g->t2[1] = t2y / t2n; g->t2[2] = t2z / t2n;
  g->r1n = r1n;
  g->r2n = r2n;
  g->gamma = sqrt((mu * s) / 2);
  double rho = -(cx * (r1x + r2x) + cy * (r1y + r2y) + cz * (r1z + r2z)) / ((r1n + r2n) * c);
  g->rho = rho;
  g->sigma = fabs(rho) < 0.5 ? sqrt(1 - rho * rho) : (sqrt(r1n * r2n) * sqrt(qx * qx + qy * qy + qz * qz)) / c;
  g->oml2 = c / s;
  g->oml = lam > 0 ? g->oml2 / (1 + lam) : 1 - lam;
  return 0;
}

static double guess_single(const LamGeom *g, double T, double lam) {
  double oml = g->oml, q = sqrt(g->oml2);
  double T00 = atan2(q, lam) + lam * q;
  double T1 = (2.0 / 3.0) * oml * (1 + lam + lam * lam);
  if (T >= T00) return -(T - T00) / (T - T00 + 4);
  if (T <= T1) return (T1 * (T1 - T)) / ((2.0 / 5.0) * oml * (1 + lam * (1 + lam * (1 + lam * (1 + lam)))) * T) + 1;
  return pow(T / T00, M_LN2 / log(T1 / T00)) - 1;
}

/* Single-revolution Lambert, prograde about +z: v1, v2 out; iterations, or -1 on failure. */
static int lambert_single(double mu, const double *r1, const double *r2, double tof, double *v1, double *v2) {
  LamGeom g;
  if (!(mu > 0) || !(tof > 0) || lam_prepare(&g, mu, r1, r2, tof) != 0) return -1;
  int iters = 0;
  double lam = g.lam;
  double x = solve_x(&g, g.T, guess_single(&g, g.T, lam), lam, -1, INFINITY, &iters);
  if (isnan(x)) return -1;
  double y = sqrt(g.oml2 + lam * lam * x * x);
  double a = lam * y - x, b = lam * y + x;
  double vr1 = (g.gamma * (a - g.rho * b)) / g.r1n;
  double vr2 = (-g.gamma * (a + g.rho * b)) / g.r2n;
  double vt = g.gamma * g.sigma * (y + lam * x);
  double vt1 = vt / g.r1n, vt2 = vt / g.r2n;
  for (int k = 0; k < 3; k++) {
    v1[k] = vr1 * g.u1[k] + vt1 * g.t1[k];
    v2[k] = vr2 * g.u2[k] + vt2 * g.t2[k];
  }
  if (!(fabs(v1[0] + v1[1] + v1[2] + v2[0] + v2[1] + v2[2]) < INFINITY)) return -1;
  return iters;
}
