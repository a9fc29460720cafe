import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import schema from '../../../assets/schema/system.schema.json' with { type: 'json' };
import { ValidationError, type ValidationIssue } from '../../../core/math/errors.ts';
import { SYSTEM_MIGRATIONS, migrate, parseSystemFile, pointerToPath, serializeSystemFile, type SystemMigration } from '../../../core/io/systemFile.ts';
import { demoDocument, demoText } from '../system/fixtures.ts';

type Doc = Record<string, any>;

/** The issues a text raises; fails the test if it loads. */
function issuesOf(text: string, migrations?: Record<number, SystemMigration>): ValidationIssue[] {
  try {
    parseSystemFile(text, migrations ? { migrations } : {});
  } catch (e) {
    expect(e).toBeInstanceOf(ValidationError);
    expect((e as ValidationError).what).toBe('system file');
    return (e as ValidationError).issues;
  }
  throw new Error('file loaded but should not have');
}

function edited(edit: (d: Doc) => void): string {
  const d = demoDocument() as unknown as Doc;
  edit(d);
  return JSON.stringify(d);
}

const errorsOnly = (issues: ValidationIssue[]) => issues.filter((i) => i.severity === 'error').map((i) => `${i.path}: ${i.rule}`);

// Demo body indices in the file: 0 kiln, 1 tessel, 2 quill, 3 ochre, 4 moravel, 5 skerry, 6 lough, 7 fennick.
const BAD_FILES: { name: string; text: () => string; expected: string[] }[] = [
  { name: 'not JSON', text: () => '{ "format": "waymark-system", ', expected: ['(document)'] },
  { name: 'JSON but not an object', text: () => '[1, 2, 3]', expected: [': must be a JSON object'] },
  { name: 'empty text', text: () => '', expected: ['(document)'] },
  {
    name: 'wrong format string',
    text: () => edited((d) => (d.format = 'waymark-plan')),
    expected: ['format: must be "waymark-system" (got "waymark-plan"); this is not a system file'],
  },
  { name: 'missing format', text: () => edited((d) => delete d.format), expected: ['format: is required (must be "waymark-system")'] },
  {
    name: 'version from the future',
    text: () => edited((d) => (d.version = 7)),
    expected: ['version: is 7, newer than this program reads (up to 1); use a newer Waymark'],
  },
  { name: 'version not an integer', text: () => edited((d) => (d.version = '1')), expected: ['version: must be an integer (got "1")'] },
  {
    name: 'version older than any migration',
    text: () => edited((d) => (d.version = 0)),
    expected: ['version: is 0, which this program cannot read or migrate (it reads 1)'],
  },
  { name: 'missing field', text: () => edited((d) => delete d.bodies[3].radius_m), expected: ['bodies[3].radius_m: is required'] },
  { name: 'missing orbit element', text: () => edited((d) => delete d.bodies[0].orbit.e), expected: ['bodies[0].orbit.e: is required'] },
  { name: 'e >= 1', text: () => edited((d) => (d.bodies[3].orbit.e = 1)), expected: ['bodies[3].orbit.e: must be < 1'] },
  { name: 'negative e', text: () => edited((d) => (d.bodies[3].orbit.e = -0.1)), expected: ['bodies[3].orbit.e: must be >= 0'] },
  { name: 'negative radius', text: () => edited((d) => (d.bodies[1].radius_m = -5)), expected: ['bodies[1].radius_m: must be > 0'] },
  {
    name: 'negative atmosphere height',
    text: () => edited((d) => (d.bodies[1].atmosphere_height_m = -1)),
    expected: ['bodies[1].atmosphere_height_m: must be >= 0'],
  },
  { name: 'surface not a boolean', text: () => edited((d) => (d.bodies[1].surface = 'no')), expected: ['bodies[1].surface: must be true or false'] },
  { name: 'a <= 0', text: () => edited((d) => (d.bodies[1].orbit.a_m = 0)), expected: ['bodies[1].orbit.a_m: must be > 0'] },
  { name: 'inclination > 180', text: () => edited((d) => (d.bodies[1].orbit.i_deg = 200)), expected: ['bodies[1].orbit.i_deg: must be <= 180'] },
  { name: 'number as a string', text: () => edited((d) => (d.bodies[1].mu_m3_s2 = '3e14')), expected: ['bodies[1].mu_m3_s2: must be a number'] },
  { name: 'unknown field', text: () => edited((d) => (d.bodies[2].foo = 1)), expected: ['bodies[2]: unknown field "foo"'] },
  { name: 'unknown top-level field', text: () => edited((d) => (d.extra = true)), expected: [': unknown field "extra"'] },
  {
    name: 'both mass and μ',
    text: () => edited((d) => (d.bodies[1].mass_kg = 4.5e24)),
    expected: ['bodies[1]: needs exactly one of "mu_m3_s2" and "mass_kg"'],
  },
  {
    name: 'neither mass nor μ',
    text: () => edited((d) => delete d.bodies[1].mu_m3_s2),
    expected: ['bodies[1]: needs exactly one of "mu_m3_s2" and "mass_kg"'],
  },
  {
    name: 'id not a slug',
    text: () => edited((d) => (d.bodies[1].id = 'Tessel Prime')),
    expected: ['bodies[1].id: must be a lowercase slug (a-z, 0-9 and single hyphens, starting with a letter)'],
  },
  { name: 'absurd semi-major axis', text: () => edited((d) => (d.bodies[1].orbit.a_m = 1e300)), expected: ['bodies[1].orbit.a_m: must be <= 1e17'] },
  { name: 'bad colour', text: () => edited((d) => (d.bodies[1].colour = 'blue')), expected: ['bodies[1].colour: must be a colour written #rrggbb'] },
  {
    name: 'zero rotation period',
    text: () => edited((d) => (d.bodies[1].rotation_period_s = 0)),
    expected: ['bodies[1].rotation_period_s: must be at least 1 s in magnitude (negative for retrograde)'],
  },
  {
    name: 'calendar with both home and explicit lengths',
    text: () => edited((d) => Object.assign(d.calendar, { year_s: 3e7, day_s: 9e4 })),
    expected: ['calendar: needs either "home" or both "year_s" and "day_s", not both'],
  },
  { name: 'empty name', text: () => edited((d) => (d.name = '')), expected: ['name: must not be empty'] },
  {
    name: 'unknown parent',
    text: () => edited((d) => (d.bodies[2].parent = 'nowhere')),
    expected: ['bodies[2].parent: names no body: "nowhere"'],
  },
  {
    name: 'duplicate id',
    text: () => edited((d) => (d.bodies[6].id = 'skerry')),
    expected: ['bodies[6].id: duplicates the id "skerry" of bodies[5]'],
  },
  { name: 'id equal to the star', text: () => edited((d) => (d.bodies[0].id = 'ilmar')), expected: ['bodies[0].id: duplicates the id "ilmar" of star'] },
  { name: 'parent is itself', text: () => edited((d) => (d.bodies[2].parent = 'quill')), expected: ['bodies[2].parent: must not be the body itself'] },
  {
    name: 'cycle',
    text: () =>
      edited((d) => {
        d.bodies[5].parent = 'lough'; // skerry → lough
        d.bodies[6].parent = 'skerry'; // lough → skerry
      }),
    expected: ['bodies[5].parent: forms a cycle: skerry → lough → skerry'],
  },
  {
    name: 'child more massive than parent',
    text: () => edited((d) => (d.bodies[2].mu_m3_s2 = 4e14)),
    expected: ['bodies[2].mu_m3_s2: must give a smaller μ than the parent "tessel" (4.000e+14 >= 3.000e+14 m³/s²)'],
  },
  {
    name: 'periapsis inside the parent',
    text: () => edited((d) => (d.bodies[2].orbit.a_m = 7e6)),
    expected: ['bodies[2].orbit: periapsis 6,790 km puts the body inside "tessel" (radii add to 7,400 km)'],
  },
  {
    name: 'calendar home unknown',
    text: () => edited((d) => (d.calendar.home = 'nowhere')),
    expected: ['calendar.home: names no body: "nowhere"'],
  },
  {
    name: 'calendar home without rotation',
    text: () => edited((d) => (d.calendar.home = 'skerry')),
    expected: ['calendar.home: names "skerry", which has no rotation_period_s; add it or give calendar.year_s and calendar.day_s'],
  },
  {
    name: 'calendar home is the star',
    text: () => edited((d) => (d.calendar.home = 'ilmar')),
    expected: ['calendar.home: must name a body that orbits, not the star'],
  },
  {
    name: 'explicit day longer than the year',
    text: () =>
      edited((d) => {
        d.calendar = { year_s: 1000, day_s: 2000, year_at_epoch: 1 };
      }),
    expected: ['calendar.day_s: must be <= calendar.year_s (1000)'],
  },
  {
    name: 'several schema errors reported together',
    text: () =>
      edited((d) => {
        d.bodies[0].orbit.e = 1.2;
        d.bodies[1].radius_m = -1;
        delete d.bodies[3].name;
        d.star.colour = '#12345';
        d.bodies[4].bar = 'x';
      }),
    expected: [
      'bodies[0].orbit.e: must be < 1',
      'bodies[1].radius_m: must be > 0',
      'bodies[3].name: is required',
      'star.colour: must be a colour written #rrggbb',
      'bodies[4]: unknown field "bar"',
    ],
  },
  {
    name: 'several semantic errors reported together',
    text: () =>
      edited((d) => {
        d.bodies[2].mu_m3_s2 = 5e14; // quill heavier than tessel
        d.bodies[6].orbit.a_m = 5e7; // lough inside moravel
      }),
    expected: [
      'bodies[2].mu_m3_s2: must give a smaller μ than the parent "tessel" (5.000e+14 >= 3.000e+14 m³/s²)',
      'bodies[6].orbit: periapsis 49,400 km puts the body inside "moravel" (radii add to 63,300 km)',
    ],
  },
];

