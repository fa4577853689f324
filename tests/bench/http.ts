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
  const r = await autocannon({
    url: opts.url,
    connections: opts.connections,
    duration: opts.amount ? undefined : (opts.duration ?? 5),
    amount: opts.amount,
    method: opts.method ?? 'GET',
    headers: { 'content-type': 'application/json', ...(opts.token ? { authorization: `Bearer ${opts.token}` } : {}) },
    body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
  });
  const lat = r.latency as unknown as Record<string, number>;
  return {
    name,
    connections: opts.connections,
    requests: r.requests.total,
    throughputPerSec: Math.round(r.requests.average),
    p50Ms: lat.p50,
    p95Ms: lat.p95 ?? lat.p97_5,
    p99Ms: lat.p99,
    non2xx: r.non2xx,
  };
}

export const benchDir = path.join(path.dirname(new URL(import.meta.url).pathname));
