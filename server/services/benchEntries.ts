import type { z } from 'zod';
import { InputError } from '../../shared/errors.js';
import type { benchEntrySchema, benchImportSchema } from '../../shared/schemas/bench.js';
import type { SampleView, TitrationView } from '../../shared/types/bench.js';
import { AppError, ConflictError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { createSample, getSample } from './samples.js';
import { createTitration, getTitration, submitTitration } from './titrations.js';
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
 * Many entries in one transaction, through the same services, so each is checked and computed
 * exactly as one typed in the grid; the first failure undoes them all and is named by its
 * position (`entries.3.titration.volumeToTotalEndpointMl`).
 */
export async function importBenchEntries(actor: Actor, input: z.output<typeof benchImportSchema>): Promise<{ created: number; items: Array<{ sampleId: number; titrationId: number; status: string }> }> {
  const items = await inTransaction(undefined, async (t) => {
    const out: Array<{ sampleId: number; titrationId: number; status: string }> = [];
    for (const [i, entry] of input.entries.entries()) {
      const sample = await under(`entries.${i}.sample`, () => createSample(actor, entry.sample, t));
      let titration = await under(`entries.${i}.titration`, () => createTitration(actor, sample.id, entry.titration, t));
      if (entry.submit) titration = await under(`entries.${i}.titration`, () => submitTitration(actor, titration.id, { version: titration.version }, t));
      out.push({ sampleId: Number(sample.id), titrationId: Number(titration.id), status: titration.status });
    }
    return out;
  });
  return { created: items.length, items };
}
