import { Op } from 'sequelize';
import { volatileAcidsRatio } from '../../shared/chemistry/bench.js';
import type { ToolInputField, ToolInputs, ToolInputValue } from '../../shared/types/tools.js';
import { Titration } from '../db/models/index.js';
import { ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { idParam } from './listing.js';
import { orgScope } from './scope.js';
import { findPoint } from './sites.js';

/** Approved results looked through for a figure that the latest one did not record. */
const SEARCH_DEPTH = 60;

const num = (v: string | null | undefined) => (v === null || v === undefined ? null : Number(v));

/**
 * A monitoring point's latest approved figures for the Tools pages: alkalinity, pH, temperature,
 * TDS, conductance, volatile acids, acidity and the titration's own inputs, each taken from the
 * most recent approved result that records it, and named with that result and its date.
 */
export async function latestToolInputs(actor: Actor, raw: Record<string, unknown>): Promise<ToolInputs> {
  const pointId = idParam(raw.pointId, 'pointId');
  if (!pointId) throw new ValidationError('Choose a monitoring point.', { pointId: 'required' });
  const point = await findPoint(actor, pointId).catch(() => {
    throw new ValidationError('Choose one of your monitoring points.', { pointId: 'not found' });
  });
  const rows = await Titration.findAll({
    where: { [Op.and]: [orgScope(actor), { pointId, status: 'approved', computed: true }] },
    order: [['analysedAt', 'DESC'], ['id', 'DESC']],
    limit: SEARCH_DEPTH,
  });
  const values: Partial<Record<ToolInputField, ToolInputValue>> = {};
  const take = (field: ToolInputField, row: Titration, value: number | null) => {
    if (values[field] || value === null || !Number.isFinite(value)) return;
    values[field] = { value, titrationId: row.id, sampleId: row.sampleId, analysedAt: row.analysedAt.toISOString() };
  };
  for (const row of rows) {
    if (row.analysis === 'alkalinity') {
      take('totalAlkalinity', row, num(row.totalAlkalinity));
      take('phenolphthaleinAlkalinity', row, num(row.phenolphthaleinAlkalinity));
      // The titration's own inputs belong together: take them from the same (latest) alkalinity result.
      if (!values.sampleVolumeMl) {
        take('sampleVolumeMl', row, num(row.sampleVolumeMl));
        take('titrantNormality', row, num(row.normalityUsed));
        take('volumeToPh83Ml', row, num(row.endpointPVolumeMl ?? row.volumeToPh83Ml));
        take('volumeToTotalEndpointMl', row, num(row.endpointTVolumeMl ?? row.volumeToTotalEndpointMl));
      }
      take('volatileAcidsMgL', row, num(row.volatileAcidsMgL));
    } else {
      take('totalAcidity', row, num(row.totalAcidity));
    }
    take('pH', row, num(row.initialPh));
    take('temperatureC', row, num(row.temperatureC));
    take('tdsMgL', row, num(row.tdsMgL));
    take('specificConductanceUsCm', row, num(row.specificConductanceUsCm));
  }
  // The digester tool's trend: ratios of the approved results before the one the figures came from.
  const ratios: number[] = [];
  for (const row of rows) {
    if (row.analysis !== 'alkalinity' || row.volatileAcidsMgL === null || row.totalAlkalinity === null) continue;
    if (row.id === values.volatileAcidsMgL?.titrationId) continue;
    const r = volatileAcidsRatio(row.volatileAcidsMgL, row.totalAlkalinity);
    if (r) ratios.push(r.ratio);
    if (ratios.length === 5) break;
  }
  const f = point.facility!;
  return {
    previousVolatileAcidsRatios: ratios.reverse(), point: { id: point.id, code: point.code, name: point.name, matrix: point.matrix, facility: { id: f.id, name: f.name } }, values, searched: rows.length };
}
