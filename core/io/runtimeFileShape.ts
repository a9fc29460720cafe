/**
 * The runtime ephemeris file's shape (JSON form), declared once: the JSON Schema
 * assets/schema/runtime-ephemeris.schema.json is emitted from it by `npm run schema:emit`
 * (core/io/fileJsonSchema.ts; test/core/io/fileSchemas.test.ts fails when they drift apart), and
 * its document type is checked against core/runtime's `RuntimeFile` (the type the encoder writes)
 * in test/core/io/runtimeFileShape.test.ts. The binary form's layout is in the schema's
 * description and in core/runtime/format.ts. zod is a development dependency: other modules import
 * this file with `import type` only.
 *
 * Names follow the brief of the format rather than the plan file's unit suffixes: the file has one
 * unit per dimension, stated in `units` (metres, seconds).
 */
import * as z from 'zod';

const time = z.number().meta({ id: 'time', description: "Time in seconds from the system's epoch (its t = 0)." });

const metres = z.number().min(0).meta({ id: 'metres', description: 'A distance in metres, >= 0.' });

const name = z.string().min(1).meta({ id: 'name', description: "A track's name: a body's id (lowercase slug) or a ship's name." });

const fineWindow = z
  .strictObject({
    t0: time.meta({ description: 'Start of the window, s from the epoch.' }),
    t1: time.meta({ description: 'End of the window, s from the epoch (later than t0).' }),
    tolerance: z.number().gt(0).meta({ description: 'Position tolerance asked in the window, m (> 0).' }),
    maxError: metres.meta({ description: 'Largest position error measured on the pieces that overlap the window, m.' }),
  })
  .meta({ id: 'fineWindow', description: 'A window fitted to a tighter tolerance (near a burn or a periapsis).' });

const arc = z
  .strictObject({
    center: z.string().min(1).meta({ description: "Name of the centre: the name of track `centerIndex`, or the star's id (`origin`) when centerIndex is -1." }),
    centerIndex: z.int().min(-1).meta({ description: "Index of the centre's track in `tracks`, or -1 for the star (the origin of the axes)." }),
    t0: time.meta({ description: 'Start of the arc, s from the epoch (the previous arc ends here).' }),
    t1: time.meta({ description: 'End of the arc, s from the epoch (later than t0).' }),
    count: z.int().min(1).meta({ description: 'Number of pieces.' }),
    length: z
      .number()
      .gt(0)
      .meta({ description: 'Equal pieces: their length, s ((t1 - t0)/count); piece k covers [t0 + k*length, t0 + k*length + length].' })
      .optional(),
    breaks: z
      .array(time)
      .min(2)
      .meta({ description: 'Listed pieces: the count + 1 boundaries, t0 first and t1 last, increasing; piece k covers [breaks[k], breaks[k+1]].' })
      .optional(),
    coefficients: z.array(z.number()).meta({
      description:
        'count * 3 * (degree + 1) Chebyshev coefficients, m: piece after piece, each [x_0..x_N, y_0..y_N, z_0..z_N], so that x(t) = sum_j x_j T_j(s) with s = 2(t - a)/(b - a) - 1 on the piece [a, b] (c_0 is not halved).',
    }),
  })
  .meta({
    id: 'arc',
    description: 'A stretch of a track relative to one centre, cut into pieces: equal pieces ("length") or listed ones ("breaks").',
    oneOf: [{ required: ['length'] }, { required: ['breaks'] }],
    'x-rule-oneOf': 'needs exactly one of "length" (equal pieces) and "breaks" (listed pieces)',
  });

const track = z
  .strictObject({
    name,
    kind: z.enum(['body', 'ship']).meta({ description: '"body" (a planet or moon of the system) or "ship".' }),
    degree: z.int().min(1).max(40).meta({ description: "Degree N of every piece's series: N + 1 coefficients per axis. 1 to 40." }),
    tolerance: z.number().gt(0).meta({ description: 'Position tolerance the track was fitted to, m (> 0).' }),
    maxError: metres.meta({
      description:
        'Largest position error measured over the track, m: on each piece, against the source, at the extremes of T_{N+1} and midway between them, the peaks refined, plus 16 units of roundoff of the largest coordinate. At most `tolerance`.',
    }),
    fine: z.array(fineWindow).meta({ description: 'Windows fitted to a tighter tolerance (ships; empty for bodies).' }),
    arcs: z.array(arc).min(1).meta({ description: 'Arcs in time order, contiguous.' }),
  })
  .meta({
    id: 'track',
    description:
      "One body's or ship's position over time. A body: one arc relative to its parent, equal pieces. A ship: one arc per stretch about one body, listed pieces.",
  });

/** The whole runtime ephemeris file (JSON form). */
export const runtimeFileShape = z
  .strictObject({
    format: z.literal('waymark-runtime-ephemeris').meta({ description: 'Always "waymark-runtime-ephemeris".' }),
    version: z.literal(1).meta({ description: 'File format version. This schema describes version 1.' }),
    system: z.string().min(1).meta({ description: "The star system's name." }),
    origin: z.string().min(1).meta({ description: "The star's id: the origin of the axes (centre index -1)." }),
    epoch: z.string().meta({ description: "Label of the system's epoch, the time origin: every time is seconds from it." }),
    units: z
      .strictObject({
        length: z.literal('m').meta({ description: 'Always "m": positions and coefficients in metres.' }),
        time: z.literal('s').meta({ description: 'Always "s": times in seconds.' }),
      })
      .meta({ description: 'Units of every number in the file.' }),
    t0: time.meta({ description: "Start of the bodies' tracks, s from the epoch." }),
    t1: time.meta({ description: "End of the bodies' tracks, s from the epoch; ships' tracks lie within [t0, t1]." }),
    tracks: z
      .array(track)
      .min(1)
      .meta({ description: "The bodies in the system's order without the star (the system's body j is track j - 1), then the ships." }),
  })
  .meta({
    $id: 'https://waymark.invalid/schema/runtime-ephemeris.schema.json',
    title: 'Waymark runtime ephemeris file, version 1',
    description:
      "Positions of a star system's bodies and of a ship over a span as piecewise Chebyshev series (velocity is the series' derivative times 2/(b - a)), for a game to evaluate with a few multiply-adds per frame. Axes: the system's own (non-rotating, x and y in the reference plane, z completing a right-handed set), centred on the star; each arc is relative to its centre; add the centres' positions up the chain for the position relative to the star. Evaluation (Clenshaw): b1 = b2 = 0; for j = N..1: (b1, b2) = (2s*b1 - b2 + c_j, b1); value = s*b1 - b2 + c_0. Derivative: d1 = d2 = 0; for m = N-1..0: (d1, d2) = ((m+1)*c_{m+1} + 2s*d1 - d2, d1); velocity = d1 * 2/(b - a). The same data in binary (little-endian; str = u16 byte count then UTF-8): magic \"WMRE\", u16 version 1, u16 track count T, f64 t0, f64 t1, str system, str origin, str epoch; per track: str name, u8 kind (0 body, 1 ship), u8 degree N, f64 tolerance, f64 maxError, u32 fine count F then F x (f64 t0, t1, tolerance, maxError), u32 arc count A; per arc: str center, i32 centerIndex, u8 layout (0 equal, 1 listed), u32 count n, f64 t0, f64 t1, then f64 length (equal) or (n + 1) x f64 breaks (listed), then n x 3(N + 1) x f64 coefficients. Nothing follows the last track. Unknown fields are errors.",
  });

export type RuntimeFileDocument = z.input<typeof runtimeFileShape>;
