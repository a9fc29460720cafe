/**
 * Dormand–Prince 8(5,3) explicit Runge–Kutta with adaptive steps, dense output and event location.
 *
 * Method: Hairer, Nørsett & Wanner, Solving Ordinary Differential Equations I, 2nd ed., §II.10
 * (the DOP853 pair of Dormand & Prince; coefficients as published with the book's DOP853 code),
 * with its step-size control: the error estimate combines the 5th- and 3rd-order embedded
 * estimates, err = |h|·err5² / sqrt(n·(err5² + 0.01·err3²)), and h_new = h·clamp(0.9·err^(−1/8)).
 *
 * - FSAL: f at the new point is the 1st stage of the next step (12 evaluations per step).
 * - Same options, result shape and statuses as rk45.ts, so callers can switch.
 * - Dense output of order 7 (Hairer et al. §II.10, the continuous extension of the DOP853 code):
 *   three extra stages per accepted step, evaluated only when dense output is kept or an event
 *   is to be located (so fevals counts them then); stored as eight vectors per step (dense.ts,
 *   width 8). Events are refined on the same interpolant.
 * - Non-finite derivative values reject the trial step and shrink it; a non-finite derivative at
 *   the initial point throws SolverError 'non-finite'.
 * - The state update y + h·Σ b_i k_i and the time t + h use compensated summation (Kahan 1965;
 *   Hairer, Lubich & Wanner, Geometric Numerical Integration, 2nd ed., §VIII.5, from memory): the
 *   rounding error of each update is carried into the next, so a step's round-off is that of its
 *   increment, not one ulp of y (or t). That is what lets DOP853 take rtol down to DOP853_MIN_RTOL
 *   (10 ulps), below RK45's MIN_RTOL (100 ulps): on 100 revolutions of an e = 0.3 orbit the error
 *   there is the method's own truncation error, and the round-off left is ~3e-5 m.
 * - The step loop allocates nothing: stage buffers are Float64Arrays created once per solve.
 */
import { InputError, SolverError, requireFinite } from '../math/index.ts';
import { DenseOutput } from './dense.ts';
import { EventLocator, checkEvents } from './eventLocator.ts';
import type { OdeFunction, SolveStats } from './ode.ts';
import { DEFAULT_ATOL, DEFAULT_MAX_STEPS, DEFAULT_RTOL, type RK45Options, type RK45Result, type RK45Status } from './rk45.ts';

export type Dop853Options = RK45Options;
export type Dop853Result = RK45Result;

/** Step-size safety factor (DOP853 default). */
export const DOP853_SAFETY = 0.9;
/** Smallest step-change factor h_new/h (DOP853 FAC1). */
export const DOP853_FAC_MIN = 0.333;
/** Largest step-change factor h_new/h (DOP853 FAC2). */
export const DOP853_FAC_MAX = 6;
/** Step shrink factor after a trial step produced non-finite values. */
const NONFINITE_SHRINK = 0.25;
const EPS = 2.220446049250313e-16;
const UNDERFLOW_ULPS = 16;
/**
 * Tightest relative tolerance accepted (10 ulps). Below RK45's MIN_RTOL because the state is
 * carried with compensated summation; the 5th-order error estimate Σ ER_i k_i (Σ|ER_i| ≈ 4.2)
 * then still stands above its own round-off (≈ 4 ulps of h·k, itself a small part of y).
 */
export const DOP853_MIN_RTOL = 10 * EPS;

/** Nodes c_1..c_12 of the DOP853 tableau (Hairer et al. §II.10, DOP853 code). */
export const DOP853_C: readonly number[] = [
  0,
  0.05260015195876773,
  0.0789002279381516,
  0.1183503419072274,
  0.2816496580927726,
  1 / 3,
  0.25,
  4 / 13,
  127 / 195,
  0.6,
  6 / 7,
  1,
];

