// The browser shell's loopback server. Expectations come from HTTP itself (RFC 9110;
// section numbers from memory) and from the browser rules for cross-origin isolation
// (HTML standard: COOP same-origin + COEP require-corp), named beside each check.
import http from 'node:http';
import { mkdtemp, mkdir, rm, symlink, writeFile } from 'node:fs/promises';
import { networkInterfaces, tmpdir } from 'node:os';
import net from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isAllowedHost, startStaticServer, type StaticServer } from '../../main/browser-shell/server';

interface Reply {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: string;
}

/** A raw request: the path goes on the wire exactly as given (fetch would normalise '..'). */
function request(port: number, rawPath: string, method = 'GET', host = `127.0.0.1:${port}`): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const req = http.request({ host: '127.0.0.1', port, path: rawPath, method, headers: { host } }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (d) => (body += d));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body }));
    });
    req.on('error', reject);
    req.end();
  });
}

const SECRET = 'outside-the-root-secret';
let dir: string;
let server: StaticServer;

beforeAll(async () => {
  dir = await mkdtemp(path.join(tmpdir(), 'qs-server-'));
  const served = path.join(dir, 'served');
  await mkdir(path.join(served, 'sub'), { recursive: true });
  await writeFile(path.join(served, 'index.html'), '<!doctype html><title>t</title>');
  await writeFile(path.join(served, 'app.js'), 'export {};');
  await writeFile(path.join(served, 'styles.css'), 'body{}');
  await writeFile(path.join(served, 'sub', 'data.json'), '{}');
  await writeFile(path.join(served, 'tone.wav'), 'RIFF');
  await writeFile(path.join(served, 'blob.bin'), 'x');
  await writeFile(path.join(served, '.hidden'), SECRET);
  await writeFile(path.join(dir, 'secret.txt'), SECRET);
  await symlink(path.join(dir, 'secret.txt'), path.join(served, 'link.txt'));
  server = await startStaticServer({ root: served, port: 0 });
});

afterAll(async () => {
  await server?.close();
  await rm(dir, { recursive: true, force: true });
});

describe('browser shell server', () => {
  it('serves index.html at / with the isolation and security headers', async () => {
    const r = await request(server.port, '/');
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toBe('text/html; charset=utf-8');
    // Cross-origin isolation needs both headers (HTML standard, "cross-origin isolated").
    expect(r.headers['cross-origin-opener-policy']).toBe('same-origin');
    expect(r.headers['cross-origin-embedder-policy']).toBe('require-corp');
    // MIME sniffing off (Fetch standard, X-Content-Type-Options).
    expect(r.headers['x-content-type-options']).toBe('nosniff');
    expect(r.headers['content-security-policy']).toContain("default-src 'none'");
    expect(r.headers['content-security-policy']).toContain("script-src 'self'");
    expect(r.body).toContain('<title>t</title>');
  });

  it.each([
    ['/app.js', 'text/javascript; charset=utf-8'],
    ['/styles.css', 'text/css; charset=utf-8'],
    ['/sub/data.json', 'application/json; charset=utf-8'],
    ['/tone.wav', 'audio/wav'],
    ['/blob.bin', 'application/octet-stream'],
  ])('serves %s as %s', async (p, type) => {
    // Module scripts must be a JavaScript MIME type (HTML standard, module script fetching).
    const r = await request(server.port, p);
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toBe(type);
  });

  it('answers HEAD with the length and no body (RFC 9110 section 9.3.2)', async () => {
    const r = await request(server.port, '/app.js', 'HEAD');
    expect(r.status).toBe(200);
    expect(r.headers['content-length']).toBe(String('export {};'.length));
    expect(r.body).toBe('');
  });

  it.each(['POST', 'PUT', 'DELETE', 'OPTIONS', 'PATCH'])(
    'refuses %s with 405 and Allow (RFC 9110 section 15.5.6)',
    async (method) => {
      const r = await request(server.port, '/index.html', method);
      expect(r.status).toBe(405);
      expect(r.headers.allow).toBe('GET, HEAD');
    },
  );

  it('answers 404 for a missing file, still with the security headers', async () => {
    const r = await request(server.port, '/nope.js');
    expect(r.status).toBe(404);
    expect(r.headers['x-content-type-options']).toBe('nosniff');
    expect(r.headers['cross-origin-embedder-policy']).toBe('require-corp');
  });

  it.each([
    '/../secret.txt',
    '/sub/../../secret.txt',
    '/%2e%2e/secret.txt',
    '/..%2fsecret.txt',
    '/sub/%2e%2e%2f%2e%2e%2fsecret.txt',
    '/..%5csecret.txt',
    '/%00index.html',
    '/index.html%00.js',
    '/.hidden',
    '/%2ehidden',
    '/link.txt',
    '/sub/',
    '/%zz',
    '//etc/passwd',
  ])('refuses %s (path traversal, hidden files, symlinks out of the root)', async (p) => {
    const r = await request(server.port, p);
    expect(r.status).toBe(404);
    expect(r.body).not.toContain(SECRET);
  });

  it('refuses foreign Host headers (DNS rebinding; 421 per RFC 9110 section 15.5.20)', async () => {
    const r = await request(server.port, '/', 'GET', 'attacker.example');
    expect(r.status).toBe(421);
    expect((await request(server.port, '/', 'GET', `localhost:${server.port}`)).status).toBe(200);
    expect(isAllowedHost(`127.0.0.1:${server.port + 1}`, server.port)).toBe(false);
    expect(isAllowedHost(undefined, server.port)).toBe(false);
  });

  it('listens on 127.0.0.1 only', async () => {
    expect(server.url).toBe(`http://127.0.0.1:${server.port}/`);
    // Any non-loopback IPv4 address of this machine must refuse the connection.
    const external = Object.values(networkInterfaces())
      .flat()
      .find((a) => a && a.family === 'IPv4' && !a.internal)?.address;
    if (external) {
      const connected = await new Promise<boolean>((resolve) => {
        const s = net.connect({ host: external, port: server.port });
        s.once('connect', () => {
          s.destroy();
          resolve(true);
        });
        s.once('error', () => resolve(false));
      });
      expect(connected).toBe(false);
    }
  });

  it('closes promptly with a keep-alive connection open', async () => {
    const extra = await startStaticServer({ root: path.join(dir, 'served'), port: 0 });
    const agent = new http.Agent({ keepAlive: true });
    await new Promise<void>((resolve, reject) => {
      http
        .get({ host: '127.0.0.1', port: extra.port, path: '/', agent }, (res) => {
          res.resume();
          res.on('end', () => resolve());
        })
        .on('error', reject);
    });
    const started = Date.now();
    await extra.close();
    expect(Date.now() - started).toBeLessThan(1000);
    agent.destroy();
  });
});
