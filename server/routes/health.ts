import { QueryTypes, type Sequelize } from 'sequelize';
import type { RouteBuilder } from './registry.js';

/** Public liveness: `{status, db}`; 503 with `db: "down"` while MariaDB does not answer. */
export function healthRoutes(r: RouteBuilder, sequelize: Sequelize) {
  r.get('/health', 'public', async (_req, res) => {
    try {
      await Promise.race([
        sequelize.query('SELECT 1 AS ok', { type: QueryTypes.SELECT }),
        new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 3000)),
      ]);
      res.json({ status: 'ok', db: 'up' });
    } catch {
      res.status(503).json({ status: 'degraded', db: 'down' });
    }
  });
}
