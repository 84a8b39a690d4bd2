// Mapping a request path to a file under the served root, shared by both shells.
// Anything that could reach outside the root is refused, not cleaned up.
import path from 'node:path';

export const INDEX_FILE = 'index.html';
/** The page's icon. The page links it; see ALIASES for browsers that ask for /favicon.ico anyway. */
export const ICON_FILE = 'favicon.svg';

/**
 * Request paths answered by another file: '/' by the page, and '/favicon.ico' by the SVG icon,
 * so a browser that asks for the conventional icon path gets our one icon (served under its
 * real name's type, image/svg+xml) rather than a 404 in every log. Both shells resolve through
 * here, so Electron's scheme and the loopback server answer alike.
 */
const ALIASES: Readonly<Record<string, string>> = { '/': INDEX_FILE, '/favicon.ico': ICON_FILE };

/**
 * Absolute file path for a URL pathname (without query), or null when refused:
 * bad percent-encoding, NUL, backslashes, '.' or '..' segments, hidden names, or a
 * result outside `root`. '/' maps to index.html and '/favicon.ico' to favicon.svg.
 */
export function resolveStaticPath(root: string, urlPathname: string): string | null {
  if (!urlPathname.startsWith('/')) return null;
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPathname);
  } catch {
    return null;
  }
  if (decoded.includes('\0') || decoded.includes('\\')) return null;
  const segments = decoded.split('/').slice(1);
  for (const seg of segments) {
    if (seg === '.' || seg === '..' || seg.startsWith('.')) return null;
  }
  const relative = ALIASES[decoded] ?? segments.join('/');
  if (relative === '' || relative.endsWith('/')) return null;
  const base = path.resolve(root);
  const full = path.resolve(base, relative);
  if (!full.startsWith(base + path.sep)) return null;
  return full;
}

/** True when `real` (a symlink-resolved path) still lies under `realRoot`. */
export function isInside(realRoot: string, real: string): boolean {
  return real.startsWith(realRoot + path.sep);
}