describe('parseSystemFile: bad files', () => {
  for (const c of BAD_FILES) {
    it(`rejects: ${c.name}`, () => {
      const issues = issuesOf(c.text());
      const got = errorsOnly(issues);
      if (c.expected[0] === '(document)') {
        expect(got).toHaveLength(1);
        expect(issues[0].path).toBe('');
        expect(issues[0].rule).toMatch(/^is not valid JSON/);
      } else {
        expect(got.sort()).toEqual([...c.expected].sort());
      }
    });
  }

  it('throws ValidationError for odd top-level values', () => {
    const samples = ['null', '42', '"x"', 'true', '{}', '{"format":"waymark-system"}', '{"format":"waymark-system","version":1}', '\u0000', '{"format":1}'];
    for (const s of samples) expect(() => parseSystemFile(s)).toThrow(ValidationError);
  });

  it('property: any JSON value put anywhere in the demo either loads or raises ValidationError (never a crash)', () => {
    // Every path of the demo document, as key lists.
    const paths: (string | number)[][] = [];
    const walk = (v: unknown, at: (string | number)[]) => {
      paths.push(at);
      if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...at, i]));
      else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, [...at, k]);
    };
    walk(demoDocument(), []);
    fc.assert(
      fc.property(fc.integer({ min: 1, max: paths.length - 1 }), fc.jsonValue(), (k, value) => {
        const d = demoDocument() as unknown as Doc;
        const path = paths[k];
        let o: Doc = d;
        for (const key of path.slice(0, -1)) o = o[key as string];
        o[path[path.length - 1] as string] = value;
        try {
          parseSystemFile(JSON.stringify(d));
        } catch (e) {
          if (!(e instanceof ValidationError)) throw e;
          expect(e.issues.length).toBeGreaterThan(0);
        }
      }),
      { numRuns: 400 },
    );
  });

  it('property: arbitrary text never crashes the reader', () => {
    fc.assert(
      fc.property(fc.string(), (text) => {
        expect(() => parseSystemFile(text)).toThrow(ValidationError);
      }),
      { numRuns: 300 },
    );
  });

  it('lists every issue in the error message with its path', () => {
    try {
      parseSystemFile(BAD_FILES.find((c) => c.name === 'several schema errors reported together')!.text());
    } catch (e) {
      const msg = (e as Error).message;
      expect(msg).toMatch(/^system file: 5 problems/);
      expect(msg).toContain('bodies[0].orbit.e must be < 1');
      expect(msg).toContain('bodies[3].name is required');
      return;
    }
    throw new Error('expected a ValidationError');
  });
});

