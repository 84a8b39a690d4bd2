// Path resolution and MIME types shared by both shells; the launcher's small decisions.
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { mimeTypeFor, FALLBACK_MIME } from '../../main/static/mime';
import { isInside, resolveStaticPath } from '../../main/static/resolve';
import { choosePort, DEFAULT_PORT } from '../../main/launch/port';
import { findElectronBinary } from '../../main/launch/electron-binary';

const root = path.resolve('/srv/renderer');

describe('resolveStaticPath', () => {
  it('maps paths under the root and / to index.html', () => {
    expect(resolveStaticPath(root, '/')).toBe(path.join(root, 'index.html'));
    expect(resolveStaticPath(root, '/app.js')).toBe(path.join(root, 'app.js'));
    expect(resolveStaticPath(root, '/a/b%20c.css')).toBe(path.join(root, 'a', 'b c.css'));
  });

  it('answers the conventional /favicon.ico with the SVG icon, in both shells', () => {
    // Browsers ask for /favicon.ico when a page names no icon (common practice, no source).
    expect(resolveStaticPath(root, '/favicon.ico')).toBe(path.join(root, 'favicon.svg'));
    expect(resolveStaticPath(root, '/favicon.svg')).toBe(path.join(root, 'favicon.svg'));
    expect(resolveStaticPath(root, '/sub/favicon.ico')).toBe(path.join(root, 'sub', 'favicon.ico'));
  });

  it.each([
    '',
    'app.js',
    '/..',
    '/../x',
    '/a/../../x',
    '/%2e%2e/x',
    '/a%2f..%2f..%2fx',
    '/a\\..\\x',
    '/%5c..%5cx',
    '/x%00.js',
    '/.env',
    '/a/./b',
    '/dir/',
    '/%E0%A4%A',
    '//etc/passwd',
  ])('refuses %j', (p) => {
    expect(resolveStaticPath(root, p)).toBeNull();
  });

  it('isInside compares whole path segments, not prefixes', () => {
    expect(isInside(root, path.join(root, 'x'))).toBe(true);
    expect(isInside(root, `${root}-other${path.sep}x`)).toBe(false);
    expect(isInside(root, root)).toBe(false);
  });
});

describe('mimeTypeFor', () => {
  it.each([
    // IANA media types; text/javascript per RFC 9239 (from memory).
    ['index.html', 'text/html; charset=utf-8'],
    ['app.js', 'text/javascript; charset=utf-8'],
    ['worklet.mjs', 'text/javascript; charset=utf-8'],
    ['s.CSS', 'text/css; charset=utf-8'],
    ['app.js.map', 'application/json; charset=utf-8'],
    ['a.wav', 'audio/wav'],
    // SVG's registered type (SVG 1.1, W3C, appendix on the media type; from memory).
    ['favicon.svg', 'image/svg+xml'],
    ['a.wasm', 'application/wasm'],
    ['noext', FALLBACK_MIME],
    ['.hidden', FALLBACK_MIME],
    ['dir.d/file', FALLBACK_MIME],
  ])('%s -> %s', (file, type) => {
    expect(mimeTypeFor(file)).toBe(type);
  });
});

describe('launcher', () => {
  it('chooses the port from QUANTISCOPE_PORT, else the default with fallback', () => {
    expect(choosePort({})).toEqual({ port: DEFAULT_PORT, strict: false });
    expect(choosePort({ QUANTISCOPE_PORT: '9123' })).toEqual({ port: 9123, strict: true });
    expect(choosePort({ QUANTISCOPE_PORT: '0' })).toEqual({ port: 0, strict: true });
    expect(choosePort({ QUANTISCOPE_PORT: 'http' })).toHaveProperty('error');
    expect(choosePort({ QUANTISCOPE_PORT: '70000' })).toHaveProperty('error');
  });

  it('finds Electron only when the package gives an existing executable', () => {
    const throwing = () => {
      throw new Error('Electron failed to install correctly');
    };
    expect(findElectronBinary(throwing)).toMatchObject({ found: false });
    expect(
      findElectronBinary(
        () => '/nowhere/electron',
        () => false,
      ),
    ).toMatchObject({ found: false });
    expect(
      findElectronBinary(
        () => ({}),
        () => true,
      ),
    ).toMatchObject({ found: false });
    expect(
      findElectronBinary(
        () => '/opt/electron',
        () => true,
      ),
    ).toEqual({ found: true, path: '/opt/electron' });
    // The real package, as installed with install scripts off: its index.js throws when
    // path.txt (written by the download step) is missing; otherwise it names the binary.
    const load = () => createRequire(import.meta.url)('electron') as unknown;
    const downloaded = existsSync(
      path.join(path.dirname(createRequire(import.meta.url).resolve('electron')), 'path.txt'),
    );
    expect(findElectronBinary(load).found).toBe(downloaded);
  });
});
