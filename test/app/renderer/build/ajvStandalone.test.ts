/**
 * The build-time validators that replace ajv's compiler in the renderer (its CSP forbids eval)
 * must report exactly what ajv itself reports for the same schema and document, compiled as the
 * core's parsers compile it (core/io/fileValidator.ts: local references inlined).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { standaloneModuleSource } from '../../../../app/renderer/build/ajvStandalone.ts';
import { compileFileSchema } from '../../../../core/io/fileValidator.ts';

const root = new URL('../../../../', import.meta.url);
const schemaDir = new URL('assets/schema/', root).pathname;
const outDir = new URL('test/output/ajv-standalone/', root).pathname;

async function standalone() {
  mkdirSync(outDir, { recursive: true });
  const file = `${outDir}validators-${process.pid}.mjs`;
  writeFileSync(file, standaloneModuleSource(schemaDir));
  return (await import(file)) as { Ajv2020: new (o: unknown) => { compile(s: unknown): ((d: unknown) => boolean) & { errors: unknown } } };
}

function reference(schema: object) {
  return compileFileSchema(schema);
}

const strip = (errs: unknown) =>
  (errs as { instancePath: string; keyword: string; params: unknown; schemaPath: string }[] | null)?.map((e) => ({
    p: e.instancePath,
    k: e.keyword,
    params: e.params,
    s: e.schemaPath,
  })) ?? null;

describe('build-time schema validators (renderer bundle)', () => {
  for (const name of ['system', 'plan']) {
    it(`agree with ajv's compiler on the ${name} schema`, async () => {
      const schema = JSON.parse(readFileSync(`${schemaDir}${name}.schema.json`, 'utf8'));
      const good = JSON.parse(
        readFileSync(new URL(name === 'system' ? 'assets/systems/ilmar.system.json' : 'assets/plans/tessel-to-ochre.plan.json', root), 'utf8'),
      );
      const bad = structuredClone(good);
      if (name === 'system') {
        bad.bodies[0].orbit.e = 1.5;
        bad.bodies[1].id = 'Not A Slug';
        delete bad.star.radius_m;
        bad.extra = true;
      } else {
        bad.vehicle.stages[0].isp_s = -3;
        bad.events[0].frame = 'sideways';
        delete bad.reserve;
        bad.truth_model = 'exact';
      }
      const alsoGood = structuredClone(good);
      if (name === 'plan') alsoGood.truth_model = 'nbody';
      const { Ajv2020: Shim } = await standalone();
      const mine = new Shim({}).compile(schema);
      const ref = reference(schema);
      for (const doc of [good, alsoGood, bad]) {
        expect(mine(doc)).toBe(ref(doc));
        expect(strip(mine.errors)).toEqual(strip(ref.errors));
      }
      expect(mine(alsoGood)).toBe(true);
      expect(mine(bad)).toBe(false);
      if (name === 'plan') expect(strip(mine.errors)?.some((e) => e.p === '/truth_model' && e.k === 'enum')).toBe(true);
    });
  }
});
