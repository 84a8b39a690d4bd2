// Sandboxed preload: exposes the shell bridge (core/bridge.ts) to the page. Nothing
// but these calls crosses; the page never sees ipcRenderer itself.
import { contextBridge, ipcRenderer } from 'electron';
import type { AppInfo, BridgeGlobalName, ShellBridge } from '../core/bridge';
import { IPC_CHANNELS } from './ipc/channels';

const bridge: ShellBridge = {
  appInfo: () => ipcRenderer.invoke(IPC_CHANNELS.appInfo) as Promise<AppInfo>,
};

const name: BridgeGlobalName = 'quantiscopeShell';
contextBridge.exposeInMainWorld(name, bridge);