/** Rows a_i (i = 2..12, then the weights b as row 13) of the DOP853 tableau, full length 12 each. */
export const DOP853_A: readonly (readonly number[])[] = [
  [0.05260015195876773],
  [0.0197250569845379, 0.0591751709536137],
  [0.02958758547680685, 0, 0.08876275643042054],
  [0.2413651341592667, 0, -0.8845494793282861, 0.924834003261792],
  [0.037037037037037035, 0, 0, 0.17082860872947386, 0.12546768756682242],
  [3.7109375e-2, 0, 0, 0.17025221101954405, 0.06021653898045596, -1.7578125e-2],
  [0.03709200011850479, 0, 0, 0.17038392571223998, 0.10726203044637328, -0.015319437748624402, 0.008273789163814023],
  [0.6241109587160757, 0, 0, -3.3608926294469414, -0.868219346841726, 27.59209969944671, 20.154067550477894, -43.48988418106996],
  [0.47766253643826434, 0, 0, -2.4881146199716677, -0.590290826836843, 21.230051448181193, 15.279233632882423, -33.28821096898486, -0.020331201708508627],
  [
    -0.9371424300859873, 0, 0, 5.186372428844064, 1.0914373489967295, -8.149787010746927, -18.52006565999696, 22.739487099350505, 2.4936055526796523,
    -3.0467644718982196,
  ],
  [
    2.273310147516538, 0, 0, -10.53449546673725, -2.0008720582248625, -17.9589318631188, 27.94888452941996, -2.8589982771350235, -8.87285693353063,
    12.360567175794303, 0.6433927460157636,
  ],
];

/** 8th-order weights b_1..b_12. */
export const DOP853_B: readonly number[] = [
  0.054293734116568765, 0, 0, 0, 0, 4.450312892752409, 1.8915178993145003, -5.801203960010585, 0.3111643669578199, -0.1521609496625161, 0.20136540080403034,
  0.04471061572777259,
];

/** 3rd-order embedded weights: non-zero b̂_1, b̂_9, b̂_12 (DOP853 BHH1..3). */
export const DOP853_BHH: readonly number[] = [0.2440944881889764, 0.7338466882816118, 0.022058823529411766];

/** 5th-order error coefficients ER_1..ER_12 (b − b̂5). */
export const DOP853_ER: readonly number[] = [
  0.01312004499419488, 0, 0, 0, 0, -1.2251564463762044, -0.4957589496572502, 1.6643771824549864, -0.35032884874997366, 0.3341791187130175, 0.08192320648511571,
  -0.022355307863886294,
];

/** Extra stages 14..16 for the dense output: nodes c_14..c_16. */
export const DOP853_C_EXTRA: readonly number[] = [0.1, 0.2, 7 / 9];

/**
 * Rows a_14..a_16 over k1..k15 (k13 = f at the new point), full length 13..15
 * (DOP853 code, A141..A1615).
 */
export const DOP853_A_EXTRA: readonly (readonly number[])[] = [
  [
    0.056167502283047954, 0, 0, 0, 0, 0, 0.25350021021662483, -0.2462390374708025, -0.12419142326381637, 0.15329179827876568, 0.00820105229563469,
    0.007567897660545699, -8.298e-3,
  ],
  [
    0.03183464816350214, 0, 0, 0, 0, 0.028300909672366776, 0.053541988307438566, -0.05492374857139099, 0, 0, -0.00010834732869724932, 0.0003825710908356584,
    -0.00034046500868740456, 0.1413124436746325,
  ],
  [
    -0.42889630158379194, 0, 0, 0, 0, -4.697621415361164, 7.683421196062599, 4.06898981839711, 0.3567271874552811, 0, 0, 0, -0.0013990241651590145,
    2.9475147891527724, -9.15095847217987,
  ],
];

