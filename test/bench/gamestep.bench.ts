/**
 * Game-step check and system stability check speed.
 *
 * Figures:
 * - the game-step check of the demo plan (test/fixtures/demoPlan.ts) at 1/60 s over the spans
 *   flown at that step (the 234-day cruise is extrapolated by step scaling), velocity Verlet in
 *   float64 and semi-implicit Euler in float32 with a floating origin: wall time and steps per
 *   second over all the steps the check takes (flown, extrapolation flights, energy probes);
 * - the stability run of the demo system for 10,000 years (moons merged, as the step budget
 *   decides): wall time and steps per second;
 * - the stability run for 1,000,000 years (Wisdom–Holman, the check's default): extrapolated ×10
 *   from 100,000 years unless the bench is given the argument 1e6years, against the 10,000-year
 *   Wisdom–Holman and Yoshida 4 runs ×100.
 * References in the same run:
 * - the reference flight of the plan (what every check builds first; DOP853 at rtol 1e-13, and
 *   the run at MIN_RTOL that estimates its error) — its wall time;
 * - a bare semi-implicit Euler loop on one central body, local variables only, for as many
 *   steps as the check flew (the cost floor of a game step);
 * - a plain leapfrog (kick–drift–kick) loop of the same n bodies and step count as the
 *   stability run, written inline (the cost floor of the n-body run; the check's Yoshida 4
 *   takes three force evaluations per step).
 */
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { gameStepCheck, prepareGameStep } from '../../core/gamestep/check.ts';
import { checkStability } from '../../core/checks/stability.ts';
import { initialStates } from '../../core/system/nbodyEphemeris.ts';
import { demoPlan } from '../fixtures/demoPlan.ts';
import { bareEuler, printTable } from './table.ts';

const SYSTEM_PATH = new URL('../../assets/systems/ilmar.system.json', import.meta.url);
/** Command-line argument that makes the 1,000,000-year stability row run for real. */
const LONG_ARG = '1e6years';

function bareLeapfrog(mus: Float64Array, x0: Float64Array, v0: Float64Array, h: number, steps: number): number {
  const N = mus.length;
  const x = Float64Array.from(x0);
  const v = Float64Array.from(v0);
  const a = new Float64Array(3 * N);
  const accel = (): void => {
    a.fill(0);
    for (let i = 0; i < N; i++) {
      for (let j = i + 1; j < N; j++) {
        const dx = x[3 * j] - x[3 * i],
          dy = x[3 * j + 1] - x[3 * i + 1],
          dz = x[3 * j + 2] - x[3 * i + 2];
        const r2 = dx * dx + dy * dy + dz * dz;
        const inv3 = 1 / (r2 * Math.sqrt(r2));
        a[3 * i] += mus[j] * inv3 * dx;
        a[3 * i + 1] += mus[j] * inv3 * dy;
        a[3 * i + 2] += mus[j] * inv3 * dz;
        a[3 * j] -= mus[i] * inv3 * dx;
        a[3 * j + 1] -= mus[i] * inv3 * dy;
        a[3 * j + 2] -= mus[i] * inv3 * dz;
      }
    }
  };
  accel();
  for (let k = 0; k < steps; k++) {
    for (let i = 0; i < 3 * N; i++) {
      v[i] += 0.5 * h * a[i];
      x[i] += h * v[i];
    }
    accel();
    for (let i = 0; i < 3 * N; i++) v[i] += 0.5 * h * a[i];
  }
  return x[0];
}

function time<T>(fn: () => T): { ms: number; value: T } {
  const t0 = performance.now();
  const value = fn();
  return { ms: performance.now() - t0, value };
}

