/**
 * Benchmarks of the proof issue: HTTP latency of the main routes, API ingest against a raw
 * batch insert of the same rows, the client's initial download and first paint, and how the
 * report grows with months of data.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import * as mariadb from 'mariadb';
import { chromium } from 'playwright-core';
import { ensureClientBuilt } from '../../server/bin/build-client.js';
import { dataDir } from '../../server/config.js';
import { renderReportPdf } from '../../server/services/reportPdf.js';
import { testConfig, testDbPort } from '../setup/env.js';
import { load, type HttpResult } from './http.js';
import { largeMonthContent } from './reports.js';

type Call = (token: string, method: string, url: string, body?: unknown) => Promise<any>;

export function caller(base: string): Call {
  return async (token, method, url, body) => {
    const res = await fetch(`${base}/api/v1${url}`, { method, headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
    const json = res.headers.get('content-type')?.includes('json') ? await res.json() : null;
    if (res.status >= 300) throw new Error(`${method} ${url}: ${res.status} ${JSON.stringify(json)}`);
    return json;
  };
}

/** Titration entry, the Bench list, the compliance month and a report PDF at 1, 10 and 50 connections. */
export async function mainRoutes(base: string, token: (email: string) => Promise<string>): Promise<HttpResult[]> {
  const call = caller(base);
  const operator = await token('operator@kestrelford.example');
  const officer = await token('compliance@kestrelford.example');
  const facility = (await call(operator, 'GET', '/facilities')).items[0];
  const titrant = (await call(operator, 'GET', '/titrants?kind=acid')).items[0];
  const points = (await call(operator, 'GET', `/facilities/${facility.id}/points`)).items;
  // 50 samples: each connection enters on a sample of its own, as analysts at separate benches do
  const samples: { id: number }[] = [];
  for (let i = 0; i < 50; i++) samples.push(await call(operator, 'POST', '/samples', { pointId: points[i % points.length].id, sampleType: 'grab', collectedAt: new Date(Date.now() - 3_600_000).toISOString() }));
  const sample = samples[0];
  const month = new Date(Date.UTC(new Date().getUTCFullYear(), new Date().getUTCMonth() - 1, 1)).toISOString().slice(0, 7);
  const report = (await call(officer, 'GET', `/reports?facilityId=${facility.id}&status=draft`)).items[0] ?? (await call(officer, 'POST', '/reports', { facilityId: facility.id, month }));
  const out: HttpResult[] = [];
  const titration = { analysis: 'alkalinity', method: 'color_indicator', sampleVolumeMl: 100, titrantId: titrant.id, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 6.2, totalEndpointPh: 4.5, analysedAt: new Date().toISOString() };
  for (const connections of [1, 10, 50]) {
    out.push(await load('POST /samples/:id/titrations (entry)', { url: `${base}/api/v1/samples/${sample.id}/titrations`, paths: samples.map((s) => `/api/v1/samples/${s.id}/titrations`), method: 'POST', token: operator, connections, duration: 3, body: titration }));
    // every connection on one sample: each entry waits for the sample's row lock (the worst case)
    out.push(await load('POST /samples/:id/titrations (entry, all on one sample)', { url: `${base}/api/v1/samples/${sample.id}/titrations`, method: 'POST', token: operator, connections, duration: 3, body: titration }));
    out.push(await load('GET /samples (Bench list, page 1)', { url: `${base}/api/v1/samples?page=1&pageSize=25`, token: operator, connections, duration: 3 }));
    out.push(await load('GET /compliance (facility month)', { url: `${base}/api/v1/compliance?facilityId=${facility.id}&month=${month}`, token: officer, connections, duration: 3 }));
    out.push(await load('GET /reports/:id/pdf (draft, rendered)', { url: `${base}/api/v1/reports/${report.id}/pdf`, token: officer, connections, duration: 3 }));
  }
  return out;
}

/** The rows of `table` matching `where`, all columns but the id, as arrays ready for a bulk insert. */
async function storedRows(conn: mariadb.Connection, table: string, where: string, values: unknown[]) {
  const cols = ((await conn.query({ sql: `SELECT COLUMN_NAME AS c FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ? AND COLUMN_NAME <> 'id' ORDER BY ORDINAL_POSITION` }, [table])) as Array<{ c: string }>).map((r) => `\`${r.c}\``);
  const rows = (await conn.query({ sql: `SELECT ${cols.join(',')} FROM ${table} WHERE ${where}`, rowsAsArray: true }, values)) as unknown[][];
  return { cols, rows: rows.map((r) => r.map((v) => (v !== null && typeof v === 'object' && !(v instanceof Date) && !Buffer.isBuffer(v) ? JSON.stringify(v) : v))) };
}