/** Dense output rows d_4..d_7 over k1..k16 (DOP853 code, D41..D716); r5..r8 = h·Σ d_ij k_j. */
export const DOP853_D: readonly (readonly number[])[] = [
  [
    -8.428938276109013, 0, 0, 0, 0, 0.5667149535193777, -3.0689499459498917, 2.38466765651207, 2.117034582445028, -0.871391583777973, 2.2404374302607883,
    0.6315787787694688, -0.08899033645133331, 18.148505520854727, -9.194632392478356, -4.436036387594894,
  ],
  [
    10.427508642579134, 0, 0, 0, 0, 242.28349177525817, 165.20045171727028, -374.5467547226902, -22.113666853125306, 7.733432668472264, -30.674084731089398,
    -9.332130526430229, 15.697238121770845, -31.139403219565178, -9.35292435884448, 35.81684148639408,
  ],
  [
    19.985053242002433, 0, 0, 0, 0, -387.0373087493518, -189.17813819516758, 527.8081592054236, -11.57390253995963, 6.8812326946963, -1.0006050966910838,
    0.7777137798053443, -2.778205752353508, -60.19669523126412, 84.32040550667716, 11.99229113618279,
  ],
  [
    -25.69393346270375, 0, 0, 0, 0, -154.18974869023643, -231.5293791760455, 357.6391179106141, 93.40532418362432, -37.45832313645163, 104.0996495089623,
    29.8402934266605, -43.53345659001114, 96.32455395918828, -39.17726167561544, -149.72683625798564,
  ],
];

interface Settings {
  n: number;
  tEnd: number;
  dir: number;
  rtol: number;
  atol: Float64Array;
  maxStep: number;
  minStep: number;
  maxSteps: number;
}

