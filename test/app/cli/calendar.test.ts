import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseCsv } from '../../../core/io/csv.ts';
import { CALENDAR_CSV_COLUMNS, parseSystemFile } from '../../../core/io/index.ts';
import { windowCalendar } from '../../../core/survey/index.ts';
import { ROOT, runCli } from './runCli.ts';

const DEMO = 'assets/systems/ilmar.system.json';
const system = parseSystemFile(readFileSync(join(ROOT, DEMO), 'utf8')).system;
const PAIRS = ['--pair', 'tessel:ochre', '--pair', 'Kiln:Tessel'];
const request = {
  years: 3,
  within: 0.1,
  pairs: [
    { from: 'tessel', to: 'ochre' },
    { from: 'kiln', to: 'tessel' },
  ],
};

describe.concurrent('waymark calendar', () => {
  it('--json over the worker pool prints the calendar the core computes in this thread (same bits)', async () => {
    const r = await runCli(['calendar', '--system', DEMO, '--years', '3', ...PAIRS, '--workers', '2', '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const cal = windowCalendar(system, request, { curve: false });
    expect(out.workers).toBe(2);
    expect(out.system).toBe('Ilmar');
    expect(out.start).toBe(cal.start);
    expect(out.end).toBe(cal.end);
    expect(out.pairs.map((p: { from: string; to: string }) => `${p.from}:${p.to}`)).toEqual(['tessel:ochre', 'kiln:tessel']);
    expect(out.pairs).toEqual(JSON.parse(JSON.stringify(cal.pairs)));
  });

  it('prints the windows per pair with calendar dates, Δv and flight time; CSV has one row per window', async () => {
    const [text, csv] = await Promise.all([
      runCli(['calendar', '--system', DEMO, '--years', '3', ...PAIRS, '--workers', '0']),
      runCli(['calendar', '--system', DEMO, '--years', '3', ...PAIRS, '--workers', '0', '--csv']),
    ]);
    expect(text.code).toBe(0);
    const cal = windowCalendar(system, request, { curve: false });
    expect(text.stdout).toMatch(/^Window calendar of Ilmar: 412-001T00:00 to 415-001T00:00, .* within 10 % /);
    expect(text.stdout).toContain(`Tessel → Ochre: ${cal.pairs[0].windows.length} windows`);
    expect(text.stdout).toMatch(/\n {2}412-\d{3}T\d\d:\d\d +412-\d{3}T\d\d:\d\d +412-\d{3}T\d\d:\d\d +[\d,]+ m\/s +[\d.]+ d\n/);
    expect(csv.code).toBe(0);
    const rows = parseCsv(csv.stdout);
    expect(rows[0]).toEqual([...CALENDAR_CSV_COLUMNS]);
    const windows = cal.pairs.flatMap((p) => p.windows.map((w) => ({ p, w })));
    expect(rows.length - 1).toBe(windows.length);
    windows.forEach(({ p, w }, k) => {
      const row = rows[k + 1];
      expect(row[0]).toBe(p.from);
      expect(Number(row[3])).toBe(w.opens);
      expect(Number(row[11])).toBe(w.best.dv);
    });
  });

  it('refuses bad pairs, years and percentages in the flags’ words with exit code 2', async () => {
    const [self, unknown, years, within, moon] = await Promise.all([
      runCli(['calendar', '--system', DEMO, '--pair', 'tessel:tessel']),
      runCli(['calendar', '--system', DEMO, '--pair', 'tessel:nowhere']),
      runCli(['calendar', '--system', DEMO, '--years', '0']),
      runCli(['calendar', '--system', DEMO, '--within', '-5']),
      runCli(['calendar', '--system', DEMO, '--pair', 'tessel:quill', '--json']),
    ]);
    for (const r of [self, unknown, years, within, moon]) expect(r.code).toBe(2);
    expect(self.stderr).toMatch(/--pair .*paired with itself/);
    expect(unknown.stderr).toMatch(/--pair must name a body of Ilmar/);
    expect(years.stderr).toMatch(/--years must be a number of calendar years above 0/);
    expect(within.stderr).toMatch(/--within must be a percentage/);
    expect(JSON.parse(moon.stdout).error.field).toBe('--pair');
  });
});
