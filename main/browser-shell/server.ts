// The browser shell: dist/renderer served on loopback with the same headers as the
// Electron scheme. Read-only (GET/HEAD), loopback-bound, and it checks the Host header
// so a page from elsewhere cannot read it through DNS rebinding.
import http from 'node:http';
import { readFile, realpath, stat } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import { securityHeaders } from '../security/headers';
import { mimeTypeFor } from '../static/mime';
import { isInside, resolveStaticPath } from '../static/resolve';

export const LOOPBACK_HOST = '127.0.0.1';

export interface StaticServerOptions {
  /** Directory to serve (dist/renderer). */
  root: string;
  /** 0 or absent: an ephemeral port. */
  port?: number;
}

export interface StaticServer {
  readonly url: string;
  readonly port: number;
  close(): Promise<void>;
}

function plain(res: http.ServerResponse, status: number, text: string, extra: Record<string, string> = {}) {
  const body = Buffer.from(`${text}\n`, 'utf8');
  res.writeHead(status, {
    ...securityHeaders(),
    'Content-Type': 'text/plain; charset=utf-8',
    'Content-Length': String(body.length),
    ...extra,
  });
  res.end(res.req.method === 'HEAD' ? undefined : body);
}

/** Host header values we answer to: the loopback address or localhost, on our port. */
export function isAllowedHost(host: string | undefined, port: number): boolean {
  return host === `${LOOPBACK_HOST}:${port}` || host === `localhost:${port}`;
}

async function serveFile(res: http.ServerResponse, realRoot: string, file: string): Promise<void> {
  let real: string;
  try {
    real = await realpath(file);
  } catch {
    return plain(res, 404, 'not found');
  }
  if (!isInside(realRoot, real)) return plain(res, 404, 'not found');
  const info = await stat(real);
  if (!info.isFile()) return plain(res, 404, 'not found');
  const body = await readFile(real);
  res.writeHead(200, {
    ...securityHeaders(),
    'Content-Type': mimeTypeFor(real),
    'Content-Length': String(body.length),
  });
  res.end(res.req.method === 'HEAD' ? undefined : body);
}

export async function startStaticServer(options: StaticServerOptions): Promise<StaticServer> {
  const realRoot = await realpath(options.root);
  let port = 0;
  const server = http.createServer((req, res) => {
    if (req.method !== 'GET' && req.method !== 'HEAD') {
      return plain(res, 405, 'method not allowed', { Allow: 'GET, HEAD' });
    }
    if (!isAllowedHost(req.headers.host, port)) return plain(res, 421, 'misdirected request');
    const pathname = (req.url ?? '').split('?')[0].split('#')[0];
    const file = resolveStaticPath(realRoot, pathname);
    if (!file) return plain(res, 404, 'not found');
    serveFile(res, realRoot, file).catch(() => {
      if (!res.headersSent) plain(res, 500, 'internal error');
      else res.destroy();
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, LOOPBACK_HOST, () => {
      server.off('error', reject);
      resolve();
    });
  });
  port = (server.address() as AddressInfo).port;
  return {
    url: `http://${LOOPBACK_HOST}:${port}/`,
    port,
    close: () =>
      new Promise<void>((resolve, reject) => {
        server.close((err) => (err ? reject(err) : resolve()));
        server.closeAllConnections();
      }),
  };
}
