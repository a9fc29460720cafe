import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { parsePlanFile } from '../../../../core/io/planFile.ts';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import * as edits from '../../../../app/renderer/plan/edits.ts';
import { Session, blankPlan, type SessionDeps } from '../../../../app/renderer/state/session.ts';
import { NewerVersionError } from '../../../../app/renderer/host/host.ts';
import { fakeHost, type FakeHost } from './fakeHost.ts';
import { runCli } from '../../cli/runCli.ts';

const root = new URL('../../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const demoText = readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8');

async function session(host: FakeHost = fakeHost(), ask: SessionDeps['ask'] = async () => 'cancel') {
  const s = await Session.create({
    host,
    evaluate: (sys, plan) => evaluate(sys, plan),
    bundledSystems: { 'ilmar.system.json': systemText },
    demo: { name: 'tessel-to-ochre.plan.json', text: demoText },
    ask,
    autosaveMs: 0,
    now: () => 1234,
  });
  return { s, host };
}

describe('session: the open document and its files', () => {
  it('opens on the demo plan, evaluated, with nothing unsaved', async () => {
    const { s, host } = await session();
    const d = s.doc.get();
    expect(d.name).toBe('tessel-to-ochre.plan.json');
    expect(d.dirty).toBe(false);
    expect(d.plan.vehicle.name).toBe('Long Patience');
    const e = s.evaluation.get();
    expect(e.error).toBeNull();
    expect(e.result!.budget.rows.length).toBeGreaterThan(0);
    expect(s.cursor.get().t).toBe(e.result!.t0);
    expect(host.titles.at(-1)).toBe('tessel-to-ochre.plan.json — Waymark');
  });

  it('re-evaluates after every edit, marks it unsaved, and undo takes it back', async () => {
    const { s, host } = await session();
    const before = s.evaluation.get().result!.budget.rows.length;
    s.doc.edit('Add burn', (p) => edits.addEvent(p, 'burn'));
    expect(s.evaluation.get().result!.budget.rows.length).toBe(before + 1);
    expect(s.doc.get().dirty).toBe(true);
    expect(host.titles.at(-1)).toMatch(/^• /);
    await s.command({ command: 'undo' });
    expect(s.evaluation.get().result!.budget.rows.length).toBe(before);
    expect(s.doc.get().dirty).toBe(false);
    await s.command({ command: 'redo' });
    expect(s.evaluation.get().result!.budget.rows.length).toBe(before + 1);
  });

  it('saves, and the saved file reads back to the same plan', async () => {
    const { s, host } = await session();
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 4.5 }));
    expect(await s.save()).toBe(true);
    expect(host.save).toHaveBeenCalledOnce();
    const text = host.files.get('tessel-to-ochre.plan.json')!;
    expect(parsePlanFile(text).plan).toEqual(s.doc.get().plan);
    expect(s.doc.get().dirty).toBe(false);
    expect(await s.saveAs()).toBe(true);
    expect(s.doc.get().file?.path).toBe('/plans/tessel-to-ochre.plan.json');
  });

  it('a bad plan file shows every issue and changes nothing', async () => {
    const { s } = await session();
    const before = s.doc.get();
    const bad = JSON.parse(demoText);
    bad.vehicle.stages[0].isp_s = -5;
    bad.events[0].frame = 'sideways';
    const ok = await s.openText(JSON.stringify(bad), { name: 'bad.plan.json', path: null, handle: null });
    expect(ok).toBe(false);
    const n = s.notices.get().at(-1)!;
    expect(n.kind).toBe('error');
    expect(n.title).toMatch(/bad\.plan\.json was not opened/);
    const paths = n.issues!.map((i) => i.path);
    expect(paths).toContain('vehicle.stages[0].isp_s');
    expect(paths).toContain('events[0].frame');
    expect(s.doc.get().plan).toBe(before.plan);
    expect(s.doc.get().revision).toBe(before.revision);
  });

  it('a bad plan file says its problems in the user’s words: the burn numbered from 1 as on its card, its time as a calendar date', async () => {
    const { s, host } = await session();
    const bad = JSON.parse(demoText);
    bad.events[0].solve.arrive_s = bad.events[0].t_s - 86400;
    bad.vehicle.stages[0].isp_s = -5;
    vi.mocked(host.readSystemBeside).mockResolvedValue(systemText);
    expect(await s.openText(JSON.stringify(bad), { name: 'bad.plan.json', path: '/plans/bad.plan.json', handle: null })).toBe(false);
    const issues = s.notices.get().at(-1)!.issues!;
    const arrive = issues.find((i) => i.path === 'events[0].solve.arrive_s');
    // The system is found beside the plan, so the time reads in its calendar.
    expect(arrive?.words).toMatch(new RegExp(`^Burn 1 '${bad.events[0].name}': arrival must be later than the burn \\(\\d+-\\d{3}T\\d\\d:\\d\\d\\)$`));
    expect(issues.find((i) => i.path === 'vehicle.stages[0].isp_s')?.words).toMatch(new RegExp(`^Stage 1 '${bad.vehicle.stages[0].name}': Isp must be`));
  });

  it('not JSON at all: one issue, nothing changed', async () => {
    const { s } = await session();
    const before = s.doc.get().plan;
    expect(await s.openText('{ nope', { name: 'x.json', path: null, handle: null })).toBe(false);
    expect(s.notices.get().at(-1)!.issues![0].rule).toMatch(/not valid JSON/);
    expect(s.doc.get().plan).toBe(before);
  });

  it('asks for a system file it cannot read beside the plan, saying which and why, and refuses the plan without one', async () => {
    const ask = vi.fn<SessionDeps['ask']>(async () => 'cancel');
    const { s, host } = await session(fakeHost(), ask);
    const other = demoText.replace('../systems/ilmar.system.json', '../systems/elsewhere.system.json');
    expect(await s.openText(other, { name: 'o.plan.json', path: null, handle: null })).toBe(false);
    // Asked first, in words, with no picker behind the user's back; nothing bundled by that name to offer.
    expect(host.openSystem).not.toHaveBeenCalled();
    const q = ask.mock.calls[0][0];
    expect(q.message).toMatch(
      /^o\.plan\.json names the system file "\.\.\/systems\/elsewhere\.system\.json" \(relative to the plan's folder\), and this browser cannot read files beside o\.plan\.json/,
    );
    expect(q.message).toMatch(/Choose the system file 'elsewhere\.system\.json' this plan was made with\./);
    expect(q.choices.map((c) => c.id)).toEqual(['choose', 'cancel']);
    const n = s.notices.get().at(-1)!;
    expect(n.issues![0].path).toBe('system.path');
    expect(n.issues![0].rule).toMatch(/names "\.\.\/systems\/elsewhere\.system\.json", which was not loaded: .*the question was cancelled/);
    ask.mockResolvedValue('choose');
    host.nextSystem = { ref: { name: 'elsewhere.system.json', path: null, handle: null }, text: systemText };
    expect(await s.openText(other, { name: 'o.plan.json', path: null, handle: null })).toBe(true);
    expect(host.openSystem).toHaveBeenCalledOnce();
    expect(s.doc.get().name).toBe('o.plan.json');
  });

  it('asks before discarding unsaved changes; Cancel keeps them', async () => {
    const ask = vi.fn(async () => 'cancel');
    const { s, host } = await session(fakeHost(), ask);
    s.doc.edit('Rename', (p) => edits.setPlanInfo(p, { name: 'Changed' }));
    host.nextOpen = { ref: { name: 'n.plan.json', path: null, handle: null }, text: demoText };
    await s.open();
    expect(ask).toHaveBeenCalledOnce();
    expect(host.openPlan).not.toHaveBeenCalled();
    expect(s.doc.get().plan.name).toBe('Changed');
  });

  it('Discard opens the other plan', async () => {
    const { s, host } = await session(fakeHost(), async () => 'discard');
    vi.mocked(host.readSystemBeside).mockResolvedValue(systemText);
    s.doc.edit('Rename', (p) => edits.setPlanInfo(p, { name: 'Changed' }));
    host.nextOpen = { ref: { name: 'n.plan.json', path: null, handle: null }, text: demoText };
    await s.open();
    expect(s.doc.get().name).toBe('n.plan.json');
    expect(s.doc.get().dirty).toBe(false);
    expect(s.doc.get().canUndo).toBe(false);
  });

  it('autosaves unsaved work and offers it back after a restart', async () => {
    const host = fakeHost();
    const { s } = await session(host);
    s.doc.edit('Rename', (p) => edits.setPlanInfo(p, { name: 'Unsaved work' }));
    await s.autosave();
    expect(host.recovery?.name).toBe('tessel-to-ochre.plan.json');
    // "crash": a new session on the same host
    const { s: s2 } = await session(host);
    const offer = s2.notices.get().find((n) => n.title === 'Unsaved work was found')!;
    expect(offer).toBeTruthy();
    await offer.actions![0].run();
    expect(s2.doc.get().plan.name).toBe('Unsaved work');
    expect(s2.doc.get().dirty).toBe(true);
  });

  it('clears the recovery copy once the work is saved', async () => {
    const host = fakeHost();
    const { s } = await session(host);
    s.doc.edit('Rename', (p) => edits.setPlanInfo(p, { name: 'X' }));
    await s.autosave();
    expect(host.recovery).not.toBeNull();
    await s.save();
    expect(host.recovery).toBeNull();
  });

  it('a plan written by a newer version says so and is not opened', async () => {
    const { s } = await session();
    const before = s.doc.get();
    const newer = JSON.stringify({ ...JSON.parse(demoText), version: 2, some_future_field: {} });
    expect(await s.openText(newer, { name: 'future.plan.json', path: '/plans/future.plan.json', handle: null })).toBe(false);
    const n = s.notices.get().at(-1)!;
    expect(n.title).toBe('future.plan.json was not opened');
    expect(n.issues).toEqual([
      expect.objectContaining({ path: 'version', rule: expect.stringMatching(/is 2, newer than this program reads \(up to 1\); use a newer Waymark/) }),
    ]);
    expect(s.doc.get().plan).toBe(before.plan);
    expect(s.doc.get().file).toBe(before.file);
  });

  it('Save does not overwrite a file a newer version wrote: it offers Save As', async () => {
    const ask = vi.fn(async () => 'save-as');
    const { s, host } = await session(fakeHost(), ask);
    await s.saveAs(); // the document now lives at /plans/tessel-to-ochre.plan.json
    const written = host.files.get('tessel-to-ochre.plan.json');
    vi.mocked(host.save).mockRejectedValueOnce(
      new NewerVersionError(
        'tessel-to-ochre.plan.json',
        'tessel-to-ochre.plan.json was written by a newer version of Waymark (version 2; this one reads up to 1)',
      ),
    );
    vi.mocked(host.saveAs).mockClear();
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 4.5 }));
    expect(await s.save()).toBe(true);
    expect(ask).toHaveBeenCalledWith(
      expect.objectContaining({
        title: 'Written by a newer Waymark',
        message: expect.stringMatching(/tessel-to-ochre\.plan\.json was written by a newer version of Waymark/),
      }),
    );
    expect(host.saveAs).toHaveBeenCalledOnce();
    expect(host.files.get('tessel-to-ochre.plan.json')).not.toBe(written); // the Save As copy (the fake writes by name)
    expect(s.doc.get().dirty).toBe(false);
  });

  it('declining the Save As offer leaves the newer file alone and the edits unsaved', async () => {
    const { s, host } = await session(fakeHost(), async () => 'cancel');
    await s.saveAs();
    vi.mocked(host.save).mockRejectedValueOnce(
      new NewerVersionError('t.plan.json', 't.plan.json was written by a newer version of Waymark (version 3; this one reads up to 1)'),
    );
    vi.mocked(host.saveAs).mockClear();
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 4.5 }));
    expect(await s.save()).toBe(false);
    expect(host.saveAs).not.toHaveBeenCalled();
    expect(s.doc.get().dirty).toBe(true);
    expect(s.notices.get().at(-1)).toMatchObject({ kind: 'warning', title: 't.plan.json was not overwritten' });
  });

  it('New starts a blank plan in the same system', async () => {
    const { s } = await session();
    await s.newPlan();
    const d = s.doc.get();
    expect(d.name).toBe('Untitled plan');
    expect(d.plan.events).toEqual([]);
    expect(d.plan).toEqual(blankPlan(d.system));
    expect(d.issues.filter((i) => i.severity === 'error')).toEqual([]);
  });

  it('exports the report, the burn table, CSV and OEM ephemerides', async () => {
    const { s, host } = await session();
    for (const kind of ['report', 'burns-csv', 'csv', 'oem'] as const) await s.exportAs(kind);
    expect(host.exported.map((x) => x.name)).toEqual([
      'tessel-to-ochre.report.md',
      'tessel-to-ochre.burns.csv',
      'tessel-to-ochre.ephemeris.csv',
      'tessel-to-ochre.oem',
    ]);
    expect(host.exported[0].text).toMatch(/Δv budget/);
    expect(host.exported[3].text).toMatch(/^CCSDS_OEM_VERS\s+=\s+2\.0/);
  });

  it('an edit that would break the plan is refused: the plan, its result and its undo stay; a refusal no field showed is a notice', async () => {
    const { s } = await session();
    const before = s.doc.get();
    const result = s.evaluation.get().result;
    const r = s.doc.edit('Break isp', (p) => edits.updateStage(p, 0, { isp: -1 }));
    expect(r?.issues.map((i) => i.path)).toEqual(['vehicle.stages[0].isp']);
    expect(s.doc.get().plan).toBe(before.plan);
    expect(s.doc.get().canUndo).toBe(false);
    expect(s.evaluation.get()).toMatchObject({ stale: false, error: null });
    expect(s.evaluation.get().result).toBe(result);
    await Promise.resolve();
    expect(s.notices.get().at(-1)).toMatchObject({ kind: 'warning', title: 'Not applied: Break isp' });
    // A refusal the field showed (marked shown before the microtask) makes no notice.
    const count = s.notices.get().length;
    const shown = s.doc.edit('Break reserve', (p) => edits.setReserve(p, { percent: 500 }));
    if (shown) shown.shown = true;
    await Promise.resolve();
    expect(s.notices.get().length).toBe(count);
  });
});

