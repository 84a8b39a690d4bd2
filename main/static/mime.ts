// MIME types for the files the renderer build contains. With nosniff the browser
// trusts these, so module scripts must be served as JavaScript.

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.wav': 'audio/wav',
  '.wasm': 'application/wasm',
};

export const FALLBACK_MIME = 'application/octet-stream';

export function mimeTypeFor(filePath: string): string {
  const dot = filePath.lastIndexOf('.');
  const slash = Math.max(filePath.lastIndexOf('/'), filePath.lastIndexOf('\\'));
  if (dot <= slash + 1) return FALLBACK_MIME;
  return TYPES[filePath.slice(dot).toLowerCase()] ?? FALLBACK_MIME;
}
