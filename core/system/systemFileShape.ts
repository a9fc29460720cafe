/**
 * The system file's shape, declared once: the single source of truth of a version-1 system file.
 *
 * From this declaration come the JSON Schema assets/schema/system.schema.json (emitted by
 * `npm run schema:emit` through core/io/fileJsonSchema.ts; test/core/io/fileSchemas.test.ts
 * fails when the committed file differs), which ajv checks every file against, and the document
 * types (`SystemDocument` …, re-exported by document.ts). Why zod, and why it is never loaded at
 * run time (other modules import this file with `import type`): see core/io/planFileShape.ts.
 * The in-memory `StarSystem` (model.ts: radians, derived quantities) is a different model;
 * build.ts converts.
 *
 * Either/or fields (exactly one of `mu_m3_s2` and `mass_kg`; `home` or `year_s` + `day_s`) are a
 * JSON Schema `oneOf` of `required` lists written in `.meta()`, with the plain-language rule
 * in `x-rule-oneOf`; their types are optional fields.
 */
import * as z from 'zod';

const id = z
  .string()
  .regex(/^[a-z][a-z0-9]*(?:-[a-z0-9]+)*$/)
  .meta({
    id: 'id',
    description: 'Lowercase slug: a letter, then letters, digits or single hyphens.',
    'x-rule': 'must be a lowercase slug (a-z, 0-9 and single hyphens, starting with a letter)',
  });

const name = z.string().min(1).meta({ id: 'name', description: 'Display name.' });

const mu = z.number().gt(0).max(1e27).meta({
  id: 'mu',
  description: 'Standard gravitational parameter GM in m^3/s^2. Sanity bound: at most 1e27 (about ten million solar masses).',
});

const mass = z.number().gt(0).max(1e37).meta({
  id: 'mass',
  description: 'Mass in kg; the program uses mu = G * mass with G = 6.67430e-11 m^3/(kg s^2) (CODATA 2018). Sanity bound: at most 1e37.',
});

const radius = z.number().gt(0).max(1e13).meta({ id: 'radius', description: 'Mean radius in metres. Sanity bound: at most 1e13.' });

