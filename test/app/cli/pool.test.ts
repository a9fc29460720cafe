import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SolverError } from '../../../core/math/errors.ts';
import { FLOAT_PLANES, INT_PLANES } from '../../../core/search/planes.ts';
import { computePorkchop } from '../../../core/search/porkchop.ts';
import type { PorkchopRequest } from '../../../core/search/request.ts';
import { computePorkchopPooled, PorkchopPool } from '../../../app/cli/pool.ts';
import { demoSystem } from '../../core/search/fixtures.ts';

const DAY = 86400;
const sys = demoSystem();
const base: PorkchopRequest = {
  from: sys.indexById.tessel,
  to: sys.indexById.ochre,
  depart: { start: 0, end: 800 * DAY, n: 90 },
  secondAxis: 'tof',
  second: { start: 60 * DAY, end: 500 * DAY, n: 70 },
  parkingAltitude: 200e3,
  arrivalAltitude: 300e3,
  arrivalEccentricity: 0.2,
};

describe('worker pool', () => {
  let pool: PorkchopPool;
  beforeAll(() => {
    pool = new PorkchopPool(2);
  });
  afterAll(async () => {
    await pool.close();
  });

  for (const [name, req] of [
    ['time-of-flight axis', base],
    ['arrival-time axis, up to 1 revolution', { ...base, secondAxis: 'arrival', second: { start: 100 * DAY, end: 1300 * DAY, n: 70 }, maxRevs: 1 }],
    ['planet to moon', { ...base, to: sys.indexById.quill, second: { start: 1 * DAY, end: 12 * DAY, n: 70 } }],
  ] as [string, PorkchopRequest][]) {
    it(`gives the in-thread grid bit for bit (${name})`, async () => {
      const here = computePorkchop(sys, req);
      const there = await pool.compute(sys, req, { chunks: 7 });
      for (const k of [...FLOAT_PLANES, ...INT_PLANES]) {
        expect(Buffer.compare(Buffer.from(there.planes[k].buffer), Buffer.from(here.planes[k].buffer)), k).toBe(0);
      }
      expect(there.unsolved).toBe(here.unsolved);
      expect(Array.from(there.departTimes)).toEqual(Array.from(here.departTimes));
    });
  }

  it('reports progress per chunk up to 100%', async () => {
    const seen: [number, number][] = [];
    await pool.compute(sys, base, { chunks: 9, onProgress: (d, t) => seen.push([d, t]) });
    expect(seen.length).toBe(9);
    const total = base.depart.n * base.second.n;
    for (let k = 1; k < seen.length; k++) expect(seen[k][0]).toBeGreaterThan(seen[k - 1][0]);
    expect(seen[seen.length - 1]).toEqual([total, total]);
  });

  it('stops early when cancelled, rejecting with SolverError cancelled', async () => {
    const big = { ...base, depart: { ...base.depart, n: 400 }, second: { ...base.second, n: 300 } };
    const ctl = new AbortController();
    let chunksDone = 0;
    let err: unknown;
    try {
      await pool.compute(sys, big, {
        chunks: 40,
        signal: ctl.signal,
        onProgress: () => {
          chunksDone++;
          ctl.abort();
        },
      });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SolverError);
    expect((err as SolverError).reason).toBe('cancelled');
    expect(chunksDone).toBeGreaterThanOrEqual(1);
    expect(chunksDone).toBeLessThan(40);
    // the pool still works afterwards
    const again = await pool.compute(sys, base, { chunks: 3 });
    expect(again.planes.dvTotal.length).toBe(base.depart.n * base.second.n);
  });

  it('a one-off pool gives the same grid and validates before starting work', async () => {
    const g = await computePorkchopPooled(sys, { ...base, depart: { ...base.depart, n: 10 } }, 1);
    const h = computePorkchop(sys, { ...base, depart: { ...base.depart, n: 10 } });
    expect(Buffer.compare(Buffer.from(g.planes.dvTotal.buffer), Buffer.from(h.planes.dvTotal.buffer))).toBe(0);
    await expect(pool.compute(sys, { ...base, to: base.from })).rejects.toMatchObject({ name: 'InputError', field: 'to' });
  });
});
