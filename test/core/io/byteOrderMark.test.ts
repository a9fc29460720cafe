import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile } from '../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';

const root = new URL('../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const planText = readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8');

describe('files saved with a byte-order mark (RFC 8259 §8.1 lets parsers ignore it)', () => {
  it('a system file with a BOM loads like the same file without one', () => {
    const a = parseSystemFile(systemText);
    const b = parseSystemFile(`\ufeff${systemText}`);
    expect(b.system.bodies.map((x) => x.id)).toEqual(a.system.bodies.map((x) => x.id));
  });
  it('a plan file with a BOM loads like the same file without one', () => {
    expect(parsePlanFile(`\ufeff${planText}`).plan).toEqual(parsePlanFile(planText).plan);
  });
  it('a BOM anywhere else is still invalid JSON', () => {
    expect(() => parsePlanFile(` \ufeff${planText}`)).toThrow(/not valid JSON/);
  });
});
