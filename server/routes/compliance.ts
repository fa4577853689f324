import { acknowledgeSchema, closeExceedanceSchema, complianceQuerySchema, projectionAlertSchema } from '../../shared/schemas/compliance.js';
import { parseOrThrow } from '../../shared/schemas/parse.js';
import { actorOf } from '../services/actor.js';
import * as compliance from '../services/compliance.js';
import type { RouteBuilder } from './registry.js';
import { idOf } from './users.js';

export function complianceRoutes(r: RouteBuilder) {
  r.get('/compliance', 'compliance.read', async (req, res) => {
    const q = parseOrThrow(complianceQuerySchema, req.query);
    res.json(await compliance.complianceMonth(actorOf(req), q.facilityId, q.month));
  });
  r.get('/exceedances', 'compliance.read', async (req, res) => {
    res.json(await compliance.listExceedances(actorOf(req), req.query as Record<string, unknown>));
  });
  r.get('/exceedances/:id', 'compliance.read', async (req, res) => {
    res.json(await compliance.getExceedance(actorOf(req), idOf(req.params.id)));
  });
  r.post('/exceedances/:id/acknowledge', 'exceedances.manage', async (req, res) => {
    res.json(await compliance.acknowledgeExceedance(actorOf(req), idOf(req.params.id), parseOrThrow(acknowledgeSchema, req.body).correctiveAction));
  });
  r.post('/exceedances/:id/close', 'exceedances.manage', async (req, res) => {
    res.json(await compliance.closeExceedance(actorOf(req), idOf(req.params.id), parseOrThrow(closeExceedanceSchema, req.body).reason));
  });
  r.get('/notices', 'compliance.read', async (req, res) => {
    res.json(await compliance.listNotices(actorOf(req), req.query as Record<string, unknown>));
  });
  r.get('/projection-alerts', 'exceedances.manage', async (req, res) => {
    res.json(await compliance.listProjectionAlerts(actorOf(req)));
  });
  r.post('/projection-alerts', 'exceedances.manage', async (req, res) => {
    res.status(201).json(await compliance.subscribeProjectionAlert(actorOf(req), parseOrThrow(projectionAlertSchema, req.body).facilityId));
  });
  r.delete('/projection-alerts/:id', 'exceedances.manage', async (req, res) => {
    res.json(await compliance.unsubscribeProjectionAlert(actorOf(req), idOf(req.params.id)));
  });
  r.get('/public/notices/:token', 'public', async (req, res) => {
    res.json(await compliance.publicNotice(String(req.params.token)));
  });
}
