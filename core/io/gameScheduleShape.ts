/**
 * The game schedule file's shape, declared once: a version-1 "waymark-game-schedule" document,
 * the burns a game's script applies at whole steps of its fixed step (gameSchedule.ts writes
 * and reads it).
 *
 * From this declaration come the JSON Schema assets/schema/game-schedule.schema.json (emitted
 * by `npm run schema:emit`, see core/io/fileJsonSchema.ts and test/core/io/fileSchemas.ts) and
 * the document's TypeScript type. zod is a development dependency: other modules import this
 * file with `import type` only.
 *
 * Units: fields whose name ends in a unit (`_s`, `_m`, `_N`, `_kg`, `_kg_per_s`) are always in
 * that SI unit; every other dimensional field is in the units the document names in `units`:
 * lengths in `units.length` (m or km), times in `units.time` (s, or steps of `physics.dt_s`),
 * velocities in length per time unit (with steps: length per step, i.e. velocity · dt),
 * accelerations in length per time unit squared (with steps: acceleration · dt²); vectors in the
 * game's axes named by `units.axes` (its matrix is `axes_matrix`).
 */
import * as z from 'zod';
import { GAME_AXES_NAMES } from './gameAxes.ts';

// Sanity bound of the file's times (s from the epoch), as in the plan file.
const T_BOUND = 1e13;

const vector = (what: string) => z.tuple([z.number(), z.number(), z.number()]).meta({ description: `${what} [x, y, z] in the game's axes (units.axes).` });

const name = (what: string) => z.string().min(1).meta({ description: what });

const VELOCITY = 'length per time unit (units.length per units.time; with steps: per step, = velocity · dt)';

const units = z
  .strictObject({
    length: z.enum(['m', 'km']).meta({ description: 'Unit of every length of the document that has no unit in its name: "m" (metres) or "km" (kilometres).' }),
    time: z.enum(['s', 'steps']).meta({
      description:
        'Unit of every time of the document that has no unit in its name: "s" (seconds) or "steps" (game steps of physics.dt_s). With steps, velocities are length per step (velocity · dt) and accelerations length per step squared (acceleration · dt²).',
    }),
    axes: z.enum(GAME_AXES_NAMES).meta({
      description:
        "Axis convention of every vector: \"z-up-right-handed\" (Waymark's own: x, y in the reference plane, z north), \"y-up-right-handed\" (x' = x, y' = z, z' = -y), \"y-up-left-handed\" (x' = x, y' = z, z' = y) or \"z-up-left-handed\" (x' = x, y' = -y, z' = z).",
    }),
  })
  .meta({ description: 'The units and axes the document is written in (the options it was written with).' });

const matrixRow = z.tuple([z.number().min(-1).max(1), z.number().min(-1).max(1), z.number().min(-1).max(1)]);

const physics = z
  .strictObject({
    integrator: z.enum(['symplectic-euler', 'verlet', 'explicit-euler', 'rk4']).meta({ description: "The game's fixed-step integrator." }),
    dt_s: z.number().gt(0).max(1e6).meta({ description: "The game's fixed step, s (greater than 0). One step of units.time = steps." }),
    precision: z.enum(['float64', 'float32']).meta({ description: 'Floating-point precision of the game\'s state: "float64" or "float32".' }),
    gravity: z.enum(['central', 'all']).meta({
      description: 'Gravity the game applies: "central" (the central body only) or "all" (the star and every body).',
    }),
    burns: z.enum(['impulsive', 'spread']).meta({
      description: 'How the game applies a burn: "impulsive" (the whole Δv added before the burn\'s step) or "spread" (thrust over steps, see burns[].thrust).',
    }),
    rebase: z
      .strictObject({
        distance_m: z.number().gt(0).meta({ description: 'The game re-centres its origin on the ship when the ship is farther than this, m.' }),
        velocity: z.boolean().meta({ description: 'Whether the velocity is re-centred too.' }),
      })
      .nullable()
      .meta({ description: 'Floating-origin rebasing of the game, or null for none.' }),
    guidance: z.enum(['resolve', 'open-loop']).meta({
      description:
        'How the schedule\'s burns were made: "resolve" (re-solved from the game\'s own state) or "open-loop" (the plan\'s inertial Δv). The game applies the listed Δv either way.',
    }),
  })
  .meta({ description: "The game's physics the schedule is made for (always in SI: the step in seconds, the rebase distance in metres)." });

