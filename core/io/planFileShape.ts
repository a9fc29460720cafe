/**
 * The plan file's shape, declared once: the single source of truth of a version-1 plan file.
 *
 * From this declaration come
 * - the JSON Schema assets/schema/plan.schema.json, emitted by `npm run schema:emit`
 *   (core/io/fileJsonSchema.ts; test/core/io/fileSchemas.test.ts fails when the committed file
 *   differs from the emitted one), which ajv checks every file against, at run time in Node and
 *   through the validators precompiled for the renderer (app/renderer/build/ajvStandalone.ts);
 * - the TypeScript types of the document (`PlanDocument` …), inferred below.
 * Why zod: the schema and the types come from one TypeScript declaration with no generated code
 * to keep in step, and zod emits JSON Schema itself; json-schema-to-typescript, the other way
 * round, ignores the if/then switches that give ajv's field-precise messages, so the types it
 * generates lose every tagged union. zod is only a development dependency: other modules import
 * this file with `import type`, so zod is never loaded at run time (nor bundled).
 *
 * The in-memory `Plan` (core/plan/plan.ts: SI, radians, camelCase, defaults filled in) is a
 * different model; planFile.ts converts, type-checked against both.
 *
 * Rules of the file: every dimensional field carries its SI unit in its name (`_m`, `_s`,
 * `_mps`, `_kg`, `_N`); angles carry `_deg` and are in DEGREES. Tagged unions
 * (`z.discriminatedUnion`) become if/then switches, nullable values `"type": [T, "null"]`,
 * `x-rule` / `x-rule-oneOf` annotations give the plain-language rule of a pattern or of a
 * `oneOf` (see fileJsonSchema.ts).
 */
import * as z from 'zod';

// Sanity bounds of the file (times and altitudes |x| <= 1e13, masses and thrust <= 1e12).
const T_BOUND = 1e13;
const MASS_MAX = 1e12;

const id = z
  .string()
  .regex(/^[a-z][a-z0-9]*(?:-[a-z0-9]+)*$/)
  .meta({
    id: 'id',
    description: 'Lowercase slug: a letter, then letters, digits or single hyphens.',
    'x-rule': 'must be a lowercase slug (a-z, 0-9 and single hyphens, starting with a letter)',
  });

const bodyId = z.string().min(1).meta({ id: 'bodyId', description: "Id of a body (or the star) of the plan's system." });

const time = z
  .number()
  .min(-T_BOUND)
  .max(T_BOUND)
  .meta({ id: 'time', description: "Time in seconds from the system's epoch (t = 0 of the system clock). Sanity bound: |t| <= 1e13 s." });

const altitude = z.number().min(-T_BOUND).max(T_BOUND).meta({
  id: 'altitude',
  description: "Altitude above the body's mean radius in metres (may be negative only where stated). Sanity bound: |h| <= 1e13 m.",
});

const angle = z.number().min(-360).max(360).meta({ id: 'angle', description: 'Angle in DEGREES, -360 to 360.' });

const inclination = z.number().min(0).max(180).meta({ id: 'inclination', description: "Inclination to the system's reference plane in DEGREES, 0 to 180." });

const eccentricity = z.number().min(0).lt(1).meta({ id: 'eccentricity', description: 'Eccentricity of an elliptic orbit, 0 <= e < 1.' });

const vector3 = z.tuple([z.number(), z.number(), z.number()]);

const stage = z
  .strictObject({
    name: z.string().min(1).meta({ description: 'Display name of the stage.' }),
    dry_kg: z.number().min(0).max(MASS_MAX).meta({ description: "Structure (and engines) left when the stage's propellant is spent, kg. 0 to 1e12." }),
    propellant_kg: z.number().min(0).max(MASS_MAX).meta({ description: 'Propellant loaded, kg. 0 to 1e12.' }),
    isp_s: z.number().gt(0).max(1e8).meta({ description: 'Vacuum specific impulse, s. Greater than 0, at most 1e8.' }),
    thrust_N: z.number().gt(0).max(MASS_MAX).meta({ description: 'Vacuum thrust, N. Greater than 0, at most 1e12.' }),
  })
  .meta({
    id: 'stage',
    description: 'One stage of the vehicle. Stages fire in the order listed; stages[0] fires first and is dropped first.',
  });

