// Which permission requests the Electron shell grants: the microphone, to our own
// page, and nothing else (no camera, no notifications, no other origin).

export const APP_SCHEME = 'quantiscope';
export const APP_HOST = 'app';
export const APP_ORIGIN = `${APP_SCHEME}://${APP_HOST}`;

/** Origin of a URL, or null when it does not parse. */
export function originOf(url: string): string | null {
  try {
    const u = new URL(url);
    // Custom standard schemes report origin 'null' in some runtimes; build it ourselves.
    return `${u.protocol}//${u.host}`;
  } catch {
    return null;
  }
}

export function isAppUrl(url: string): boolean {
  return originOf(url) === APP_ORIGIN;
}

export interface PermissionAsk {
  permission: string;
  /** URL (or origin) of the frame asking. */
  requestingUrl: string;
  /** For 'media': the kinds asked for, when the runtime says. */
  mediaTypes?: readonly string[];
}

/** Microphone only: 'media' from our origin, asking for audio and nothing else (unsaid kinds are refused). */
export function isPermissionGranted(ask: PermissionAsk): boolean {
  if (ask.permission !== 'media') return false;
  if (!isAppUrl(ask.requestingUrl)) return false;
  const kinds = ask.mediaTypes;
  return kinds !== undefined && kinds.length > 0 && kinds.every((t) => t === 'audio');
}

/** Page navigation away from the loaded page is never allowed; nor are new windows. */
export function isNavigationAllowed(_targetUrl: string): boolean {
  return false;
}
