import { parseOrThrow } from '../../shared/schemas/parse.js';
import { benchEntrySchema, benchImportSchema, sampleCreateSchema, sampleUpdateSchema, titrationCreateSchema } from '../../shared/schemas/bench.js';
import { createBenchEntry, importBenchEntries } from '../services/benchEntries.js';
import { actorOf } from '../services/actor.js';
import * as samples from '../services/samples.js';
import * as titrations from '../services/titrations.js';
import type { RouteBuilder } from './registry.js';
import { idOf } from './users.js';

type Q = Record<string, unknown>;

/** Samples and the titrations logged against them (Bench). */
export function sampleRoutes(r: RouteBuilder) {
  r.get('/samples', 'samples.read', async (req, res) => {
    res.json(await samples.listSamples(actorOf(req), req.query as Q));
  });
  r.post('/samples', 'samples.write', async (req, res) => {
    res.status(201).json(await samples.createSample(actorOf(req), parseOrThrow(sampleCreateSchema, req.body)));
  });
  r.get('/samples/:id', 'samples.read', async (req, res) => {
    res.json(await samples.getSample(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/samples/:id', 'samples.write', async (req, res) => {
    res.json(await samples.updateSample(actorOf(req), idOf(req.params.id), parseOrThrow(sampleUpdateSchema, req.body)));
  });
  r.get('/samples/:id/titrations', 'samples.read', async (req, res) => {
    res.json(await titrations.listSampleTitrations(actorOf(req), idOf(req.params.id), req.query as Q));
  });
  r.post('/samples/:id/titrations', 'samples.write', async (req, res) => {
    res.status(201).json(await titrations.createTitration(actorOf(req), idOf(req.params.id), parseOrThrow(titrationCreateSchema, req.body)));
  });
  // The daily entry grid: a sample with its titration, all or nothing.
  r.post('/bench/entries', 'samples.write', async (req, res) => {
    res.status(201).json(await createBenchEntry(actorOf(req), parseOrThrow(benchEntrySchema, req.body)));
  });
  // Many entries at once (a day's sheet, an import): all or nothing.
  r.post('/bench/entries/import', 'samples.write', async (req, res) => {
    res.status(201).json(await importBenchEntries(actorOf(req), parseOrThrow(benchImportSchema, req.body)));
  });
}
