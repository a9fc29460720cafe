/**
 * The export files of a flown plan, from the core's writers: CCSDS OEM (core/io/oem.ts), CSV
 * ephemeris and burn table (core/io/csv.ts), Markdown budget report (core/io/report.ts). The
 * ephemeris step keeps an export under EXPORT_MAX_SAMPLES samples (and no coarser than needed).
 */
import { burnTableCsv, ephemerisCsv } from '../../../core/io/index.ts';
import { writeOem } from '../../../core/io/index.ts';
import { budgetReport } from '../../../core/io/index.ts';
import { sampleEphemeris } from '../../../core/conic/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import type { PlanResult } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { PlanExportKind } from '../host/host.ts';

export const EXPORT_MAX_SAMPLES = 20_000;
/** Finest export step, s. */
export const EXPORT_MIN_STEP = 60;

export function exportStep(result: PlanResult): number {
  return Math.max(EXPORT_MIN_STEP, Math.ceil((result.t1 - result.t0) / EXPORT_MAX_SAMPLES));
}

export function baseName(fileName: string): string {
  return fileName.replace(/\.plan\.json$|\.json$/i, '') || 'plan';
}

export function exportFile(
  kind: PlanExportKind,
  system: StarSystem,
  plan: Plan,
  result: PlanResult,
  fileName: string,
  now = new Date(),
): { name: string; text: string } {
  const base = baseName(fileName);
  switch (kind) {
    case 'oem': {
      const eph = sampleEphemeris(system, result, { step: exportStep(result) });
      const creationDate = now.toISOString().slice(0, 19);
      return { name: `${base}.oem`, text: writeOem(system, eph, { objectName: plan.vehicle.name, creationDate }) };
    }
    case 'csv':
      return { name: `${base}.ephemeris.csv`, text: ephemerisCsv(system, sampleEphemeris(system, result, { step: exportStep(result) })) };
    case 'burns-csv':
      return { name: `${base}.burns.csv`, text: burnTableCsv(result.budget, plan) };
    case 'report':
      return { name: `${base}.report.md`, text: budgetReport(system, plan, result) };
  }
}
