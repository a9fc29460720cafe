/**
 * The bodies' tracks: every body of the system but the star, its position relative to its parent
 * from the conic ephemeris (core/system bodyStateRelativeToParent), fitted over [t0, t1] with
 * equal pieces of one degree per body (pieces.ts fitUniform) to a position tolerance.
 *
 * Degree and piece length (defaults measured on the Ilmar system over the demo plan's 242 days,
 * 1 m): the coefficients of all bodies fall steeply up to degree 12 and slowly beyond (7,263 doubles
 * at degree 8, 5,379 at 10, 4,524 at 12, 4,095 at 14, 3,465 at 20) while an evaluation costs two
 * flops per coefficient, so degree 12 (13 coefficients per axis, within the range the planetary
 * ephemerides use, Newhall 1989, from memory). The piece count search starts from half an orbital period per piece, where a degree-12
 * series of a near-circular orbit reaches about a metre at 10¹¹ m (the first dropped term,
 * 2 J₁₃(π/2)·a by the Jacobi–Anger expansion, from memory), and ends at the fewest
 * equal pieces that hold the tolerance.
 * Relative to the parent, a moon's track carries only its own orbit (Quill's 2.6·10⁸ m, not the
 * 10¹¹ m of Tessel's): its roundoff floor is 400 times lower, and a game adds the planet's track
 * only when it needs star-centred positions. It does not save pieces: the pieces are set by the
 * fastest motion in the series, the moon's own orbit either way (measured for Quill over the demo
 * span, degree 12: 31 pieces both ways at 1 m, 54 against 57 at 1 mm).
 */
import { InputError, requireFinite, requirePositive } from '../math/index.ts';
import { type StarSystem, bodyStateRelativeToParent } from '../system/index.ts';
import { requireDegree } from './chebyshev.ts';
import type { RuntimeTrack } from './model.ts';
import { DEFAULT_PIECE_LIMITS, fitUniform } from './pieces.ts';

/** Default position tolerance of a body's track, m. */
export const BODY_TOLERANCE = 1;
/** Default degree of a body's pieces. */
export const BODY_DEGREE = 12;
/** The first piece length tried, as a fraction of the body's orbital period. */
export const BODY_FIRST_PIECE = 0.5;

export interface BodyFitOptions {
  /** Position tolerance, m (default BODY_TOLERANCE). */
  tolerance?: number;
  /** Degree of the series (default BODY_DEGREE). */
  degree?: number;
}

/** Checks a span: finite, t1 > t0. */
export function requireSpan(t0: number, t1: number, field0 = 't0', field1 = 't1'): void {
  requireFinite(field0, t0);
  requireFinite(field1, t1);
  if (!(t1 > t0)) throw new InputError(field1, `must be later than ${field0} (${t0})`, t1);
}

/** Tracks of every body but the star over [t0, t1], in the system's order (body j → track j − 1). */
export function fitBodyTracks(system: StarSystem, t0: number, t1: number, options: BodyFitOptions = {}): RuntimeTrack[] {
  requireSpan(t0, t1);
  const tolerance = requirePositive('tolerance', options.tolerance ?? BODY_TOLERANCE);
  const degree = requireDegree('degree', options.degree ?? BODY_DEGREE);
  const tracks: RuntimeTrack[] = [];
  for (let j = 1; j < system.bodies.length; j++) {
    const body = system.bodies[j];
    const parent = body.parentIndex;
    const source = (t: number, out6: Float64Array): void => {
      bodyStateRelativeToParent(system, j, t, out6);
    };
    const first = Math.ceil((t1 - t0) / (BODY_FIRST_PIECE * body.derived.period));
    const fit = fitUniform(source, t0, t1, degree, tolerance, first, DEFAULT_PIECE_LIMITS);
    tracks.push({
      name: body.id,
      kind: 'body',
      degree,
      tolerance,
      maxError: fit.maxError,
      fine: [],
      arcs: [
        {
          center: system.bodies[parent].id,
          centerIndex: parent - 1,
          t0,
          t1,
          count: fit.count,
          length: fit.length,
          breaks: null,
          coefficients: fit.coefficients,
        },
      ],
    });
  }
  return tracks;
}
