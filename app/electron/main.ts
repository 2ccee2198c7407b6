/**
 * Electron main process: one window on the renderer build, hardened (security.ts), with the native
 * menu, dialogs and file access behind validated IPC (ipc.ts). Bundled to dist/electron/main.cjs by
 * electron.config.ts.
 */
import { app, BrowserWindow, dialog, ipcMain, Menu, protocol, session, shell } from 'electron';
import { join } from 'node:path';
import type { MenuCommand } from '../../core/index.ts';
import { FileGrants } from './grants.ts';
import { registerIpc, SAMPLE_CAMPAIGN_FILE } from './ipc.ts';
import { EVENTS } from './ipcChannels.ts';
import { menuTemplate } from './menu.ts';
import { APP_ORIGIN, APP_SCHEME, serveAppFile } from './protocol.ts';
import { recentList } from './recent.ts';
import { hardenContents, hardenSession, isAllowedExternal, webPreferences } from './security.ts';

/** Where the packaged files live: the app folder (dist/electron/..) holds dist/renderer and sample-runs. */
const APP_ROOT = join(__dirname, '..', '..');
const RENDERER_ROOT = join(APP_ROOT, 'dist', 'renderer');

let win: BrowserWindow | undefined;
let dirty = false;

function send(command: MenuCommand) {
  win?.webContents.send(EVENTS.menuCommand, command);
}

async function buildMenu(recent: ReturnType<typeof recentList>) {
  const paths = await recent.list();
  const template = menuTemplate(send, {
    isMac: process.platform === 'darwin',
    recent: paths.map((p) => ({ name: p.split(/[\\/]/).pop() ?? p, open: () => win?.webContents.send(EVENTS.menuOpenRecent, p) })),
  });
  Menu.setApplicationMenu(Menu.buildFromTemplate(template));
}

async function createWindow() {
  const grants = new FileGrants();
  const kept = recentList(join(app.getPath('userData'), 'recent-campaigns.json'));
  // File → Open Recent follows the list: rebuilt whenever a campaign is opened or saved
  const recent = { ...kept, add: async (path: string) => (await kept.add(path), await buildMenu(kept)) };
  hardenSession(session.defaultSession);
  win = new BrowserWindow({
    width: 1400,
    height: 900,
    minWidth: 960,
    minHeight: 640,
    title: 'Sweepbook',
    show: false,
    backgroundColor: '#f7f7f4',
    webPreferences: webPreferences(join(__dirname, 'preload.cjs')),
  });
  hardenContents(win.webContents, (url) => {
    if (isAllowedExternal(url)) void shell.openExternal(url);
  });
  registerIpc({
    ipcMain,
    dialog,
    window: () => win,
    grants,
    recent,
    sampleCampaignPath: join(APP_ROOT, SAMPLE_CAMPAIGN_FILE),
    setDirty: (d) => {
      dirty = d;
      win?.setDocumentEdited(d);
    },
    print: async () => {
      win?.webContents.print({ silent: false, printBackground: true });
    },
  });
  await buildMenu(recent);
  win.on('close', (event) => {
    if (!dirty || !win) return;
    const choice = dialog.showMessageBoxSync(win, {
      type: 'question',
      buttons: ['Discard changes and close', 'Cancel'],
      defaultId: 1,
      cancelId: 1,
      message: 'The campaign has unsaved changes.',
      detail: 'Close anyway and lose them?',
    });
    if (choice !== 0) event.preventDefault();
  });
  win.once('ready-to-show', () => win?.show());
  await win.loadURL(`${APP_ORIGIN}/index.html`);
}

/** Serve the renderer build on app://sweepbook/ (see protocol.ts), read by the main process itself. */
function serveAppScheme() {
  protocol.handle(APP_SCHEME, (request) => serveAppFile(request.url, RENDERER_ROOT));
}

protocol.registerSchemesAsPrivileged([{ scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true } }]);
app.enableSandbox();
app.whenReady().then(() => {
  serveAppScheme();
  return createWindow();
});
app.on('window-all-closed', () => app.quit());
