/**
 * Bench benchmark (not part of npm test): `npx tsx tests/bench/bench-bench.ts`.
 *
 * 1. Bulk entry: 10,000 samples with one titration each, through the HTTP API as the
 *    Kestrel Ford operator, BENCH_CONCURRENCY requests in flight (default 16): throughput
 *    and per-request latency.
 * 2. The Bench list at 100,000 stored results: the entered rows are copied in SQL (shifted
 *    back in time) to reach 100,000 titrations, then GET /samples pages are timed (p50/p95)
 *    for the lab analyst and the operator, unfiltered and filtered.
 *
 * Runs on the test MariaDB instance (TEST_DB_PORT, default 3407) in its own database
 * `titrata_benchbench`, on port 8192; results go to tests/bench/bench-at-scale.json (committed; `npm run bench` puts them in RESULTS.md).
 * BENCH_LIST_ONLY=1 reuses that database from an earlier run and times only the list.
 */
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { prepareDatabase } from '../../server/bin/bootstrap.js';
import { startServer } from '../../server/index.js';
import { rootDir } from '../../server/config.js';
import { testConfig, testDbDir } from '../setup/env.js';

const ENTRIES = Number(process.env.BENCH_ENTRIES ?? 10_000);
const TARGET = Number(process.env.BENCH_TARGET ?? 100_000);
const CONCURRENCY = Number(process.env.BENCH_CONCURRENCY ?? 16);
const LIST_REQUESTS = Number(process.env.BENCH_LIST_REQUESTS ?? 200);
const OFFSET = 1_000_000;
const LIST_ONLY = process.env.BENCH_LIST_ONLY === '1';

const say = (m: string) => console.log(`[bench-bench] ${m}`);
const pct = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? Math.round(s[Math.min(s.length - 1, Math.floor(q * s.length))] * 10) / 10 : NaN;
};
const stats = (xs: number[]) => ({ n: xs.length, p50Ms: pct(xs, 0.5), p95Ms: pct(xs, 0.95), p99Ms: pct(xs, 0.99), maxMs: pct(xs, 1) });

