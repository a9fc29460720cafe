/**
 * A hand-made Δv map of an invented small system (star Brin; planets Ash with air and a surface,
 * Brume a gas giant without a surface and with moons Cinder and Dross, Eyot airless): the shape
 * core/survey deltaVMap returns, with made-up figures, for testing the drawing only.
 */
import type { DeltaVMap, MapEdge, MapEdgeKind, MapNode, MapNodeKind } from '../../../core/survey/index.ts';
import type { MapLayoutBody } from '../../../core/io/deltaVMapSvg.ts';

const BODIES: { id: string; name: string; surface: boolean; air: boolean; parent: string | null; a: number }[] = [
  { id: 'ash', name: 'Ash', surface: true, air: true, parent: null, a: 1.1e11 },
  { id: 'brume', name: 'Brume', surface: false, air: true, parent: null, a: 4.2e11 },
  { id: 'cinder', name: 'Cinder', surface: true, air: false, parent: 'brume', a: 3.1e8 },
  { id: 'dross', name: 'Dross', surface: true, air: true, parent: 'brume', a: 6.4e8 },
  { id: 'eyot', name: 'Eyot', surface: true, air: false, parent: null, a: 7.9e11 },
];

export const FIXTURE_BODIES: MapLayoutBody[] = BODIES.map((b) => ({ id: b.id, parent: b.parent, a: b.a }));

function node(k: number, kind: MapNodeKind, label: string, altitude: number): MapNode {
  const b = BODIES[k];
  return { id: `${b.id}:${kind}`, body: k + 1, bodyId: b.id, bodyName: b.name, kind, label, altitude };
}

function edge(from: string, to: string, kind: MapEdgeKind, dv: number, dvAero: number | null, how: string): MapEdge {
  const transfer = kind === 'transfer';
  return {
    id: `${from}>${to}`,
    from,
    to,
    kind,
    dv,
    dvAero,
    window: transfer
      ? { depart: 1.2e6 + dv, tof: 9.1e6, dvDepart: 0.6 * dv, dvCapture: 0.4 * dv, range: { min: dv, median: dv * 1.2, max: dv * 1.9 }, synodic: 3.3e7 }
      : null,
    hohmann: transfer ? dv * 0.97 : null,
    how,
  };
}

/** The fixture map. Figures (m/s) chosen so every formatting branch shows: below 1 km/s, km/s, and thousands of km/s. */
export function fixtureMap(): DeltaVMap {
  const nodes: MapNode[] = [];
  const edges: MapEdge[] = [];
  BODIES.forEach((b, k) => {
    if (b.surface) nodes.push(node(k, 'surface', 'surface', 0));
    nodes.push(node(k, 'low-orbit', 'low orbit 80 km', 80_000));
    nodes.push(node(k, 'soi-edge', `SOI edge ${(1.5e6 + k * 2.1e5).toFixed(0)} km`, 1.5e9 + k * 2.1e8));
    const lo = `${b.id}:low-orbit`;
    const soi = `${b.id}:soi-edge`;
    if (b.surface) {
      const sf = `${b.id}:surface`;
      edges.push(edge(sf, lo, 'ascent', 3400 + 310 * k, null, `Ascent on ${b.name}: orbital speed + losses (rule of thumb) & <drag>`));
      edges.push(edge(lo, sf, 'landing', 3100 + 290 * k, b.air ? 140 + k : null, `Landing on ${b.name}: "powered" descent`));
    }
    edges.push(edge(lo, soi, 'escape', 820 + 410 * k, null, `Escape from ${b.name}'s low orbit to its SOI edge`));
    edges.push(edge(soi, lo, 'capture', 830 + 405 * k, b.air ? 60 + k : null, `Capture at ${b.name} from its SOI edge`));
  });
  const planets = ['ash', 'brume', 'eyot'];
  const transfer = (a: string, b: string, dv: number) => {
    edges.push(edge(`${a}:low-orbit`, `${b}:low-orbit`, 'transfer', dv, null, `Transfer ${a} → ${b}: porkchop minimum over one synodic period`));
  };
  for (let i = 0; i < planets.length; i++)
    for (let j = 0; j < planets.length; j++) if (i !== j) transfer(planets[i], planets[j], 5120 + 733 * i + 311 * j + (i > j ? 1_234_567 : 0));
  for (const m of ['cinder', 'dross']) {
    transfer('brume', m, 2210 + m.length * 13);
    transfer(m, 'brume', 2250 + m.length * 17);
  }
  transfer('cinder', 'dross', 940);
  transfer('dross', 'cinder', 955);
  return {
    system: 'Brin & <Co>',
    nodes,
    edges,
    rules: [
      'Ascent: orbital speed at the low orbit plus gravity and drag losses of a simple rule of thumb, stated with its numbers for each body in the hover text.',
      'Low orbit: a circular orbit just above the air or the terrain.',
    ],
  };
}
