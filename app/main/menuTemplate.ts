/**
 * The native menu as a plain template (Electron's MenuItemConstructorOptions), built by a pure
 * function so it can be tested without Electron. Items send MenuCommands to the renderer,
 * which owns the document; Quit, window and edit-field items use Electron's roles.
 */
import type { MenuItemConstructorOptions } from 'electron';
import type { MenuCommand, RecentEntry } from '../preload/api.ts';

export interface MenuOptions {
  platform: string;
  appName: string;
  recent: readonly RecentEntry[];
  send(command: MenuCommand): void;
}

export function menuTemplate(o: MenuOptions): MenuItemConstructorOptions[] {
  const mac = o.platform === 'darwin';
  const item = (label: string, accelerator: string | undefined, command: MenuCommand): MenuItemConstructorOptions => ({
    label,
    ...(accelerator ? { accelerator } : {}),
    click: () => o.send(command),
  });
  const recent: MenuItemConstructorOptions[] =
    o.recent.length === 0
      ? [{ label: 'No recent plans', enabled: false }]
      : o.recent.map((r) => ({ label: r.name, toolTip: r.path, click: () => o.send({ command: 'open-recent', path: r.path }) }));

  const file: MenuItemConstructorOptions = {
    label: 'File',
    submenu: [
      item('New Plan', 'CmdOrCtrl+N', { command: 'new' }),
      item('New Plan from a Route…', undefined, { command: 'new-from-route' }),
      item('Open…', 'CmdOrCtrl+O', { command: 'open' }),
      { label: 'Open Recent', submenu: recent },
      { type: 'separator' },
      item('Save', 'CmdOrCtrl+S', { command: 'save' }),
      item('Save As…', 'CmdOrCtrl+Shift+S', { command: 'save-as' }),
      {
        label: 'Export',
        submenu: [
          item('Ephemeris (CCSDS OEM)…', 'CmdOrCtrl+E', { command: 'export', kind: 'oem' }),
          item('Ephemeris (CSV)…', undefined, { command: 'export', kind: 'csv' }),
          item('Burn table (CSV)…', undefined, { command: 'export', kind: 'burns-csv' }),
          item('Budget report (Markdown)…', undefined, { command: 'export', kind: 'report' }),
        ],
      },
      ...(mac
        ? []
        : [{ type: 'separator' } as MenuItemConstructorOptions, { role: 'quit', label: 'Quit', accelerator: 'Ctrl+Q' } as MenuItemConstructorOptions]),
    ],
  };
  const edit: MenuItemConstructorOptions = {
    label: 'Edit',
    submenu: [
      item('Undo', 'CmdOrCtrl+Z', { command: 'undo' }),
      item('Redo', mac ? 'Cmd+Shift+Z' : 'Ctrl+Y', { command: 'redo' }),
      { type: 'separator' },
      { role: 'cut' },
      { role: 'copy' },
      { role: 'paste' },
      { role: 'selectAll' },
    ],
  };
  const view: MenuItemConstructorOptions = {
    label: 'View',
    submenu: [{ role: 'resetZoom' }, { role: 'zoomIn' }, { role: 'zoomOut' }, { type: 'separator' }, { role: 'togglefullscreen' }],
  };
  const appMenu: MenuItemConstructorOptions[] = mac
    ? [
        {
          label: o.appName,
          submenu: [
            { role: 'about' },
            { type: 'separator' },
            { role: 'hide' },
            { role: 'hideOthers' },
            { type: 'separator' },
            { role: 'quit', accelerator: 'Cmd+Q' },
          ],
        },
      ]
    : [];
  return [...appMenu, file, edit, view, { role: 'windowMenu' }];
}
