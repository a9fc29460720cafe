/**
 * Field paths. The plan file reports problems with the FILE's field names
 * (`events[2].dv_mps[0]`, `vehicle.stages[1].isp_s`); the evaluator with the in-memory names
 * (`events[2].dv[0]`, `vehicle.stages[1].isp`). The editor keys its fields by the in-memory
 * path, so file paths are translated here, name by name.
 */
const FILE_TO_MEMORY: Record<string, string> = {
  payload_kg: 'payloadMass',
  dry_kg: 'dryMass',
  propellant_kg: 'propellantMass',
  isp_s: 'isp',
  thrust_N: 'thrust',
  epoch_s: 'epoch',
  periapsis_altitude_m: 'periapsisAltitude',
  apoapsis_altitude_m: 'apoapsisAltitude',
  i_deg: 'i',
  raan_deg: 'raan',
  argp_deg: 'argp',
  nu_deg: 'nu',
  r_m: 'r',
  v_mps: 'v',
  t_s: 't',
  dv_mps: 'dv',
  dt_s: 'dt',
  arrive_s: 'arrive',
  altitude_m: 'altitude',
  absolute_mps: 'absolute',
  end_s: 'end',
};

/** `events[2].dv_mps[0]` → `events[2].dv[0]`; names without a unit suffix pass unchanged. */
export function fileToMemoryPath(path: string): string {
  return path.replace(/[A-Za-z_]+/g, (name) => FILE_TO_MEMORY[name] ?? name);
}

/** True when `issuePath` is `field` or lies inside it (`events[2].dv[0]` is inside `events[2].dv`). */
export function pathWithin(issuePath: string, field: string): boolean {
  return issuePath === field || issuePath.startsWith(`${field}.`) || issuePath.startsWith(`${field}[`);
}
