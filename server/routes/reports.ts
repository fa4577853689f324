import { actorOf } from '../services/actor.js';
import * as reports from '../services/reports.js';
import type { RouteBuilder } from './registry.js';
import { idOf } from './users.js';

/** Monthly reports; every version is its own id (`versions` in GET /reports/:id lists them). */
export function reportRoutes(r: RouteBuilder) {
  r.get('/reports', 'reports.read', async (req, res) => {
    res.json(await reports.listReports(actorOf(req), req.query as Record<string, unknown>));
  });
  r.post('/reports', 'reports.read', async (req, res) => {
    res.status(201).json(await reports.createReport(actorOf(req), req.body ?? {}));
  });
  r.get('/report-batches', 'reports.certify', async (req, res) => {
    res.json(await reports.listBatches(actorOf(req)));
  });
  r.post('/report-batches', 'reports.certify', async (req, res) => {
    res.status(201).json(await reports.createBatch(actorOf(req), req.body ?? {}));
  });
  r.get('/report-batches/:id', 'reports.certify', async (req, res) => {
    res.json(await reports.getBatch(actorOf(req), idOf(req.params.id)));
  });
  r.post('/report-batches/:id/state', 'reports.certify', async (req, res) => {
    res.json(await reports.setBatchState(actorOf(req), idOf(req.params.id), req.body ?? {}));
  });
  r.get('/reports/:id', 'reports.read', async (req, res) => {
    res.json(await reports.getReport(actorOf(req), idOf(req.params.id)));
  });
  r.get('/reports/:id/pdf', 'reports.read', async (req, res) => {
    const { name, pdf } = await reports.reportPdf(actorOf(req), idOf(req.params.id));
    res.type('application/pdf').attachment(name).send(pdf);
  });
  r.get('/reports/:id/csv', 'reports.read', async (req, res) => {
    const { name, csv } = await reports.reportCsv(actorOf(req), idOf(req.params.id));
    res.type('text/csv').attachment(name).send(csv);
  });
  r.post('/reports/:id/certify', 'reports.certify', async (req, res) => {
    res.json(await reports.certifyReport(actorOf(req), idOf(req.params.id), req.body ?? {}));
  });
  r.get('/reports/:id/pending-changes', 'reports.read', async (req, res) => {
    res.json(await reports.pendingChanges(actorOf(req), idOf(req.params.id)));
  });
  r.post('/reports/:id/revisions', 'reports.certify', async (req, res) => {
    res.status(201).json(await reports.reviseReport(actorOf(req), idOf(req.params.id), req.body ?? {}));
  });
}
