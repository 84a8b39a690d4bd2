// The Electron shell's security decisions, checked in Node without Electron.
// Sources: Electron's security checklist (electronjs.org "Security" documentation: context
// isolation, sandbox, permission handlers, navigation and new-window limits, IPC sender
// validation; from memory) and the CSP Level 3 / HTML standards where named.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { CONTENT_SECURITY_POLICY, securityHeaders } from '../../main/security/headers';
import {
  APP_ORIGIN,
  isAppUrl,
  isNavigationAllowed,
  isPermissionGranted,
  originOf,
} from '../../main/security/permissions';
import { ALL_IPC_CHANNELS, IPC_CHANNELS } from '../../main/ipc/channels';
import { checkCall, checkSender, isIpcChannel } from '../../main/ipc/validate';

const root = fileURLToPath(new URL('../..', import.meta.url));

function directives(policy: string): Map<string, string> {
  return new Map(
    policy
      .split(';')
      .map((d) => d.trim())
      .filter(Boolean)
      .map((d) => {
        const [name, ...values] = d.split(/\s+/);
        return [name, values.join(' ')] as [string, string];
      }),
  );
}

describe('content security policy', () => {
  const csp = directives(CONTENT_SECURITY_POLICY);

  it("denies by default and allows scripts only from 'self' (no inline, no eval)", () => {
    // CSP Level 3: default-src is the fallback of every fetch directive.
    expect(csp.get('default-src')).toBe("'none'");
    expect(csp.get('script-src')).toBe("'self'");
    expect(CONTENT_SECURITY_POLICY).not.toMatch(/unsafe-inline|unsafe-eval|\*/);
    expect(csp.get('object-src')).toBe("'none'");
    expect(csp.get('base-uri')).toBe("'none'");
    expect(csp.get('frame-ancestors')).toBe("'none'");
  });

  it('the page carries the same policy in a meta tag (frame-ancestors is ignored there, CSP Level 3)', () => {
    const html = readFileSync(path.join(root, 'renderer/index.html'), 'utf8');
    const meta = /http-equiv="Content-Security-Policy"\s+content="([^"]+)"/.exec(html);
    expect(meta).not.toBeNull();
    const fromMeta = directives(meta![1]);
    const expected = new Map(csp);
    expected.delete('frame-ancestors');
    expect(fromMeta).toEqual(expected);
  });

  it('sends the cross-origin isolation pair and nosniff with every response', () => {
    const h = securityHeaders();
    // HTML standard: COOP same-origin + COEP require-corp make a document cross-origin isolated.
    expect(h['Cross-Origin-Opener-Policy']).toBe('same-origin');
    expect(h['Cross-Origin-Embedder-Policy']).toBe('require-corp');
    expect(h['X-Content-Type-Options']).toBe('nosniff');
    expect(h['Content-Security-Policy']).toBe(CONTENT_SECURITY_POLICY);
    // Fresh objects, so a caller adding a header cannot change the next response.
    expect(securityHeaders()).not.toBe(h);
  });
});

describe('permissions', () => {
  const page = `${APP_ORIGIN}/index.html`;

  it('grants the microphone to our own page', () => {
    expect(isPermissionGranted({ permission: 'media', requestingUrl: page, mediaTypes: ['audio'] })).toBe(
      true,
    );
    expect(
      isPermissionGranted({ permission: 'media', requestingUrl: `${APP_ORIGIN}/`, mediaTypes: ['audio'] }),
    ).toBe(true);
  });

  it.each([
    ['media', 'https://example.com/', ['audio']],
    ['media', 'http://127.0.0.1:5178/', ['audio']],
    ['media', 'file:///etc/passwd', ['audio']],
    ['media', 'quantiscope://other/index.html', ['audio']],
    ['media', 'not a url', ['audio']],
    ['media', page, ['video']],
    ['media', page, ['audio', 'video']],
    ['media', page, undefined],
    ['media', page, []],
    ['notifications', page, undefined],
    ['geolocation', page, undefined],
    ['clipboard-read', page, undefined],
    ['openExternal', page, undefined],
    ['midi', page, undefined],
  ])('denies %s for %s (%j)', (permission, requestingUrl, mediaTypes) => {
    expect(isPermissionGranted({ permission, requestingUrl, mediaTypes })).toBe(false);
  });

  it('reads origins of our custom scheme', () => {
    expect(originOf(page)).toBe(APP_ORIGIN);
    expect(originOf('::')).toBeNull();
    expect(isAppUrl('quantiscope://app.evil/x')).toBe(false);
  });

  it('never allows navigation, to anywhere', () => {
    for (const url of [page, 'https://example.com/', 'file:///', 'javascript:alert(1)']) {
      expect(isNavigationAllowed(url)).toBe(false);
    }
  });
});

describe('IPC validation', () => {
  const page = `${APP_ORIGIN}/index.html`;

  it('knows exactly the channels on the one list', () => {
    expect(ALL_IPC_CHANNELS).toEqual(Object.values(IPC_CHANNELS));
    expect(new Set(ALL_IPC_CHANNELS).size).toBe(ALL_IPC_CHANNELS.length);
    expect(isIpcChannel(IPC_CHANNELS.appInfo)).toBe(true);
    expect(isIpcChannel('quantiscope:shell-exec')).toBe(false);
    expect(isIpcChannel(42)).toBe(false);
  });

  it('accepts a well-formed call from our page', () => {
    expect(checkCall(IPC_CHANNELS.appInfo, page, [])).toEqual({ ok: true, value: undefined });
  });

  it('refuses unknown channels, foreign senders and bad payloads, saying why', () => {
    const unknown = checkCall('quantiscope:read-file', page, []);
    expect(unknown).toMatchObject({ ok: false, error: expect.stringContaining('unknown channel') });
    for (const sender of ['https://example.com/', 'file:///x.html', undefined, '']) {
      const r = checkCall(IPC_CHANNELS.appInfo, sender, []);
      expect(r).toMatchObject({ ok: false, error: expect.stringContaining('not the app page') });
    }
    const extra = checkCall(IPC_CHANNELS.appInfo, page, [{ path: '/etc/passwd' }]);
    expect(extra).toMatchObject({ ok: false, error: expect.stringContaining('takes no arguments') });
    expect(checkSender(page).ok).toBe(true);
    expect(checkCall(IPC_CHANNELS.appInfo, page, [], false)).toMatchObject({
      ok: false,
      error: expect.stringContaining('subframe'),
    });
  });
});