const vehicle = z
  .strictObject({
    name: z.string().min(1).meta({ description: 'Name of the vehicle.' }),
    payload_kg: z.number().min(0).max(MASS_MAX).meta({ description: 'Mass carried to the end (never dropped), kg. 0 to 1e12.' }),
    stages: z.array(stage).min(1).meta({ description: 'Stages in firing order (at least one).' }),
  })
  .meta({ description: 'The vehicle: payload carried to the end and stages in firing order.' });

const parkingStart = z
  .strictObject({
    kind: z.literal('parking'),
    body: bodyId.meta({ description: 'Id of the body the parking orbit is around.' }),
    epoch_s: time.meta({ description: 'Start time of the plan, s from the system epoch.' }),
    periapsis_altitude_m: altitude.meta({ description: "Periapsis altitude above the body's mean radius, m." }),
    e: eccentricity.meta({ description: 'Eccentricity of the parking orbit (default 0: circular).' }).optional(),
    i_deg: inclination.meta({ description: 'Inclination, degrees (default 0).' }).optional(),
    raan_deg: angle.meta({ description: 'Longitude of the ascending node, degrees (default 0).' }).optional(),
    argp_deg: angle.meta({ description: 'Argument of periapsis, degrees (default 0).' }).optional(),
    nu_deg: angle.meta({ description: 'True anomaly at the epoch, degrees (default 0).' }).optional(),
  })
  .meta({
    id: 'parkingStart',
    description: 'A parking orbit around a body at an epoch. Angles in degrees; the optional elements default to 0.',
  });

const stateStart = z
  .strictObject({
    kind: z.literal('state'),
    body: bodyId.meta({ description: 'Id of the body the state is relative to.' }),
    epoch_s: time.meta({ description: 'Time of the state, s from the system epoch.' }),
    r_m: vector3.meta({ description: 'Position relative to the body [x, y, z], m.' }),
    v_mps: vector3.meta({ description: 'Velocity relative to the body [vx, vy, vz], m/s.' }),
  })
  .meta({ id: 'stateStart', description: "A state vector relative to a body, in the system's inertial axes." });

const start = z
  .discriminatedUnion('kind', [parkingStart, stateStart])
  .meta({ description: 'Where the plan starts: a parking orbit ("kind": "parking") or a state vector ("kind": "state").' });

const solve = z
  .discriminatedUnion('kind', [
    z.strictObject({ kind: z.literal('fixed') }).meta({ description: 'Fly dv_mps as written.' }),
    z
      .strictObject({
        kind: z.literal('transfer'),
        to: bodyId.meta({ description: 'Id of the body the transfer arc reaches.' }),
        arrive_s: time.meta({ description: 'Arrival time at the body, s from the system epoch.' }),
        revs: z.int().min(0).max(100).meta({ description: 'Full revolutions on the transfer arc (default 0).' }).optional(),
        retrograde: z.boolean().meta({ description: 'Retrograde transfer (clockwise about +z); default false.' }).optional(),
        periapsis_altitude_m: altitude
          .meta({
            description:
              "Direct transfers only (the target orbits the ship's central body, e.g. a mid-course correction): aim off the target's centre so that the arrival hyperbola's periapsis is at this altitude above the target's mean radius, m. Absent: aim at the centre.",
          })
          .optional(),
        flyby: z
          .strictObject({
            next: bodyId.meta({ description: 'Id of the body the leg after the flyby reaches.' }),
            arrive_s: time.meta({ description: 'Arrival time at that body, s from the system epoch.' }),
            powered: z
              .boolean()
              .meta({
                description:
                  'Powered flyby (a burn at periapsis meets the next leg; the default) or unpowered (false: |v∞| kept, the periapsis and B-plane angle that turn v∞ toward the next leg; a later correction pays the rest).',
              })
              .optional(),
          })
          .meta({
            description:
              "Direct transfers only: the target is a flyby body; aim off its centre so that the hyperbola's outgoing asymptote matches the Lambert leg to `next` arriving at `arrive_s` (periapsis and B-plane angle solved; not with periapsis_altitude_m).",
          })
          .optional(),
      })
      .meta({ description: 'Lambert transfer to a body.' }),
    z
      .strictObject({
        kind: z.literal('capture'),
        e: eccentricity.meta({ description: 'Eccentricity of the orbit after capture.' }),
      })
      .meta({ description: 'Capture into an orbit of eccentricity e with the same periapsis.' }),
    z
      .strictObject({
        kind: z.literal('plane'),
        i_deg: inclination.meta({ description: 'Inclination after the burn, degrees.' }),
      })
      .meta({ description: 'Plane change to inclination i_deg.' }),
    z
      .strictObject({
        kind: z.literal('apsis'),
        altitude_m: altitude.meta({ description: 'Altitude of the opposite apsis after the burn, m.' }),
      })
      .meta({ description: 'Along-track burn setting the opposite apsis.' }),
  ])
  .meta({
    id: 'solve',
    description:
      'How the burn\'s Δv is obtained: "fixed" flies dv_mps as written; the other kinds solve it when the plan is evaluated (dv_mps is then a correction added on top). "transfer": Lambert arc to body "to" arriving at arrive_s; "capture": retrograde burn at the current point into an orbit of eccentricity e with the same periapsis; "plane": rotate the velocity about the radius vector to reach inclination i_deg; "apsis": along-track burn that puts the opposite apsis at altitude_m.',
  });

