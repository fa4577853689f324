import type { z } from 'zod';
import { InputError } from '../../shared/errors.js';
import type { benchEntrySchema, benchImportSchema } from '../../shared/schemas/bench.js';
import type { SampleView, TitrationView } from '../../shared/types/bench.js';
import { AppError, ConflictError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { insertBuilt } from '../db/batchInsert.js';
import { Sample, Titration } from '../db/models/index.js';
import { auditMany } from './audit.js';
import { benchSnapshot } from './benchViews.js';
import { benchSettings } from './benchSettings.js';
import { buildSample, createSample, getSample, pointForSample } from './samples.js';
import { batchLookups, buildTitration, createTitration, getTitration, insertReadings, refreshSampleStatus, submitTitration } from './titrations.js';
import { inTransaction } from './transaction.js';

/** A service's field errors named under the part of the entry they belong to (`sample.pointId`). */
async function under<T>(part: string, work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (e) {
    const fields = e instanceof AppError || e instanceof InputError ? e.fields : undefined;
    if (!fields || !Object.keys(fields).length) throw e;
    const named = Object.fromEntries(Object.entries(fields).map(([k, v]) => [`${part}.${k}`, v]));
    if (e instanceof ConflictError) throw new ConflictError(e.message, named);
    if (e instanceof InputError || (e instanceof AppError && e.status === 400)) throw new ValidationError(e.message, named);
    throw e;
  }
}

/**
 * One row of the daily entry grid: the sample, its titration and (optionally) the submission
 * through the same services as the separate routes, in one transaction, so a failure anywhere
 * leaves nothing of the row behind.
 */
export async function createBenchEntry(actor: Actor, input: z.output<typeof benchEntrySchema>): Promise<{ sample: SampleView; titration: TitrationView }> {
  const ids = await inTransaction(undefined, async (t) => {
    const sample = await under('sample', () => createSample(actor, input.sample, t));
    const titration = await under('titration', () => createTitration(actor, sample.id, input.titration, t));
    if (input.submit) await under('titration', () => submitTitration(actor, titration.id, { version: titration.version }, t));
    return { sampleId: sample.id, titrationId: titration.id };
  });
  return { sample: await getSample(actor, ids.sampleId), titration: await getTitration(actor, ids.titrationId) };
}

/**
 * Many entries in one transaction, each checked and computed by the same functions as one typed
 * in the grid (the same rules, engine and qualifiers), but saved in batched inserts: the points,
 * lots, standardisations and calibrations are read once for the batch. Every entry is checked
 * before anything is written; the first failure undoes them all and is named by its position
 * (`entries.3.titration.volumeToTotalEndpointMl`). Entries to submit go through the submit
 * service after the insert.
 */
export async function importBenchEntries(actor: Actor, input: z.output<typeof benchImportSchema>): Promise<{ created: number; items: Array<{ sampleId: number; titrationId: number; status: string }> }> {
  const items = await inTransaction(undefined, async (t) => {
    const points = new Map<number, Awaited<ReturnType<typeof pointForSample>>>();
    const samples: Array<ReturnType<typeof buildSample>> = [];
    for (const [i, entry] of input.entries.entries()) {
      samples.push(
        await under(`entries.${i}.sample`, async () => {
          let point = points.get(entry.sample.pointId);
          if (!point) points.set(entry.sample.pointId, (point = await pointForSample(actor, entry.sample.pointId, t)));
          return buildSample(actor, point, entry.sample);
        }),
      );
    }
    const settings = await benchSettings(actor.labId, t);
    const lookups = await batchLookups(
      input.entries.map((e) => ({ titrantId: e.titration.titrantId, analysedAt: e.titration.analysedAt ? new Date(e.titration.analysedAt) : new Date(), performedByOrgId: actor.organizationId })),
      t,
    );
    const built: Array<Awaited<ReturnType<typeof buildTitration>>> = [];
    for (const [i, entry] of input.entries.entries()) {
      built.push(await under(`entries.${i}.titration`, () => buildTitration(actor, samples[i], entry.titration, { settings, lookups }, t)));
    }

    // Everything checked: the batched writes.
    const savedSamples = await insertBuilt(Sample, samples, t);
    built.forEach((b, i) => b.row.set('sampleId', savedSamples[i].id));
    const savedTitrations = await insertBuilt(Titration, built.map((b) => b.row), t);
    await insertReadings(savedTitrations.flatMap((row, i) => (built[i].readings?.length ? [{ titrationId: row.id, readings: built[i].readings! }] : [])), t);
    await auditMany(
      actor,
      [
        ...savedSamples.map((s) => ({ action: 'sample.created', entity: 'sample', entityId: s.id, organizationId: s.organizationId, after: benchSnapshot(s) })),
        ...savedTitrations.map((row) => ({ action: 'titration.created', entity: 'titration', entityId: row.id, organizationId: row.organizationId, after: benchSnapshot(row) })),
      ],
      t,
    );
    await refreshSampleStatus(savedSamples.map((s) => s.id), t);

    const out: Array<{ sampleId: number; titrationId: number; status: string }> = [];
    for (const [i, entry] of input.entries.entries()) {
      const row = savedTitrations[i];
      const status = entry.submit ? (await under(`entries.${i}.titration`, () => submitTitration(actor, row.id, { version: row.version }, t))).status : row.status;
      out.push({ sampleId: Number(savedSamples[i].id), titrationId: Number(row.id), status });
    }
    return out;
  });
  return { created: items.length, items };
}
