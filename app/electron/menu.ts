/** The native menu: campaign and run commands with the usual shortcuts, sent to the renderer as host menu commands. */
import type { MenuItemConstructorOptions } from 'electron';
import type { MenuCommand } from '../../core/index.ts';

export function menuTemplate(send: (command: MenuCommand) => void, options: { isMac: boolean; recent: { name: string; open: () => void }[] }): MenuItemConstructorOptions[] {
  const cmd = (label: string, command: MenuCommand, accelerator?: string): MenuItemConstructorOptions => ({ label, accelerator, click: () => send(command) });
  return [
    ...(options.isMac ? [{ role: 'appMenu' as const }] : []),
    {
      label: '&File',
      submenu: [
        cmd('New Campaign', 'campaign:new', 'CmdOrCtrl+N'),
        cmd('Open Campaign…', 'campaign:open', 'CmdOrCtrl+O'),
        {
          label: 'Open Recent',
          submenu: options.recent.length > 0 ? options.recent.map((r) => ({ label: r.name, click: r.open })) : [{ label: 'No recent campaigns', enabled: false }],
        },
        { type: 'separator' },
        cmd('Save Campaign', 'campaign:save', 'CmdOrCtrl+S'),
        cmd('Save Campaign As…', 'campaign:save-as', 'CmdOrCtrl+Shift+S'),
        { type: 'separator' },
        cmd('Import Runs…', 'runs:import', 'CmdOrCtrl+I'),
        {
          label: 'Export',
          submenu: [
            cmd('Point Table as CSV…', 'export:points-csv', 'CmdOrCtrl+E'),
            cmd('Point Table as XLSX…', 'export:points-xlsx', 'CmdOrCtrl+Shift+E'),
            cmd('Fit Summary as CSV…', 'export:fits-csv'),
            cmd('Plot as PNG…', 'export:plot-png'),
          ],
        },
        cmd('Print Run Summary…', 'print:summary', 'CmdOrCtrl+P'),
        { type: 'separator' },
        options.isMac ? { role: 'close' } : { role: 'quit', accelerator: 'CmdOrCtrl+Q' },
      ],
    },
    { label: '&Edit', submenu: [{ role: 'undo' }, { role: 'redo' }, { type: 'separator' }, { role: 'cut' }, { role: 'copy' }, { role: 'paste' }, { role: 'selectAll' }] },
    { label: '&View', submenu: [{ role: 'resetZoom' }, { role: 'zoomIn' }, { role: 'zoomOut' }, { type: 'separator' }, { role: 'togglefullscreen' }] },
  ];
}