const until = z
  .discriminatedUnion('kind', [
    z
      .strictObject({ kind: z.literal('time'), t_s: time.meta({ description: 'End of the coast, s from the system epoch.' }) })
      .meta({ description: 'Coast until a time.' }),
    z
      .strictObject({
        kind: z.literal('duration'),
        dt_s: z.number().gt(0).max(T_BOUND).meta({ description: 'Duration of the coast, s. Greater than 0, at most 1e13.' }),
      })
      .meta({ description: 'Coast for a duration.' }),
    z
      .strictObject({
        kind: z.literal('periapsis'),
        body: bodyId
          .meta({
            description: "Optional: count only a periapsis passed while in this body's sphere of influence (e.g. the periapsis at the target).",
          })
          .optional(),
      })
      .meta({ description: 'Coast to the next periapsis.' }),
    z
      .strictObject({
        kind: z.literal('apoapsis'),
        body: bodyId.meta({ description: "Optional: count only an apoapsis passed while in this body's sphere of influence." }).optional(),
      })
      .meta({ description: 'Coast to the next apoapsis.' }),
    z.strictObject({ kind: z.literal('soi-change') }).meta({ description: 'Coast to the next sphere-of-influence change.' }),
    z
      .strictObject({
        kind: z.literal('altitude'),
        altitude_m: altitude.meta({ description: "Altitude above the central body's mean radius, m." }),
      })
      .meta({ description: 'Coast to the first crossing of an altitude.' }),
    z
      .strictObject({ kind: z.literal('node'), which: z.enum(['ascending', 'descending', 'any']) })
      .meta({ description: "Coast to a node of the central body's equatorial plane." }),
  ])
  .meta({
    id: 'until',
    description:
      'The condition a coast runs until: "time" (t_s), "duration" (dt_s), the next "periapsis" or "apoapsis" (optionally only in the sphere of influence of "body"), a "soi-change", the first crossing of an "altitude" (altitude_m, either direction), or a "node" (crossing of the central body\'s equatorial plane: which = ascending, descending or any).',
  });

const eventId = id.meta({ description: 'Stable id of the event, unique within the plan.' });
const eventName = z.string().meta({ description: 'Display name.' });

const vectorMps = (what: string) => vector3.meta({ description: what });
const resolvedFigure = (what: string) => z.number().min(-MASS_MAX).max(MASS_MAX).meta({ description: what });

/**
 * What the plan's evaluation solved for a burn, written by Waymark on save (derived data, never
 * read as the plan: on open it is recomputed and compared, and a stale copy is a warning).
 */
const resolvedBurn = z
  .strictObject({
    note: z
      .string()
      .meta({ description: 'Free text Waymark writes ("derived: written by Waymark on save, recomputed and checked on open"); ignored on load.' })
      .optional(),
    model: z.enum(['conic', 'finite', 'nbody']).meta({
      description:
        'The model the burn was solved and flown in: the plan\'s truth model ("conic": patched conics, the burn flown as its mode says; "finite": patched conics, the burn flown finite; "nbody": the plan\'s timed burn schedule for the restricted n-body flight, whose Δv is a fixed inertial vector).',
    }),
    frame: z.enum(['vnb', 'rtn', 'inertial']).meta({
      description: 'Frame of dv_frame_mps: the burn\'s own frame, except "inertial" for the n-body schedule (its burns are fixed inertial vectors).',
    }),
    dv_frame_mps: vectorMps('Solved Δv (settings plus correction) as components in `frame`, m/s.'),
    dv_inertial_mps: vectorMps("Solved Δv in the system's inertial axes [x, y, z], m/s."),
    dv_magnitude_mps: resolvedFigure('Magnitude of the solved Δv, m/s.'),
    t_start_s: time.meta({
      description: 'Start of the burn, s from the system epoch: centre − duration/2 (for an impulsive burn the start of the finite burn of the same Δv).',
    }),
    t_end_s: time.meta({ description: 'End of the burn, s from the system epoch: centre + duration/2.' }),
    duration_s: z.number().min(0).max(T_BOUND).meta({ description: "Burn time at the vehicle's thrust and the mass at the burn (across staging), s." }),
    propellant_kg: z.number().min(0).max(MASS_MAX).meta({ description: 'Propellant the burn uses, kg.' }),
    mass_after_kg: z.number().min(0).max(MASS_MAX).meta({ description: 'Ship mass after the burn, kg.' }),
  })
  .meta({
    id: 'resolvedBurn',
    description:
      "DERIVED DATA, written by Waymark on save: the burn as the plan's evaluation solved it in its truth model. Not an input: Waymark recomputes it on open and warns, naming the burn, when the plan no longer gives these figures (Δv within 1 mm/s, times within 1 ms, masses within 1 g, or 1e-12 of the value where that is larger; see core/io/resolvedBurns.ts). Absent in files written before it existed, or when the burn was not flown (a failed solve, a flight that ended before it).",
  });

