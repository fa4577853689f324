import { parseOrThrow } from '../../shared/schemas/parse.js';
import { limitSchema, limitUpdateSchema, permitSchema, permitUpdateSchema } from '../../shared/schemas/permits.js';
import { actorOf } from '../services/actor.js';
import * as permits from '../services/permits.js';
import type { RouteBuilder } from './registry.js';
import { idOf } from './users.js';

export function permitRoutes(r: RouteBuilder) {
  r.get('/permits', 'permits.read', async (req, res) => {
    res.json(await permits.listPermits(actorOf(req), req.query as Record<string, unknown>));
  });
  r.post('/permits', 'permits.manage', async (req, res) => {
    res.status(201).json(await permits.createPermit(actorOf(req), parseOrThrow(permitSchema, req.body)));
  });
  r.get('/permits/:id', 'permits.read', async (req, res) => {
    res.json(await permits.getPermit(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/permits/:id', 'permits.manage', async (req, res) => {
    res.json(await permits.updatePermit(actorOf(req), idOf(req.params.id), parseOrThrow(permitUpdateSchema, req.body)));
  });
  r.get('/permits/:id/limits', 'permits.read', async (req, res) => {
    res.json(await permits.listLimits(actorOf(req), idOf(req.params.id)));
  });
  r.post('/permits/:id/limits', 'permits.manage', async (req, res) => {
    res.status(201).json(await permits.createLimit(actorOf(req), idOf(req.params.id), parseOrThrow(limitSchema, req.body)));
  });
  r.get('/limits/:id', 'permits.read', async (req, res) => {
    res.json(await permits.getLimit(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/limits/:id', 'permits.manage', async (req, res) => {
    res.json(await permits.updateLimit(actorOf(req), idOf(req.params.id), parseOrThrow(limitUpdateSchema, req.body)));
  });
}
