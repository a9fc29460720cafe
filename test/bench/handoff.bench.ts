/**
 * Retargeting the demo plan for a game at 1/60 s (semi-implicit Euler, float64).
 *
 * Figures:
 * - retargeting with the verification's long cruise extrapolated (what the 15 s goal is
 *   for), wall time including the plan's reference flights, and the game flights and steps it took;
 * - the same with the verification flying every one of the mission's 1.26e9 steps (the default);
 * - whole-process: the `waymark handoff` command in a fresh Node process when it exists (built CLI
 *   when `npm run build:cli` has run, else through tsx).
 * References in the same run:
 * - the game-step check of the same plan at the same physics (what a designer runs first);
 * - a bare semi-implicit Euler loop for as many steps as the every-step verification flew (the
 *   cost floor of flying every step).
 */
import { existsSync, readFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { gameStepCheck } from '../../core/gamestep/index.ts';
import { retargetForGame } from '../../core/handoff/index.ts';
import { demoPlan } from '../fixtures/demoPlan.ts';
import { bareEuler, printTable } from './table.ts';

const SYSTEM_PATH = new URL('../../assets/systems/ilmar.system.json', import.meta.url);
const ROOT = fileURLToPath(new URL('../../', import.meta.url));

function time<T>(fn: () => T): { ms: number; value: T } {
  const t0 = performance.now();
  const value = fn();
  return { ms: performance.now() - t0, value };
}

export function run(): void {
  const { system } = parseSystemFile(readFileSync(SYSTEM_PATH, 'utf8'));
  const physics = { integrator: 'symplectic-euler' as const, dt: 1 / 60 };
  const rows: (string | number)[][] = [];
  const check = time(() => gameStepCheck(system, demoPlan, { physics }));
  const ext = time(() => retargetForGame(system, demoPlan, { physics, verify: 'extrapolated', compare: false }));
  const s = ext.value.stats;
  rows.push([
    'retarget, verification extrapolated',
    `${(ext.ms / 1000).toFixed(2)} s`,
    `game-step check ${(check.ms / 1000).toFixed(2)} s`,
    (ext.ms / check.ms).toFixed(2),
    `${ext.value.status}; ${s.gameFlights} game flights, ${(s.gameSteps / 1e6).toFixed(0)} M + ${(s.coarseSteps / 1e6).toFixed(0)} M coarse steps, ${s.referenceFlights} reference flights; goal < 15 s`,
  ]);
  const every = time(() => retargetForGame(system, demoPlan, { physics, verify: 'every-step', compare: false }));
  const vSteps = every.value.verification.steps;
  const bare = time(() => bareEuler(vSteps, physics.dt));
  rows.push([
    'retarget, verification at every step',
    `${(every.ms / 1000).toFixed(2)} s`,
    `bare Euler loop, ${(vSteps / 1e9).toFixed(2)} G steps: ${(bare.ms / 1000).toFixed(2)} s`,
    ((every.ms - ext.ms) / bare.ms).toFixed(2),
    'ratio: the verification (this row minus the one above) to the bare loop',
  ]);
  const worst = Math.max(...every.value.goals.map((g) => (g.after === null ? Number.POSITIVE_INFINITY : Math.abs(g.after - g.wanted) / g.tolerance)));
  rows.push(['  largest goal miss in tolerances', worst.toFixed(3), '≤ 1 is met', '', every.value.status]);
  const built = `${ROOT}dist/cli/waymark.js`;
  const cmd = existsSync(built) ? ['node', [built]] : ['npx', ['tsx', `${ROOT}app/cli/main.ts`]];
  const help = spawnSync(cmd[0] as string, [...(cmd[1] as string[]), 'handoff', '--help'], { cwd: ROOT, encoding: 'utf8' });
  if (help.status === 0) {
    const args = [
      ...(cmd[1] as string[]),
      'handoff',
      'assets/plans/tessel-to-ochre.plan.json',
      '--integrator',
      'symplectic-euler',
      '--dt',
      String(1 / 60),
      '--verify',
      'extrapolated',
    ];
    const p = time(() => spawnSync(cmd[0] as string, args, { cwd: ROOT, encoding: 'utf8' }));
    rows.push([
      `whole process: waymark handoff (${existsSync(built) ? 'built' : 'tsx'}), extrapolated`,
      `${(p.ms / 1000).toFixed(2)} s`,
      'goal 15 s',
      (p.ms / 15000).toFixed(2),
      `exit ${p.value.status}`,
    ]);
  } else {
    rows.push(['whole process: waymark handoff', 'skipped', 'the command is not there', '', '']);
  }
  console.log('retargeting for a game (demo, semi-implicit Euler 1/60 s, float64)');
  printTable(['figure', 'value', 'reference', 'ratio', 'note'], rows);
}
