import type { RequestHandler } from 'express';
import multer from 'multer';
import { amendSchema, benchReadingsSchema, bulkApproveSchema, returnSchema, titrationUpdateSchema, transitionSchema, versionField } from '../../shared/schemas/bench.js';
import { parseOrThrow } from '../../shared/schemas/parse.js';
import { z } from 'zod';
import type { Config } from '../config.js';
import { ValidationError } from '../errors.js';
import { actorOf } from '../services/actor.js';
import { assertCsvFile, parseReadingsCsv } from '../services/readingsCsv.js';
import { listReview } from '../services/review.js';
import * as titrations from '../services/titrations.js';
import type { RouteBuilder } from './registry.js';
import { idOf } from './users.js';

type Q = Record<string, unknown>;

const jsonReadingsSchema = z.strictObject({ readings: benchReadingsSchema, version: versionField.optional() });
const formVersion = z.object({ version: z.coerce.number({ error: 'must be a whole number' }).int('must be a whole number').min(0).optional() }).loose();

/** multer's one-file upload; its refusals become our 400 (or 413 over the size limit, see errorHandler). */
function readingsUpload(config: Config): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: config.UPLOAD_LIMIT_BYTES, files: 1, fields: 10 } }).single('file');
  return (req, res, next) =>
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') return next(err);
        return next(new ValidationError(`The upload was refused: ${err.message}.`, { [err.field ?? 'file']: 'send one CSV file in the field "file"' }));
      }
      next(new ValidationError('The upload is not a valid multipart form.', { file: 'send one CSV file in the field "file"' }));
    });
}

/** Titrations, their workflow, the readings upload, and the review queue. */
export function titrationRoutes(r: RouteBuilder, config: Config) {
  r.get('/titrations/:id', 'samples.read', async (req, res) => {
    res.json(await titrations.getTitration(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/titrations/:id', 'samples.write', async (req, res) => {
    res.json(await titrations.updateTitration(actorOf(req), idOf(req.params.id), parseOrThrow(titrationUpdateSchema, req.body)));
  });
  r.post('/titrations/:id/submit', 'samples.write', async (req, res) => {
    res.json(await titrations.submitTitration(actorOf(req), idOf(req.params.id), parseOrThrow(transitionSchema, req.body)));
  });
  r.post('/titrations/:id/approve', 'titrations.approve', async (req, res) => {
    res.json(await titrations.approveTitration(actorOf(req), idOf(req.params.id), parseOrThrow(transitionSchema, req.body)));
  });
  r.post('/titrations/:id/return', 'titrations.approve', async (req, res) => {
    res.json(await titrations.returnTitration(actorOf(req), idOf(req.params.id), parseOrThrow(returnSchema, req.body)));
  });
  r.post('/titrations/:id/amend', 'titrations.approve', async (req, res) => {
    res.status(201).json(await titrations.amendTitration(actorOf(req), idOf(req.params.id), parseOrThrow(amendSchema, req.body)));
  });
  r.post('/titrations/:id/readings', 'samples.write', readingsUpload(config), async (req, res) => {
    const id = idOf(req.params.id);
    if (req.file) {
      assertCsvFile(req.file);
      const { version } = parseOrThrow(formVersion, req.body);
      res.json(await titrations.replaceReadings(actorOf(req), id, parseReadingsCsv(req.file.buffer), version, `csv:${req.file.originalname}`));
      return;
    }
    if (req.is('application/json') && req.body && typeof req.body === 'object' && 'readings' in req.body) {
      const body = parseOrThrow(jsonReadingsSchema, req.body);
      res.json(await titrations.replaceReadings(actorOf(req), id, body.readings, body.version, 'json'));
      return;
    }
    throw new ValidationError('Send the readings as a CSV file in the multipart field "file".', { file: 'required' });
  });
  r.get('/titrations/:id/audit', 'samples.read', async (req, res) => {
    res.json(await titrations.titrationAudit(actorOf(req), idOf(req.params.id), req.query as Q));
  });

  r.get('/review', 'titrations.approve', async (req, res) => {
    res.json(await listReview(actorOf(req), req.query as Q));
  });
  r.post('/review/approve', 'titrations.approve', async (req, res) => {
    res.json(await titrations.bulkApprove(actorOf(req), parseOrThrow(bulkApproveSchema, req.body)));
  });
}
