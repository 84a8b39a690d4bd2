// The bench runs in Node and its figures are synchronous, so the browser runs in a child
// process: a loopback server for the built renderer (dist/renderer, with the isolation
// headers the page expects) and Debian's Chromium through playwright-core.
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

// Debian's Chromium, never a download; the browser tests take these from here too (the bench may
// not import the tests, the tests may use the bench's helpers).
export const CHROMIUM_PATH = process.env.QUANTISCOPE_CHROMIUM ?? '/usr/bin/chromium';
/** Flags that work headless as root on these machines (no GPU, no network services). */
export const CHROMIUM_FLAGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--autoplay-policy=no-user-gesture-required',
];

/** The child: serves the page, opens it, runs PAGE_SCRIPT (an async function body) in it, prints its JSON. */
const CHILD = String.raw`
import http from 'node:http';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
const [root, exe, flags, script] = JSON.parse(process.argv[1]);
const types = { '.html': 'text/html', '.js': 'text/javascript', '.css': 'text/css', '.map': 'application/json', '.svg': 'image/svg+xml' };
const server = http.createServer(async (req, res) => {
  const rel = decodeURIComponent(new URL(req.url, 'http://127.0.0.1').pathname);
  const file = path.join(root, rel.endsWith('/') ? rel + 'index.html' : rel);
  if (!file.startsWith(root)) { res.writeHead(403).end(); return; }
  try {
    const body = await readFile(file);
    res.writeHead(200, {
      'content-type': types[path.extname(file)] ?? 'application/octet-stream',
      'cross-origin-opener-policy': 'same-origin',
      'cross-origin-embedder-policy': 'require-corp',
    });
    res.end(body);
  } catch { res.writeHead(404).end(); }
});
await new Promise((r) => server.listen(0, '127.0.0.1', r));
const { chromium } = await import('playwright-core');
const browser = await chromium.launch({ executablePath: exe, headless: true, args: flags });
try {
  const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
  await page.goto('http://127.0.0.1:' + server.address().port + '/');
  await page.waitForSelector('body[data-ready="true"]', { timeout: 20000 });
  const r = await page.evaluate('(async () => {' + script + '})()');
  console.log(JSON.stringify(r));
} finally {
  await browser.close();
  server.close();
}
`;

/** Runs `script` (the body of an async function, evaluated in the page) and returns its result. */
export function runInPage<T>(script: string, timeoutMs = 300_000): T {
  const here = path.dirname(fileURLToPath(import.meta.url));
  // Bundled, this module runs from dist/bench/; the build puts the page in dist/renderer/.
  const root = path.resolve(here, '..', 'renderer');
  const repo = path.resolve(here, '..', '..');
  if (!existsSync(path.join(root, 'index.html')))
    throw new Error(`no built renderer in ${root}: run the build`);
  const out = execFileSync(
    process.execPath,
    ['--input-type=module', '-e', CHILD, JSON.stringify([root, CHROMIUM_PATH, CHROMIUM_FLAGS, script])],
    { cwd: repo, encoding: 'utf8', timeout: timeoutMs },
  );
  return JSON.parse(out.trim().split('\n').pop()!) as T;
}
