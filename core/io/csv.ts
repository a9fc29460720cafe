/**
 * CSV exports: a sampled ephemeris and the burn table of a budget.
 *
 * Dialect: RFC 4180 (Common Format and MIME Type for Comma-Separated Values Files): a header
 * line, comma separators, CRLF line ends, fields with a comma, a double quote or a line break
 * enclosed in double quotes with inner quotes doubled. SI units named in each column header;
 * numbers written with the fewest digits that read back to the same double (JavaScript's
 * shortest round-trip form), so a spreadsheet or a script gets every bit (a negative zero is
 * written 0). Empty field: no value
 * (e.g. the gravity loss of an impulsive burn).
 *
 * `parseCsv` reads the same dialect back (tests and pipelines).
 */

import { InputError } from '../math/index.ts';
import type { SampledEphemeris } from '../conic/index.ts';
import type { Budget } from '../plan/index.ts';
import type { StarSystem } from '../system/index.ts';

/** Line end of every CSV written (RFC 4180: CRLF). */
export const CSV_EOL = '\r\n';

export const EPHEMERIS_CSV_COLUMNS = ['t_s', 'x_m', 'y_m', 'z_m', 'vx_mps', 'vy_mps', 'vz_mps', 'mass_kg', 'central'] as const;

/**
 * Burn-table columns. A burn is named as the plan's cards name it: `event` its 1-based place
 * among the plan's events and `name` its name; `id` is the event's id in the plan file.
 */
export const BURN_CSV_COLUMNS = [
  'event',
  'name',
  'id',
  't_s',
  't_start_s',
  't_end_s',
  'dv_mps',
  'frame',
  'dv_frame_1_mps',
  'dv_frame_2_mps',
  'dv_frame_3_mps',
  'dv_x_mps',
  'dv_y_mps',
  'dv_z_mps',
  'duration_s',
  'propellant_kg',
  'mass_before_kg',
  'mass_after_kg',
  'stages',
  'dv_left_mps',
  'gravity_loss_mps',
  'period_fraction',
  'flags',
] as const;

/** One CSV field, quoted when it must be (RFC 4180 §2). */
export function csvField(v: string | number | null): string {
  if (v === null) return '';
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) throw new InputError('value', 'must be a finite number to be written to CSV', v);
    return String(v);
  }
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

/** One CSV record: the fields, each as `csvField` writes it, joined with commas. */
export function csvRow(fields: readonly (string | number | null)[]): string {
  return fields.map(csvField).join(',');
}

/**
 * Ephemeris CSV: one row per sample, t_s, position (m), velocity (m/s), mass (kg) and the id
 * of the body the state is relative to. Span boundaries appear twice (once per centre).
 */
export function ephemerisCsv(system: StarSystem, eph: SampledEphemeris): string {
  const out: string[] = [csvRow([...EPHEMERIS_CSV_COLUMNS])];
  for (const span of eph.spans) {
    const id = system.bodies[span.center]?.id;
    if (id === undefined) throw new InputError('ephemeris.center', 'must be a body index of the system', span.center);
    const s = span.states;
    for (let j = 0; j < span.t.length; j++) {
      const o = 6 * j;
      out.push(csvRow([span.t[j], s[o], s[o + 1], s[o + 2], s[o + 3], s[o + 4], s[o + 5], span.mass[j], id]));
    }
  }
  return out.join(CSV_EOL) + CSV_EOL;
}

/** Burn-table CSV: one row per budget row; stages and flag codes joined with ";". */
export function burnTableCsv(budget: Budget, plan?: { readonly events: readonly { readonly id: string }[] }): string {
  const out: string[] = [csvRow([...BURN_CSV_COLUMNS])];
  for (const r of budget.rows) {
    const k = plan ? plan.events.findIndex((e) => e.id === r.planEventId) : -1;
    out.push(
      csvRow([
        k >= 0 ? k + 1 : null,
        r.name,
        r.planEventId,
        r.t,
        r.tStart,
        r.tEnd,
        r.dv,
        r.frame,
        r.dvFrame[0],
        r.dvFrame[1],
        r.dvFrame[2],
        r.dvInertial[0],
        r.dvInertial[1],
        r.dvInertial[2],
        r.duration,
        r.propellantUsed,
        r.massBefore,
        r.massAfter,
        r.stages.join(';'),
        r.dvLeft,
        r.gravityLoss,
        r.periodFraction,
        r.flags.map((f) => f.code).join(';'),
      ]),
    );
  }
  return out.join(CSV_EOL) + CSV_EOL;
}

/** Reads RFC 4180 CSV text into rows of fields (accepts LF or CRLF line ends). */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let fieldText = '';
  let rowFields: string[] = [];
  let i = 0;
  let quoted = false;
  let any = false;
  while (i < text.length) {
    const c = text[i];
    if (quoted) {
      if (c === '"') {
        if (text[i + 1] === '"') {
          fieldText += '"';
          i += 2;
          continue;
        }
        quoted = false;
        i++;
        continue;
      }
      fieldText += c;
      i++;
      continue;
    }
    if (c === '"' && fieldText === '') {
      quoted = true;
      any = true;
      i++;
    } else if (c === ',') {
      rowFields.push(fieldText);
      fieldText = '';
      any = true;
      i++;
    } else if (c === '\r' || c === '\n') {
      rowFields.push(fieldText);
      rows.push(rowFields);
      rowFields = [];
      fieldText = '';
      any = false;
      i += c === '\r' && text[i + 1] === '\n' ? 2 : 1;
    } else {
      fieldText += c;
      any = true;
      i++;
    }
  }
  if (quoted) throw new InputError('csv', 'has an unclosed quoted field');
  if (any || fieldText !== '' || rowFields.length > 0) {
    rowFields.push(fieldText);
    rows.push(rowFields);
  }
  return rows;
}