type StoredSets = Record<string, Awaited<ReturnType<typeof storedRows>>>;

/**
 * Three timed bulk inserts of the stored rows of each table into an emptied copy, in one
 * transaction each time: titrations per second, for the median (one short insert varied
 * two-fold between runs).
 */
async function rawInsertRates(conn: mariadb.Connection, sets: StoredSets, titrations: number): Promise<number[]> {
  for (const table of Object.keys(sets)) {
    await conn.query(`DROP TABLE IF EXISTS ${table}_raw`);
    await conn.query(`CREATE TABLE ${table}_raw LIKE ${table}`);
  }
  const rates: number[] = [];
  try {
    for (let k = 0; k < 3; k++) {
      for (const table of Object.keys(sets)) await conn.query(`TRUNCATE TABLE ${table}_raw`);
      const t0 = performance.now();
      await conn.beginTransaction();
      for (const [table, { cols, rows }] of Object.entries(sets)) await conn.batch(`INSERT INTO ${table}_raw (${cols.join(',')}) VALUES (${cols.map(() => '?').join(',')})`, rows);
      await conn.commit();
      rates.push(titrations / ((performance.now() - t0) / 1000));
    }
  } finally {
    for (const table of Object.keys(sets)) await conn.query(`DROP TABLE IF EXISTS ${table}_raw`);
  }
  return rates;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/**
 * Titration ingest through the API against a raw batch insert of the same stored rows with the
 * `mariadb` connector into a copy of the table. The API side is the import route (batches of
 * 100 entries, 4 clients: sample, titration, engine, qualifiers and audit for each row); the
 * one-entry-per-request rate of the grid's route is measured beside it.
 */
export async function ingestRatio(base: string, token: (email: string) => Promise<string>, rows = 4000, batchSize = Number(process.env.INGEST_BATCH ?? 100), clients = Number(process.env.INGEST_CLIENTS ?? 4)) {
  const call = caller(base);
  const operator = await token('operator@kestrelford.example');
  const facility = (await call(operator, 'GET', '/facilities')).items[0];
  const points = (await call(operator, 'GET', `/facilities/${facility.id}/points`)).items;
  const titrant = (await call(operator, 'GET', '/titrants?kind=acid')).items[0];
  const entry = (i: number) => {
    const at = new Date(Date.now() - (200 + (i % 100)) * 86_400_000);
    return {
      sample: { pointId: points[i % points.length].id, sampleType: 'grab', collectedAt: at.toISOString(), receivedAt: at.toISOString(), receiptTemperatureC: 4 },
      titration: { analysis: 'alkalinity', method: 'color_indicator', sampleVolumeMl: 100, titrantId: titrant.id, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 5 + (i % 50) / 10, totalEndpointPh: 4.5, analysedAt: new Date(at.getTime() + 3_600_000).toISOString() },
    };
  };
  // one entry per request, 10 clients (the grid's route)
  let n = 0;
  const single = 300;
  const s0 = performance.now();
  await Promise.all(Array.from({ length: 10 }, async () => { for (let i = n++; i < single; i = n++) await call(operator, 'POST', '/bench/entries', entry(i)); }));
  const singlePerSecond = single / ((performance.now() - s0) / 1000);
  // the import route: `count` rows from entry number `from`, in batches over the clients
  const importRows = async (from: number, count: number) => {
    const ids: number[] = [];
    const sampleIds: number[] = [];
    let batch = 0;
    const t0 = performance.now();
    await Promise.all(
      Array.from({ length: clients }, async () => {
        for (let b = batch++; b * batchSize < count; b = batch++) {
          const r = await call(operator, 'POST', '/bench/entries/import', { entries: Array.from({ length: Math.min(batchSize, count - b * batchSize) }, (_, k) => entry(from + b * batchSize + k)) });
          ids.push(...r.items.map((x: { titrationId: number }) => x.titrationId));
          sampleIds.push(...r.items.map((x: { sampleId: number }) => x.sampleId));
        }
      }),
    );
    return { perSecond: count / ((performance.now() - t0) / 1000), ids, sampleIds };
  };
  // one untimed run first (the server's JIT warms on this route's code), then three timed runs:
  // the median, as for the raw side; the raw rows are those of the last run
  const warmUp = Math.min(rows, 1000);
  await importRows(0, warmUp);
  const runs = [];
  for (let k = 0; k < 3; k++) runs.push(await importRows((k + 1) * rows, rows));
  const apiRates = runs.map((r) => r.perSecond);
  const { ids, sampleIds } = runs[runs.length - 1];
  const config = testConfig('titrata_bench');
  const conn = await mariadb.createConnection({ host: '127.0.0.1', port: testDbPort, user: config.DB_USER, password: config.DB_PASSWORD, database: config.DB_NAME });
  try {
    const titrations = await storedRows(conn, 'titrations', 'id IN (?)', [ids]);
    const rawRates = await rawInsertRates(conn, { titrations }, ids.length);
    // For comparison (not the target): every row the import wrote for these entries (the samples,
    // titrations and their two audit events), bulk-inserted the same way; titrations per second.
    const allRates = await rawInsertRates(
      conn,
      {
        samples: await storedRows(conn, 'samples', 'id IN (?)', [sampleIds]),
        titrations,
        audit_events: await storedRows(conn, 'audit_events', "(entity = 'sample' AND entity_id IN (?)) OR (entity = 'titration' AND entity_id IN (?))", [sampleIds.map(String), ids.map(String)]),
      },
      ids.length,
    );
    const apiRate = median(apiRates);
    const rawRate = median(rawRates);
    const rawAllRate = median(allRates);
    return {
      rows,
      apiPerSecond: Math.round(apiRate),
      apiRuns: apiRates.map(Math.round),
      singleEntryPerSecond: Math.round(singlePerSecond),
      rawPerSecond: Math.round(rawRate),
      rawRuns: rawRates.map(Math.round),
      ratio: Math.round((apiRate / rawRate) * 1000) / 1000,
      rawAllRowsPerSecond: Math.round(rawAllRate),
      ratioAllRows: Math.round((apiRate / rawAllRate) * 1000) / 1000,
      note: `Through POST /bench/entries/import, ${batchSize} entries a request, ${clients} clients, after an untimed run of ${warmUp} rows (one entry per request: ${Math.round(singlePerSecond)} rows/s); each API row is a sample, a titration, the engine, qualifiers and audit, the raw rows one batched INSERT of the titrations alone`,
    };
  } finally {
    await conn.end();
  }
}

/** The client's initial JavaScript and CSS (gzip) as index.html loads them, and first paint in Chromium. */
export async function clientWeight(base: string) {
  await ensureClientBuilt();
  const dir = path.join(dataDir, 'client');
  const html = readFileSync(path.join(dir, 'index.html'), 'utf8');
  const refs = [...html.matchAll(/(?:src|href)="(\/[^"]+\.(js|css))"/g)].map((m) => ({ file: m[1], kind: m[2] }));
  const size = (kind: string) => refs.filter((r) => r.kind === kind).reduce((n, r) => n + gzipSync(readFileSync(path.join(dir, r.file))).length, 0);
  const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', args: ['--headless', '--no-sandbox', '--disable-gpu'] });
  const paints: number[] = [];
  try {
    for (let i = 0; i < 5; i++) {
      const page = await browser.newPage();
      await page.goto(`${base}/sign-in`, { waitUntil: 'load' });
      await page.locator('#email').waitFor();
      // the paint entry can come after the sign-in form is in the DOM: wait for it (buffered), up to 5 s
      paints.push(
        await page.evaluate(
          () =>
            new Promise<number>((resolve) => {
              new PerformanceObserver((list) => {
                const e = list.getEntriesByName('first-contentful-paint')[0];
                if (e) resolve(e.startTime);
              }).observe({ type: 'paint', buffered: true });
              setTimeout(() => resolve(NaN), 5000);
            }),
        ),
      );
      await page.close();
    }
  } finally {
    await browser.close();
  }
  paints.sort((a, b) => a - b);
  return { files: refs.length, jsGzipKiB: Math.round(size('js') / 102.4) / 10, cssGzipKiB: Math.round(size('css') / 102.4) / 10, firstContentfulPaintMs: Math.round(paints[2]) };
}

/** Report rendering for 1, 12 and 60 months: ms per month should stay flat (linear growth). */
export async function reportGrowth() {
  const base = largeMonthContent();
  // a typical month: 4 points × 2 parameters
  const content = { ...base, limits: base.limits.slice(0, 8), daily: base.daily.slice(0, 8) };
  await renderReportPdf(content);
  const out: { months: number; totalMs: number; msPerMonth: number }[] = [];
  for (const months of [1, 12, 60]) {
    const t0 = performance.now();
    for (let m = 0; m < months; m++) await renderReportPdf({ ...content, month: `20${String(20 + Math.floor(m / 12)).padStart(2, '0')}-${String((m % 12) + 1).padStart(2, '0')}` });
    const totalMs = performance.now() - t0;
    out.push({ months, totalMs: Math.round(totalMs), msPerMonth: Math.round((totalMs / months) * 10) / 10 });
  }
  return out;
}
