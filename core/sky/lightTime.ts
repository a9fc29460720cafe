/**
 * One-way light time between the ship and a body's centre: the instantaneous geometric distance between
 * them at the same time t, divided by c. No light-time iteration (the body's position is not
 * taken at t − d/c) and no relativity (no Shapiro delay, no aberration): a readout for an author
 * ("a message takes 14 min to reach Tessel"), not a navigation observable.
 *
 * What the shortcut costs: during the light time d/c the body moves v·d/c, so the distance
 * to where the body really was when the light left it differs by at most that. In the demo
 * (tessel-to-ochre) the largest ship–Tessel distance is about 2.5e11 m (d/c ≈ 830 s) and Tessel
 * moves at about 30.5 km/s about Ilmar: up to about 2.5e4 km, i.e. up to 0.06 s of light time
 * (v/c ≈ 1e-4 of the readout), below the readout's shown precision (one light-time iteration
 * on the demo in test/core/sky/lightTime.test.ts measures it).
 *
 * c = 299 792 458 m/s is exact by the SI definition of the metre (17th CGPM, 1983).
 */
import { InputError } from '../math/index.ts';
import { bodyPosition, type StarSystem } from '../system/index.ts';

/** The speed of light in vacuum, m/s (exact by the definition of the metre). */
export const SPEED_OF_LIGHT = 299_792_458;

const pos = new Float64Array(3);

/** One-way light time (s) from a ship at star-relative (x, y, z) m to body `body` at time t: |r_ship − r_body(t)| / c. */
export function lightTimeAt(system: StarSystem, body: number, t: number, x: number, y: number, z: number): number {
  bodyPosition(system, body, t, pos, 0);
  return Math.hypot(x - pos[0], y - pos[1], z - pos[2]) / SPEED_OF_LIGHT;
}

/**
 * The light time (s) from the ship to body `body` at each sample: `t` the sample times (s),
 * `shipStar` the ship's positions relative to the star at those times (x, y, z interleaved, m).
 * Written into `out` (allocated when not given).
 */
export function lightTimes(system: StarSystem, body: number, t: ArrayLike<number>, shipStar: ArrayLike<number>, out?: Float64Array): Float64Array {
  const n = t.length;
  if (shipStar.length < 3 * n) throw new InputError('shipStar', `must hold 3 numbers per sample (${3 * n})`, shipStar.length);
  if (!(Number.isInteger(body) && body >= 0 && body < system.bodies.length)) throw new InputError('body', 'must be a body index', body);
  const res = out ?? new Float64Array(n);
  if (res.length < n) throw new InputError('out', `must hold ${n} numbers`, res.length);
  for (let k = 0; k < n; k++) {
    const x = shipStar[3 * k];
    const y = shipStar[3 * k + 1];
    const z = shipStar[3 * k + 2];
    if (!(Number.isFinite(x) && Number.isFinite(y) && Number.isFinite(z))) throw new InputError(`shipStar[${3 * k}]`, 'must be finite', x);
    res[k] = lightTimeAt(system, body, t[k], x, y, z);
  }
  return res;
}
