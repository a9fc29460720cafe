/**
 * Sunlight, penumbra or umbra of a ship behind one body: the star a uniform disc of its radius
 * (no limb darkening), the occulting body a sphere of its mean radius (no atmosphere), the star
 * at the origin of the star-relative frame.
 *
 * Conical model (Montenbruck & Gill, Satellite Orbits, Springer 2000, §3.4.2, from memory): seen
 * from the ship, the star's apparent angular radius a = asin(R★/|r★ − r|), the body's
 * b = asin(R/|r_b − r|) and their separation c (angle between the two directions). Then
 *   c ≥ a + b        sunlight (fraction 1)
 *   c ≤ b − a        umbra: the body hides the whole disc (fraction 0)
 *   c ≤ a − b        antumbra (beyond the umbra cone's tip, the body inside the disc): fraction
 *                    1 − b²/a²; reported as penumbra (partly lit), its fraction saying how much
 *   otherwise        penumbra: fraction 1 − A/(π a²), A the area of overlap of two discs of radii
 *                    a and b whose centres are c apart: x = (c² + a² − b²)/(2c), y = √(a² − x²),
 *                    A = a² acos(x/a) + b² acos((c − x)/b) − c·y.
 * The discs are treated as plane circles of those angular radii (the area ratio of small discs).
 *
 * Cylindrical model: the shadow is the cylinder of the body's radius behind it, its axis along
 * the star → body line (the star a point at infinity in direction): in it the fraction is 0,
 * outside 1 (no penumbra).
 *
 * A ship inside the body (|r_b − r| ≤ R) counts as in umbra; inside the star as in sunlight.
 * Nothing allocates.
 */

/** The shadow models: `conical` (the star a disc: penumbra and umbra) or `cylindrical` (the star a point at infinity: umbra only). */
export type ShadowModel = 'conical' | 'cylindrical';

/** Kinds of light at the ship (codes, for hot loops). */
export const SUNLIGHT = 0;
export const PENUMBRA = 1;
export const UMBRA = 2;

/** Fraction of the star's disc that two discs of angular radii a (the star) and b (the body), centres c apart, leave uncovered: 1 sunlight, 0 umbra. */
export function discFraction(a: number, b: number, c: number): number {
  if (c >= a + b) return 1;
  if (c <= b - a) return 0;
  if (c <= a - b) return 1 - (b * b) / (a * a);
  const x = (c * c + a * a - b * b) / (2 * c);
  const y = Math.sqrt(Math.max(0, a * a - x * x));
  const cosA = Math.min(1, Math.max(-1, x / a));
  const cosB = Math.min(1, Math.max(-1, (c - x) / b));
  const area = a * a * Math.acos(cosA) + b * b * Math.acos(cosB) - c * y;
  const f = 1 - area / (Math.PI * a * a);
  // the overlap formula is continuous with the branches above; rounding may step just outside [0, 1]
  return f < 0 ? 0 : f > 1 ? 1 : f;
}

/**
 * The angles of the conical model seen from a ship at star-relative (sx, sy, sz) with the body at
 * (bx, by, bz): out3 = [a (the star's apparent radius), b (the body's), c (their separation)], rad.
 * Returns false when the ship is inside the body (out3 then [a, π/2, 0]: umbra) or inside the star.
 */
export function shadowAngles(
  sx: number,
  sy: number,
  sz: number,
  bx: number,
  by: number,
  bz: number,
  starRadius: number,
  bodyRadius: number,
  out3: Float64Array,
): boolean {
  const ds = Math.hypot(sx, sy, sz);
  const ux = bx - sx;
  const uy = by - sy;
  const uz = bz - sz;
  const db = Math.hypot(ux, uy, uz);
  const a = ds > starRadius ? Math.asin(starRadius / ds) : Math.PI / 2;
  if (!(db > bodyRadius)) {
    out3[0] = a;
    out3[1] = Math.PI / 2;
    out3[2] = 0;
    return false;
  }
  const b = Math.asin(bodyRadius / db);
  // directions ship → star (−s) and ship → body (u)
  const cos = (-sx * ux - sy * uy - sz * uz) / (ds * db);
  out3[0] = a;
  out3[1] = b;
  out3[2] = Math.acos(cos > 1 ? 1 : cos < -1 ? -1 : cos);
  return ds > starRadius;
}

const ang = new Float64Array(3);

/**
 * Fraction of the star's disc seen from a ship at star-relative (sx, sy, sz) with the body at
 * (bx, by, bz) of radius `bodyRadius` (1 sunlight, 0 umbra, between: penumbra or antumbra), in
 * the `model` given.
 */
export function sunlitFraction(
  sx: number,
  sy: number,
  sz: number,
  bx: number,
  by: number,
  bz: number,
  starRadius: number,
  bodyRadius: number,
  model: ShadowModel,
): number {
  if (model === 'cylindrical') {
    // axial distance behind the body along the star → body direction, and distance from the axis
    const db = Math.hypot(bx, by, bz);
    const dx = sx - bx;
    const dy = sy - by;
    const dz = sz - bz;
    const along = (dx * bx + dy * by + dz * bz) / db;
    const d2 = dx * dx + dy * dy + dz * dz;
    if (d2 <= bodyRadius * bodyRadius) return 0;
    if (along <= 0) return 1;
    const perp2 = d2 - along * along;
    return perp2 < bodyRadius * bodyRadius ? 0 : 1;
  }
  const inStarOrBody = !shadowAngles(sx, sy, sz, bx, by, bz, starRadius, bodyRadius, ang);
  if (inStarOrBody) return ang[2] === 0 && ang[1] === Math.PI / 2 ? 0 : 1;
  return discFraction(ang[0], ang[1], ang[2]);
}

/** The kind of light a sunlit fraction means: SUNLIGHT (1), UMBRA (0), else PENUMBRA. */
export function shadowKind(fraction: number): number {
  return fraction >= 1 ? SUNLIGHT : fraction <= 0 ? UMBRA : PENUMBRA;
}

/** Length of a body's umbra cone behind its centre, m: R·d/(R★ − R) (similar triangles of the tangent lines); Infinity when the body is not smaller than the star. */
export function umbraLength(starRadius: number, bodyRadius: number, distance: number): number {
  return starRadius > bodyRadius ? (bodyRadius * distance) / (starRadius - bodyRadius) : Infinity;
}
