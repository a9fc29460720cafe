import type { MenuItemConstructorOptions } from 'electron';
import { describe, expect, it, vi } from 'vitest';
import { menuTemplate } from '../../../app/main/menuTemplate.ts';

function flatten(items: MenuItemConstructorOptions[]): MenuItemConstructorOptions[] {
  return items.flatMap((i) => [i, ...(Array.isArray(i.submenu) ? flatten(i.submenu) : [])]);
}

describe('native menu template', () => {
  const send = vi.fn();
  const items = flatten(menuTemplate({ platform: 'linux', appName: 'Waymark', recent: [{ path: '/p/a.plan.json', name: 'a.plan.json', at: 1 }], send }));
  const byLabel = (l: string) => items.find((i) => i.label === l);

  it('has the usual accelerators (common practice)', () => {
    expect(byLabel('New Plan')?.accelerator).toBe('CmdOrCtrl+N');
    expect(byLabel('Open…')?.accelerator).toBe('CmdOrCtrl+O');
    expect(byLabel('Save')?.accelerator).toBe('CmdOrCtrl+S');
    expect(byLabel('Save As…')?.accelerator).toBe('CmdOrCtrl+Shift+S');
    expect(byLabel('Undo')?.accelerator).toBe('CmdOrCtrl+Z');
    expect(byLabel('Redo')?.accelerator).toBe('Ctrl+Y');
    expect(items.find((i) => i.role === 'quit')?.accelerator).toBe('Ctrl+Q');
    expect(byLabel('Export')).toBeTruthy();
    expect(byLabel('Open Recent')).toBeTruthy();
  });

  it('sends menu commands to the renderer', () => {
    (byLabel('Save As…')!.click as () => void)();
    expect(send).toHaveBeenLastCalledWith({ command: 'save-as' });
    (byLabel('a.plan.json')!.click as () => void)();
    expect(send).toHaveBeenLastCalledWith({ command: 'open-recent', path: '/p/a.plan.json' });
    (byLabel('Ephemeris (CCSDS OEM)…')!.click as () => void)();
    expect(send).toHaveBeenLastCalledWith({ command: 'export', kind: 'oem' });
    (byLabel('New Plan from a Route…')!.click as () => void)();
    expect(send).toHaveBeenLastCalledWith({ command: 'new-from-route' });
  });

  it('uses Cmd+Shift+Z for redo and the app menu for Quit on macOS', () => {
    const mac = flatten(menuTemplate({ platform: 'darwin', appName: 'Waymark', recent: [], send }));
    expect(mac.find((i) => i.label === 'Redo')?.accelerator).toBe('Cmd+Shift+Z');
    expect(mac.find((i) => i.role === 'quit')?.accelerator).toBe('Cmd+Q');
    expect(mac.find((i) => i.label === 'No recent plans')?.enabled).toBe(false);
  });
});
