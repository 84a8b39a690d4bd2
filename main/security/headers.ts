// Response headers for the renderer, the same from Electron's custom scheme and from the
// loopback server, so the page behaves alike in both shells.

/**
 * Only our own files may load. AudioWorklet modules count as scripts ('self');
 * blob: media is for playing back recordings the page made itself.
 */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'none'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "media-src 'self' blob:",
  "worker-src 'self'",
  "manifest-src 'self'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
  "object-src 'none'",
].join('; ');

/**
 * Headers sent with every response, errors included. COOP + COEP make the page
 * cross-origin isolated, which SharedArrayBuffer needs.
 */
export function securityHeaders(): Record<string, string> {
  return {
    'Content-Security-Policy': CONTENT_SECURITY_POLICY,
    'Cross-Origin-Opener-Policy': 'same-origin',
    'Cross-Origin-Embedder-Policy': 'require-corp',
    'Cross-Origin-Resource-Policy': 'same-origin',
    'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'no-referrer',
    'Permissions-Policy': 'microphone=(self), camera=(), geolocation=(), usb=(), serial=(), hid=()',
    'Cache-Control': 'no-store',
  };
}