describe('parseSystemFile: the demo', () => {
  it('loads the demo system with zero errors and zero warnings', () => {
    const { system, warnings } = parseSystemFile(demoText());
    expect(warnings).toEqual([]);
    expect(system.bodies.map((b) => b.id)).toEqual(['ilmar', 'kiln', 'tessel', 'quill', 'ochre', 'moravel', 'skerry', 'lough', 'fennick']);
  });

  it('puts the star at index 0 and the file bodies after it, with parents and children', () => {
    const { system } = parseSystemFile(demoText());
    const s = system.bodies;
    expect(s[0].parentIndex).toBe(-1);
    expect(s[0].elements).toBeNull();
    s.forEach((b, k) => expect(b.index).toBe(k));
    expect(s[system.indexById.quill].parentIndex).toBe(system.indexById.tessel);
    expect(s[system.indexById.moravel].children).toEqual([system.indexById.skerry, system.indexById.lough]);
    expect(s[0].children).toEqual([1, 2, 4, 5, 8]);
  });

  it('converts degrees to radians on load', () => {
    const { system } = parseSystemFile(demoText());
    const f = system.bodies[system.indexById.fennick].elements!;
    const fd = demoDocument().bodies[7].orbit;
    expect(f.i).toBeCloseTo((fd.i_deg * Math.PI) / 180, 15);
    expect(f.raan).toBeCloseTo((fd.raan_deg * Math.PI) / 180, 15);
    expect(f.M0).toBeCloseTo((fd.mean_anomaly_deg * Math.PI) / 180, 15);
  });

  it('matches the design brief: Tessel μ ≈ 3e14, radius ≈ 5,900 km, air ≈ 90 km; Ochre thin air; Fennick eccentric and inclined', () => {
    const { system } = parseSystemFile(demoText());
    const b = (id: string) => system.bodies[system.indexById[id]];
    expect(b('ilmar').mu).toBeCloseTo(1e20, -17);
    expect(b('tessel').mu).toBeCloseTo(3e14, -11);
    expect(b('tessel').radius).toBeCloseTo(5.9e6, -4);
    expect(b('tessel').safeAlt).toBe(90e3);
    expect(b('ochre').safeAlt).toBe(40e3);
    expect(b('fennick').elements!.e).toBeCloseTo(0.22, 10);
    expect((b('fennick').elements!.i * 180) / Math.PI).toBeCloseTo(12, 10);
    // Moons well inside their parents' SOI.
    for (const id of ['quill', 'skerry', 'lough']) {
      const m = b(id);
      expect(m.derived.apoapsis).toBeLessThan(0.5 * system.bodies[m.parentIndex].derived.soiRadius);
    }
    // Distinct display colours.
    const colours = system.bodies.map((x) => x.colour);
    expect(new Set(colours).size).toBe(colours.length);
  });
});

