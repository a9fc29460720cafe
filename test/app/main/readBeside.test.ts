/**
 * The desktop app's "read the system beside the plan" handler on real files (the main process's
 * own file access, app/main/diskFiles.ts; Electron not needed): it reads a system file in the
 * plan's folder or below it, or in a folder the user chose a system file from; it refuses — with
 * one refusal that says nothing about the file — a path out of the folder (by `..` or by a
 * symbolic link), a missing file, a FIFO or a device (without blocking), and a JSON file that is
 * not a system file (its content, such as its "format", never echoed).
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, realpathSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createDiskFiles } from '../../../app/main/diskFiles.ts';
import { BESIDE_REFUSAL, createIpcHandlers, createRecoveryStore, type Sender } from '../../../app/main/ipcHandlers.ts';
import { createRecentStore } from '../../../app/main/recentFiles.ts';
import { IPC } from '../../../app/preload/api.ts';

const ROOT = new URL('../../../', import.meta.url).pathname;
const SYSTEM_TEXT = readFileSync(join(ROOT, 'assets/systems/ilmar.system.json'), 'utf8');
const PLAN = '{"format":"waymark-plan","version":1,"name":"a"}';
const APP = 'waymark://app/index.html';
const me: Sender = { url: APP, topFrame: true };
/** Turns a blocked read (the bug) into a failure; the fixed code answers at once. */
const HANG_GUARD = 20_000;

const work = realpathSync(mkdtempSync(join(tmpdir(), 'waymark-beside-')));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/**
 * work/plans/trip.plan.json beside: ok.system.json, sub/deep.system.json, pipe.json (a FIFO),
 * zero.json (a link to /dev/zero), escape.json (a link to ../secret/secret.json), notes.json
 * (JSON with a "format" of its own); work/secret/ holds a system file and secret.json outside.
 */
function layout() {
  const plans = join(work, 'plans');
  const secret = join(work, 'secret');
  mkdirSync(join(plans, 'sub'), { recursive: true });
  mkdirSync(secret, { recursive: true });
  writeFileSync(join(plans, 'trip.plan.json'), PLAN);
  writeFileSync(join(plans, 'ok.system.json'), SYSTEM_TEXT);
  writeFileSync(join(plans, 'sub', 'deep.system.json'), SYSTEM_TEXT);
  writeFileSync(join(plans, 'notes.json'), '{"format":"top-secret-token-4711","version":1}');
  execFileSync('mkfifo', [join(plans, 'pipe.json')]);
  symlinkSync('/dev/zero', join(plans, 'zero.json'));
  writeFileSync(join(secret, 'secret.json'), '{"format":"top-secret-token-4711"}');
  writeFileSync(join(secret, 'other.system.json'), SYSTEM_TEXT);
  symlinkSync(join(secret, 'other.system.json'), join(plans, 'escape.json'));
  return { plans, secret, plan: join(plans, 'trip.plan.json') };
}
const { plans, secret, plan } = layout();

function handlers(dialogPath: string | null = plan) {
  const files = createDiskFiles();
  const userData = join(work, 'user');
  mkdirSync(userData, { recursive: true });
  const showOpen = { next: dialogPath };
  const h = createIpcHandlers({
    dialogs: { showOpen: async () => showOpen.next, showSave: async () => null },
    files,
    recent: createRecentStore(join(userData, 'recent.json'), files),
    recovery: createRecoveryStore(join(userData, 'recovery.json'), files),
    window: { setDocumentState: () => undefined, closeConfirmed: () => undefined },
    isTrustedSender: (url) => url === APP,
  });
  return { h, showOpen };
}

const refusal = (h: ReturnType<typeof handlers>['h'], rel: string): Promise<string> =>
  h[IPC.readSystemBeside](me, plan, rel).then(
    () => 'read',
    (e: Error) => e.message,
  );

describe('readSystemBeside on real files', () => {
  it(
    'reads a system file in the plan folder or below; refuses everything else with one refusal that tells nothing',
    async () => {
      const { h } = handlers();
      await h[IPC.openDialog](me);
      await expect(h[IPC.readSystemBeside](me, plan, 'ok.system.json')).resolves.toMatchObject({ text: SYSTEM_TEXT });
      await expect(h[IPC.readSystemBeside](me, plan, 'sub/deep.system.json')).resolves.toMatchObject({ text: SYSTEM_TEXT });
      const rels = [
        '../secret/secret.json', // outside, exists
        '../secret/missing.json', // outside, missing
        '../../../../../../etc/none.json', // far outside
        'missing.json', // inside, missing
        'escape.json', // inside by name, a link out of the folder
        'pipe.json', // a FIFO: refused without blocking
        'zero.json', // a link to /dev/zero: refused without reading
        'notes.json', // JSON that is not a system file: its "format" is not echoed
      ];
      const messages = await Promise.all(rels.map((rel) => refusal(h, rel)));
      expect(new Set(messages)).toEqual(new Set([`relativePath ${BESIDE_REFUSAL}`]));
      for (const m of messages) expect(m).not.toMatch(/top-secret|secret\.json|ENOENT|FIFO|device|exist/);
    },
    HANG_GUARD,
  );

  it('a folder the user chose a system file from (through the dialog) may be read from too', async () => {
    const { h, showOpen } = handlers();
    await h[IPC.openDialog](me);
    expect(await refusal(h, '../secret/other.system.json')).toBe(`relativePath ${BESIDE_REFUSAL}`);
    showOpen.next = join(secret, 'other.system.json');
    await h[IPC.openSystemDialog](me);
    await expect(h[IPC.readSystemBeside](me, plan, '../secret/other.system.json')).resolves.toMatchObject({ text: SYSTEM_TEXT });
    // that folder holds a file that is not a system file: still the same refusal
    expect(await refusal(h, '../secret/secret.json')).toBe(`relativePath ${BESIDE_REFUSAL}`);
  });

  it(
    'the open dialog picking a FIFO or a device link: refused at once as not a regular file',
    async () => {
      const { h, showOpen } = handlers(join(plans, 'pipe.json'));
      await expect(h[IPC.openDialog](me)).rejects.toThrow(/pipe\.json: it is not a regular file \(it is a FIFO \(named pipe\)\)/);
      showOpen.next = join(plans, 'zero.json');
      await expect(h[IPC.openDialog](me)).rejects.toThrow(/zero\.json: it is not a regular file \(it is a character device\)/);
    },
    HANG_GUARD,
  );
});
