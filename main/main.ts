// Electron main process: a thin shell. Every decision lives in a small pure module
// (security/, static/, ipc/) that the tests check in Node; this file only wires them.
import { app, BrowserWindow, ipcMain, protocol, session, type WebContents } from 'electron';
import { readFile, realpath } from 'node:fs/promises';
import path from 'node:path';
import type { AppInfo } from '../core/bridge';
import { IPC_CHANNELS, type IpcChannel } from './ipc/channels';
import { checkCall } from './ipc/validate';
import { securityHeaders } from './security/headers';
import {
  APP_HOST,
  APP_ORIGIN,
  APP_SCHEME,
  isNavigationAllowed,
  isPermissionGranted,
} from './security/permissions';
import { mimeTypeFor } from './static/mime';
import { isInside, resolveStaticPath } from './static/resolve';

const rendererRoot = path.join(__dirname, '..', 'renderer');

// Must run before 'ready'. standard + secure give the page a real origin and a secure
// context (AudioWorklet, cross-origin isolation); supportFetchAPI lets it fetch its files.
protocol.registerSchemesAsPrivileged([
  { scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true, stream: true } },
]);

function textResponse(status: number, text: string): Response {
  return new Response(`${text}\n`, {
    status,
    headers: { ...securityHeaders(), 'Content-Type': 'text/plain; charset=utf-8' },
  });
}

async function serveApp(request: Request): Promise<Response> {
  if (request.method !== 'GET' && request.method !== 'HEAD') return textResponse(405, 'method not allowed');
  const url = new URL(request.url);
  if (url.host !== APP_HOST) return textResponse(404, 'not found');
  const file = resolveStaticPath(rendererRoot, url.pathname);
  if (!file) return textResponse(404, 'not found');
  try {
    const realRoot = await realpath(rendererRoot);
    const real = await realpath(file);
    if (!isInside(realRoot, real)) return textResponse(404, 'not found');
    const body = await readFile(real);
    return new Response(request.method === 'HEAD' ? null : body, {
      status: 200,
      headers: { ...securityHeaders(), 'Content-Type': mimeTypeFor(real) },
    });
  } catch {
    return textResponse(404, 'not found');
  }
}

function lockDown(contents: WebContents): void {
  contents.on('will-navigate', (event, url) => {
    if (!isNavigationAllowed(url)) event.preventDefault();
  });
  contents.on('will-redirect', (event, url) => {
    if (!isNavigationAllowed(url)) event.preventDefault();
  });
  contents.on('will-attach-webview', (event) => event.preventDefault());
  contents.setWindowOpenHandler(() => ({ action: 'deny' }));
}

/** Every IPC handler goes through here: known channel, our own page, a valid payload. */
function handleChecked(channel: IpcChannel, handler: () => unknown): void {
  ipcMain.handle(channel, (event, ...args: unknown[]) => {
    const frame = event.senderFrame;
    const checked = checkCall(channel, frame?.url, args, frame !== null && frame.parent === null);
    if (!checked.ok) throw new Error(checked.error);
    return handler();
  });
}

function registerIpc(): void {
  handleChecked(IPC_CHANNELS.appInfo, (): AppInfo => ({ version: app.getVersion(), shell: 'electron' }));
}

function createWindow(): void {
  const win = new BrowserWindow({
    width: 1280,
    height: 800,
    title: 'Quantiscope',
    backgroundColor: '#f4f1ea',
    webPreferences: {
      preload: path.join(__dirname, 'preload.cjs'),
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
      spellcheck: false,
    },
  });
  void win.loadURL(`${APP_ORIGIN}/index.html`);
}

app.on('web-contents-created', (_event, contents) => lockDown(contents));

app.on('window-all-closed', () => app.quit());

void app.whenReady().then(() => {
  protocol.handle(APP_SCHEME, serveApp);
  const ses = session.defaultSession;
  ses.setPermissionRequestHandler((_contents, permission, callback, details) => {
    const mediaTypes = 'mediaTypes' in details ? details.mediaTypes : undefined;
    callback(isPermissionGranted({ permission, requestingUrl: details.requestingUrl, mediaTypes }));
  });
  ses.setPermissionCheckHandler((_contents, permission, requestingOrigin, details) =>
    isPermissionGranted({
      permission,
      requestingUrl: requestingOrigin,
      mediaTypes: details.mediaType ? [details.mediaType] : undefined,
    }),
  );
  registerIpc();
  createWindow();
});