describe('session: the system a plan names, and plans that travel', () => {
  /** A folder with plans/trip.plan.json (the demo, naming ../systems/ilmar.system.json) and that system file as given. */
  function folder(system: string): { plan: string; dir: string } {
    const dir = mkdtempSync(join(tmpdir(), 'waymark-session-'));
    mkdirSync(join(dir, 'plans'));
    mkdirSync(join(dir, 'systems'));
    writeFileSync(join(dir, 'plans', 'trip.plan.json'), demoText);
    writeFileSync(join(dir, 'systems', 'ilmar.system.json'), system);
    return { plan: join(dir, 'plans', 'trip.plan.json'), dir };
  }
  /** A desktop-like fake host that reads systems beside the plan from the real disk. */
  function desktopHost(): FakeHost {
    const host = fakeHost();
    (host as { kind: string }).kind = 'electron';
    vi.mocked(host.readSystemBeside).mockImplementation(async (ref, rel) => readFileSync(join(dirname(ref.path!), rel), 'utf8'));
    return host;
  }
  /** `waymark check PLAN --model conic --json`: the budget the command line reads the plan file with. */
  async function cliBudget(planPath: string): Promise<{ total: number; margin: number }> {
    const run = await runCli(['check', planPath, '--model', 'conic', '--json']);
    expect([0, 1], run.stderr).toContain(run.code);
    return JSON.parse(run.stdout).budget;
  }
  // The app and the command line run the same evaluation on the same plan and system: the only
  // differences allowed are the plan file's own rounding of what it writes (shortest decimals of
  // the degree values), a few ulps of a 6 km/s total.
  const SAME = 1e-9; // m/s

  it('a plan beside an edited system file evaluates against that file, in the app and on the command line alike', async () => {
    const edited = systemText.replace('"mu_m3_s2": 3e14', '"mu_m3_s2": 3.3e14'); // Tessel 10 % heavier
    expect(edited).not.toBe(systemText);
    const { plan, dir } = folder(edited);
    try {
      const { s } = await session(desktopHost());
      const bundledTotal = s.evaluation.get().result!.budget.total;
      expect(await s.openText(demoText, { name: 'trip.plan.json', path: plan, handle: null })).toBe(true);
      const d = s.doc.get();
      expect(d.system.bodies.find((b) => b.id === 'tessel')!.mu).toBe(3.3e14);
      // Read from beside the plan, so it stays named by path when saved on the desktop.
      expect(d.systemRef).toEqual({ kind: 'path', path: '../systems/ilmar.system.json' });
      const app = s.evaluation.get().result!.budget;
      // A heavier home world changes the departure by far more than any rounding: the bundled system was not used.
      expect(Math.abs(app.total - bundledTotal)).toBeGreaterThan(10);
      const cli = await cliBudget(plan);
      expect(Math.abs(cli.total - app.total)).toBeLessThan(SAME);
      expect(Math.abs(cli.margin - app.margin)).toBeLessThan(SAME);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 30_000);

  it('Save As into another folder names the same system file from there, so the saved plan resolves (the command line reads it)', async () => {
    const { plan, dir } = folder(systemText);
    try {
      const host = desktopHost();
      const target = join(dir, 'elsewhere', 'deep', 'trip.plan.json');
      mkdirSync(dirname(target), { recursive: true });
      vi.mocked(host.saveAs).mockImplementation(async (_name, text) => {
        writeFileSync(target, text);
        return { name: 'trip.plan.json', path: target, handle: null };
      });
      vi.mocked(host.save).mockImplementation(async (ref, text) => {
        writeFileSync(ref.path!, text);
        return ref;
      });
      const { s } = await session(host);
      expect(await s.openText(demoText, { name: 'trip.plan.json', path: plan, handle: null })).toBe(true);
      expect(await s.saveAs()).toBe(true);
      const written = parsePlanFile(readFileSync(target, 'utf8')).system;
      expect(written).toEqual({ kind: 'path', path: '../../systems/ilmar.system.json' });
      expect(s.doc.get().systemRef).toEqual(written);
      const run = await runCli(['check', target, '--model', 'conic', '--json']);
      expect([0, 1], run.stderr).toContain(run.code);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 30_000);

  it('a system file chosen on the desktop is named from the plan’s folder when saved', async () => {
    const ask = vi.fn<SessionDeps['ask']>(async () => 'choose');
    const host = desktopHost();
    vi.mocked(host.readSystemBeside).mockRejectedValue(new Error('relativePath names no system file this plan may read'));
    host.nextSystem = { ref: { name: 'ilmar.system.json', path: '/data/systems/ilmar.system.json', handle: null }, text: systemText };
    const { s } = await session(host, ask);
    expect(await s.openText(demoText, { name: 'trip.plan.json', path: '/data/plans/trip.plan.json', handle: null })).toBe(true);
    expect(s.doc.get().systemRef).toEqual({ kind: 'path', path: '../systems/ilmar.system.json' });
  });

  it('the recovery copy carries its system, so it is recovered without the file beside the plan and without a question', async () => {
    const { plan, dir } = folder(systemText.replace('"mu_m3_s2": 3e14', '"mu_m3_s2": 3.3e14'));
    try {
      const host = desktopHost();
      const { s } = await session(host);
      expect(await s.openText(demoText, { name: 'trip.plan.json', path: plan, handle: null })).toBe(true);
      s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 4.5 }));
      await s.autosave();
      expect(parsePlanFile(host.recovery!.text).system.kind).toBe('embedded');
      const ask = vi.fn<SessionDeps['ask']>(async () => 'cancel');
      const later = desktopHost();
      later.recovery = host.recovery;
      vi.mocked(later.readSystemBeside).mockRejectedValue(new Error('not opened in this session'));
      const { s: s2 } = await session(later, ask);
      expect(await s2.recover(later.recovery!)).toBe(true);
      expect(ask).not.toHaveBeenCalled();
      expect(s2.doc.get().system.bodies.find((b) => b.id === 'tessel')!.mu).toBe(3.3e14);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('a system beside the plan that cannot be read: the question and the refusal say which file and why, and nothing changes', async () => {
    const ask = vi.fn<SessionDeps['ask']>(async () => 'cancel');
    const host = desktopHost();
    const { s } = await session(host, ask);
    const before = s.doc.get();
    vi.mocked(host.readSystemBeside).mockRejectedValue(
      new Error("relativePath names no system file this plan may read (it must be a Waymark system file in the plan's folder)"),
    );
    expect(await s.openText(demoText, { name: 'trip.plan.json', path: '/plans/trip.plan.json', handle: null })).toBe(false);
    const q = ask.mock.calls[0][0];
    expect(q.message).toMatch(
      /trip\.plan\.json names the system file "\.\.\/systems\/ilmar\.system\.json" \(relative to the plan's folder\), and it could not be read beside trip\.plan\.json: relativePath names no system file this plan may read/,
    );
    expect(q.message).toMatch(/Choose the system file 'ilmar\.system\.json' this plan was made with/);
    // The bundled copy of that name is offered as a choice of its own, not taken silently.
    expect(q.choices.map((c) => c.id)).toEqual(['choose', 'bundled', 'cancel']);
    expect(host.openSystem).not.toHaveBeenCalled();
    const n = s.notices.get().at(-1)!;
    expect(n.title).toBe('trip.plan.json was not opened');
    expect(n.issues![0].rule).toMatch(
      /which was not loaded: it could not be read beside trip\.plan\.json: relativePath names no system file .*; the question was cancelled/,
    );
    expect(s.doc.get().plan).toBe(before.plan);
    expect(s.doc.get().revision).toBe(before.revision);
  });

  it('a chosen file that is not a valid system is refused with its issues, after one explained picker', async () => {
    const ask = vi.fn<SessionDeps['ask']>(async () => 'choose');
    const host = fakeHost();
    const { s } = await session(host, ask);
    const before = s.doc.get();
    host.nextSystem = { ref: { name: 'odd.system.json', path: null, handle: null }, text: '{"format":"waymark-system","version":1,"name":"x"}' };
    expect(await s.openText(demoText, { name: 'trip.plan.json', path: null, handle: null })).toBe(false);
    expect(ask).toHaveBeenCalledOnce();
    expect(host.openSystem).toHaveBeenCalledOnce();
    const n = s.notices.get().at(-1)!;
    expect(n.detail).toMatch(/its system odd\.system\.json is not a valid system file/);
    expect(n.issues!.length).toBeGreaterThan(0);
    expect(n.issues!.every((i) => i.path.startsWith('system (odd.system.json)'))).toBe(true);
    expect(s.doc.get().plan).toBe(before.plan);
  });

  it("the system file's warnings show in the app, as on the command line", async () => {
    // Kiln's safe altitude above its own radius: a warning of the system file, not an error.
    const warned = systemText.replace('"min_safe_altitude_m": 6000', '"min_safe_altitude_m": 3e6');
    expect(warned).not.toBe(systemText);
    const { plan, dir } = folder(warned);
    try {
      const { s } = await session(desktopHost());
      expect(await s.openText(demoText, { name: 'trip.plan.json', path: plan, handle: null })).toBe(true);
      const n = s.notices.get().at(-1)!;
      expect(n.title).toBe('trip.plan.json opened with warnings');
      expect(n.issues!.some((i) => i.path.startsWith('system (ilmar.system.json) bodies') && /larger than the body's radius/.test(i.rule))).toBe(true);
      const run = await runCli(['check', plan, '--model', 'conic']);
      expect(run.stderr).toMatch(/larger than the body's radius/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 30_000);

  it('a browser save embeds the system, and the command line reads the saved file to the same budget', async () => {
    const host = fakeHost(); // a browser: downloads, no folder
    const { s } = await session(host);
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 4.5 }));
    expect(await s.save()).toBe(true);
    const text = host.files.get('tessel-to-ochre.plan.json')!;
    expect(parsePlanFile(text).system.kind).toBe('embedded');
    const dir = mkdtempSync(join(tmpdir(), 'waymark-download-'));
    try {
      const saved = join(dir, 'tessel-to-ochre.plan.json'); // a download folder: no systems/ beside it
      writeFileSync(saved, text);
      const app = s.evaluation.get().result!.budget;
      const cli = await cliBudget(saved);
      expect(Math.abs(cli.total - app.total)).toBeLessThan(SAME);
      expect(Math.abs(cli.margin - app.margin)).toBeLessThan(SAME);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 30_000);
});
