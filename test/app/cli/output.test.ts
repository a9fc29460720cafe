/**
 * Terminal output of names that come from files: control characters are shown escaped, never
 * sent raw to the terminal (ESC sequences clear the screen, OSC sequences retitle the window, CR
 * overwrites a line); ordinary Unicode (Δ, accents, emoji) prints as written. The control sets
 * are those of ECMA-48 (C0 U+0000–U+001F and C1 U+0080–U+009F, from memory) plus DEL and the
 * bidirectional formatting characters of Unicode UAX #9.
 */
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { jsonText, printData, termSafe } from '../../../app/cli/output.ts';
import { ROOT, runCli } from './runCli.ts';

/** Any character a terminal acts on instead of printing (newline and tab excepted). */
// biome-ignore lint/suspicious/noControlCharactersInRegex: the test looks for control characters left in the output
const RAW_CONTROL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/;

const work = mkdtempSync(join(tmpdir(), 'waymark-output-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const EVIL_PLAN = 'Evil\u001b[2J\u001b]0;pwned\u0007 plan Δ é';
const EVIL_BURN = '\u001b[31mRED\u001b[0m\r\u009b2J';
const EVIL_BODY = 'Tessel\u001b]0;title\u0007';

/** The demo plan and system with hostile names, in plans/ and systems/ like the assets. */
function evilFiles(): { plan: string; system: string } {
  const plan = JSON.parse(readFileSync(join(ROOT, 'assets/plans/tessel-to-ochre.plan.json'), 'utf8'));
  const system = JSON.parse(readFileSync(join(ROOT, 'assets/systems/ilmar.system.json'), 'utf8'));
  plan.name = EVIL_PLAN;
  for (const e of plan.events) if (e.type === 'burn') e.name = `${e.name ?? ''}${EVIL_BURN}`;
  const tessel = system.bodies.find((b: { id: string }) => b.id === 'tessel');
  tessel.name = EVIL_BODY;
  mkdirSync(join(work, 'plans'), { recursive: true });
  mkdirSync(join(work, 'systems'), { recursive: true });
  const p = { plan: join(work, 'plans', 'evil.plan.json'), system: join(work, 'systems', 'ilmar.system.json') };
  writeFileSync(p.plan, JSON.stringify({ ...plan, system: { path: '../systems/ilmar.system.json' } }));
  writeFileSync(p.system, JSON.stringify(system));
  return p;
}

describe('terminal-safe text', () => {
  it('shows ESC, BEL, CR, DEL, C1 CSI and a bidi override escaped, and keeps newline, tab and ordinary Unicode', () => {
    expect(termSafe('a\u001b[2Jb')).toBe('a\\u001b[2Jb');
    expect(termSafe('\u001b]0;title\u0007')).toBe('\\u001b]0;title\\u0007');
    expect(termSafe('over\rwrite\u007f\u009b2J')).toBe('over\\u000dwrite\\u007f\\u009b2J');
    expect(termSafe('abc\u202edef')).toBe('abc\\u202edef');
    const ordinary = 'Δv 5 km/s\tFénix, Ærø, Ωmega 🚀 👩‍🚀\nnext line';
    expect(termSafe(ordinary)).toBe(ordinary);
  });

  it('leaves no control character in any string, and changes none that has none (fast-check)', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 40 }), (s) => {
        const t = termSafe(s);
        expect(RAW_CONTROL.test(t)).toBe(false);
        if (!RAW_CONTROL.test(s)) expect(t).toBe(s);
      }),
      { numRuns: 2000, seed: 7 },
    );
  });

  it('JSON output escapes DEL, C1 and bidi controls too, and still parses to the same value (fast-check)', () => {
    fc.assert(
      fc.property(fc.dictionary(fc.string({ maxLength: 6 }), fc.string({ unit: 'binary', maxLength: 20 })), (v) => {
        const t = jsonText(v);
        expect(RAW_CONTROL.test(t)).toBe(false);
        expect(JSON.parse(t)).toEqual(v);
      }),
      { numRuns: 1000, seed: 8 },
    );
  });

  it('data on stdout (CSV ...) passes unchanged to a pipe and is escaped at a terminal', () => {
    const out: string[] = [];
    printData('a,\u001b[2J\n', { isTTY: false, write: (s: string) => out.push(s) });
    printData('a,\u001b[2J\n', { isTTY: true, write: (s: string) => out.push(s) });
    expect(out).toEqual(['a,\u001b[2J\n', 'a,\\u001b[2J\n']);
  });
});

describe.concurrent('names from files on the command line', () => {
  const files = evilFiles();

  it('check and fly print the plan, burn and body names with their control characters escaped', async () => {
    for (const args of [
      ['check', files.plan],
      ['fly', files.plan],
    ]) {
      const r = await runCli(args);
      expect(r.code, r.stderr).toBeLessThan(2);
      expect(RAW_CONTROL.test(r.stdout)).toBe(false);
      expect(RAW_CONTROL.test(r.stderr)).toBe(false);
      expect(r.stdout).toContain('Evil\\u001b[2J\\u001b]0;pwned\\u0007 plan Δ é');
      expect(r.stdout).toContain('Departure\\u001b[31mRED'); // the budget table cuts long names to its column
    }
  });

  it('stability prints body names escaped', async () => {
    const r = await runCli(['stability', files.system, '--years', '1']);
    expect(r.code, r.stderr).toBeLessThan(2);
    expect(RAW_CONTROL.test(r.stdout)).toBe(false);
    expect(r.stdout).toContain('Tessel\\u001b]0;title\\u0007');
  });

  it('--json keeps the names exactly (JSON escapes) with no raw control character', async () => {
    const r = await runCli(['check', files.plan, '--json']);
    expect(RAW_CONTROL.test(r.stdout)).toBe(false);
    expect(JSON.stringify(JSON.parse(r.stdout))).toContain(JSON.stringify(EVIL_PLAN).slice(1, -1));
  });

  it('error messages that repeat what was typed are escaped (an unknown option)', async () => {
    const r = await runCli(['check', files.plan, '--\u001b]0;x\u0007']);
    expect(r.code).not.toBe(0);
    expect(r.stderr).toContain('\\u001b]0;x\\u0007');
    expect(RAW_CONTROL.test(r.stderr)).toBe(false);
  });
});
