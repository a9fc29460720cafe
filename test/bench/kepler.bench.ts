/**
 * Kepler propagation throughput: core/orbit/kepler.ts (universal variables, Laguerre–Conway,
 * allocation-free path with `out`) on mixed elliptic and hyperbolic cases.
 *
 * Reference, measured in the same run on the same cases: the textbook element route — plain
 * Newton iteration on Kepler's equation E − e·sin E = M (or e·sinh H − H = M), started at
 * E = M (H = asinh(M/e)) and stopped at |ΔE| < 1e-13 (Curtis, Orbital Mechanics for Engineering
 * Students, Algorithm 3.1 / 3.2), then ν from core/orbit/anomaly.ts and the state from
 * core/orbit/elements.ts. Both also write into preallocated outputs. The two results are
 * compared, so the table also shows that they agree.
 */
import { eccentricToTrue, hyperbolicToTrue } from '../../core/orbit/anomaly.ts';
import { elementsToState } from '../../core/orbit/elements.ts';
import { propagateKepler } from '../../core/orbit/kepler.ts';
import { printTable, timeMedian } from './table.ts';

const MU = 3.0e14; // m³/s², an invented home-world value
const N = 20000;
const ROUNDS = 15;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1];
}

interface Cases {
  states: Float64Array[];
  dts: Float64Array;
  // element route inputs
  el: { p: number; e: number; i: number; raan: number; argp: number; nu: number }[];
  M0: Float64Array;
  n: Float64Array;
}

/** Deterministic cases (a small linear congruential generator, so runs compare). */
function makeCases(kind: 'ellipse' | 'hyperbola', seed: number): Cases {
  let s = seed >>> 0;
  const rnd = (): number => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
  const states: Float64Array[] = [];
  const dts = new Float64Array(N);
  const el: Cases['el'] = [];
  const M0 = new Float64Array(N);
  const n = new Float64Array(N);
  for (let k = 0; k < N; k++) {
    const e = kind === 'ellipse' ? 0.95 * rnd() : 1.05 + 8.95 * rnd();
    const rp = 6.0e6 + 4.0e7 * rnd();
    const p = rp * (1 + e);
    const a = p / (1 - e * e);
    const mm = Math.sqrt(MU / Math.abs(a) ** 3);
    let M: number;
    let nu: number;
    let dt: number;
    if (kind === 'ellipse') {
      M = 2 * Math.PI * rnd();
      // E from M by bisection (set-up only)
      let lo = 0,
        hi = 2 * Math.PI;
      for (let j = 0; j < 80; j++) {
        const mid = 0.5 * (lo + hi);
        if (mid - e * Math.sin(mid) < M) lo = mid;
        else hi = mid;
      }
      nu = eccentricToTrue(0.5 * (lo + hi), e);
      dt = (2 * rnd() - 1) * 3 * ((2 * Math.PI) / mm); // up to ±3 periods
    } else {
      const H = 3 * (2 * rnd() - 1);
      M = e * Math.sinh(H) - H;
      nu = hyperbolicToTrue(H, e);
      dt = (2 * rnd() - 1) * (20 / mm); // |ΔM| up to 20
    }
    const elk = { p, e, i: Math.PI * rnd(), raan: 2 * Math.PI * rnd(), argp: 2 * Math.PI * rnd(), nu };
    states.push(elementsToState(MU, elk, new Float64Array(6)) as Float64Array);
    el.push({ ...elk });
    dts[k] = dt;
    M0[k] = M;
    n[k] = mm;
  }
  return { states, dts, el, M0, n };
}

function runKepler(c: Cases, out: Float64Array[]): void {
  for (let k = 0; k < N; k++) propagateKepler(MU, c.states[k], c.dts[k], out[k]);
}

function runReference(c: Cases, out: Float64Array[], hyperbolic: boolean): void {
  for (let k = 0; k < N; k++) {
    const el = c.el[k];
    const e = el.e;
    const M = c.M0[k] + c.n[k] * c.dts[k];
    if (!hyperbolic) {
      let E = M;
      for (let j = 0; j < 100; j++) {
        const d = (E - e * Math.sin(E) - M) / (1 - e * Math.cos(E));
        E -= d;
        if (Math.abs(d) < 1e-13) break;
      }
      el.nu = eccentricToTrue(E, e);
    } else {
      let H = Math.asinh(M / e);
      for (let j = 0; j < 100; j++) {
        const d = (e * Math.sinh(H) - H - M) / (e * Math.cosh(H) - 1);
        H -= d;
        if (Math.abs(d) < 1e-13 * Math.max(1, Math.abs(H))) break;
      }
      el.nu = hyperbolicToTrue(H, e);
    }
    elementsToState(MU, el, out[k]);
  }
}

function maxRelDiff(a: Float64Array[], b: Float64Array[]): number {
  let m = 0;
  for (let k = 0; k < N; k++) {
    const r = Math.hypot(b[k][0], b[k][1], b[k][2]);
    const v = Math.hypot(b[k][3], b[k][4], b[k][5]);
    for (let j = 0; j < 3; j++) m = Math.max(m, Math.abs(a[k][j] - b[k][j]) / r, Math.abs(a[k][j + 3] - b[k][j + 3]) / v);
  }
  return m;
}

export async function run(): Promise<void> {
  const rows: (string | number)[][] = [];
  for (const kind of ['ellipse', 'hyperbola'] as const) {
    const c = makeCases(kind, kind === 'ellipse' ? 12345 : 54321);
    const outK = Array.from({ length: N }, () => new Float64Array(6));
    const outR = Array.from({ length: N }, () => new Float64Array(6));
    // interleave the two so that load from other processes hits both alike
    const sk: number[] = [];
    const sr: number[] = [];
    for (let round = 0; round < ROUNDS; round++) {
      sk.push(timeMedian(() => runKepler(c, outK), 1, round === 0 ? 3 : 0).median);
      sr.push(timeMedian(() => runReference(c, outR, kind === 'hyperbola'), 1, round === 0 ? 3 : 0).median);
    }
    const tk = median(sk);
    const tr = median(sr);
    const rateK = N / (tk / 1000);
    const rateR = N / (tr / 1000);
    rows.push([
      kind === 'ellipse' ? 'ellipse, e ∈ [0, 0.95), |Δt| ≤ 3 T' : 'hyperbola, e ∈ [1.05, 10), |ΔM| ≤ 20',
      Math.round(rateK),
      Math.round(rateR),
      rateK / rateR,
      maxRelDiff(outK, outR),
    ]);
  }
  printTable(['case', 'propagateKepler /s', 'Newton+elements /s', 'ratio', 'max rel. difference'], rows);
  console.log('  target: propagateKepler ≥ 1e6 /s on one core');
}
