/**
 * `waymark route --system FILE --from BODY[:ALT] --to BODY[:ALT] [--apoapsis ALT]
 *  [--inclination ANGLE] [--from-inclination ANGLE] --after DATE --before DATE
 *  [--vehicle-from PLAN] [--model conic|finite|nbody] [--name TEXT] -o NEW_PLAN [--json]` —
 * a whole plan from intent (core/route planRoute): from a circular orbit of one body to an orbit
 * of another, the hops between them (between bodies of the same parent, down to a moon, out of a
 * moon to its planet), the best window in the departure range, then targeted in the model.
 *
 * - `--from tessel:300km`: the body and the circular orbit's altitude (a bare number is metres;
 *   no altitude: the body's minimum safe altitude). `--to skerry:500km`: the target body and
 *   periapsis altitude; `--apoapsis` makes the target orbit elliptical, `--inclination` sets its
 *   inclination (`10` or `10deg` is 10°, `0.2rad` radians), `--from-inclination` the start orbit's.
 * - `--after`/`--before`: the departure range, calendar dates of the system ("412-037",
 *   "412-037T06:12") or times from the epoch ("120d").
 * - `--vehicle-from PLAN`: the vehicle of that plan file; without it an invented single-stage
 *   ship (ROUTE_DEFAULT_VEHICLE, about 15 km/s) is used and the report says so.
 * - NEW_PLAN is written when the target orbit is met, like `target`'s output: atomically, the
 *   previous file kept as NEW_PLAN.bak, through the output guard of app/node/files.ts (checked
 *   before the work starts; never over the system file or the vehicle's plan); its system named by
 *   a path relative to NEW_PLAN's folder. `waymark check NEW_PLAN` reads it.
 *
 * Exit code: 0 the target orbit met (the plan written); 1 not met (the report says why; the plan
 * not written); 2 a bad file or option, or an output refused; 3 no route found or a numerical
 * failure. Text: one line per hop with its dates and Δv estimate, then the targeted Δv, margin
 * and the verdict. `--json`: the hops, the estimate, the targeter's status, Δv and margin in SI.
 */
import { resolve } from 'node:path';
import type { Command } from 'commander';
import { parseQuantity, resolveBurnsForSave, serializePlanFile } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { truthModelLabel, type Vehicle } from '../../../core/plan/index.ts';
import { planRoute, ROUTE_HOP_WORDS, type RouteIntent, type RouteResult } from '../../../core/route/index.ts';
import { formatDate, type StarSystem } from '../../../core/system/index.ts';
import { checkOutputs, loadPlanFile, loadSystemFile, writeOutput, type InputFile, type OutputTarget } from '../../node/files.ts';
import { bodyIndexNamed, parseAngle, type FlagNames } from '../flags.ts';
import { EXIT_NO, EXIT_OK, guard, printJson, printText, printWarnings, termSafe } from '../output.ts';
import { createProgress, progressEnabled } from '../progress.ts';
import { fixed, parseModel } from '../truthText.ts';
import { systemRefFor } from './correct.ts';
import { parseTime } from './windows.ts';

/** Which flag sets which field of the route intent. */
export const ROUTE_FLAGS: FlagNames = {
  'from.body': '--from',
  'from.altitude': '--from',
  'from.inclination': '--from-inclination',
  'to.body': '--to',
  'to.periapsisAltitude': '--to',
  'to.apoapsisAltitude': '--apoapsis',
  'to.inclination': '--inclination',
  departAfter: '--after',
  departBefore: '--before',
  truthModel: '--model',
  name: '--name',
};

/** The ship used without `--vehicle-from`: invented, one stage, Δv = 450 s·g₀·ln(206 t/6 t) ≈ 15.6 km/s. */
export const ROUTE_DEFAULT_VEHICLE: Vehicle = {
  name: 'Route ship',
  payloadMass: 1000,
  stages: [{ name: 'Main stage', dryMass: 5000, propellantMass: 200000, isp: 450, thrust: 1e6 }],
};

/** `BODY[:ALT]` → the body id and the altitude (undefined: the body's safe altitude). */
export function parseBodyAltitude(flag: string, text: string): { body: string; altitude: number | undefined } {
  const m = /^\s*([^:\s]+)\s*(?::\s*(.+))?$/.exec(text);
  if (!m) throw new InputError(flag, 'must be BODY or BODY:ALTITUDE, e.g. tessel:300km', text);
  return { body: m[1].toLowerCase(), altitude: m[2] === undefined ? undefined : parseQuantity(flag, m[2].trim(), 'length') };
}

interface RouteCliOptions {
  system: string;
  from: string;
  to: string;
  apoapsis?: string;
  inclination?: string;
  fromInclination?: string;
  after: string;
  before: string;
  vehicleFrom?: string;
  model?: string;
  name?: string;
  output: string;
  json?: boolean;
}

/** The options as a route intent (the vehicle apart). */
export function routeIntent(system: StarSystem, o: RouteCliOptions, vehicle: Vehicle): RouteIntent {
  const from = parseBodyAltitude('--from', o.from);
  const to = parseBodyAltitude('--to', o.to);
  return {
    from: {
      body: system.bodies[bodyIndexNamed(system, '--from', from.body)].id,
      altitude: from.altitude as number,
      inclination: o.fromInclination === undefined ? null : parseAngle('--from-inclination', o.fromInclination),
    },
    to: {
      body: system.bodies[bodyIndexNamed(system, '--to', to.body)].id,
      periapsisAltitude: to.altitude as number,
      apoapsisAltitude: o.apoapsis === undefined ? null : parseQuantity('--apoapsis', o.apoapsis, 'length'),
      inclination: o.inclination === undefined ? null : parseAngle('--inclination', o.inclination),
    },
    departAfter: parseTime(system.calendar, '--after', o.after),
    departBefore: parseTime(system.calendar, '--before', o.before),
    vehicle,
    truthModel: o.model === undefined ? 'conic' : parseModel('--model', o.model),
    name: o.name,
  };
}