const burnEvent = z
  .strictObject({
    type: z.literal('burn'),
    id: eventId,
    name: eventName,
    t_s: z.number().min(-T_BOUND).max(T_BOUND).nullable().meta({
      description: 'Centre of the burn, s from the system epoch; null: at the end of the preceding event. Sanity bound: |t| <= 1e13 s.',
    }),
    frame: z.enum(['vnb', 'rtn', 'inertial']).meta({
      description: 'Frame of dv_mps: "vnb" (velocity, normal, binormal), "rtn" (radial, transverse, normal) or "inertial" (the system\'s axes).',
    }),
    dv_mps: vector3.meta({ description: 'Δv components in the frame, m/s (for solved burns: a correction added to the solved Δv).' }),
    solve: solve.meta({ description: 'How the Δv is obtained (default {"kind": "fixed"}).' }).optional(),
    mode: z
      .enum(['impulsive', 'finite'])
      .meta({ description: '"impulsive" (instantaneous, the default) or "finite" (thrust integrated over the burn).' })
      .optional(),
    pointing: z
      .enum(['velocity', 'inertial'])
      .meta({
        description: 'Finite burns: thrust held along the velocity ("velocity", the default) or fixed in inertial space along the impulsive Δv ("inertial").',
      })
      .optional(),
    resolved: resolvedBurn.optional(),
  })
  .meta({ description: 'A burn.' });

const coastEvent = z
  .strictObject({ type: z.literal('coast'), id: eventId, name: eventName, until })
  .meta({ description: 'Unpowered flight until a condition.' });

const stageEvent = z
  .strictObject({ type: z.literal('stage'), id: eventId, name: eventName })
  .meta({ description: 'Drop the active stage now (its remaining propellant is lost).' });

const flybyEvent = z
  .strictObject({ type: z.literal('flyby'), id: eventId, name: eventName, body: bodyId.meta({ description: 'Id of the body passed.' }) })
  .meta({ description: 'Marks a flyby of a body: nothing is flown; the result reports the pass (periapsis, v∞ in and out, turn, B-plane, free Δv).' });

const event = z.discriminatedUnion('type', [burnEvent, coastEvent, stageEvent, flybyEvent]).meta({
  id: 'event',
  description: 'One event of the plan, flown in order: a "burn", a "coast", a "stage" (drop the active stage) or a "flyby" (a marker reported from the pass).',
});

const target = z
  .strictObject({
    body: bodyId.meta({ description: 'Id of the body of the target orbit.' }),
    periapsis_altitude_m: altitude.meta({ description: 'Desired periapsis altitude above the mean radius, m.' }),
    e: z.number().min(0).lt(1).nullable().meta({ description: 'Desired eccentricity (0 <= e < 1), or null.' }).optional(),
    apoapsis_altitude_m: z.number().min(-T_BOUND).max(T_BOUND).nullable().meta({ description: 'Desired apoapsis altitude, m, or null.' }).optional(),
    i_deg: z
      .number()
      .min(0)
      .max(180)
      .nullable()
      .meta({ description: "Desired inclination to the system's reference plane, degrees (0 to 180), or null for any." })
      .optional(),
    tolerance: z
      .strictObject({
        periapsis_altitude_m: z.number().gt(0).max(T_BOUND).meta({ description: 'Periapsis altitude tolerance, m (> 0).' }),
        e: z.number().gt(0).max(1).meta({ description: 'Eccentricity tolerance (> 0).' }),
        i_deg: z.number().gt(0).max(180).meta({ description: 'Inclination tolerance, degrees (> 0).' }),
      })
      .meta({ description: 'How close counts as reached.' }),
  })
  .meta({
    id: 'target',
    description: 'The orbit the plan must end in. Give e or apoapsis_altitude_m (or neither), not both.',
  });

