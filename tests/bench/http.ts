/**
 * HTTP benchmarks against a real app process on the test MariaDB instance: autocannon at
 * 1, 10 and 50 connections, p50/p95/p99 latency and throughput.
 */
import autocannon from 'autocannon';
import path from 'node:path';
import { prepareDatabase } from '../../server/bin/bootstrap.js';
import { startServer } from '../../server/index.js';
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
  const app = await startServer(config);
  const token = async (email: string) => {
    const res = await fetch(`${config.publicUrl}/api/v1/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: config.DEMO_PASSWORD }) });
    return ((await res.json()) as { token: string }).token;
  };
  try {
    return await fn(config.publicUrl, token);
  } finally {
    await app.stop();
  }
}

/** One autocannon run; p95 is read from the latency histogram's percentiles. */
export async function load(name: string, opts: { url: string; connections: number; duration?: number; method?: 'GET' | 'POST'; body?: unknown; token?: string; amount?: number }): Promise<HttpResult> {
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
