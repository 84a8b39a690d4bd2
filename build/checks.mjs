// The static checks, shared by `npm run typecheck`, `npm run lint` and `npm test`.
// Tools run as `node <their script>` so a missing executable bit cannot break them.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const bin = (p) => path.join(root, 'node_modules', p);

/**
 * Type projects: the whole tree, then each layer with only its own environment's
 * types (core: none; main: Node; renderer: DOM; worklet: none), so a stray API fails.
 */
export const TYPE_PROJECTS = [
  'tsconfig.json',
  'core/tsconfig.json',
  'main/tsconfig.json',
  'renderer/tsconfig.json',
  'renderer/audio/worklet/tsconfig.json',
];

export const CHECKS = {
  typecheck: TYPE_PROJECTS.map((p) => [bin('typescript/bin/tsc'), '-p', p, '--noEmit', '--pretty', 'false']),
  eslint: [[bin('eslint/bin/eslint.js'), '-c', 'build/eslint.config.mjs', '.']],
  prettier: [[bin('prettier/bin/prettier.cjs'), '--check', '.', '--log-level', 'warn']],
};

function runNode(args, capture) {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, args, {
      cwd: root,
      stdio: capture ? ['ignore', 'pipe', 'pipe'] : 'inherit',
    });
    let output = '';
    if (capture) {
      child.stdout.on('data', (d) => (output += d));
      child.stderr.on('data', (d) => (output += d));
    }
    child.on('error', (err) => resolve({ code: 1, output: output + String(err) }));
    child.on('close', (code) => resolve({ code: code ?? 1, output }));
  });
}

/** Runs one named check; `ok` is true when every command in it exited 0. */
export async function runCheck(name, { capture = false } = {}) {
  let ok = true;
  let output = '';
  for (const args of CHECKS[name]) {
    const r = await runNode(args, capture);
    ok &&= r.code === 0;
    output += r.output;
  }
  return { name, ok, output };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  // node build/checks.mjs typecheck | lint
  const wanted = process.argv[2] === 'lint' ? ['eslint', 'prettier'] : [process.argv[2] ?? 'typecheck'];
  let failed = false;
  for (const name of wanted) {
    if (!(name in CHECKS)) {
      console.error(`unknown check ${name}`);
      process.exit(2);
    }
    const r = await runCheck(name);
    if (!r.ok) failed = true;
    console.log(`${name}: ${r.ok ? 'ok' : 'FAILED'}`);
  }
  process.exitCode = failed ? 1 : 0;
}
