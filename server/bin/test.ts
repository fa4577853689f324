/**
 * `npm test`: its own MariaDB instance (TEST_DB_PORT, default 3407, under .data/test-db),
 * then every layer in turn — unit, API against the real database, browser — and one
 * summary line. Exits non-zero when anything failed.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { rootDir } from '../config.js';
import { startInstance, stopInstance } from './mariadb.js';
import { testDbDir, testDbPort, testOutputDir } from '../../tests/setup/env.js';

const say = (m: string) => console.log(`[titrata test] ${m}`);
const layers = (process.env.TEST_LAYERS ?? 'types,unit,api,e2e').split(',').filter(Boolean);

interface Counts { passed: number; failed: number; skipped: number; }

/** The typecheck of client, server, shared and tests (vue-tsc), counted as one check. */
function typecheck(): Promise<{ code: number; counts: Counts }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [path.join(rootDir, 'node_modules/vue-tsc/bin/vue-tsc.js'), '--noEmit', '-p', 'tsconfig.json'], { cwd: rootDir, stdio: 'inherit' });
    child.on('exit', (code) => {
      say(code === 0 ? 'typecheck: no errors' : 'typecheck: errors above');
      resolve({ code: code ?? 1, counts: { passed: code === 0 ? 1 : 0, failed: code === 0 ? 0 : 1, skipped: 0 } });
    });
  });
}

function vitest(project: string, extraArgs: string[]): Promise<{ code: number; counts: Counts }> {
  const out = path.join(testOutputDir, `vitest-${project}.json`);
  rmSync(out, { force: true });
  return new Promise((resolve) => {
    const child = spawn(
      process.execPath,
      [path.join(rootDir, 'node_modules/vitest/vitest.mjs'), 'run', '--project', project, '--reporter=default', '--reporter=json', `--outputFile.json=${out}`, ...extraArgs],
      { cwd: rootDir, stdio: 'inherit', env: { ...process.env, TEST_DB_PORT: String(testDbPort) } },
    );
    child.on('exit', (code) => {
      let counts: Counts = { passed: 0, failed: 0, skipped: 0 };
      if (existsSync(out)) {
        const r = JSON.parse(readFileSync(out, 'utf8'));
        counts = { passed: r.numPassedTests ?? 0, failed: (r.numFailedTests ?? 0) + (r.numRuntimeErrorTestSuites ?? 0), skipped: (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0) };
        if (code !== 0 && counts.failed === 0) counts.failed = 1;
      } else if (code !== 0) counts.failed = 1;
      resolve({ code: code ?? 1, counts });
    });
  });
}

async function main() {
  const t0 = Date.now();
  mkdirSync(testOutputDir, { recursive: true });
  const needsDb = layers.some((l) => l === 'api' || l === 'e2e') && !process.env.TEST_DB_HOST;
  const instance = needsDb ? await startInstance({ dir: testDbDir, port: testDbPort }) : undefined;
  if (instance) say(`test MariaDB on 127.0.0.1:${testDbPort} (${instance.startedHere ? 'started' : 'already running'})`);

  const total: Counts = { passed: 0, failed: 0, skipped: 0 };
  let failedLayers: string[] = [];
  try {
    for (const layer of layers) {
      say(`layer: ${layer}`);
      const { code, counts } = layer === 'types' ? await typecheck() : await vitest(layer, process.argv.slice(2));
      total.passed += counts.passed;
      total.failed += counts.failed;
      total.skipped += counts.skipped;
      if (code !== 0) failedLayers.push(layer);
    }
  } finally {
    if (instance?.startedHere && !process.env.KEEP_TEST_DB) await stopInstance(instance);
  }
  const secs = ((Date.now() - t0) / 1000).toFixed(0);
  say(`layers ${layers.join(', ')} in ${secs} s${failedLayers.length ? `; failed: ${failedLayers.join(', ')}` : ''}`);
  console.log(`${total.passed} passed, ${total.failed} failed, ${total.skipped} skipped`);
  process.exit(failedLayers.length || total.failed ? 1 : 0);
}

main().catch((err) => {
  console.error(err);
  console.log('0 passed, 1 failed');
  process.exit(1);
});