async function main() {
  const config = testConfig('titrata_benchbench', { PORT: '8192', LOGIN_RATE_LIMIT: '1000000', API_RATE_LIMIT: '10000000', LOG_LEVEL: 'warn' });
  say(LIST_ONLY ? 'reusing the database of an earlier run' : 'preparing a fresh database with the demo data');
  const db = await prepareDatabase(config, { instanceDir: testDbDir, fresh: !LIST_ONLY, seed: !LIST_ONLY });
  const server = await startServer(config);
  const base = `${config.publicUrl}/api/v1`;
  const results: Record<string, unknown> = { ranAt: new Date().toISOString(), entries: ENTRIES, target: TARGET, concurrency: CONCURRENCY };
  try {
    const login = async (email: string) => {
      const res = await fetch(`${base}/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: config.DEMO_PASSWORD }) });
      return ((await res.json()) as { token: string }).token;
    };
    const operator = await login('operator@kestrelford.example');
    const analyst = await login('analyst@marrowfield.example');
    const call = async (token: string, method: string, url: string, body?: unknown) => {
      const started = performance.now();
      const res = await fetch(`${base}${url}`, { method, headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
      const json = await res.json();
      if (res.status >= 300) throw new Error(`${method} ${url}: ${res.status} ${JSON.stringify(json)}`);
      return { ms: performance.now() - started, json };
    };

    const facilities = (await call(operator, 'GET', '/facilities')).json.items;
    const facility = facilities[0];
    const points = (await call(operator, 'GET', `/facilities/${facility.id}/points`)).json.items.filter((p: { code: string }) => p.code !== 'DIG-1');
    const titrant = (await call(operator, 'GET', '/titrants?kind=acid&q=0.02')).json.items[0];

    const now = Date.now();
    const sq = server.sequelize;
    const count = async (table: string) => Number((await sq.query<{ n: string }>(`SELECT COUNT(*) AS n FROM ${table}`, { type: QueryTypes.SELECT }))[0].n);

    // ---- 1. bulk entry through the API ----
    if (!LIST_ONLY) {
    say(`entering ${ENTRIES} samples + titrations, ${CONCURRENCY} at a time`);
    const sampleMs: number[] = [];
    const titrationMs: number[] = [];
    let next = 0;
    const started = performance.now();
    const worker = async () => {
      for (;;) {
        const i = next++;
        if (i >= ENTRIES) return;
        // Spread over the past 300 days, before the demo's three months.
        const analysedAt = new Date(now - (100 + (i % 300)) * 86_400_000 - (i % 7) * 60_000);
        const collectedAt = new Date(analysedAt.getTime() - 2 * 3_600_000);
        const point = points[i % points.length];
        const s = await call(operator, 'POST', '/samples', { pointId: point.id, sampleType: 'grab', collectedAt: collectedAt.toISOString(), receivedAt: collectedAt.toISOString(), receiptTemperatureC: 4 });
        sampleMs.push(s.ms);
        const t = await call(operator, 'POST', `/samples/${s.json.id}/titrations`, {
          analysis: 'alkalinity',
          method: 'color_indicator',
          sampleVolumeMl: 100,
          titrantId: titrant.id,
          volumeToPh83Ml: 0,
          volumeToTotalEndpointMl: Math.round((5 + (i % 200) / 10) * 100) / 100,
          totalEndpointPh: 4.5,
          analysedAt: analysedAt.toISOString(),
        });
        titrationMs.push(t.ms);
      }
    };
    await Promise.all(Array.from({ length: CONCURRENCY }, worker));
    const seconds = (performance.now() - started) / 1000;
    results.bulkEntry = {
      seconds: Math.round(seconds * 10) / 10,
      titrationsPerSecond: Math.round((ENTRIES / seconds) * 10) / 10,
      requestsPerSecond: Math.round(((2 * ENTRIES) / seconds) * 10) / 10,
      postSample: stats(sampleMs),
      postTitration: stats(titrationMs),
    };
    say(`bulk entry: ${JSON.stringify(results.bulkEntry)}`);

    // ---- 2. the Bench list at TARGET stored results ----
    const columns = async (table: string) => (await sq.query<{ COLUMN_NAME: string }>('SELECT COLUMN_NAME FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = :table ORDER BY ORDINAL_POSITION', { replacements: { table }, type: QueryTypes.SELECT })).map((c) => c.COLUMN_NAME);
    const sampleCols = await columns('samples');
    const titrationCols = await columns('titrations');
    const shiftedTimes = new Set(['collected_at', 'received_at', 'composite_start_at', 'composite_end_at', 'analysed_at', 'submitted_at', 'approved_at', 'returned_at']);
    const expr = (c: string, k: number, ids: string[]) =>
      ids.includes(c) ? `${c} + ${k * OFFSET}` : shiftedTimes.has(c) ? `DATE_SUB(${c}, INTERVAL ${k * 400} DAY)` : `\`${c}\``;
    const fillStarted = performance.now();
    let k = 1;
    let stored = await count('titrations');
    while (stored < TARGET) {
      const need = TARGET - stored;
      const limit = `WHERE id < ${OFFSET} ORDER BY id LIMIT ${need}`;
      await sq.transaction(async (transaction) => {
        // An amendment pair is copied in id order, so its forward link is checked only after the copy.
        await sq.query('SET foreign_key_checks = 0', { type: QueryTypes.RAW, transaction });
        await sq.query(
          `INSERT INTO samples (${sampleCols.map((c) => `\`${c}\``).join(',')}) SELECT ${sampleCols.map((c) => expr(c, k, ['id'])).join(',')} FROM samples WHERE id IN (SELECT sample_id FROM (SELECT sample_id FROM titrations ${limit}) x)`,
          { type: QueryTypes.INSERT, transaction },
        );
        await sq.query(
          `INSERT INTO titrations (${titrationCols.map((c) => `\`${c}\``).join(',')}) SELECT ${titrationCols.map((c) => expr(c, k, ['id', 'sample_id', 'amends_id', 'superseded_by_id'])).join(',')} FROM titrations ${limit}`,
          { type: QueryTypes.INSERT, transaction },
        );
        await sq.query('SET foreign_key_checks = 1', { type: QueryTypes.RAW, transaction });
      });
      k++;
      stored = await count('titrations');
    }
    await sq.query('ANALYZE TABLE samples, titrations', { type: QueryTypes.SELECT });
    results.fill = { titrations: stored, samples: await count('samples'), seconds: Math.round((performance.now() - fillStarted) / 100) / 10 };
    say(`stored: ${JSON.stringify(results.fill)}`);
    }

    const month = new Date(now - 200 * 86_400_000).toISOString().slice(0, 7);
    const scenarios: Array<{ name: string; token: string; url: (page: number) => string; pages: number }> = [];
    const total = async (token: string, query: string) => (await call(token, 'GET', `/samples?${query}&pageSize=1`)).json.total as number;
    const add = async (name: string, token: string, query: string) => {
      const n = await total(token, query);
      scenarios.push({ name: `${name} (${n} samples)`, token, pages: Math.max(1, Math.ceil(n / 25)), url: (page) => `/samples?${query}&pageSize=25&page=${page}` });
    };
    await add('analyst, all clients, newest first', analyst, 'sort=-collectedAt');
    await add('operator, own utility, newest first', operator, 'sort=-collectedAt');
    await add(`operator, one facility, ${month}`, operator, `facilityId=${facility.id}&from=${month}-01&to=${month}-28`);
    await add('analyst, submitted', analyst, 'status=submitted');
    const list: Record<string, unknown> = {};
    let seed = 7;
    const random = () => ((seed = (seed * 48271) % 2147483647) / 2147483647);
    for (const s of scenarios) {
      const times: number[] = [];
      for (let i = 0; i < LIST_REQUESTS; i++) {
        // Mostly the first pages, as people use the list; a tail of deep pages.
        const page = i % 5 === 4 ? 1 + Math.floor(random() * s.pages) : 1 + Math.floor(random() * Math.min(5, s.pages));
        times.push((await call(s.token, 'GET', s.url(page))).ms);
      }
      list[s.name] = stats(times);
      say(`GET /samples ${s.name}: ${JSON.stringify(list[s.name])}`);
    }
    results.benchList = list;
  } finally {
    await server.stop();
    await db.stopDatabase();
  }
  // committed beside RESULTS.md, which `npm run bench` writes with these figures in it
  const out = path.join(rootDir, 'tests', 'bench', 'bench-at-scale.json');
  writeFileSync(out, JSON.stringify(results, null, 2) + '\n');
  say(`written to ${out}`);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
