/**
 * The app as its own process for the HTTP benchmarks, so the load generator does not share the
 * server's event loop. Started by http.ts with the bench database's name and port in the
 * environment; prints "listening" when it answers.
 */
import { startServer } from '../../server/index.js';
import { testConfig } from '../setup/env.js';

const config = testConfig(process.env.BENCH_DB_NAME ?? 'titrata_bench', { PORT: process.env.BENCH_PORT ?? '8190', LOGIN_RATE_LIMIT: '1000000', API_RATE_LIMIT: '10000000' });
const app = await startServer(config);
process.stdout.write('listening\n');
const stop = async () => {
  await app.stop();
  process.exit(0);
};
process.on('SIGTERM', () => void stop());
process.on('SIGINT', () => void stop());
