import { parseOrThrow } from '../../shared/schemas/parse.js';
import {
  benchSettingsSchema,
  calibrationCreateSchema,
  qcBatchCreateSchema,
  qcBatchUpdateSchema,
  standardizationCreateSchema,
  titrantCreateSchema,
  titrantUpdateSchema,
} from '../../shared/schemas/bench.js';
import { actorOf } from '../services/actor.js';
import { getBenchSettings, updateBenchSettings } from '../services/benchSettings.js';
import * as qc from '../services/labQc.js';
import type { RouteBuilder } from './registry.js';
import { idOf } from './users.js';

type Q = Record<string, unknown>;

/** Titrant lots and standardisations, pH meter calibrations, QC batches and the lab's bench limits. */
export function labQcRoutes(r: RouteBuilder) {
  r.get('/titrants', 'lab.qc.read', async (req, res) => {
    res.json(await qc.listTitrants(actorOf(req), req.query as Q));
  });
  r.post('/titrants', 'lab.qc', async (req, res) => {
    res.status(201).json(await qc.createTitrant(actorOf(req), parseOrThrow(titrantCreateSchema, req.body)));
  });
  r.get('/titrants/:id', 'lab.qc.read', async (req, res) => {
    res.json(await qc.getTitrant(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/titrants/:id', 'lab.qc', async (req, res) => {
    res.json(await qc.updateTitrant(actorOf(req), idOf(req.params.id), parseOrThrow(titrantUpdateSchema, req.body)));
  });
  r.get('/titrants/:id/standardizations', 'lab.qc.read', async (req, res) => {
    res.json(await qc.listStandardizations(actorOf(req), idOf(req.params.id), req.query as Q));
  });
  r.post('/titrants/:id/standardizations', 'lab.qc', async (req, res) => {
    res.status(201).json(await qc.createStandardization(actorOf(req), idOf(req.params.id), parseOrThrow(standardizationCreateSchema, req.body)));
  });

  r.get('/calibrations', 'lab.qc.read', async (req, res) => {
    res.json(await qc.listCalibrations(actorOf(req), req.query as Q));
  });
  r.post('/calibrations', 'calibrations.write', async (req, res) => {
    res.status(201).json(await qc.createCalibration(actorOf(req), parseOrThrow(calibrationCreateSchema, req.body)));
  });
  r.get('/calibrations/:id', 'lab.qc.read', async (req, res) => {
    res.json(await qc.getCalibration(actorOf(req), idOf(req.params.id)));
  });

  r.get('/qc-batches', 'lab.qc.read', async (req, res) => {
    res.json(await qc.listQcBatches(actorOf(req), req.query as Q));
  });
  r.post('/qc-batches', 'lab.qc', async (req, res) => {
    res.status(201).json(await qc.createQcBatch(actorOf(req), parseOrThrow(qcBatchCreateSchema, req.body)));
  });
  r.get('/qc-batches/:id', 'lab.qc.read', async (req, res) => {
    res.json(await qc.getQcBatch(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/qc-batches/:id', 'lab.qc', async (req, res) => {
    res.json(await qc.updateQcBatch(actorOf(req), idOf(req.params.id), parseOrThrow(qcBatchUpdateSchema, req.body)));
  });

  r.get('/lab-settings/bench', 'lab.qc.read', async (req, res) => {
    res.json(await getBenchSettings(actorOf(req)));
  });
  r.patch('/lab-settings/bench', 'settings.manage', async (req, res) => {
    res.json(await updateBenchSettings(actorOf(req), parseOrThrow(benchSettingsSchema, req.body)));
  });
}
