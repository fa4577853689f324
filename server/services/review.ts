import { Op, type WhereOptions } from 'sequelize';
import type { ReviewItem } from '../../shared/types/bench.js';
import { Sample, Titration } from '../db/models/index.js';
import { ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { benchSettings } from './benchSettings.js';
import { sampleIncludes, sampleView, titrationIncludes, titrationView } from './benchViews.js';
import { boolParam, idParam, listParams } from './listing.js';
import { orgScope } from './scope.js';
import { historyFor } from './titrations.js';

/**
 * The analyst's queue: submitted results in scope, each with its point's recent approved values
 * and the "unusual" flag (beyond k SD of the last n, 3 and 30 by default), so a transcription
 * error shows before approval.
 */
export async function listReview(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { submittedAt: 'submittedAt', analysedAt: 'analysedAt', createdAt: 'createdAt' }, 'submittedAt');
  const where: WhereOptions[] = [orgScope(actor), { status: 'submitted' }];
  const pointId = idParam(raw.pointId, 'pointId');
  if (pointId) where.push({ pointId });
  if (raw.analysis !== undefined && raw.analysis !== '') {
    if (raw.analysis !== 'alkalinity' && raw.analysis !== 'acidity') throw new ValidationError('Unknown analysis.', { analysis: 'alkalinity or acidity' });
    where.push({ analysis: raw.analysis });
  }
  const qualified = boolParam(raw.qualified, 'qualified');
  if (qualified !== undefined) where.push({ qualified });
  const facilityId = idParam(raw.facilityId, 'facilityId');
  const { rows, count } = await Titration.findAndCountAll({
    where: { [Op.and]: where },
    include: [...titrationIncludes(), { model: Sample, as: 'sample', required: true, include: sampleIncludes(), ...(facilityId ? { where: { facilityId } } : {}) }],
    order: p.order,
    limit: p.limit,
    offset: p.offset,
    distinct: true,
  });
  const settings = await benchSettings(actor.labId);
  const items: ReviewItem[] = await Promise.all(
    rows.map(async (row) => {
      const history = await historyFor(row, settings);
      const { titrations: _t, ...sample } = sampleView(row.sample!);
      return { ...titrationView(row), sample, history, unusual: history.unusual };
    }),
  );
  return { items, total: count };
}
