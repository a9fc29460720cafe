/** Hand-made plans for the file tests (invented values; the demo plans live in test/fixtures). */
import type { Plan } from '../../../core/plan/plan.ts';

const RAD = Math.PI / 180;

/** A plan touching every event, solve and coast kind; angles from round degree values. */
export function samplePlan(): Plan {
  return {
    name: 'Sample run',
    description: 'Every kind of event once.',
    vehicle: {
      name: 'Test Hull',
      payloadMass: 1500,
      stages: [
        { name: 'Kick', dryMass: 900, propellantMass: 6000, isp: 321.5, thrust: 45000 },
        { name: 'Cruise', dryMass: 400, propellantMass: 2100.25, isp: 305, thrust: 8000 },
      ],
    },
    start: { kind: 'parking', body: 'tessel', epoch: 3.25e7, periapsisAltitude: 250000, e: 0.001, i: 28.5 * RAD, raan: 12 * RAD, argp: 0, nu: -45 * RAD },
    events: [
      {
        type: 'burn',
        id: 'depart',
        name: 'Departure',
        t: 3.26e7,
        frame: 'vnb',
        dv: [0, 0, 0],
        solve: { kind: 'transfer', to: 'ochre', arrive: 5.1e7, revs: 0, periapsisAltitude: 350000 },
        mode: 'finite',
        pointing: 'velocity',
      },
      { type: 'coast', id: 'cruise-1', name: 'Cruise', until: { kind: 'time', t: 4e7 } },
      {
        type: 'burn',
        id: 'mcc',
        name: 'Mid-course',
        t: null,
        frame: 'rtn',
        dv: [1.25, -0.5, 0.1],
        solve: { kind: 'fixed' },
        mode: 'impulsive',
        pointing: 'inertial',
      },
      { type: 'stage', id: 'drop-kick', name: 'Drop kick stage' },
      { type: 'coast', id: 'to-soi', name: 'To Ochre', until: { kind: 'soi-change' } },
      { type: 'coast', id: 'to-peri', name: 'To periapsis', until: { kind: 'periapsis', body: 'ochre' } },
      {
        type: 'burn',
        id: 'capture',
        name: 'Capture',
        t: null,
        frame: 'vnb',
        dv: [0, 0, 0],
        solve: { kind: 'capture', e: 0.3 },
        mode: 'impulsive',
        pointing: 'velocity',
      },
      { type: 'coast', id: 'to-node', name: 'To node', until: { kind: 'node', which: 'ascending' } },
      {
        type: 'burn',
        id: 'plane',
        name: 'Plane change',
        t: null,
        frame: 'vnb',
        dv: [0, 0, 0],
        solve: { kind: 'plane', i: 60 * RAD },
        mode: 'impulsive',
        pointing: 'velocity',
      },
      { type: 'coast', id: 'to-apo', name: 'To apoapsis', until: { kind: 'apoapsis' } },
      {
        type: 'burn',
        id: 'circ',
        name: 'Circularise',
        t: null,
        frame: 'inertial',
        dv: [0, 0, 0],
        solve: { kind: 'apsis', altitude: 400000 },
        mode: 'impulsive',
        pointing: 'velocity',
      },
      { type: 'coast', id: 'low', name: 'Wait for low pass', until: { kind: 'altitude', altitude: 390000 } },
      { type: 'coast', id: 'settle', name: 'Settle', until: { kind: 'duration', dt: 7200 } },
      {
        type: 'burn',
        id: 'flyby-aim',
        name: 'Flyby aim',
        t: null,
        frame: 'vnb',
        dv: [0, 0, 0],
        solve: { kind: 'transfer', to: 'moravel', arrive: 4.5e7, flyby: { next: 'ochre', arrive: 5.1e7, powered: false } },
        mode: 'impulsive',
        pointing: 'velocity',
      },
      { type: 'flyby', id: 'moravel-pass', name: 'Moravel pass', body: 'moravel' },
    ],
    target: {
      body: 'ochre',
      periapsisAltitude: 400000,
      e: 0.01,
      apoapsisAltitude: null,
      i: 60 * RAD,
      tolerance: { periapsisAltitude: 20000, e: 0.02, i: 0.5 * RAD },
    },
    reserve: { percent: 5, absolute: 25 },
    end: 5.2e7,
  };
}

/** A state-vector start, no target. */
export function stateStartPlan(): Plan {
  return {
    name: 'Drift',
    description: '',
    vehicle: { name: 'Probe', payloadMass: 0, stages: [{ name: 'Only', dryMass: 50, propellantMass: 20, isp: 220, thrust: 20 }] },
    start: { kind: 'state', body: 'ilmar', epoch: 0, r: [1.2e11, -3.5e9, 1e8], v: [1200.5, 29800.25, -3.75] },
    events: [{ type: 'coast', id: 'drift', name: 'Drift', until: { kind: 'duration', dt: 8.64e6 } }],
    target: null,
    reserve: { percent: 0, absolute: 0 },
    end: null,
  };
}