const colour = z
  .string()
  .regex(/^#[0-9a-fA-F]{6}$/)
  .meta({ id: 'colour', description: 'Display colour as #rrggbb.', 'x-rule': 'must be a colour written #rrggbb' });

const oneOfMuOrMass = {
  oneOf: [{ required: ['mu_m3_s2'] }, { required: ['mass_kg'] }],
  'x-rule-oneOf': 'needs exactly one of "mu_m3_s2" and "mass_kg"',
};

const orbit = z
  .strictObject({
    a_m: z.number().gt(0).max(1e17).meta({ description: 'Semi-major axis in metres (sanity bound: at most 1e17, about ten light-years).' }),
    e: z.number().min(0).lt(1).meta({ description: 'Eccentricity, 0 <= e < 1 (elliptic orbits only).' }),
    i_deg: z.number().min(0).max(180).meta({ description: 'Inclination to the reference plane in degrees, 0 to 180 (above 90 is retrograde).' }),
    raan_deg: z.number().min(-360).max(360).meta({ description: 'Longitude of the ascending node in degrees, from the reference direction.' }),
    argp_deg: z.number().min(-360).max(360).meta({ description: 'Argument of periapsis in degrees, from the ascending node.' }),
    mean_anomaly_deg: z.number().min(-360).max(360).meta({ description: 'Mean anomaly at the epoch in degrees.' }),
  })
  .meta({
    id: 'orbit',
    description: 'Osculating Keplerian elements at the epoch, centred on the parent, in the system reference frame. Angles in degrees.',
  });

const star = z
  .strictObject({
    id,
    name,
    description: z.string().optional(),
    mu_m3_s2: mu.optional(),
    mass_kg: mass.optional(),
    radius_m: radius,
    min_safe_altitude_m: z
      .number()
      .min(0)
      .max(1e13)
      .meta({ description: 'Optional closest safe approach above the photosphere, in metres (default 0).' })
      .optional(),
    colour: colour.optional(),
  })
  .meta({ description: 'The central star. Exactly one of mu_m3_s2 and mass_kg.', ...oneOfMuOrMass });

const body = z
  .strictObject({
    id,
    name,
    description: z.string().optional(),
    parent: id.meta({ description: 'Id of the star or of another body this body orbits.' }),
    mu_m3_s2: mu.optional(),
    mass_kg: mass.optional(),
    radius_m: radius,
    min_safe_altitude_m: z.number().min(0).max(1e13).meta({
      description: 'Minimum safe altitude above the mean radius in metres: top of the atmosphere, or highest terrain for an airless body.',
    }),
    atmosphere_height_m: z
      .number()
      .min(0)
      .max(1e13)
      .meta({
        description:
          'Optional height of the atmosphere above the mean radius in metres: where the air becomes too thin to matter (for ascent losses and aerobraking). Absent or 0: airless.',
      })
      .optional(),
    surface: z
      .boolean()
      .meta({ description: 'Optional: false for a body without a solid surface to land on or launch from (a gas giant). Default true.' })
      .optional(),
    rotation_period_s: z
      .number()
      .min(-1e12)
      .max(1e12)
      .meta({
        description: 'Optional sidereal rotation period in seconds; negative for retrograde rotation. At least 1 s and at most 1e12 s in magnitude.',
        not: { exclusiveMinimum: -1, exclusiveMaximum: 1 },
        'x-rule': 'must be at least 1 s in magnitude (negative for retrograde)',
      })
      .optional(),
    colour: colour.optional(),
    orbit,
  })
  .meta({ id: 'body', description: 'A planet, moon or smaller body. Exactly one of mu_m3_s2 and mass_kg.', ...oneOfMuOrMass });

const calendar = z
  .strictObject({
    home: id.meta({ description: 'Id of the home body whose year and day the calendar uses. The body needs rotation_period_s.' }).optional(),
    year_s: z.number().min(1).max(1e12).meta({ description: 'Length of the calendar year in seconds (instead of home), 1 to 1e12.' }).optional(),
    day_s: z.number().min(1).max(1e12).meta({ description: 'Length of the calendar day in seconds (instead of home), 1 to 1e12.' }).optional(),
    year_at_epoch: z.int().min(-1e9).max(1e9).meta({ description: 'Number of the calendar year that starts at the epoch (-1e9 to 1e9).' }),
    era: z
      .string()
      .regex(/^[^,\s](?:[^,]*[^,\s])?$/)
      .meta({
        description: 'Optional short era label printed after the year number, e.g. "TR" gives "Year 412 TR".',
        'x-rule': 'must be a short label without commas or surrounding spaces',
      })
      .optional(),
  })
  .meta({
    description:
      'Calendar used to show times. Either "home" (the year is the home body\'s orbital period; the day is its mean solar day, 1 / |1/rotation_period_s - 1/orbital period|) or both "year_s" and "day_s" given explicitly. Days within a year are numbered from 1; a clock time is SI hours:minutes:seconds since the start of the day (so a 26-hour day runs 00:00 to 25:59).',
    oneOf: [{ required: ['home'] }, { required: ['year_s', 'day_s'] }],
    'x-rule-oneOf': 'needs either "home" or both "year_s" and "day_s", not both',
  });

/** The whole system file. Key order here is the order the file is written in. */
export const systemFileShape = z
  .strictObject({
    $schema: z.string().meta({ description: 'Optional pointer to this schema for editors; ignored on load and not written back on save.' }).optional(),
    format: z.literal('waymark-system').meta({ description: 'Always "waymark-system".' }),
    version: z.literal(1).meta({ description: 'File format version. This schema describes version 1; older versions are migrated on load.' }),
    name: z.string().min(1).meta({ description: 'Name of the star system, for display.' }),
    description: z.string().meta({ description: 'Optional free text about the system.' }).optional(),
    epoch: z
      .strictObject({
        label: z.string().min(1).meta({ description: 'Display label of the epoch, e.g. "Year 412 TR, day 1, 00:00".' }),
      })
      .meta({
        description:
          "The system's epoch: time t = 0 s of the system clock. Every time inside the program is seconds from this instant. The epoch is also the start (day 1, 00:00) of calendar year calendar.year_at_epoch.",
      }),
    calendar,
    star,
    bodies: z.array(body).meta({
      description: 'Planets, moons and smaller bodies, in any order (a parent may come after its children). Each orbits the star or another body.',
    }),
  })
  .meta({
    $id: 'https://waymark.invalid/schema/system.schema.json',
    title: 'Waymark star-system file, version 1',
    description:
      "One invented star system: its star, its bodies on Keplerian orbits at the epoch, and the calendar used to show times. Units: every dimensional field carries its SI unit in its name (_m metres, _s seconds, _kg kilograms, _m3_s2 cubic metres per second squared); angles carry _deg and are written in DEGREES in the file (the program converts them to radians on load). Orbital elements of a body are osculating Keplerian elements at the epoch, centred on the parent, referred to the system's single inertial reference frame (x-y plane is the reference plane, x the reference direction, z completes a right-handed set). Only elliptic orbits (0 <= e < 1). Unknown fields are errors.",
  });

// The document types, as written in a schema-valid file (optional fields may be absent).
export type SystemDocument = z.input<typeof systemFileShape>;
export type OrbitDocument = z.input<typeof orbit>;
export type StarDocument = z.input<typeof star>;
export type BodyDocument = z.input<typeof body>;
export type CalendarDocument = z.input<typeof calendar>;