/** Integrates y' = f(t, y) from t0 to tEnd (either direction) with DOP853. See the module comment. */
export function dop853(f: OdeFunction, t0: number, y0: ArrayLike<number>, tEnd: number, options: Dop853Options = {}): Dop853Result {
  requireFinite('t0', t0);
  requireFinite('tEnd', tEnd);
  if (!y0 || typeof y0.length !== 'number' || y0.length < 1) throw new InputError('y0', 'must have at least 1 component', y0);
  const n = y0.length;
  for (let i = 0; i < n; i++) {
    if (typeof y0[i] !== 'number' || !Number.isFinite(y0[i])) throw new InputError(`y0[${i}]`, 'must be a finite number', y0[i]);
  }
  const rtol = options.rtol ?? DEFAULT_RTOL;
  requireFinite('rtol', rtol);
  if (!(rtol > 0)) throw new InputError('rtol', 'must be > 0', rtol);
  if (rtol < DOP853_MIN_RTOL) throw new InputError('rtol', `must be >= ${DOP853_MIN_RTOL} (10 ulps); tighter cannot be met in double precision`, rtol);
  const atol = new Float64Array(n);
  const atolIn = options.atol ?? DEFAULT_ATOL;
  if (typeof atolIn === 'number') {
    requireFinite('atol', atolIn);
    if (!(atolIn > 0)) throw new InputError('atol', 'must be > 0', atolIn);
    atol.fill(atolIn);
  } else {
    if (!atolIn || atolIn.length !== n) throw new InputError('atol', `must be a number or have ${n} components (one per component of y0)`, atolIn);
    for (let i = 0; i < n; i++) {
      requireFinite(`atol[${i}]`, atolIn[i]);
      if (!(atolIn[i] > 0)) throw new InputError(`atol[${i}]`, 'must be > 0', atolIn[i]);
      atol[i] = atolIn[i];
    }
  }
  const span = Math.abs(tEnd - t0);
  let maxStep = span;
  if (options.maxStep !== undefined) {
    requireFinite('maxStep', options.maxStep);
    if (!(options.maxStep > 0)) throw new InputError('maxStep', 'must be > 0', options.maxStep);
    maxStep = Math.min(options.maxStep, span);
  }
  let minStep = 0;
  if (options.minStep !== undefined) {
    requireFinite('minStep', options.minStep);
    if (!(options.minStep >= 0)) throw new InputError('minStep', 'must be >= 0', options.minStep);
    minStep = options.minStep;
  }
  if (options.h0 !== undefined) {
    requireFinite('h0', options.h0);
    if (!(options.h0 > 0)) throw new InputError('h0', 'must be > 0', options.h0);
  }
  const maxSteps = options.maxSteps ?? DEFAULT_MAX_STEPS;
  if (!Number.isInteger(maxSteps) || maxSteps < 1) throw new InputError('maxSteps', 'must be an integer >= 1', maxSteps);
  const events = checkEvents(options.events);

  const stats: SolveStats = { accepted: 0, rejected: 0, fevals: 0 };
  const y = Float64Array.from(y0 as ArrayLike<number>);
  const locator = new EventLocator(events, n, 'dop853');
  const dense = options.dense ? new DenseOutput(n, t0, 64, 8) : undefined;
  if (span === 0) {
    return { t: t0, y, status: 'done', message: 'tEnd equals t0: nothing to integrate', stats, events: locator.hits, dense, hNext: 0 };
  }
  const dir = tEnd > t0 ? 1 : -1;
  const k1 = new Float64Array(n);
  f(t0, y, k1);
  stats.fevals++;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(k1[i])) {
      throw new SolverError('dop853', 'non-finite', `derivative component ${i} is ${k1[i]} at the initial point t=${t0}`, { t0, y0: Array.from(y) });
    }
  }
  if (locator.active) locator.begin(t0, y);
  const s: Settings = { n, tEnd, dir, rtol, atol, maxStep, minStep, maxSteps };
  const h = options.h0 !== undefined ? Math.min(options.h0, maxStep) : initialStep(f, t0, y, k1, s, stats);

  // Stage buffers: k[0..11] = k1..k12, k[12] = f at the new point (FSAL, swapped with k[0]),
  // k[13..15] = the dense output's extra stages.
  const k: Float64Array[] = [k1];
  for (let j = 1; j < 16; j++) k.push(new Float64Array(n));
  let ycur = y;
  let ynew = new Float64Array(n);
  const ys = new Float64Array(n);
  let comp = new Float64Array(n);
  let compNew = new Float64Array(n);
  const rc = new Float64Array(8 * n);
  const A = DOP853_A;
  const C = DOP853_C;
  const B = DOP853_B;
  const ER = DOP853_ER;
  const BH1 = DOP853_BHH[0],
    BH2 = DOP853_BHH[1],
    BH3 = DOP853_BHH[2];
  const B1 = B[0],
    B6 = B[5],
    B7 = B[6],
    B8 = B[7],
    B9 = B[8],
    B10 = B[9],
    B11 = B[10],
    B12 = B[11];

  // t is carried compensated like y: the time reached is t + tc.
  let t = t0;
  let tc = 0;
  let hh = h;
  let lastRejected = false;
  let lastNonFinite = false;
  let steps = 0;
  let status: RK45Status = 'done';
  let message = '';
  const signal = options.signal;

  for (;;) {
    const floor = Math.max(minStep, UNDERFLOW_ULPS * EPS * Math.max(Math.abs(t), Math.abs(tEnd)));
    if (signal?.aborted) {
      status = 'cancelled';
      message = `cancelled at t=${t} after ${stats.accepted} accepted steps`;
      break;
    }
    if (steps >= maxSteps) {
      status = 'step-budget';
      message = `step budget of ${maxSteps} steps exhausted at t=${t} (tEnd=${tEnd})`;
      break;
    }
    if (!(hh > floor)) {
      status = 'step-underflow';
      message =
        `step size ${hh} fell below its minimum ${floor} at t=${t}` +
        (lastNonFinite ? ' (the derivative kept returning non-finite values)' : ' (tolerance cannot be met)');
      break;
    }
    let last = false;
    if ((t + 1.01 * dir * hh - tEnd) * dir >= 0) {
      hh = Math.abs(tEnd - t - tc);
      last = true;
    }
    const hs = dir * hh;
    steps++;

    // Stages 2..12.
    for (let st = 1; st < 12; st++) {
      const row = A[st - 1];
      const m = row.length;
      for (let i = 0; i < n; i++) {
        let acc = 0;
        for (let j = 0; j < m; j++) {
          const a = row[j];
          if (a !== 0) acc += a * k[j][i];
        }
        ys[i] = ycur[i] + hs * acc;
      }
      f(st === 11 ? (last ? tEnd : t + hs) : t + C[st] * hs, ys, k[st]);
    }
    const ka = k[0],
      k6 = k[5],
      k7 = k[6],
      k8 = k[7],
      k9 = k[8],
      k10 = k[9],
      k11 = k[10],
      k12 = k[11];
    // The 8th-order solution.
    // Compensated (Kahan) summation of y + Δy: the rounding error of each update is carried into
    // the next, so round-off does not grow with the step count (Hairer, Lubich & Wanner,
    // Geometric Numerical Integration, 2nd ed., §VIII.5).
    for (let i = 0; i < n; i++) {
      const d = hs * (B1 * ka[i] + B6 * k6[i] + B7 * k7[i] + B8 * k8[i] + B9 * k9[i] + B10 * k10[i] + B11 * k11[i] + B12 * k12[i]) + comp[i];
      const sum = ycur[i] + d;
      compNew[i] = d - (sum - ycur[i]);
      ynew[i] = sum;
    }
    stats.fevals += 11;

    // Error estimate (Hairer et al. §II.10, DOP853): 5th- and 3rd-order estimates combined.
    let err5 = 0;
    let err3 = 0;
    for (let i = 0; i < n; i++) {
      const sk = atol[i] + rtol * Math.max(Math.abs(ycur[i]), Math.abs(ynew[i]));
      const bsum = B1 * ka[i] + B6 * k6[i] + B7 * k7[i] + B8 * k8[i] + B9 * k9[i] + B10 * k10[i] + B11 * k11[i] + B12 * k12[i];
      const e3 = bsum - BH1 * ka[i] - BH2 * k9[i] - BH3 * k12[i];
      const e5 = ER[0] * ka[i] + ER[5] * k6[i] + ER[6] * k7[i] + ER[7] * k8[i] + ER[8] * k9[i] + ER[9] * k10[i] + ER[10] * k11[i] + ER[11] * k12[i];
      const r3 = e3 / sk;
      const r5 = e5 / sk;
      err3 += r3 * r3;
      err5 += r5 * r5;
    }
    let deno = err5 + 0.01 * err3;
    if (deno <= 0) deno = 1;
    const err = (hh * err5) / Math.sqrt(n * deno);

    if (!(err < Infinity)) {
      stats.rejected++;
      lastRejected = true;
      lastNonFinite = true;
      hh *= NONFINITE_SHRINK;
      continue;
    }
    lastNonFinite = false;
    const fac11 = err ** 0.125;
    if (err > 1) {
      hh /= Math.min(1 / DOP853_FAC_MIN, fac11 / DOP853_SAFETY);
      stats.rejected++;
      lastRejected = true;
      continue;
    }
    // Accepted (DOP853 with BETA = 0: no PI term).
    const fac = Math.max(1 / DOP853_FAC_MAX, Math.min(1 / DOP853_FAC_MIN, fac11 / DOP853_SAFETY));
    let hNew = hh / fac;
    // Compensated t + h (as y above): a fixed step such as maxStep would otherwise round the
    // same way every step and the time flown would drift from Σ h.
    const dt = hs + tc;
    const tsum = t + dt;
    const tn = last ? tEnd : tsum;
    const tcNew = last ? 0 : dt - (tsum - t);
    const kn = k[12];
    f(tn, ynew, kn);
    stats.fevals++;
    let finite = true;
    for (let i = 0; i < n; i++) if (!Number.isFinite(kn[i])) finite = false;
    if (!finite) {
      stats.rejected++;
      lastRejected = true;
      lastNonFinite = true;
      hh *= NONFINITE_SHRINK;
      continue;
    }
    stats.accepted++;

    let rcReady = false;
    if (dense) {
      denseCoeffs(f, n, t, hs, ycur, ynew, k, ys, rc, stats);
      dense.appendStep(t, hs, rc);
      rcReady = true;
    }
    if (locator.active && locator.detect(tn, ynew)) {
      if (!rcReady) denseCoeffs(f, n, t, hs, ycur, ynew, k, ys, rc, stats);
      const stopAt = locator.locate(t, hs, tn, ynew, rc, 8);
      if (!Number.isNaN(stopAt)) {
        const hit = locator.hits[locator.hits.length - 1];
        ycur.set(hit.y);
        t = stopAt;
        if (dense) dense.truncate(stopAt);
        status = 'event';
        message = `terminal event ${locator.label(hit.index)} at t=${t}`;
        hh = hNew;
        break;
      }
    }

    // Advance (FSAL: f at the new point is k1 of the next step).
    t = tn;
    tc = tcNew;
    const tmp = ycur;
    ycur = ynew;
    ynew = tmp;
    const ctmp = comp;
    comp = compNew;
    compNew = ctmp;
    k[12] = k[0];
    k[0] = kn;
    if (locator.active) locator.advance();
    if (hNew > maxStep) hNew = maxStep;
    if (lastRejected) hNew = Math.min(hNew, hh);
    lastRejected = false;
    hh = hNew;
    if (last) {
      message = `reached tEnd=${tEnd} in ${stats.accepted} accepted steps (${stats.rejected} rejected)`;
      break;
    }
  }
  return { t, y: Float64Array.from(ycur), status, message, stats, events: locator.hits, dense, hNext: dir * hh };
}

