/**
 * The Dispersion panel's form: its starting values (the defaults the command line's `disperse`
 * uses too, core/io/defaults.ts) and the core options it sends.
 */
import { DISPERSION_DEFAULTS, RESOLVE_NAMES } from '../../../core/io/index.ts';
import type { DispersionOptions } from '../../../core/nbody/index.ts';

export interface DispersionForm {
  samples: number;
  /** 1σ magnitude error, percent. */
  magnitudeSigma: number;
  /** 1σ pointing error per axis, degrees. */
  pointingSigma: number;
  resolve: 'retarget' | 'frozen';
}

/** The smallest sample count the panel runs. */
export const MIN_SAMPLES = 10;

/** A new form with the shared defaults. */
export function dispersionFormDefaults(): DispersionForm {
  const d = DISPERSION_DEFAULTS;
  return { samples: d.samples, magnitudeSigma: d.magnitudeSigmaPct, pointingSigma: d.pointingSigmaDeg, resolve: d.resolve };
}

/** The modes in the panel's choice, in order, with their words. */
export const RESOLVE_CHOICES = (['retarget', 'frozen'] as const).map((value) => ({ value, label: RESOLVE_NAMES[value] }));

/** The core's options for the form (sample count rounded, at least MIN_SAMPLES). */
export function dispersionOptions(f: DispersionForm): DispersionOptions {
  return {
    samples: Math.max(MIN_SAMPLES, Math.round(f.samples)),
    seed: DISPERSION_DEFAULTS.seed,
    magnitudeSigma: f.magnitudeSigma,
    pointingSigma: f.pointingSigma,
    resolve: f.resolve,
  };
}
