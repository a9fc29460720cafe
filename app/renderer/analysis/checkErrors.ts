/**
 * Messages of the core's errors as the check panels show them. The worker passes an error's
 * message only (a string crosses the worker boundary); the core writes them in two known shapes
 * (core/math/errors.ts): an InputError "field rule (got value)" and a SolverError
 * "solver: reason: detail". Known fields get the panel's own words; anything else is shown as
 * the core wrote it.
 */

export interface CheckError {
  /** One sentence for the panel. */
  message: string;
  /** The core's own message (shown on hover). */
  detail: string;
}

/** Panel words for the fields the checks' inputs reach. */
const FIELDS: Record<string, string> = {
  'physics.dt': 'Step',
  'physics.integrator': 'Integrator',
  'physics.precision': 'Precision',
  'physics.rebase': 'Floating origin',
  'physics.rebase.distance': 'Floating-origin distance',
  'physics.gravity': 'Gravity',
  'physics.burns': 'Burns',
  'physics.guidance': 'Guidance',
  tolerance: 'Tolerance',
  energyTolerance: 'Energy tolerance',
  warpDt: 'Coast step',
  dtMax: 'Largest step',
  years: 'Years',
  span: 'Span',
  plan: 'The plan',
  system: 'The system',
};

const REASONS: Record<string, string> = {
  'no-convergence': 'did not converge',
  'step-underflow': 'needed a step too small to take',
  'step-budget': 'ran out of its step budget',
  'no-bracket': 'found no bracket for its root',
  'no-solution': 'found no solution',
  'non-finite': 'produced a non-finite number',
  cancelled: 'was cancelled',
  singular: 'met a singular matrix',
};

const SOLVERS: Record<string, string> = {
  'game-step': 'The game-step flight',
  'game-step reference': 'The reference flight (DOP853)',
  rk45: 'The RK45 integrator',
  dop853: 'The DOP853 integrator',
  stability: 'The stability run',
};

const SOLVER_RE = /^([a-z0-9][\w -]*): ([a-z-]+): ([\s\S]*)$/;
const INPUT_RE = /^([A-Za-z_][\w.[\]]*) ((?:must|needs|flies|has|is)\b[\s\S]*)$/;

export function checkError(raw: string): CheckError {
  const detail = raw.trim() || 'unknown error';
  const s = SOLVER_RE.exec(detail);
  if (s && REASONS[s[2]]) {
    const who = SOLVERS[s[1]] ?? `The ${s[1]} solver`;
    return { message: `${who} ${REASONS[s[2]]}: ${s[3]}`, detail };
  }
  const i = INPUT_RE.exec(detail);
  if (i) {
    const label = FIELDS[i[1]];
    if (label) return { message: `${label} ${i[2]}`, detail };
  }
  return { message: detail, detail };
}
