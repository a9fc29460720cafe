/**
 * The command line's words for models and goals, shared by `target`, `check` and `fly`:
 * reading a `--model` option, and one text line per goal (value, wanted ± tolerance, met) in
 * the goal's own units (km, °, days), with as many decimals as its tolerance needs; a plan read
 * in a model (with an n-body progress bar) and its target in words.
 */
import { InputError } from '../../core/math/index.ts';
import { TRUTH_MODELS, truthModelLabel, type Plan, type TruthModel } from '../../core/plan/index.ts';
import type { StarSystem } from '../../core/system/index.ts';
import { truthReport, type TruthReport } from '../../core/target/index.ts';
import { num } from './output.ts';
import { createProgress, progressEnabled } from './progress.ts';

const DEG = 180 / Math.PI;

/** A `--model` word: one of the truth models (conic, finite, nbody), else InputError naming the flag and the words allowed. */
export function parseModel(flag: string, text: string): TruthModel {
  if (!(TRUTH_MODELS as readonly string[]).includes(text)) throw new InputError(flag, `must be one of: ${TRUTH_MODELS.join(', ')}`, text);
  return text as TruthModel;
}

/** What the text lines need of a goal (core/target LegReport goals and TruthReport goals both fit). */
export interface GoalLike {
  name: string;
  /** SI; null when the flight gave none (no orbit about the body). */
  value: number | null;
  wanted: number;
  tolerance: number;
  met: boolean;
  units?: string;
  unitScale?: number;
}

/** Decimals that show a value to about a tenth of its tolerance `tol` (display units), 0 to 7. */
export function decimalsFor(tol: number): number {
  if (!(tol > 0) || !Number.isFinite(tol)) return 3;
  return Math.min(7, Math.max(0, Math.ceil(-Math.log10(tol)) + 2));
}

/** A tolerance in display units, three significant digits without trailing zeros (0.15, 0.000116, 10). */
function tolText(tol: number): string {
  if (!Number.isFinite(tol)) return '—';
  return String(Number(tol.toPrecision(3)));
}

/** `x` with `d` decimals, never in exponent form, and no "-0.000". */
export function fixed(x: number, d: number): string {
  if (!Number.isFinite(x)) return '—';
  return (Math.abs(x) < 0.5 * 10 ** -d ? 0 : x).toFixed(d);
}

/** One aligned line per goal: `name  value unit  wanted W ± T unit  met|NOT MET`; names padded to `width` at least. */
export function goalLines(goals: readonly GoalLike[], indent = '  ', width = 0): string[] {
  const w = Math.max(width, ...goals.map((g) => g.name.length));
  return goals.map((g) => {
    const scale = g.unitScale ?? 1;
    const units = g.units ?? '';
    const sep = units === '' || units === '°' ? '' : ' ';
    const d = decimalsFor(g.tolerance / scale);
    const value = g.value === null ? '—' : `${fixed(g.value / scale, d)}${sep}${units}`;
    const wanted = `${fixed(g.wanted / scale, d)} ± ${tolText(g.tolerance / scale)}${sep}${units}`;
    return `${indent}${g.name.padEnd(w)}  ${value.padStart(16)}   wanted ${wanted.padEnd(30)}  ${g.met ? 'met' : 'NOT MET'}`;
  });
}

/** Which model a readout is in, in words: "n-body (the plan's truth model)" or "n-body (a comparison; the plan's truth model is patched conics)". */
export function modelWords(model: TruthModel, truth: TruthModel): string {
  return model === truth
    ? `${truthModelLabel(model)} (the plan's truth model)`
    : `${truthModelLabel(model)} (a comparison; the plan's truth model is ${truthModelLabel(truth)})`;
}

/** The target judged in the report's model: a headline, then one line per goal. */
export function targetText(system: StarSystem, report: TruthReport): string[] {
  const t = report.plan.target;
  if (!t) return [];
  const k = system.indexById[t.body];
  const name = k === undefined ? t.body : system.bodies[k].name;
  const a = report.achieved;
  const out = [
    `target ${name}: ${report.reached ? 'reached' : 'not reached'} in ${truthModelLabel(report.model)}` +
      (a ? ` — periapsis ${num(a.periapsisAltitude / 1e3, 1)} km, e ${num(a.e, 4)}, i ${num(a.i * DEG, 2)} deg` : ''),
  ];
  out.push(...goalLines(report.goals));
  return out;
}

/** The plan read in `model` (default its truth model), with an n-body progress bar on a terminal unless machine-readable. */
export function readInModel(system: StarSystem, plan: Plan, model: TruthModel, machineReadable: boolean, step?: number): TruthReport {
  const bar = createProgress('n-body flight', '‰', model === 'nbody' && progressEnabled(machineReadable));
  try {
    // `step` (exports' fixed grid) reaches core/nbody verifyNBody through the options truthReport passes on
    const options: Parameters<typeof truthReport>[2] & { step?: number } = {
      model,
      samples: false,
      step,
      onProgress: (d, t) => bar.update(Math.round((1000 * d) / Math.max(t, 1e-9)), 1000),
    };
    return truthReport(system, plan, options);
  } finally {
    bar.stop();
  }
}