describe('parseSystemFile: mass instead of μ', () => {
  it('uses μ = G·m with CODATA 2018 G', () => {
    const t = edited((d) => {
      delete d.bodies[1].mu_m3_s2;
      d.bodies[1].mass_kg = 4.5e24;
    });
    const { system } = parseSystemFile(t);
    expect(system.bodies[2].mu).toBeCloseTo(6.6743e-11 * 4.5e24, -4);
    expect(system.bodies[2].massKg).toBe(4.5e24);
  });
});

describe('serializeSystemFile', () => {
  it('writes the demo file back byte for byte (stable key order, 2-space indent, trailing newline)', () => {
    const text = demoText();
    expect(serializeSystemFile(parseSystemFile(text).system)).toBe(text);
  });

  it('round-trips a file written with other key order and number forms to the same model', () => {
    const d = demoDocument() as unknown as Doc;
    const shuffled = JSON.stringify({
      bodies: d.bodies,
      star: d.star,
      calendar: d.calendar,
      epoch: d.epoch,
      name: d.name,
      description: d.description,
      version: 1,
      format: d.format,
    });
    const a = parseSystemFile(shuffled).system;
    const out = serializeSystemFile(a);
    expect(out.endsWith('}\n')).toBe(true);
    expect(out.split('\n')[1]).toBe('  "format": "waymark-system",');
    const b = parseSystemFile(out).system;
    expect(b.bodies).toEqual(a.bodies);
    expect(b.calendar).toEqual(a.calendar);
  });

  it('keeps mass_kg when the file gave mass, and explicit calendar lengths', () => {
    const t = edited((d) => {
      delete d.bodies[1].mu_m3_s2;
      d.bodies[1].mass_kg = 4.5e24;
      d.calendar = { year_s: 2.5e7, day_s: 90000, year_at_epoch: -3 };
    });
    const out = serializeSystemFile(parseSystemFile(t).system);
    const doc = JSON.parse(out);
    expect(doc.bodies[1].mass_kg).toBe(4.5e24);
    expect(doc.bodies[1].mu_m3_s2).toBeUndefined();
    expect(doc.calendar).toEqual({ year_s: 2.5e7, day_s: 90000, year_at_epoch: -3 });
  });
});

