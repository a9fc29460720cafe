import { describe, expect, it, vi } from 'vitest';
import type { WaymarkBridge } from '../../../../app/preload/api.ts';
import { createElectronHost, fromMain } from '../../../../app/renderer/host/electronHost.ts';
import { NewerVersionError } from '../../../../app/renderer/host/host.ts';
import { createHost } from '../../../../app/renderer/host/index.ts';

function bridge(): WaymarkBridge {
  return {
    kind: 'electron',
    openDialog: vi.fn(async () => ({ path: '/p/a.plan.json', name: 'a.plan.json', text: 'A' })),
    openRecent: vi.fn(async (p: string) => ({ path: p, name: 'r.plan.json', text: 'R' })),
    openSystemDialog: vi.fn(async () => null),
    readSystemBeside: vi.fn(async () => ({ path: '/s/s.json', name: 's.json', text: 'S' })),
    save: vi.fn(async (p: string) => ({ path: p, name: 'a.plan.json' })),
    saveAs: vi.fn(async () => ({ path: '/p/new.plan.json', name: 'new.plan.json' })),
    exportFile: vi.fn(async () => null),
    recentList: vi.fn(async () => [{ path: '/p/a.plan.json', name: 'a.plan.json', at: 1 }]),
    recoveryRead: vi.fn(async () => null),
    recoveryWrite: vi.fn(async () => undefined),
    recoveryClear: vi.fn(async () => undefined),
    setDocumentState: vi.fn(async () => undefined),
    closeConfirmed: vi.fn(async () => undefined),
    onMenu: vi.fn(() => () => undefined),
  };
}

describe('Electron host', () => {
  it('maps the preload API onto the host interface', async () => {
    const b = bridge();
    const host = createElectronHost(b);
    expect(await host.openPlan()).toEqual({ ref: { name: 'a.plan.json', path: '/p/a.plan.json', handle: null }, text: 'A' });
    expect(await host.recentFiles()).toEqual([{ key: '/p/a.plan.json', name: 'a.plan.json', at: 1 }]);
    expect(await host.readSystemBeside({ name: 'a', path: '/p/a.plan.json', handle: null }, '../s.json')).toBe('S');
    expect(b.readSystemBeside).toHaveBeenCalledWith('/p/a.plan.json', '../s.json');
  });

  it('saves to the path, or asks (Save As) when there is none', async () => {
    const b = bridge();
    const host = createElectronHost(b);
    await host.save({ name: 'a.plan.json', path: '/p/a.plan.json', handle: null }, 'T');
    expect(b.save).toHaveBeenCalledWith('/p/a.plan.json', 'T');
    const ref = await host.save({ name: 'demo.plan.json', path: null, handle: null }, 'T');
    expect(b.saveAs).toHaveBeenCalledWith('demo.plan.json', 'T');
    expect(ref?.path).toBe('/p/new.plan.json');
  });

  it("shows main's error message without Electron's IPC wrapping", async () => {
    const b = bridge();
    b.openDialog = vi.fn(async () => {
      throw new Error("Error invoking remote method 'waymark:file-open-dialog': ArgumentError: x.json is not a Waymark plan file (not a JSON object)");
    });
    const host = createElectronHost(b);
    await expect(host.openPlan()).rejects.toThrow(/^x\.json is not a Waymark plan file \(not a JSON object\)$/);
    expect(fromMain(new Error('plain'), 'f').message).toBe('plain');
  });

  it("turns main's refusal to overwrite a newer file into NewerVersionError (for the Save As offer)", async () => {
    const b = bridge();
    b.save = vi.fn(async () => {
      throw new Error(
        "Error invoking remote method 'waymark:file-save': ArgumentError: a.plan.json was written by a newer version of Waymark (version 2; this one reads up to 1): it is not overwritten; use Save As",
      );
    });
    const err = await createElectronHost(b)
      .save({ name: 'a.plan.json', path: '/p/a.plan.json', handle: null }, 'T')
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(NewerVersionError);
    expect((err as NewerVersionError).fileName).toBe('a.plan.json');
    expect((err as Error).message).toMatch(/^a\.plan\.json was written by a newer version of Waymark/);
  });

  it('is chosen when the preload exposed window.waymark', () => {
    const w = { waymark: bridge() } as unknown as Window & typeof globalThis;
    expect(createHost(w).kind).toBe('electron');
  });
});