// The 7th-order continuous extension of the accepted step from (y, k) to ynew, k[12] = f(ynew)
// (Hairer et al. §II.10, DOP853 code): three extra stages into k[13..15], then r1..r8 into rc.
function denseCoeffs(
  f: OdeFunction,
  n: number,
  t: number,
  hs: number,
  y: Float64Array,
  ynew: Float64Array,
  k: Float64Array[],
  ys: Float64Array,
  rc: Float64Array,
  stats: SolveStats,
): void {
  for (let st = 0; st < 3; st++) {
    const row = DOP853_A_EXTRA[st];
    const m = row.length;
    for (let i = 0; i < n; i++) {
      let acc = 0;
      for (let j = 0; j < m; j++) {
        const a = row[j];
        if (a !== 0) acc += a * k[j][i];
      }
      ys[i] = y[i] + hs * acc;
    }
    f(t + DOP853_C_EXTRA[st] * hs, ys, k[13 + st]);
  }
  stats.fevals += 3;
  const k1 = k[0];
  const kn = k[12];
  for (let i = 0; i < n; i++) {
    const dy = ynew[i] - y[i];
    const bspl = hs * k1[i] - dy;
    rc[i] = y[i];
    rc[n + i] = dy;
    rc[2 * n + i] = bspl;
    rc[3 * n + i] = dy - hs * kn[i] - bspl;
  }
  for (let r = 0; r < 4; r++) {
    const row = DOP853_D[r];
    const base = (4 + r) * n;
    for (let i = 0; i < n; i++) {
      let acc = 0;
      for (let j = 0; j < 16; j++) {
        const d = row[j];
        if (d !== 0) acc += d * k[j][i];
      }
      rc[base + i] = hs * acc;
    }
  }
}