describe('migrations', () => {
  it('ships no migrations: version 1 is the first format', () => {
    expect(Object.keys(SYSTEM_MIGRATIONS)).toEqual([]);
  });

  // A synthetic version 0 that spelled the body list "worlds" and orbit size "semi_major_axis_m".
  const v0ToV1: SystemMigration = (doc) => {
    const { worlds, ...rest } = doc as Doc;
    return {
      ...rest,
      bodies: (worlds as Doc[]).map(({ orbit, ...b }) => {
        const { semi_major_axis_m, ...o } = orbit;
        return { ...b, orbit: { a_m: semi_major_axis_m, ...o } };
      }),
    };
  };

  function v0Text(): string {
    const d = demoDocument() as unknown as Doc;
    const { bodies, ...rest } = d;
    return JSON.stringify({
      ...rest,
      version: 0,
      worlds: bodies.map(({ orbit, ...b }: Doc) => {
        const { a_m, ...o } = orbit;
        return { ...b, orbit: { semi_major_axis_m: a_m, ...o } };
      }),
    });
  }

  it('migrates a synthetic v0 file through a supplied table to the same model as the v1 file', () => {
    const migrated = parseSystemFile(v0Text(), { migrations: { 0: v0ToV1 } });
    expect(migrated.fileVersion).toBe(0);
    expect(migrated.system.bodies).toEqual(parseSystemFile(demoText()).system.bodies);
  });

  it('reports schema errors of the migrated document', () => {
    const broken: SystemMigration = (doc) => ({ ...doc }); // leaves "worlds", no "bodies"
    const issues = issuesOf(v0Text(), { 0: broken });
    expect(errorsOnly(issues).sort()).toEqual(['bodies: is required', ': unknown field "worlds"'].sort());
  });

  it('sets the version after each step', () => {
    const { doc } = migrate({ format: 'waymark-system', version: 0 }, { 0: (d) => ({ ...d, touched: true }) });
    expect(doc).toEqual({ format: 'waymark-system', version: 1, touched: true });
  });
});

describe('pointerToPath', () => {
  it('turns ajv instance paths into dotted paths with indices', () => {
    expect(pointerToPath('/bodies/3/orbit/e')).toBe('bodies[3].orbit.e');
    expect(pointerToPath('')).toBe('');
    expect(pointerToPath('/star')).toBe('star');
    expect(pointerToPath('/a~1b/c~0d')).toBe('a/b.c~d');
  });
});

describe('the schema', () => {
  it('documents units and degrees in its description', () => {
    expect(schema.description).toMatch(/DEGREES/);
    expect(schema.description).toMatch(/_m metres/);
  });
});

describe('atmosphere_height_m and surface (optional body fields)', () => {
  it('reads the demo: Tessel air 90 km, Ochre 40 km, Moravel 1,000 km without a surface, the others airless with one', () => {
    const { system } = parseSystemFile(demoText());
    const by = (id: string) => system.bodies[system.indexById[id]];
    expect(by('tessel').atmosphereHeight).toBe(90000);
    expect(by('ochre').atmosphereHeight).toBe(40000);
    expect(by('moravel').atmosphereHeight).toBe(1e6);
    expect(by('moravel').hasSurface).toBe(false);
    for (const id of ['kiln', 'quill', 'skerry', 'lough', 'fennick']) {
      expect(by(id).atmosphereHeight).toBe(0);
      expect(by(id).hasSurface).toBe(true);
    }
  });

  it('loads a file without the fields as airless with a surface and writes it back without them, byte for byte', () => {
    // The demo as written before the fields existed: their lines taken out of the text.
    const t = demoText()
      .split('\n')
      .filter((line) => !/"(atmosphere_height_m|surface)":/.test(line))
      .join('\n');
    expect(t).not.toBe(demoText());
    const { system } = parseSystemFile(t);
    expect(system.bodies.every((b) => b.atmosphereHeight === 0)).toBe(true);
    expect(system.bodies.slice(1).every((b) => b.hasSurface)).toBe(true);
    expect(serializeSystemFile(system)).toBe(t);
  });
});