const systemRef = z
  .strictObject({
    path: z.string().min(1).meta({ description: 'Path of the system file, relative to this plan file.' }).optional(),
    embedded: z.record(z.string(), z.unknown()).meta({ description: 'A whole system file (format "waymark-system").' }).optional(),
  })
  .meta({
    description:
      'The star system the plan flies in: {"path": ...} names a system file relative to this plan file (forward slashes), or {"embedded": {...}} holds a whole system file (see system.schema.json), checked by the system-file rules.',
    oneOf: [{ required: ['path'] }, { required: ['embedded'] }],
    'x-rule-oneOf': 'needs exactly one of "path" and "embedded"',
  });

const reserve = z
  .strictObject({
    percent: z.number().min(0).max(100).meta({ description: 'Percent of the total planned Δv, 0 to 100.' }),
    absolute_mps: z.number().min(0).max(1e7).meta({ description: 'Absolute reserve, m/s, 0 to 1e7.' }),
  })
  .meta({ description: 'Δv held back by policy: percent of the total planned Δv plus an absolute amount.' });

/** The whole plan file. Key order here is the order the file is written in. */
export const planFileShape = z
  .strictObject({
    $schema: z.string().meta({ description: 'Optional pointer to this schema for editors; ignored on load and not written back on save.' }).optional(),
    format: z.literal('waymark-plan').meta({ description: 'Always "waymark-plan".' }),
    version: z.literal(1).meta({ description: 'File format version. This schema describes version 1; older versions are migrated on load.' }),
    name: z.string().min(1).meta({ description: 'Name of the plan, for display.' }),
    description: z.string().meta({ description: 'Optional free text about the plan (default empty).' }).optional(),
    system: systemRef,
    vehicle,
    start,
    events: z.array(event).meta({ description: 'Events in the order they are flown.' }),
    target: target.nullable().meta({ description: 'The orbit the plan must end in, or null for none.' }),
    reserve,
    end_s: z
      .number()
      .min(-T_BOUND)
      .max(T_BOUND)
      .nullable()
      .meta({
        description: 'Where the plan ends if its last event ends earlier, s from the system epoch; null or absent: at the last event.',
      })
      .optional(),
    truth_model: z
      .enum(['conic', 'finite', 'nbody'])
      .meta({
        description:
          'The model the plan\'s burns are targeted in and its readouts show (the others are comparisons): "conic" (patched conics, each burn flown as its mode says), "finite" (patched conics, every burn flown finite at the vehicle\'s thrust) or "nbody" (restricted n-body gravity, each burn flown as its mode says). Absent: "conic".',
      })
      .optional(),
  })
  .meta({
    $id: 'https://waymark.invalid/schema/plan.schema.json',
    title: 'Waymark mission plan file, version 1',
    description:
      "One mission plan: a vehicle, a start, an ordered list of events (burns, coasts, staging), a target orbit and a reserve policy, flown in one star system. Units: every dimensional field carries its SI unit in its name (_m metres, _s seconds, _mps metres per second, _kg kilograms, _N newtons); angles carry _deg and are written in DEGREES (the program converts them to radians on load). Times are seconds from the system's epoch. The system is named by a path relative to this file, or embedded whole. Unknown fields are errors.",
  });

// The document types, as written in a schema-valid file (optional fields may be absent).
export type PlanDocument = z.input<typeof planFileShape>;
export type StageDocument = z.input<typeof stage>;
export type VehicleDocument = z.input<typeof vehicle>;
export type ParkingStartDocument = z.input<typeof parkingStart>;
export type StateStartDocument = z.input<typeof stateStart>;
export type SolveDocument = z.input<typeof solve>;
export type UntilDocument = z.input<typeof until>;
export type BurnEventDocument = z.input<typeof burnEvent>;
export type ResolvedBurnDocument = z.input<typeof resolvedBurn>;
export type CoastEventDocument = z.input<typeof coastEvent>;
export type StageEventDocument = z.input<typeof stageEvent>;
export type EventDocument = z.input<typeof event>;
export type TargetDocument = z.input<typeof target>;
export type PlanSystemDocument = z.input<typeof systemRef>;
