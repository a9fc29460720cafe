/**
 * `waymark stability SYSTEM [--years N] [--json]` — flies the mutual gravity of the star and
 * every body of a system file for N years of its calendar (default 10,000) with a symplectic
 * method and reports what happened to each orbit (core/checks/stability.ts).
 *
 * Options: --merge-moons / --no-merge-moons (default: merge when flying the moons would exceed
 * the step budget, and say so), --method wisdom-holman|yoshida4|verlet (default
 * wisdom-holman; or the names' slugs, core/io/defaults.ts), --steps-per-orbit N, --max-steps N,
 * --samples N. A progress bar is drawn on stderr at a terminal.
 * Text: step and span, the energy error of the run, a table per body (a, e, i ranges), the
 * sibling pairs (epoch spacing and closest approach in mutual Hill radii), the flags; `--json`:
 * the whole result in SI with the element histories as arrays. Exit code: 0 no flag, 1 flags
 * raised, 2 bad input or file, 3 numerical failure.
 */
import type { Command } from 'commander';
import { InputError } from '../../../core/math/index.ts';
import { integratorChoices, integratorName, parseIntegrator, STABILITY_METHODS } from '../../../core/io/index.ts';
import { checkStability, DEFAULT_YEARS, type StabilityResult } from '../../../core/checks/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { loadSystemFile } from '../../node/files.ts';
import { EXIT_NO, EXIT_OK, guard, num, printJson, printText, printWarnings } from '../output.ts';
import { STABILITY_FLAGS } from '../flags.ts';
import { createProgress, progressEnabled } from '../progress.ts';

const DEG = 180 / Math.PI;

interface StabilityCliOptions {
  years: string;
  mergeMoons?: boolean;
  method: string;
  stepsPerOrbit?: string;
  maxSteps?: string;
  samples?: string;
  json?: boolean;
}

function positive(field: string, text: string, integer: boolean): number {
  const v = Number(text);
  if (!Number.isFinite(v) || !(v > 0) || (integer && !Number.isInteger(v))) {
    throw new InputError(field, integer ? 'must be a whole number > 0' : 'must be a number > 0', text);
  }
  return v;
}

function pad(s: string, n: number, right = false): string {
  return right ? s.padStart(n) : s.padEnd(n);
}

/** The text report. */
export function stabilityText(system: StarSystem, r: StabilityResult): string {
  const out: string[] = [];
  const B = system.bodies;
  out.push(`stability of ${system.name}: ${num(r.years, 1)} years (${integratorName(r.method)}, step ${num(r.h / 86400, 4)} d, ${r.steps} steps)`);
  out.push(`energy error of the run: largest ${r.energy.maxRelativeError.toExponential(2)}, final ${r.energy.finalRelativeError.toExponential(2)} (relative)`);
  if (r.mergedMoons) out.push(`note: ${r.mergeReason}`);
  out.push('');
  out.push(
    [pad('body', 10), pad('about', 9), pad('a (Gm)', 10, true), pad('a range', 18, true), pad('e range', 16, true), pad('i range (deg)', 18, true)].join(' '),
  );
  for (const b of r.bodies) {
    out.push(
      [
        pad(b.name.slice(0, 10), 10),
        pad(B[b.parent].name.slice(0, 9), 9),
        pad(num(b.a.initial / 1e9, 3), 10, true),
        pad(`${num((b.a.min / b.a.initial - 1) * 100, 3)}..+${num((b.a.max / b.a.initial - 1) * 100, 3)} %`, 18, true),
        pad(`${num(b.e.min, 4)}..${num(b.e.max, 4)}`, 16, true),
        pad(`${num(b.i.min * DEG, 3)}..${num(b.i.max * DEG, 3)}`, 18, true),
      ].join(' '),
    );
  }
  out.push('');
  out.push([pad('pair', 22), pad('Δa / R_H', 10, true), pad('closest / R_H', 14, true)].join(' '));
  for (const p of r.pairs) out.push([pad(`${B[p.a].name}–${B[p.b].name}`, 22), pad(num(p.spacing, 2), 10, true), pad(num(p.minHill, 2), 14, true)].join(' '));
  out.push('');
  if (r.flags.length === 0) out.push('no flags: no crossing orbits, close encounters (< 3 mutual Hill radii), ejections or collisions');
  for (const f of r.flags) out.push(`${f.severity.padEnd(7)} ${f.code}: ${f.message}`);
  for (const n of r.notes) if (n !== r.mergeReason) out.push(`note: ${n}`);
  return out.join('\n');
}

export function addStabilityCommand(program: Command): void {
  program
    .command('stability')
    .description('fly the mutual gravity of a system for N years and report orbit ranges, close approaches and flags')
    .argument('<system>', 'system file (.system.json)')
    .option('--years <n>', "span in years of the system's calendar", String(DEFAULT_YEARS))
    .option('--merge-moons', 'fly each planet with its moons as one body')
    .option('--no-merge-moons', 'fly the moons (default: merged only when the step budget would be exceeded)')
    .option('--method <m>', `integrator, by id or name: ${integratorChoices(STABILITY_METHODS)}`, STABILITY_METHODS[0])
    .option(
      '--steps-per-orbit <n>',
      'steps per orbit of the fastest body (wisdom-holman: per period, default 10 with the corrector, 20 when moons are flown; yoshida4/verlet: per periapsis time scale, default 200)',
    )
    .option('--max-steps <n>', 'step budget')
    .option('--samples <n>', 'element-history samples')
    .option('--json', 'machine-readable output')
    .action((systemPath: string, o: StabilityCliOptions) =>
      guard({ json: !!o.json, flags: STABILITY_FLAGS }, async () => {
        const years = positive('--years', o.years, false);
        const method = parseIntegrator('--method', o.method, STABILITY_METHODS);
        const { system, warnings } = await loadSystemFile(systemPath);
        const bar = createProgress('stability', '‰', progressEnabled(!!o.json));
        let r: StabilityResult;
        try {
          r = checkStability(system, {
            years,
            method,
            mergeMoons: o.mergeMoons === undefined ? 'auto' : o.mergeMoons,
            stepsPerOrbit: o.stepsPerOrbit !== undefined ? positive('--steps-per-orbit', o.stepsPerOrbit, true) : undefined,
            maxSteps: o.maxSteps !== undefined ? positive('--max-steps', o.maxSteps, true) : undefined,
            samples: o.samples !== undefined ? positive('--samples', o.samples, true) : undefined,
            onProgress: (f) => bar.update(Math.round(f * 1000), 1000),
          });
        } finally {
          bar.stop();
        }
        if (o.json) printJson({ system: system.name, ...r, warnings });
        else {
          printWarnings(warnings);
          printText(stabilityText(system, r));
        }
        return r.flags.length === 0 ? EXIT_OK : EXIT_NO;
      }),
    );
}
