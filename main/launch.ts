// `npm start`: the Electron app where Electron's binary is installed, otherwise the same
// renderer served on loopback for a Chromium browser. `--browser` forces the latter.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { startStaticServer, type StaticServer } from './browser-shell/server';
import { findElectronBinary } from './launch/electron-binary';
import { choosePort, PORT_ENV } from './launch/port';

// dist/main/launch.cjs -> repository root.
const appRoot = path.resolve(__dirname, '..', '..');
const rendererRoot = path.join(appRoot, 'dist', 'renderer');

function runElectron(binary: string): void {
  console.log(`Starting Electron: ${binary}`);
  const child = spawn(binary, [appRoot], { stdio: 'inherit' });
  const forward = (signal: NodeJS.Signals) => () => child.kill(signal);
  process.on('SIGINT', forward('SIGINT'));
  process.on('SIGTERM', forward('SIGTERM'));
  child.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
}

async function listen(): Promise<StaticServer> {
  const choice = choosePort(process.env);
  if ('error' in choice) throw new Error(choice.error);
  try {
    return await startStaticServer({ root: rendererRoot, port: choice.port });
  } catch (err) {
    const inUse = (err as NodeJS.ErrnoException).code === 'EADDRINUSE';
    if (inUse && choice.strict)
      throw new Error(`port ${choice.port} (from ${PORT_ENV}) is already in use`, { cause: err });
    if (!inUse) throw err;
    console.log(`Port ${choice.port} is busy; using a free one (set ${PORT_ENV} to choose).`);
    return startStaticServer({ root: rendererRoot, port: 0 });
  }
}

async function runBrowserShell(reason: string | null): Promise<void> {
  const server = await listen();
  if (reason) {
    console.log(`Electron binary not installed here (${reason}).`);
  }
  console.log(`Serving the same renderer at ${server.url} for a Chromium browser, for example:`);
  console.log(`  chromium --app=${server.url}`);
  console.log('Loopback only (127.0.0.1). Press Ctrl-C to stop.');
  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    server.close().then(
      () => {
        console.log('Browser shell stopped.');
        process.exit(0);
      },
      () => process.exit(1),
    );
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

async function main(): Promise<void> {
  if (process.argv.includes('--browser')) return runBrowserShell(null);
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const lookup = findElectronBinary(() => require('electron'));
  if (lookup.found) return runElectron(lookup.path);
  return runBrowserShell(lookup.reason);
}

main().catch((err: unknown) => {
  console.error(`quantiscope: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
