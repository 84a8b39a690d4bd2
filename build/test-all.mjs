// `npm test`: typecheck, lint (eslint + prettier --check), build, then every vitest test.
// Each static step counts as one test. The last line is always `tests: N passed, N failed`.
import { spawn } from 'node:child_process';
import { mkdir, readFile, rm } from 'node:fs/promises';
import path from 'node:path';
import { buildAll } from './build.mjs';
import { root, runCheck } from './checks.mjs';

const reportFile = path.join(root, 'test-output', 'vitest-report.json');
let passed = 0;
let failed = 0;
const failures = [];

function record(name, ok, seconds, output = '') {
  if (ok) passed++;
  else {
    failed++;
    failures.push(name);
  }
  console.log(`${ok ? 'PASS' : 'FAIL'} ${name} (${seconds.toFixed(1)} s)`);
  if (!ok && output.trim()) console.log(output.trimEnd().replace(/^/gm, '  '));
}

async function timed(fn) {
  const t = performance.now();
  const value = await fn();
  return { value, seconds: (performance.now() - t) / 1000 };
}

// The three static checks run side by side; their output is printed once each is done.
const checks = await Promise.all(
  ['typecheck', 'eslint', 'prettier'].map((name) => timed(() => runCheck(name, { capture: true }))),
);
for (const { value, seconds } of checks) record(value.name, value.ok, seconds, value.output);

const built = await timed(async () => {
  try {
    await buildAll();
    return { ok: true, output: '' };
  } catch (err) {
    return { ok: false, output: err instanceof Error ? err.message : String(err) };
  }
});
record('build', built.value.ok, built.seconds, built.value.output);

await mkdir(path.dirname(reportFile), { recursive: true });
await rm(reportFile, { force: true });
const vitestCode = await new Promise((resolve) => {
  const child = spawn(
    process.execPath,
    [
      path.join(root, 'node_modules/vitest/vitest.mjs'),
      'run',
      '--config',
      'test/vitest.config.ts',
      '--reporter=default',
      '--reporter=json',
      `--outputFile.json=${reportFile}`,
    ],
    { cwd: root, stdio: 'inherit' },
  );
  child.on('error', () => resolve(1));
  child.on('close', (code) => resolve(code ?? 1));
});

let report;
try {
  report = JSON.parse(await readFile(reportFile, 'utf8'));
} catch {
  report = null;
}

if (!report) {
  failed++;
  failures.push('vitest (no JSON report)');
} else {
  passed += report.numPassedTests;
  failed += report.numFailedTests;
  for (const file of report.testResults ?? []) {
    const rel = path.relative(root, file.name);
    // A file that fails to load has no test results of its own but must still count.
    if (file.status === 'failed' && (file.assertionResults ?? []).length === 0) {
      failed++;
      failures.push(`${rel} (did not load: ${String(file.message ?? '').split('\n')[0]})`);
    }
    for (const t of file.assertionResults ?? []) {
      if (t.status === 'failed') failures.push(`${rel} > ${t.fullName}`);
      // House rule: no skipped or todo tests.
      if (t.status === 'pending' || t.status === 'skipped' || t.status === 'todo') {
        failed++;
        failures.push(`${rel} > ${t.fullName} (${t.status}: skipped and todo tests are not allowed)`);
      }
    }
  }
  if (vitestCode !== 0 && failures.length === 0) {
    failed++;
    failures.push(`vitest exited with code ${vitestCode}`);
  }
  console.log(
    `vitest: ${report.numTotalTestSuites} suites in ${report.testResults.length} files, ` +
      `${report.numPassedTests} passed, ${report.numFailedTests} failed`,
  );
}

if (failures.length) {
  console.log('Failed:');
  for (const f of failures) console.log(`  ${f}`);
}
console.log(`tests: ${passed} passed, ${failed} failed`);
process.exitCode = failed > 0 ? 1 : 0;
