// The browser shell's port: QUANTISCOPE_PORT when set (exactly that, or fail), else a
// fixed default so the URL can be bookmarked, falling back to any free port.

export const DEFAULT_PORT = 5178;
export const PORT_ENV = 'QUANTISCOPE_PORT';

export type PortChoice = { port: number; strict: boolean } | { error: string };

export function choosePort(env: Record<string, string | undefined>): PortChoice {
  const raw = env[PORT_ENV];
  if (raw === undefined || raw === '') return { port: DEFAULT_PORT, strict: false };
  if (!/^\d+$/.test(raw)) return { error: `${PORT_ENV}=${raw} is not a port number` };
  const port = Number(raw);
  if (port > 65535) return { error: `${PORT_ENV}=${raw} is above 65535` };
  return { port, strict: true };
}
