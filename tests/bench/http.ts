/**
 * HTTP benchmarks against a real app process on the test MariaDB instance: autocannon at
 * 1, 10 and 50 connections, p50/p95/p99 latency and throughput.
 */
import autocannon from 'autocannon';
import { spawn } from 'node:child_process';
import path from 'node:path';
import { prepareDatabase } from '../../server/bin/bootstrap.js';
import { ensureClientBuilt } from '../../server/bin/build-client.js';
import { rootDir } from '../../server/config.js';
import { setSequelize } from '../../server/db/current.js';
import { initModels } from '../../server/db/models/index.js';
import { createSequelize, dbTarget } from '../../server/db/sequelize.js';
import { testConfig, testDbDir } from '../setup/env.js';

export interface HttpResult {
  name: string;
  connections: number;
  requests: number;
  throughputPerSec: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  non2xx: number;
}

export async function withBenchServer<T>(fn: (baseUrl: string, token: (email: string) => Promise<string>) => Promise<T>): Promise<T> {
  const config = testConfig('titrata_bench', { PORT: '8190', LOGIN_RATE_LIMIT: '1000000', API_RATE_LIMIT: '10000000' });
  await prepareDatabase(config, { instanceDir: testDbDir, fresh: true });
  // the client first: the server looks for its build when it starts
  await ensureClientBuilt();
  // The app in a process of its own, started as `npm start` starts it (the tsx command; under
  // `node --import tsx` the same server measured half as fast): autocannon here does not share its event loop.
  const child = spawn(process.execPath, [path.join(rootDir, 'node_modules/tsx/dist/cli.mjs'), path.join(rootDir, 'tests/bench/serve.ts')], {
    env: { ...process.env, BENCH_DB_NAME: config.DB_NAME, BENCH_PORT: String(config.PORT) },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  await new Promise<void>((resolve, reject) => {
    child.once('exit', (code) => reject(new Error(`the bench server exited (${code})`)));
    child.stdout!.on('data', (d: Buffer) => d.toString().includes('listening') && resolve());
  });
  // This process's own connection, for the benchmarks that read the database directly.
  const sequelize = createSequelize(dbTarget(config));
  initModels(sequelize);
  setSequelize(sequelize);
  const token = async (email: string) => {
    const res = await fetch(`${config.publicUrl}/api/v1/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: config.DEMO_PASSWORD }) });
    return ((await res.json()) as { token: string }).token;
  };
  try {
    return await fn(config.publicUrl, token);
  } finally {
    child.removeAllListeners('exit');
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGTERM');
    await exited;
    await sequelize.close();
  }
}

/** One autocannon run; p95 is read from the latency histogram's percentiles. */
export async function load(
  name: string,
  opts: { url: string; connections: number; duration?: number; method?: 'GET' | 'POST'; body?: unknown; token?: string; amount?: number; paths?: string[] },
): Promise<HttpResult> {
  let nextPath = 0;
  const latencies: number[] = [];
  const r = await new Promise<autocannon.Result>((resolve, reject) => {
    const inst = autocannon(
      {
    url: opts.url,
    connections: opts.connections,
    duration: opts.amount ? undefined : (opts.duration ?? 5),
    amount: opts.amount,
    method: opts.method ?? 'GET',
    headers: { 'content-type': 'application/json', ...(opts.token ? { authorization: `Bearer ${opts.token}` } : {}) },
    body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
    // One path per connection when given (each client on its own record), in turn. The client's
    // request list is replaced: `setRequest` would last for its first request only.
    setupClient: opts.paths ? (client: { setRequests: (r: Array<{ path: string }>) => void }) => client.setRequests([{ path: opts.paths![nextPath++ % opts.paths!.length] }]) : undefined,
      },
      (err: unknown, result: autocannon.Result) => (err ? reject(err) : resolve(result)),
    );
    // Every response time, so p95 is exact (autocannon's own table stops at 90 and 97.5).
    inst.on('response', (_client: unknown, _status: number, _bytes: number, ms: number) => latencies.push(ms));
  });
  latencies.sort((a, b) => a - b);
  const pct = (q: number) => (latencies.length ? Math.round(latencies[Math.min(latencies.length - 1, Math.floor(q * latencies.length))] * 10) / 10 : NaN);
  return {
    name,
    connections: opts.connections,
    requests: r.requests.total,
    throughputPerSec: Math.round(r.requests.average),
    p50Ms: pct(0.5),
    p95Ms: pct(0.95),
    p99Ms: pct(0.99),
    non2xx: r.non2xx,
  };
}

export const benchDir = path.join(path.dirname(new URL(import.meta.url).pathname));