/** The text report of `waymark route`. */
export function routeText(system: StarSystem, r: RouteResult, vehicleNote: string | null): string {
  const cal = system.calendar;
  const out: string[] = [`route ${r.plan.name}: ${r.hops.length} hop${r.hops.length === 1 ? '' : 's'}`];
  if (vehicleNote) out.push(vehicleNote);
  r.hops.forEach((h, k) => {
    const a = system.bodies[system.indexById[h.from]].name;
    const b = system.bodies[system.indexById[h.to]].name;
    out.push(
      `  ${k + 1}. ${a} → ${b} (${ROUTE_HOP_WORDS[h.kind]}): departs ${formatDate(cal, h.depart)}, arrives ${formatDate(cal, h.arrive)}, Δv ≈ ${fixed(h.dv, 0)} m/s`,
    );
  });
  const t = r.target;
  out.push(`Δv      estimate ${fixed(r.dvEstimate, 0)} m/s; flown in ${truthModelLabel(t.model)} ${fixed(t.dv.after, 0)} m/s`);
  out.push(`margin  ${fixed(t.margin.after, 0)} m/s`);
  out.push(r.message);
  return out.join('\n');
}

export function addRouteCommand(program: Command): void {
  program
    .command('route')
    .description('a whole plan from one orbit to another: the hops, the best window in a date range, targeted in a model')
    .requiredOption('--system <file>', 'system file')
    .requiredOption('--from <body[:alt]>', "departure body and circular orbit altitude (e.g. tessel:300km; default altitude: the body's safe altitude)")
    .requiredOption('--to <body[:alt]>', "target body and periapsis altitude (e.g. skerry:500km; default: the body's safe altitude)")
    .option('--apoapsis <alt>', 'target apoapsis altitude (default: a circular orbit)')
    .option('--inclination <angle>', 'target inclination, degrees unless a unit says otherwise (10, 10deg, 0.2rad; default: any)')
    .option('--from-inclination <angle>', "start orbit's inclination, degrees unless a unit says otherwise (default: the route's choice)")
    .requiredOption('--after <date>', 'earliest departure: a calendar date (412-037) or a time from the epoch (10d)')
    .requiredOption('--before <date>', 'latest departure')
    .option('--vehicle-from <plan>', 'take the vehicle of this plan file')
    .option('--model <model>', 'conic, finite or nbody (default conic)')
    .option('--name <text>', 'plan name')
    .requiredOption('-o, --output <file>', 'where to write the plan')
    .option('--json', 'machine-readable output')
    .action((o: RouteCliOptions) =>
      guard({ json: !!o.json, flags: ROUTE_FLAGS }, async () => {
        if (o.output === '-') throw new InputError('--output', 'must be a file name (the plan names its system file by a path relative to it)', o.output);
        const loaded = await loadSystemFile(o.system);
        const { system } = loaded;
        const inputs: InputFile[] = [{ path: o.system, what: 'the system file read (--system)' }];
        let vehicle = ROUTE_DEFAULT_VEHICLE;
        let vehicleNote: string | null = `vehicle: ${ROUTE_DEFAULT_VEHICLE.name} (invented, about 15.6 km/s; --vehicle-from PLAN takes a plan's)`;
        if (o.vehicleFrom !== undefined) {
          vehicle = (await loadPlanFile(o.vehicleFrom)).plan.vehicle;
          vehicleNote = null;
          inputs.push({ path: o.vehicleFrom, what: 'the plan the vehicle comes from (--vehicle-from)' });
        }
        const intent = routeIntent(system, o, vehicle);
        const target: OutputTarget = { flag: '--output', path: o.output, kind: 'plan' };
        await checkOutputs([target], { inputs });
        const bar = createProgress('route', '%', progressEnabled(!!o.json));
        let r: RouteResult;
        try {
          r = planRoute(system, intent, { onProgress: (f, words) => bar.update(Math.round(100 * f), 100, termSafe(` · ${words}`)) });
        } finally {
          bar.stop();
        }
        const met = r.target.status === 'met';
        if (met) {
          const text = serializePlanFile(
            r.plan,
            systemRefFor(o.output, { kind: 'path', path: o.system }, resolve(o.system)),
            // the burns as solved, written beside their settings (derived; checked on open)
            resolveBurnsForSave(system, r.plan),
          );
          await writeOutput(target, text, { inputs }, { forTerminal: termSafe });
        }
        if (o.json) {
          printJson({
            plan: r.plan.name,
            status: r.target.status,
            met,
            model: r.target.model,
            hops: r.hops,
            dvEstimate: r.dvEstimate,
            dv: r.target.dv,
            margin: r.target.margin,
            message: r.message,
            file: met ? o.output : null,
            warnings: loaded.warnings,
          });
        } else {
          printWarnings(loaded.warnings);
          printText(routeText(system, r, vehicleNote));
          printText(met ? `wrote ${o.output}` : 'not written: the target orbit is not met');
        }
        return met ? EXIT_OK : EXIT_NO;
      }),
    );
}
