/**
 * The JSON Schemas in assets/schema/ and where they come from: each is emitted from the zod
 * declaration of its file's shape (core/io/planFileShape.ts, core/system/systemFileShape.ts)
 * by core/io/fileJsonSchema.ts. Regenerate after changing a declaration with
 *   npm run schema:emit
 * (test/core/io/fileSchemas.test.ts fails when a committed schema and its declaration drift apart).
 */
import { fileURLToPath } from 'node:url';
import type * as z from 'zod';
import { fileJsonSchemaText } from '../../../core/io/fileJsonSchema.ts';
import { gameScheduleShape } from '../../../core/io/gameScheduleShape.ts';
import { planFileShape } from '../../../core/io/planFileShape.ts';
import { runtimeFileShape } from '../../../core/io/runtimeFileShape.ts';
import { systemFileShape } from '../../../core/system/systemFileShape.ts';

export const SCHEMA_DIR = new URL('../../../assets/schema/', import.meta.url);

export const FILE_SCHEMAS: { file: string; shape: z.ZodType }[] = [
  { file: 'game-schedule.schema.json', shape: gameScheduleShape },
  { file: 'plan.schema.json', shape: planFileShape },
  { file: 'runtime-ephemeris.schema.json', shape: runtimeFileShape },
  { file: 'system.schema.json', shape: systemFileShape },
];

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const { atomicWriteFile } = await import('../../../app/node/files.ts');
  for (const { file, shape } of FILE_SCHEMAS) {
    const path = fileURLToPath(new URL(file, SCHEMA_DIR));
    atomicWriteFile(path, fileJsonSchemaText(shape), { backup: false });
    console.log(`wrote ${path}`);
  }
}
