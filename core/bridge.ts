// The contract between the renderer and the shell that hosts it (Electron or the
// browser shell). Types only: both sides import from here, neither from the other.

export type ShellKind = 'electron' | 'browser';

export interface AppInfo {
  /** The package version the running build was made from. */
  version: string;
  shell: ShellKind;
}

/** What the renderer may ask of its shell. Every call is asynchronous (IPC in Electron). */
export interface ShellBridge {
  appInfo(): Promise<AppInfo>;
}

/** Name of the global the Electron preload exposes the bridge under. */
export type BridgeGlobalName = 'quantiscopeShell';
