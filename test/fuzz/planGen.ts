/**
 * Random plans for a star system, in memory: every start, event, solve and coast kind, vehicles
 * from featherweight probes to stages with no propellant, times in order (or, with a small
 * probability, out of order), targets that are reachable, unreachable or absent. The values stay
 * inside the plan file's schema ranges, so a plan written with serializePlanFile reads back.
 * Also the demo plan with a few of its numbers moved.
 */
import type { BurnEvent, CoastUntil, Plan, PlanEvent, PlanStart, Stage } from '../../core/plan/plan.ts';
import type { StarSystem } from '../../core/system/model.ts';
import type { Draw } from './draw.ts';

const DAY = 86400;

function randomStart(d: Draw, system: StarSystem, epoch: number): PlanStart {
  const bodies = system.bodies;
  const k = d.bool(0.5) ? (system.indexById.tessel ?? 0) : d.int(0, bodies.length - 1);
  const b = bodies[k];
  const soi = Number.isFinite(b.derived.soiRadius) ? b.derived.soiRadius : 1e3 * b.radius;
  if (d.bool(0.7)) {
    const alt = d.pick([d.log(1e3, 2e6), d.log(1e3, Math.max(2e3, soi - b.radius)), b.safeAlt, d.uniform(-0.5, 0.5) * b.radius]);
    const e = d.pick([0, d.uniform(0, 0.9), 1 - d.log(1e-9, 1e-2)]);
    return {
      kind: 'parking',
      body: b.id,
      epoch,
      periapsisAltitude: alt,
      e,
      i: d.uniform(0, Math.PI),
      raan: d.uniform(-Math.PI, Math.PI),
      argp: d.uniform(-Math.PI, Math.PI),
      nu: d.uniform(-Math.PI, Math.PI),
    };
  }
  const r = b.radius * d.log(1.0001, Math.max(1.001, (2 * soi) / b.radius));
  const u = d.unitVector();
  const w = d.unitVector();
  const vc = Math.sqrt(b.mu / r);
  const s = vc * d.pick([0, d.uniform(0, 2.5), Math.SQRT2 * d.uniform(0.999, 1.001)]);
  // sometimes exactly radial (a rectilinear orbit)
  const dir = d.bool(0.1) ? u : w;
  return { kind: 'state', body: b.id, epoch, r: [r * u[0], r * u[1], r * u[2]], v: [s * dir[0], s * dir[1], s * dir[2]] };
}

function randomStage(d: Draw, k: number): Stage {
  return {
    name: `Stage ${k}`,
    dryMass: d.bool(0.2) ? 0 : d.log(1, 1e5),
    propellantMass: d.pick([0, d.log(1e-3, 1e6), d.log(1, 1e4)]),
    isp: d.pick([d.uniform(150, 460), d.log(1, 1e4)]),
    thrust: d.pick([d.log(1e-2, 1e7), d.log(1e3, 1e6)]),
  };
}

function randomUntil(d: Draw, system: StarSystem, t: { now: number }): CoastUntil {
  const kind = d.pick(['time', 'duration', 'periapsis', 'apoapsis', 'soi-change', 'altitude', 'node'] as const);
  switch (kind) {
    case 'time':
      t.now += d.pick([0, d.log(1, 1e8)]);
      return { kind: 'time', t: t.now };
    case 'duration':
      return { kind: 'duration', dt: d.pick([1e-6, d.log(1e-3, 1e8)]) };
    case 'periapsis':
    case 'apoapsis':
      return d.bool(0.3) ? { kind, body: d.pick(system.bodies).id } : { kind };
    case 'soi-change':
      return { kind };
    case 'altitude':
      return { kind, altitude: d.pick([d.log(1e3, 1e9), -d.log(1, 1e6), 0]) };
    case 'node':
      return { kind, which: d.pick(['ascending', 'descending', 'any'] as const) };
  }
}

