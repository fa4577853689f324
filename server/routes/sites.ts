import { parseOrThrow } from '../../shared/schemas/parse.js';
import {
  facilitySchema,
  facilityUpdateSchema,
  organizationSchema,
  organizationUpdateSchema,
  pointSchema,
  pointUpdateSchema,
} from '../../shared/schemas/sites.js';
import { actorOf } from '../services/actor.js';
import * as sites from '../services/sites.js';
import type { RouteBuilder } from './registry.js';
import { idOf } from './users.js';

type Q = Record<string, unknown>;

export function siteRoutes(r: RouteBuilder) {
  r.get('/organizations', 'sites.read', async (req, res) => {
    res.json(await sites.listOrganizations(actorOf(req), req.query as Q));
  });
  r.post('/organizations', 'sites.manage', async (req, res) => {
    res.status(201).json(await sites.createOrganization(actorOf(req), parseOrThrow(organizationSchema, req.body)));
  });
  r.get('/organizations/:id', 'sites.read', async (req, res) => {
    res.json(await sites.getOrganization(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/organizations/:id', 'sites.manage', async (req, res) => {
    res.json(await sites.updateOrganization(actorOf(req), idOf(req.params.id), parseOrThrow(organizationUpdateSchema, req.body)));
  });

  r.get('/facilities', 'sites.read', async (req, res) => {
    res.json(await sites.listFacilities(actorOf(req), req.query as Q));
  });
  r.post('/facilities', 'sites.manage', async (req, res) => {
    res.status(201).json(await sites.createFacility(actorOf(req), parseOrThrow(facilitySchema, req.body)));
  });
  r.get('/facilities/:id', 'sites.read', async (req, res) => {
    res.json(await sites.getFacility(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/facilities/:id', 'sites.manage', async (req, res) => {
    res.json(await sites.updateFacility(actorOf(req), idOf(req.params.id), parseOrThrow(facilityUpdateSchema, req.body)));
  });

  r.get('/facilities/:id/points', 'sites.read', async (req, res) => {
    res.json(await sites.listPoints(actorOf(req), idOf(req.params.id), req.query as Q));
  });
  r.post('/facilities/:id/points', 'points.manage', async (req, res) => {
    res.status(201).json(await sites.createPoint(actorOf(req), idOf(req.params.id), parseOrThrow(pointSchema, req.body)));
  });
  r.get('/points/:id', 'sites.read', async (req, res) => {
    res.json(await sites.getPoint(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/points/:id', 'points.manage', async (req, res) => {
    res.json(await sites.updatePoint(actorOf(req), idOf(req.params.id), parseOrThrow(pointUpdateSchema, req.body)));
  });
}
