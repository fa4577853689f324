import { actorOf } from '../services/actor.js';
import { listAuditEvents } from '../services/auditLog.js';
import type { RouteBuilder } from './registry.js';

export function auditRoutes(r: RouteBuilder) {
  r.get('/audit-events', 'audit.read', async (req, res) => {
    res.json(await listAuditEvents(actorOf(req), req.query as Record<string, unknown>));
  });
}