const thrust = z
  .strictObject({
    steps: z.number().int().min(1).meta({ description: "Steps the engine burns, from the burn's step on (the last at part throttle)." }),
    direction: vector('Unit vector of the thrust (no unit),'),
    thrust_N: z.number().gt(0).meta({ description: 'Engine thrust, N.' }),
    mass_kg: z.number().gt(0).meta({ description: "The ship's mass at the first step of the burn, kg." }),
    mass_flow_kg_per_s: z.number().min(0).meta({ description: 'Propellant flow while the engine burns, kg/s (mass falls linearly).' }),
    acceleration: z.number().min(0).meta({
      description:
        'Thrust acceleration at the first step (thrust_N / mass_kg), length per time unit squared (with steps: per step squared, = acceleration · dt²). Derived: a reader may recompute it.',
    }),
    first_step_dv: z
      .number()
      .min(0)
      .meta({ description: `|Δv| delivered by the first step, ${VELOCITY}.` }),
    last_step_dv: z
      .number()
      .min(0)
      .meta({ description: `|Δv| delivered by the last (part-throttle) step, ${VELOCITY}.` }),
  })
  .meta({ description: 'A spread burn: the game holds the acceleration thrust/mass along direction each step until |Δv| is delivered.' });

const burn = z
  .strictObject({
    id: name("The plan's id of the burn event."),
    name: name("The plan's name of the burn."),
    step: z.number().int().min(0).meta({
      description:
        "Game step index counted from the schedule's step 0: the Δv is added before this step is integrated (impulsive), or the engine starts at it (spread).",
    }),
    elapsed: z.number().min(0).meta({
      description: 'Time of that step since step 0 (t0_s), in units.time (with steps it equals step).',
    }),
    dv: vector(`Inertial Δv, ${VELOCITY},`),
    dv_magnitude: z
      .number()
      .min(0)
      .meta({ description: `|Δv|, ${VELOCITY}.` }),
    dv_burn_frame: z
      .strictObject({
        velocity: z.number().meta({ description: `Along the velocity relative to the central body, ${VELOCITY}.` }),
        normal: z.number().meta({ description: `Along the orbit normal (r × v), ${VELOCITY}.` }),
        binormal: z.number().meta({ description: `Along velocity × normal, ${VELOCITY}.` }),
      })
      .meta({
        description:
          "The same Δv in the burn frame of the game's own state at the burn, relative to the central body (independent of units.axes; in the velocity unit).",
      }),
    change: vector(`Δv minus the reference plan's Δv for this burn (inertial), ${VELOCITY},`),
    central: name("Name of the body the game's frame is centred on at the burn."),
    thrust: thrust.nullable().meta({ description: 'The spread burn, or null for an impulse at the step.' }),
  })
  .meta({ description: 'One burn of the schedule.' });

/** The whole document. Key order here is the order it is written in. */
export const gameScheduleShape = z
  .strictObject({
    $schema: z.string().meta({ description: 'Optional pointer to this schema for editors; ignored on read.' }).optional(),
    format: z.literal('waymark-game-schedule').meta({ description: 'Always "waymark-game-schedule".' }),
    version: z.literal(1).meta({ description: 'Format version; this schema describes version 1.' }),
    units,
    axes_matrix: z.tuple([matrixRow, matrixRow, matrixRow]).meta({
      description:
        "Rows of the matrix M of units.axes: a vector's game components = M · its Waymark components (x, y in the system's reference plane, z north, right-handed). det M = +1 for a right-handed convention, -1 for a left-handed one; Waymark components = Mᵀ · game components. Must be the matrix of units.axes.",
    }),
    plan: name('Name of the plan the schedule flies.'),
    system: name('Name of the star system.'),
    physics,
    t0_s: z.number().min(-T_BOUND).max(T_BOUND).meta({ description: "Time of step 0, s from the system's epoch." }),
    end_step: z.number().int().min(0).meta({ description: 'Last step of the plan: the schedule runs from step 0 to this step.' }),
    start: z
      .strictObject({
        central: name('Name of the body the start state is relative to.'),
        position: vector('Position relative to the central body, in units.length,'),
        velocity: vector(`Velocity relative to the central body, ${VELOCITY},`),
      })
      .meta({ description: 'The ship at step 0.' }),
    burns: z.array(burn).meta({ description: 'The burns in the order the game applies them.' }),
  })
  .meta({
    $id: 'https://waymark.invalid/schema/game-schedule.schema.json',
    title: 'Waymark burn schedule for a game, version 1',
    description:
      "The burns a game's own fixed-step physics applies to fly a plan: at whole steps, fixed Δv vectors (open loop), with the ship's state at step 0, in the game's units and axes. Fields whose name ends in a unit (_s, _m, _N, _kg, _kg_per_s) are in that SI unit; every other length, time, velocity and acceleration is in the units named by `units` (velocities in length per time unit; with time in steps, per step: velocity · dt; accelerations per step squared: acceleration · dt²), vectors in the axes named by `units.axes` (matrix in `axes_matrix`). Unknown fields are errors.",
  });

export type GameScheduleDocument = z.input<typeof gameScheduleShape>;
export type GameScheduleBurnDocument = z.input<typeof burn>;
