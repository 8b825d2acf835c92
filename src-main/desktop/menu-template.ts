import type { z } from 'zod';
import type { MenuCommand } from '../../shared-core/api.js';

type Command = z.infer<typeof MenuCommand>;

/** A menu item as Electron's Menu.buildFromTemplate takes it (a plain object, tested without Electron). */
export interface MenuItem {
  label?: string;
  role?: string;
  type?: 'separator' | 'submenu';
  accelerator?: string;
  enabled?: boolean;
  submenu?: MenuItem[];
  click?: () => void;
}

export interface MenuActions {
  /** Forwards a command to the screens (they own the study and its undo history). */
  send(command: Command): void;
  openRecent(path: string): void;
  clearRecent(): void;
  openLogs(): void;
  recent: readonly { path: string; label: string }[];
  platform: NodeJS.Platform;
}

/**
 * The native menus: File (new from import, open, open recent, save, save as, export packet), Edit
 * (undo and redo of study decisions, then the clipboard), View, Help (about, open logs).
 */
export function menuTemplate(actions: MenuActions): MenuItem[] {
  const command = (label: string, name: Command, accelerator?: string): MenuItem => ({
    label,
    ...(accelerator ? { accelerator } : {}),
    click: () => actions.send(name),
  });
  const recent: MenuItem[] =
    actions.recent.length === 0
      ? [{ label: 'No recent studies', enabled: false }]
      : [
          ...actions.recent.map((entry) => ({
            label: entry.label,
            click: () => actions.openRecent(entry.path),
          })),
          { type: 'separator' as const },
          { label: 'Clear recent', click: () => actions.clearRecent() },
        ];
  const mac = actions.platform === 'darwin';
  return [
    ...(mac
      ? [
          {
            label: 'Limit Ledger',
            submenu: [
              command('About Limit Ledger', 'about'),
              { type: 'separator' as const },
              { role: 'hide' },
              { role: 'quit' },
            ],
          },
        ]
      : []),
    {
      label: '&File',
      submenu: [
        command('New from import…', 'new-from-import', 'CmdOrCtrl+N'),
        command('Open…', 'open', 'CmdOrCtrl+O'),
        { label: 'Open recent', submenu: recent },
        { type: 'separator' },
        command('Save', 'save', 'CmdOrCtrl+S'),
        command('Save as…', 'save-as', 'CmdOrCtrl+Shift+S'),
        { type: 'separator' },
        command('Export packet…', 'export-packet', 'CmdOrCtrl+E'),
        ...(mac ? [] : [{ type: 'separator' as const }, { role: 'quit', label: 'Quit' }]),
      ],
    },
    {
      label: '&Edit',
      submenu: [
        command('Undo', 'undo', 'CmdOrCtrl+Z'),
        command('Redo', 'redo', mac ? 'Cmd+Shift+Z' : 'Ctrl+Y'),
        { type: 'separator' },
        { role: 'cut' },
        { role: 'copy' },
        { role: 'paste' },
        { role: 'selectAll' },
      ],
    },
    {
      label: '&View',
      submenu: [
        { role: 'resetZoom' },
        { role: 'zoomIn' },
        { role: 'zoomOut' },
        { type: 'separator' },
        { role: 'togglefullscreen' },
      ],
    },
    {
      label: '&Help',
      submenu: [
        ...(mac ? [] : [command('About Limit Ledger', 'about')]),
        { label: 'Open logs folder', click: () => actions.openLogs() },
      ],
    },
  ];
}
