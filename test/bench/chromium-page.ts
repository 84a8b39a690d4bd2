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

/**
 * The child: serves the page, opens it, runs the script (an async function body) in it, prints its JSON.
 * The script may call two helpers the child exposes on the page:
 *  - qsCpuSeconds(): CPU time (user + system) so far of the browser and every process under it, from
 *    /proc/PID/stat, in seconds; processes that ended meanwhile drop out, so read it in pairs.
 *  - qsBlankShare(): with blankSeconds > 0, the browser's CPU share of one core (0..1) over that
 *    many seconds on about:blank before the page was opened: the browser's own floor.
 *  - qsHide(hidden): brings a blank tab to the front (the page becomes hidden, as when a user switches
 *    tabs or minimises) or the page back.
 */
const CHILD = String.raw`
import http from 'node:http';
import { readFile, readdir } from 'node:fs/promises';
import { execFileSync } from 'node:child_process';
import path from 'node:path';
const [root, exe, flags, script, viewport, blankSeconds] = JSON.parse(process.argv[1]);
const tick = Number(execFileSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).trim()) || 100;
async function treeSeconds(rootPid) {
  const stats = new Map();
  for (const name of await readdir('/proc')) {
    if (!/^[0-9]+$/.test(name)) continue;
    try {
      const text = await readFile('/proc/' + name + '/stat', 'utf8');
      // Fields after the command name, which is in parentheses and may hold spaces (proc(5)).
      const f = text.slice(text.lastIndexOf(')') + 2).split(' ');
      stats.set(Number(name), { ppid: Number(f[1]), ticks: Number(f[11]) + Number(f[12]) });
    } catch {}
  }
  let total = 0;
  const todo = [rootPid];
  while (todo.length) {
    const pid = todo.pop();
    const s = stats.get(pid);
    if (s) total += s.ticks;
    for (const [child, c] of stats) if (c.ppid === pid) todo.push(child);
  }
  return total / tick;
}
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
  const page = await browser.newPage({ viewport });
  const pid = browser.process()?.pid;
  await page.exposeFunction('qsCpuSeconds', () => (pid ? treeSeconds(pid) : Promise.reject(new Error('no browser pid'))));
  let blankShare = null;
  if (blankSeconds > 0 && pid) {
    await page.goto('about:blank');
    await new Promise((r) => setTimeout(r, 1000));
    const t0 = performance.now();
    const c0 = await treeSeconds(pid);
    await new Promise((r) => setTimeout(r, blankSeconds * 1000));
    blankShare = ((await treeSeconds(pid)) - c0) / ((performance.now() - t0) / 1000);
  }
  await page.exposeFunction('qsBlankShare', () => blankShare);
  let blank = null;
  await page.exposeFunction('qsHide', async (hidden) => {
    if (hidden) {
      blank ??= await browser.newPage({ viewport });
      await blank.bringToFront();
    } else await page.bringToFront();
    return page.evaluate(() => document.visibilityState);
  });
  await page.goto('http://127.0.0.1:' + server.address().port + '/');
  await page.waitForSelector('body[data-ready="true"]', { timeout: 20000 });
  const r = await page.evaluate('(async () => {' + script + '})()');
  console.log(JSON.stringify(r));
} finally {
  await browser.close();
  server.close();
}
`;

export interface PageRun {
  viewport?: { width: number; height: number };
  timeoutMs?: number;
  /** Seconds on about:blank first, measuring the browser's own CPU floor (see qsBlankShare). */
  blankSeconds?: number;
}

/** Runs `script` (the body of an async function, evaluated in the page) and returns its result. */
export function runInPage<T>(script: string, run: PageRun = {}): T {
  const viewport = run.viewport ?? { width: 1280, height: 800 };
  const timeoutMs = run.timeoutMs ?? 300_000;
  const here = path.dirname(fileURLToPath(import.meta.url));
  // Bundled, this module runs from dist/bench/; the build puts the page in dist/renderer/.
  const root = path.resolve(here, '..', 'renderer');
  const repo = path.resolve(here, '..', '..');
  if (!existsSync(path.join(root, 'index.html')))
    throw new Error(`no built renderer in ${root}: run the build`);
  const out = execFileSync(
    process.execPath,
    [
      '--input-type=module',
      '-e',
      CHILD,
      JSON.stringify([root, CHROMIUM_PATH, CHROMIUM_FLAGS, script, viewport, run.blankSeconds ?? 0]),
    ],
    { cwd: repo, encoding: 'utf8', timeout: timeoutMs },
  );
  return JSON.parse(out.trim().split('\n').pop()!) as T;
}
