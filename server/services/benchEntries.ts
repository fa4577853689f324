import type { z } from 'zod';
import { InputError } from '../../shared/errors.js';
import type { benchEntrySchema } from '../../shared/schemas/bench.js';
import type { SampleView, TitrationView } from '../../shared/types/bench.js';
import { AppError, ConflictError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { createSample, getSample } from './samples.js';
import { createTitration, getTitration, submitTitration } from './titrations.js';
import { inTransaction } from './transaction.js';

/** A service's field errors named under the part of the entry they belong to (`sample.pointId`). */
async function under<T>(part: 'sample' | 'titration', work: () => Promise<T>): Promise<T> {
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