function randomBurn(d: Draw, system: StarSystem, id: string, t: { now: number }): BurnEvent {
  let time: number | null = null;
  if (d.bool(0.4)) {
    t.now += d.log(1, 1e7);
    time = t.now;
  } else if (d.bool(0.05)) {
    time = t.now - d.log(1, 1e6); // out of order: flown at once, flagged
  }
  const nonStar = system.bodies.filter((b) => b.index !== 0);
  const kind = d.pick(['fixed', 'fixed', 'transfer', 'capture', 'plane', 'apsis'] as const);
  let solve: BurnEvent['solve'];
  switch (kind) {
    case 'fixed':
      solve = { kind: 'fixed' };
      break;
    case 'transfer': {
      const to = nonStar.length > 0 ? d.pick(nonStar).id : system.bodies[0].id;
      solve = { kind: 'transfer', to, arrive: t.now + d.pick([d.log(1, 1e9), d.log(30 * DAY, 400 * DAY)]) };
      if (d.bool(0.3)) solve.revs = d.int(0, 5);
      if (d.bool(0.2)) solve.retrograde = d.bool();
      if (d.bool(0.3)) solve.periapsisAltitude = d.log(1e3, 1e8);
      break;
    }
    case 'capture':
      solve = { kind: 'capture', e: d.pick([0, d.uniform(0, 0.99), 1 - 1e-12]) };
      break;
    case 'plane':
      solve = { kind: 'plane', i: d.uniform(0, Math.PI) };
      break;
    case 'apsis':
      solve = { kind: 'apsis', altitude: d.pick([d.log(1e3, 1e10), -d.log(1, 1e7), 0]) };
      break;
  }
  const dvMag = kind === 'fixed' ? d.pick([0, d.log(1e-3, 1e4), d.log(1e4, 1e6)]) : d.pick([0, 0, d.log(1e-3, 1e2)]);
  const u = d.unitVector();
  return {
    type: 'burn',
    id,
    name: `Burn ${id}`,
    t: time,
    frame: d.pick(['vnb', 'rtn', 'inertial'] as const),
    dv: [dvMag * u[0], dvMag * u[1], dvMag * u[2]],
    solve,
    mode: d.bool(0.3) ? 'finite' : 'impulsive',
    pointing: d.pick(['velocity', 'inertial'] as const),
  };
}

/** A random plan in `system` (see the module comment). */
export function randomPlan(d: Draw, system: StarSystem): Plan {
  const epoch = d.pick([0, d.uniform(0, 1e8), -d.log(1, 1e8)]);
  const stages = Array.from({ length: d.int(1, 3) }, (_, k) => randomStage(d, k));
  const t = { now: epoch };
  const events: PlanEvent[] = [];
  const n = d.int(0, 10);
  let drops = 0;
  for (let k = 0; k < n; k++) {
    const id = `e${k}`;
    const r = d.unit();
    if (r < 0.45) events.push(randomBurn(d, system, id, t));
    else if (r < 0.9) events.push({ type: 'coast', id, name: `Coast ${k}`, until: randomUntil(d, system, t) });
    else if (drops < stages.length) {
      drops++;
      events.push({ type: 'stage', id, name: `Stage drop ${k}` });
    }
  }
  const tb = d.pick(system.bodies);
  const useApo = d.bool(0.4);
  const target = d.bool(0.3)
    ? null
    : {
        body: d.bool(0.5) && system.indexById.ochre !== undefined ? 'ochre' : tb.id,
        periapsisAltitude: d.log(1e3, 1e8),
        e: useApo ? null : d.uniform(0, 0.99),
        apoapsisAltitude: useApo ? d.log(1e8, 1e9) : null,
        i: d.bool(0.5) ? null : d.uniform(0, Math.PI),
        tolerance: { periapsisAltitude: d.log(1, 1e6), e: d.log(1e-6, 0.5), i: d.log(1e-6, 1) },
      };
  return {
    name: 'Random plan',
    description: '',
    vehicle: { name: 'Random ship', payloadMass: d.bool(0.2) ? 0 : d.log(1, 1e5), stages },
    start: randomStart(d, system, epoch),
    events,
    target,
    reserve: { percent: d.uniform(0, 20), absolute: d.pick([0, d.log(1, 1e3)]) },
    end: d.bool(0.2) ? t.now + d.log(1, 1e8) : null,
  };
}

/** The demo plan with some of its numbers moved (departure time, arrival, masses, solves). */
export function variedDemoPlan(d: Draw, base: Plan): Plan {
  const p = structuredClone(base);
  const s = p.start;
  if (d.bool(0.3)) s.epoch += d.uniform(-1, 1) * d.log(1, 1e7);
  for (const st of p.vehicle.stages) {
    if (d.bool(0.3)) st.propellantMass *= d.log(0.01, 2);
    if (d.bool(0.2)) st.thrust *= d.log(1e-4, 10);
  }
  if (d.bool(0.3)) p.vehicle.payloadMass *= d.log(0.1, 100);
  for (const ev of p.events) {
    if (ev.type === 'burn') {
      if (ev.t !== null && d.bool(0.3)) ev.t += d.uniform(-1, 1) * d.log(1, 1e6);
      if (ev.solve.kind === 'transfer' && d.bool(0.3)) ev.solve.arrive += d.uniform(-1, 1) * d.log(1, 3e7);
      if (ev.solve.kind === 'capture' && d.bool(0.3)) ev.solve.e = d.uniform(0, 0.99);
      if (d.bool(0.2)) ev.mode = ev.mode === 'finite' ? 'impulsive' : 'finite';
    } else if (ev.type === 'coast' && ev.until.kind === 'duration' && d.bool(0.3)) {
      ev.until.dt *= d.log(1e-6, 1e3);
    }
  }
  return p;
}
