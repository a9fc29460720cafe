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
 * - Dense output and event location use the cubic Hermite interpolant through (y, f) at the
 *   step ends (dense.ts hermiteCoefficients; 4th order), NOT the book's 7th-order continuous
 *   extension (its three extra stages are not implemented). Between steps it is far less
 *   accurate than the step ends: use rk45 where dense output at tight tolerances matters.
 * - Non-finite derivative values reject the trial step and shrink it; a non-finite derivative at
 *   the initial point throws SolverError 'non-finite'.
 * - The state update uses compensated summation, so round-off stays near one ulp over long runs.
 * - The step loop allocates nothing: stage buffers are Float64Arrays created once per solve.
 */
import { InputError, SolverError, requireFinite } from '../math/index.ts';
import { DenseOutput, hermiteCoefficients } from './dense.ts';
import { EventLocator, checkEvents } from './eventLocator.ts';
import type { OdeFunction, SolveStats } from './ode.ts';
import { DEFAULT_ATOL, DEFAULT_MAX_STEPS, DEFAULT_RTOL, MIN_RTOL, type RK45Options, type RK45Result, type RK45Status } from './rk45.ts';

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

/** Nodes c_1..c_12 of the DOP853 tableau (Hairer et al. §II.10, DOP853 code). */
export const DOP853_C: readonly number[] = [
  0,
  0.526001519587677318785587544488e-1,
  0.789002279381515978178381316732e-1,
  0.11835034190722739672675719751,
  0.28164965809277260327324280249,
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
  [0.526001519587677318785587544488e-1],
  [1.97250569845378994544595329183e-2, 5.91751709536136983633785987549e-2],
  [2.95875854768068491816892993775e-2, 0, 8.87627564304205475450678981324e-2],
  [2.41365134159266685502369798665e-1, 0, -8.84549479328286085344864962717e-1, 9.24834003261792003115737966543e-1],
  [3.7037037037037037037037037037e-2, 0, 0, 1.70828608729473871279604482173e-1, 1.25467687566822425016691814123e-1],
  [3.7109375e-2, 0, 0, 1.70252211019544039314978060272e-1, 6.02165389804559606850219397283e-2, -1.7578125e-2],
  [
    3.70920001185047927108779319836e-2, 0, 0, 1.70383925712239993810214054705e-1, 1.07262030446373284651809199168e-1, -1.53194377486244017527936158236e-2,
    8.27378916381402288758473766002e-3,
  ],
  [
    6.24110958716075717114429577812e-1, 0, 0, -3.36089262944694129406857109825, -8.68219346841726006818189891453e-1, 2.75920996994467083049415600797e1,
    2.01540675504778934086186788979e1, -4.34898841810699588477366255144e1,
  ],
  [
    4.77662536438264365890433908527e-1, 0, 0, -2.48811461997166764192642586468, -5.90290826836842996371446475743e-1, 2.12300514481811942347288949897e1,
    1.52792336328824235832596922938e1, -3.32882109689848629194453265587e1, -2.03312017085086261358222928593e-2,
  ],
  [
    -9.3714243008598732571704021658e-1, 0, 0, 5.18637242884406370830023853209, 1.09143734899672957818500254654, -8.14978701074692612513997267357,
    -1.85200656599969598641566180701e1, 2.27394870993505042818970056734e1, 2.49360555267965238987089396762, -3.0467644718982195003823669022,
  ],
  [
    2.27331014751653820792359768449, 0, 0, -1.05344954667372501984066689879e1, -2.00087205822486249909675718444, -1.79589318631187989172765950534e1,
    2.79488845294199600508499808837e1, -2.85899827713502369474065508674, -8.87285693353062954433549289258, 1.23605671757943030647266201528e1,
    6.43392746015763530355970484046e-1,
  ],
];

/** 8th-order weights b_1..b_12. */
export const DOP853_B: readonly number[] = [
  5.42937341165687622380535766363e-2, 0, 0, 0, 0, 4.45031289275240888144113950566, 1.89151789931450038304281599044, -5.8012039600105847814672114227,
  3.1116436695781989440891606237e-1, -1.52160949662516078556178806805e-1, 2.01365400804030348374776537501e-1, 4.47106157277725905176885569043e-2,
];

/** 3rd-order embedded weights: non-zero b̂_1, b̂_9, b̂_12 (DOP853 BHH1..3). */
export const DOP853_BHH: readonly number[] = [0.244094488188976377952755905512, 0.733846688281611857341361741547, 0.220588235294117647058823529412e-1];

/** 5th-order error coefficients ER_1..ER_12 (b − b̂5). */
export const DOP853_ER: readonly number[] = [
  0.1312004499419488073250102996e-1, 0, 0, 0, 0, -0.1225156446376204440720569753e1, -0.4957589496572501915214079952, 0.1664377182454986536961530415e1,
  -0.350328848749973681688648729, 0.3341791187130174790297318841, 0.8192320648511571246570742613e-1, -0.2235530786388629525884427845e-1,
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
  if (rtol < MIN_RTOL) throw new InputError('rtol', `must be >= ${MIN_RTOL} (100 ulps); tighter cannot be met in double precision`, rtol);
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
  const dense = options.dense ? new DenseOutput(n, t0) : undefined;
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

  // Stage buffers: k[0..11] = k1..k12, k[12] = f at the new point (FSAL, swapped with k[0]).
  const k: Float64Array[] = [k1];
  for (let j = 1; j < 13; j++) k.push(new Float64Array(n));
  let ycur = y;
  let ynew = new Float64Array(n);
  const ys = new Float64Array(n);
  let comp = new Float64Array(n);
  let compNew = new Float64Array(n);
  const rc = new Float64Array(5 * n);
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

  let t = t0;
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
      hh = Math.abs(tEnd - t);
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
    const tn = last ? tEnd : t + hs;
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
      hermiteCoefficients(n, hs, ycur, ka, ynew, kn, rc);
      dense.appendStep(t, hs, rc);
      rcReady = true;
    }
    if (locator.active && locator.detect(tn, ynew)) {
      if (!rcReady) hermiteCoefficients(n, hs, ycur, ka, ynew, kn, rc);
      const stopAt = locator.locate(t, hs, tn, ynew, rc);
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