export async function run(): Promise<void> {
  const { system } = parseSystemFile(readFileSync(SYSTEM_PATH, 'utf8'));
  const rows: (string | number)[][] = [];

  const prep = time(() => prepareGameStep(system, demoPlan));
  const ref = prep.value.referenceStats;
  rows.push([
    `reference flight of the plan (${ref.method}, rtol ${prep.value.rtol}, with its self-check run)`,
    `${prep.ms.toFixed(0)} ms`,
    `${ref.steps} steps`,
    '',
    '',
  ]);

  for (const physics of [
    { integrator: 'verlet' as const, dt: 1 / 60 },
    { integrator: 'symplectic-euler' as const, dt: 1 / 60, precision: 'float32' as const, rebase: { distance: 10_000, velocity: true } },
  ]) {
    const label = `${physics.integrator} 1/60 s ${physics.precision ?? 'float64'}${physics.rebase ? ' + origin' : ''}`;
    const r = time(() => gameStepCheck(system, demoPlan, { physics, prepared: prep.value }));
    const s = r.value.stats;
    const all = s.gameSteps + s.windowSteps + s.probeSteps;
    const rate = all / (r.ms / 1000);
    const bare = time(() => bareEuler(all, 1 / 60));
    const bareRate = all / (bare.ms / 1000);
    rows.push([
      `game-step check: ${label}`,
      `${(r.ms / 1000).toFixed(2)} s`,
      `${s.gameSteps} flown + ${s.windowSteps} extrapolation + ${s.probeSteps} probe steps`,
      '',
      '',
    ]);
    rows.push([
      `  steps per second (all steps of the check)`,
      `${(rate / 1e6).toFixed(1)} M/s`,
      `bare Euler loop ${(bareRate / 1e6).toFixed(1)} M/s`,
      (rate / bareRate).toFixed(2),
      '',
    ]);
    rows.push([`  whole mission at 1/60 s`, `${s.missionSteps} steps`, `at this rate ≈ ${(s.missionSteps / rate).toFixed(0)} s if flown whole`, '', '']);
    rows.push([`  arrival miss`, `${r.value.arrival?.positionError.toFixed(2)} m (${r.value.arrival?.basis})`, r.value.passes ? 'passes' : 'fails', '', '']);
  }

  const st = time(() => checkStability(system, { years: 10_000, method: 'yoshida4' }));
  const sr = st.value;
  const stRate = sr.steps / (st.ms / 1000);
  // the same bodies (merged as the run merged them) in a plain leapfrog loop
  const { x0, v0, mus } = initialStates(system);
  const keep = [0, ...sr.bodies.map((b) => b.index)];
  const mx = new Float64Array(3 * keep.length);
  const mv = new Float64Array(3 * keep.length);
  const mm = new Float64Array(keep.length);
  keep.forEach((k, j) => {
    const group = j === 0 ? [0] : [k, ...(sr.bodies[j - 1].merged ?? [])];
    for (const g of group) {
      mm[j] += mus[g];
      for (let c = 0; c < 3; c++) {
        mx[3 * j + c] += mus[g] * x0[3 * g + c];
        mv[3 * j + c] += mus[g] * v0[3 * g + c];
      }
    }
    for (let c = 0; c < 3; c++) {
      mx[3 * j + c] /= mm[j];
      mv[3 * j + c] /= mm[j];
    }
  });
  const lf = time(() => bareLeapfrog(mm, mx, mv, sr.h, sr.steps));
  const lfRate = sr.steps / (lf.ms / 1000);
  rows.push([
    `stability: demo, 10,000 years (${sr.method}, ${keep.length} bodies${sr.mergedMoons ? ', moons merged' : ''})`,
    `${(st.ms / 1000).toFixed(2)} s`,
    `plain leapfrog loop ${(lf.ms / 1000).toFixed(2)} s`,
    (st.ms / lf.ms).toFixed(2),
    '',
  ]);
  rows.push([
    `  steps per second`,
    `${(stRate / 1e6).toFixed(2)} M/s`,
    `leapfrog ${(lfRate / 1e6).toFixed(2)} M/s`,
    (stRate / lfRate).toFixed(2),
    `energy error ${sr.energy.maxRelativeError.toExponential(1)}`,
  ]);
  // the Wisdom–Holman map (the check's default) against Yoshida 4 and against the leapfrog floor at its own step count
  const wt = time(() => checkStability(system, { years: 10_000, method: 'wisdom-holman', mergeMoons: true }));
  const wr = wt.value;
  const lfw = time(() => bareLeapfrog(mm, mx, mv, wr.h, wr.steps));
  const kilnDrift = (r: typeof sr): number => {
    const e = r.bodies.find((b) => b.id === 'kiln')?.history.e;
    return e ? e[e.length - 1] - e[0] : Number.NaN;
  };
  rows.push([
    `stability: demo, 10,000 years (wisdom-holman with corrector, ${wr.steps} steps)`,
    `${(wt.ms / 1000).toFixed(2)} s`,
    `Yoshida 4 ${(st.ms / 1000).toFixed(2)} s; leapfrog floor at ${wr.steps} steps ${(lfw.ms / 1000).toFixed(2)} s`,
    `${(wt.ms / st.ms).toFixed(2)} / ${(wt.ms / lfw.ms).toFixed(2)}`,
    `energy error ${wr.energy.maxRelativeError.toExponential(1)} (Yoshida ${sr.energy.maxRelativeError.toExponential(1)}); Kiln Δe ${kilnDrift(wr).toExponential(3)} (Yoshida ${kilnDrift(sr).toExponential(3)})`,
  ]);

  // 1,000,000 years: run for real with the argument LONG_ARG (`npm run bench -- gamestep 1e6years`),
  // otherwise extrapolated ×10 from 100,000 years (and labelled so); the references are the
  // 10,000-year Wisdom–Holman and Yoshida 4 runs above, scaled ×100
  const long = process.argv.includes(LONG_ARG);
  const longYears = long ? 1_000_000 : 100_000;
  const scale = 1_000_000 / longYears;
  const mt = time(() => checkStability(system, { years: longYears, method: 'wisdom-holman', mergeMoons: true }));
  const mr = mt.value;
  const millionS = (mt.ms * scale) / 1000;
  rows.push([
    `stability: demo, 1,000,000 years (wisdom-holman, ${(mr.steps * scale).toExponential(2)} steps)${long ? '' : `, extrapolated ×${scale} from ${longYears.toLocaleString('en-US')} years (pass ${LONG_ARG} to run it)`}`,
    `${millionS.toFixed(1)} s`,
    `10,000-year runs ×100: Wisdom–Holman ${(wt.ms / 10).toFixed(1)} s, Yoshida 4 ${(st.ms / 10).toFixed(1)} s`,
    `${(millionS / (wt.ms / 10)).toFixed(2)} / ${(millionS / (st.ms / 10)).toFixed(3)}`,
    `energy error ${mr.energy.maxRelativeError.toExponential(1)} (10,000 years: ${wr.energy.maxRelativeError.toExponential(1)}; Yoshida ${sr.energy.maxRelativeError.toExponential(1)}); goal about a minute`,
  ]);

  console.log('game-step and stability checks');
  printTable(['figure', 'value', 'reference', 'ratio', 'note'], rows);
}
