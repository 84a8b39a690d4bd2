// The renderer's side of core/bridge.ts: the Electron preload's object when it is
// there, otherwise the browser shell's own implementation.
import type { AppInfo, BridgeGlobalName, ShellBridge } from '../core/bridge';

// Set by build/build.mjs from package.json.
declare const __QUANTISCOPE_VERSION__: string;

const BRIDGE_GLOBAL: BridgeGlobalName = 'quantiscopeShell';

const browserBridge: ShellBridge = {
  appInfo: async (): Promise<AppInfo> => ({
    version: typeof __QUANTISCOPE_VERSION__ === 'string' ? __QUANTISCOPE_VERSION__ : 'dev',
    shell: 'browser',
  }),
};

function isBridge(value: unknown): value is ShellBridge {
  return typeof value === 'object' && value !== null && typeof (value as ShellBridge).appInfo === 'function';
}

export function pickBridge(scope: object = globalThis): ShellBridge {
  const exposed = (scope as Partial<Record<BridgeGlobalName, unknown>>)[BRIDGE_GLOBAL];
  return isBridge(exposed) ? exposed : browserBridge;
}
