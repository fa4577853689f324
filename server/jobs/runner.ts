import type { Logger } from 'pino';
import type { Config } from '../config.js';
import { createMailer } from '../integrations/mailer.js';
import { deliverDue } from '../services/outbox.js';
import { checkProjectionAlerts } from '../services/compliance.js';
import { processReportBatches } from '../services/reports.js';

/**
 * Background jobs of one app process: the outbox sender and report batches every few seconds. Any number of
 * processes may run it; rows are claimed with SKIP LOCKED.
 */
export function startJobs(config: Config, log: Logger, intervalMs = 2000) {
  const mailer = createMailer(config);
  let running = false;
  let stopped = false;
  let lastProjectionCheck = 0;
  /** Projections change with each approval at most; every ten minutes is plenty. */
  const PROJECTION_EVERY_MS = 10 * 60_000;
  const tick = async () => {
    if (running || stopped) return;
    running = true;
    try {
      const r = await deliverDue(config, mailer);
      if (r.sent || r.failed) log.info(r, 'outbox round');
      const made = await processReportBatches();
      if (made) log.info({ made }, 'report batch round');
      if (Date.now() - lastProjectionCheck > PROJECTION_EVERY_MS) {
        lastProjectionCheck = Date.now();
        const queued = await checkProjectionAlerts();
        if (queued) log.info({ queued }, 'projection alerts queued');
      }
    } catch (err) {
      log.warn({ err: { message: (err as Error).message } }, 'outbox round failed; will retry');
    } finally {
      running = false;
    }
  };
  const timer = setInterval(tick, intervalMs);
  timer.unref();
  return {
    tick,
    async stop() {
      stopped = true;
      clearInterval(timer);
      while (running) await new Promise((r) => setTimeout(r, 50));
      mailer.close();
    },
  };
}
