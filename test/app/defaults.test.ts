/**
 * The command line and the app start from the same defaults and names (core/io/defaults.ts):
 * the commander program's option defaults and help, and the app's form-default helpers.
 */
import { describe, expect, it } from 'vitest';
import type { Command, Option } from 'commander';
import { buildProgram } from '../../app/cli/main.ts';
import { resolveRequest } from '../../app/cli/commands/windows.ts';
import {
  ALTITUDE_MARGIN,
  DISPERSION_DEFAULTS,
  GAME_STEP_DEFAULTS,
  INTEGRATOR_NAMES,
  PORKCHOP_GRID,
  PORKCHOP_GRID_CHOICES,
  RESOLVE_NAMES,
  STABILITY_METHODS,
  WINDOW_COUNT,
  integratorName,
  orbitAltitude,
  type IntegratorId,
} from '../../core/io/index.ts';
import { GAME_INTEGRATORS } from '../../core/gamestep/index.ts';
import { dispersionFormDefaults, dispersionOptions, RESOLVE_CHOICES } from '../../app/renderer/analysis/dispersionForm.ts';
import { methodGroups } from '../../app/renderer/analysis/methods.ts';
import { DEFAULT_FORM, INTEGRATOR_NAMES as PANEL_NAMES, physicsCaption } from '../../app/renderer/gamestep/physicsForm.ts';
import { initialWindowsForm } from '../../app/renderer/windows/windowsForm.ts';
import { blankPlan } from '../../app/renderer/state/session.ts';
import { demoSystem } from '../core/search/fixtures.ts';

const program = buildProgram();
const command = (name: string): Command => program.commands.find((c) => c.name() === name)!;
const option = (cmd: string, flag: string): Option => command(cmd).options.find((o) => o.long === flag)!;
const defaultOf = (cmd: string, flag: string): unknown => option(cmd, flag).defaultValue;

describe('one set of defaults for the command line and the app', () => {
  it('dispersion: the same samples, σ and mode (the command line once ran 0 σ, frozen)', () => {
    const app = dispersionFormDefaults();
    expect(Number(defaultOf('disperse', '--samples'))).toBe(app.samples);
    expect(Number(defaultOf('disperse', '--mag-sigma'))).toBe(app.magnitudeSigma);
    expect(Number(defaultOf('disperse', '--point-sigma'))).toBe(app.pointingSigma);
    expect(defaultOf('disperse', '--resolve')).toBe(app.resolve);
    expect(Number(defaultOf('disperse', '--seed'))).toBe(dispersionOptions(app).seed);
    expect(app).toEqual({
      samples: DISPERSION_DEFAULTS.samples,
      magnitudeSigma: DISPERSION_DEFAULTS.magnitudeSigmaPct,
      pointingSigma: DISPERSION_DEFAULTS.pointingSigmaDeg,
      resolve: DISPERSION_DEFAULTS.resolve,
    });
    // not a run of identical samples
    expect(app.magnitudeSigma).toBeGreaterThan(0);
    expect(app.pointingSigma).toBeGreaterThan(0);
    // the modes' words are the same in the panel's choice and the command line's help
    for (const c of RESOLVE_CHOICES) {
      expect(c.label).toBe(RESOLVE_NAMES[c.value]);
      expect(option('disperse', '--resolve').description).toContain(c.label);
    }
  });

  it('game step: the same integrator, step and models in the panel and `gamestep`', () => {
    expect(defaultOf('gamestep', '--integrator')).toBe(DEFAULT_FORM.integrator);
    expect(defaultOf('gamestep', '--dt')).toBe(DEFAULT_FORM.dt);
    expect(defaultOf('gamestep', '--gravity')).toBe(DEFAULT_FORM.gravity);
    expect(defaultOf('gamestep', '--burns')).toBe(DEFAULT_FORM.burns);
    expect(defaultOf('gamestep', '--guidance')).toBe(DEFAULT_FORM.guidance);
    expect(Number(defaultOf('gamestep', '--rebase-distance'))).toBe(Number(DEFAULT_FORM.rebaseDistance));
    expect(DEFAULT_FORM.integrator).toBe(GAME_STEP_DEFAULTS.integrator);
    expect(DEFAULT_FORM.warpDt).toBe(GAME_STEP_DEFAULTS.coastStep);
  });

  it('porkchop: the same grid, window count, flight times and safe altitudes', () => {
    const system = demoSystem();
    expect(defaultOf('windows', '--grid')).toBe(`${PORKCHOP_GRID}x${PORKCHOP_GRID}`);
    expect(defaultOf('windows', '--top')).toBe(String(WINDOW_COUNT));
    expect(PORKCHOP_GRID_CHOICES).toContain(PORKCHOP_GRID);
    for (const flag of ['--parking', '--capture']) expect(option('windows', flag).description).toContain(`+ ${ALTITUDE_MARGIN / 1e3} km`);
    const o = { system: '', grid: `${PORKCHOP_GRID}x${PORKCHOP_GRID}`, parkingE: '0', captureE: '0', revs: '0', metric: 'total', workers: '0', top: '5' };
    // a plan with no orbit of its own at the pair's bodies: the app's form is the command line's request
    const plan = { ...blankPlan(system), start: { ...blankPlan(system).start, body: 'kiln', periapsisAltitude: 0 } } as ReturnType<typeof blankPlan>;
    for (const [from, to] of [
      ['kiln', 'ochre'],
      ['tessel', 'skerry'],
      ['moravel', 'lough'],
    ]) {
      const p = { ...plan, start: { ...plan.start, body: from }, target: { ...(plan.target ?? {}), body: to, periapsisAltitude: -1 } } as typeof plan;
      const app = initialWindowsForm(system, p, PORKCHOP_GRID);
      const cli = resolveRequest(system, { ...o, from, to }).request;
      const label = `${from} → ${to}`;
      expect([app.tofMin, app.tofMax], label).toEqual([cli.second.start, cli.second.end]);
      expect(app.departEnd - app.departStart, label).toBe(cli.depart.end - cli.depart.start);
      expect([app.parkingAlt, app.captureAlt], label).toEqual([cli.parkingAltitude, cli.arrivalAltitude]);
      expect(app.captureAlt).toBe(orbitAltitude(system.bodies[cli.to]));
      expect(app.gridN).toBe(PORKCHOP_GRID);
    }
  });

  it('integrators: one display name per id, used by the game-step panel, the n-body readout and the command line (gamestep, stability)', () => {
    expect(PANEL_NAMES).toBe(INTEGRATOR_NAMES);
    const help = option('gamestep', '--integrator').description;
    for (const id of GAME_INTEGRATORS) {
      expect(help).toContain(`${id} = ${INTEGRATOR_NAMES[id]}`);
      expect(physicsCaption({ ...DEFAULT_FORM, integrator: id, dt: 1, rebase: null }).startsWith(INTEGRATOR_NAMES[id])).toBe(true);
    }
    expect(defaultOf('stability', '--method')).toBe(STABILITY_METHODS[0]);
    for (const id of STABILITY_METHODS) expect(option('stability', '--method').description).toContain(`${id} = ${INTEGRATOR_NAMES[id]}`);
    for (const id of Object.keys(INTEGRATOR_NAMES) as IntegratorId[]) {
      const [g] = methodGroups([{ t0: 0, t1: 1, method: id, reason: 'default' } as never]);
      expect(g.label).toBe(integratorName(id));
    }
  });
});