// Starting step size (Hairer et al. §II.4, the HINIT routine of the DOP853 code, order 8), RMS norms.
function initialStep(f: OdeFunction, t: number, y: Float64Array, k1: Float64Array, s: Settings, stats: SolveStats): number {
  const { n, dir, rtol, atol, maxStep } = s;
  let d0 = 0;
  let d1 = 0;
  for (let i = 0; i < n; i++) {
    const sk = atol[i] + rtol * Math.abs(y[i]);
    d0 += (y[i] / sk) ** 2;
    d1 += (k1[i] / sk) ** 2;
  }
  d0 = Math.sqrt(d0 / n);
  d1 = Math.sqrt(d1 / n);
  const hh = Math.min(d0 < 1e-5 || d1 < 1e-5 ? 1e-6 : 0.01 * (d0 / d1), maxStep);
  const ys = new Float64Array(n);
  const k2 = new Float64Array(n);
  for (let i = 0; i < n; i++) ys[i] = y[i] + dir * hh * k1[i];
  f(t + dir * hh, ys, k2);
  stats.fevals++;
  let d2 = 0;
  for (let i = 0; i < n; i++) {
    const sk = atol[i] + rtol * Math.abs(y[i]);
    d2 += ((k2[i] - k1[i]) / sk) ** 2;
  }
  d2 = Math.sqrt(d2 / n) / hh;
  if (!Number.isFinite(d2)) return hh * 1e-3;
  const dm = Math.max(d1, d2);
  const h1 = dm <= 1e-15 ? Math.max(1e-6, hh * 1e-3) : (0.01 / dm) ** 0.125;
  return Math.min(100 * hh, h1, maxStep);
}
