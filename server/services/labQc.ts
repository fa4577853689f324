import { Op, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { evaluateQc, meterCalibration, standardize } from '../../shared/chemistry/bench.js';
import { nernstSlopeMvPerPh } from '../../shared/chemistry/qc.js';
import { Dec } from '../../shared/chemistry/decimal.js';
import {
  PRIMARY_STANDARD_KIND,
  type calibrationCreateSchema,
  type qcBatchCreateSchema,
  type qcBatchUpdateSchema,
  type standardizationCreateSchema,
  type titrantCreateSchema,
  type titrantUpdateSchema,
} from '../../shared/schemas/bench.js';
import type { QcBatchView } from '../../shared/types/bench.js';
import { MeterCalibration, QcBatch, Standardization, Titrant, Titration, User } from '../db/models/index.js';
import { ConflictError, NotFoundError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { audit } from './audit.js';
import { benchSettings } from './benchSettings.js';
import { benchSnapshot, calibrationView, standardizationView, titrantView, userRef } from './benchViews.js';
import { boolParam, idParam, listParams } from './listing.js';
import { assertInScope, assertInSharedScope, orgScope, sharedScope } from './scope.js';
import { refreshQualifiers } from './titrations.js';
import { inTransaction } from './transaction.js';

/** Titrant lots, standardisations, pH meter calibrations and QC batches. */

const DAY_MS = 86_400_000;
const FUTURE_SLACK_MS = 5 * 60_000;

function dateParam(raw: unknown, field: string): Date | undefined {
  if (raw === undefined || raw === '') return undefined;
  const d = new Date(String(raw));
  if (Number.isNaN(d.getTime())) throw new ValidationError(`${field} must be a date.`, { [field]: 'an ISO date or date-time' });
  return d;
}

function notFuture(value: string, field: string) {
  if (Date.parse(value) > Date.now() + FUTURE_SLACK_MS) throw new ValidationError('A time is in the future.', { [field]: 'must not be in the future' });
}

// ---- titrant lots ----------------------------------------------------------------------------

async function currentStandardizations(titrantIds: number[], t?: Transaction) {
  if (!titrantIds.length) return new Map<number, Standardization>();
  const rows = await Standardization.findAll({ where: { titrantId: { [Op.in]: titrantIds }, accepted: true, standardizedAt: { [Op.lte]: new Date() } }, order: [['standardizedAt', 'DESC'], ['id', 'DESC']], transaction: t });
  const out = new Map<number, Standardization>();
  for (const r of rows) if (!out.has(r.titrantId)) out.set(r.titrantId, r);
  return out;
}

export async function listTitrants(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { lot: 'lot', expiresOn: 'expiresOn', createdAt: 'createdAt', reagent: 'reagent' }, '-createdAt');
  const where: WhereOptions[] = [sharedScope(actor)];
  if (raw.kind === 'acid' || raw.kind === 'base') where.push({ kind: raw.kind });
  const active = boolParam(raw.active, 'active');
  if (active !== undefined) where.push({ active });
  if (p.query.q) where.push({ lot: { [Op.like]: `%${p.query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` } });
  const { rows, count } = await Titrant.findAndCountAll({ where: { [Op.and]: where }, order: p.order, limit: p.limit, offset: p.offset });
  const current = await currentStandardizations(rows.map((r) => r.id));
  return { items: rows.map((r) => titrantView(r, current.get(r.id) ?? null)), total: count };
}

async function findTitrant(actor: Actor, id: number, t?: Transaction) {
  const row = await Titrant.findByPk(id, { transaction: t });
  if (!row) throw new NotFoundError('Titrant lot');
  assertInSharedScope(actor, row.organizationId, 'Titrant lot');
  return row;
}

export async function getTitrant(actor: Actor, id: number, t?: Transaction) {
  const row = await findTitrant(actor, id, t);
  return titrantView(row, (await currentStandardizations([row.id], t)).get(row.id) ?? null);
}

export async function createTitrant(actor: Actor, input: z.output<typeof titrantCreateSchema>, tx?: Transaction) {
  const organizationId = input.organizationId ?? actor.organizationId;
  if (!actor.visibleOrgIds.includes(organizationId)) throw new ValidationError('Choose one of your organisations.', { organizationId: 'not found' });
  if (await Titrant.findOne({ where: { organizationId, lot: input.lot }, transaction: tx })) throw new ConflictError('A titrant lot of that number exists.', { lot: 'already in use' });
  const id = await inTransaction(tx, async (t) => {
    const row = await Titrant.create(
      { organizationId, kind: input.kind, reagent: input.reagent, nominalNormality: String(input.nominalNormality), lot: input.lot, expiresOn: input.expiresOn, preparedOn: input.preparedOn ?? null, notes: input.notes, createdById: actor.id },
      { transaction: t },
    );
    await audit(actor, { action: 'titrant.created', entity: 'titrant', entityId: row.id, organizationId, after: benchSnapshot(row) }, t);
    return row.id;
  });
  return getTitrant(actor, id, tx);
}

export async function updateTitrant(actor: Actor, id: number, input: z.output<typeof titrantUpdateSchema>) {
  await inTransaction(undefined, async (t) => {
    const row = await findTitrant(actor, id, t);
    if (!actor.visibleOrgIds.includes(row.organizationId)) throw new NotFoundError('Titrant lot');
    if (input.version !== row.version) throw new ConflictError(`This lot was changed by someone else (now version ${row.version}).`, { version: `stale: current version is ${row.version}` });
    if (input.lot && input.lot !== row.lot && (await Titrant.findOne({ where: { organizationId: row.organizationId, lot: input.lot }, transaction: t }))) {
      throw new ConflictError('A titrant lot of that number exists.', { lot: 'already in use' });
    }
    const before = benchSnapshot(row);
    const { version: _v, ...changes } = input;
    await row.update(Object.fromEntries(Object.entries(changes).filter(([, v]) => v !== undefined)), { transaction: t });
    await audit(actor, { action: input.active === false ? 'titrant.deactivated' : 'titrant.updated', entity: 'titrant', entityId: row.id, organizationId: row.organizationId, before, after: benchSnapshot(row) }, t);
  });
  return getTitrant(actor, id);
}

// ---- standardisations ------------------------------------------------------------------------

export async function listStandardizations(actor: Actor, titrantId: number, raw: Record<string, unknown>) {
  const titrant = await findTitrant(actor, titrantId);
  const p = listParams(raw, { standardizedAt: 'standardizedAt', createdAt: 'createdAt' }, '-standardizedAt');
  const { rows, count } = await Standardization.findAndCountAll({
    where: { titrantId: titrant.id },
    include: [{ model: User, as: 'standardizedBy', attributes: ['id', 'name'] }],
    order: p.order,
    limit: p.limit,
    offset: p.offset,
  });
  return { items: rows.map(standardizationView), total: count };
}

/**
 * Records a standardisation: each replicate's normality and their mean by the shared engine,
 * accepted when the RSD is within the lab's limit, valid for the lab's period (30 days by
 * default, USGS NFM A6.6.2). Titrations analysed from then on use it.
 */
export async function createStandardization(actor: Actor, titrantId: number, input: z.output<typeof standardizationCreateSchema>, tx?: Transaction) {
  const titrant = await findTitrant(actor, titrantId, tx);
  if (!actor.visibleOrgIds.includes(titrant.organizationId)) throw new NotFoundError('Titrant lot');
  if (PRIMARY_STANDARD_KIND[input.primaryStandard] !== titrant.kind) {
    throw new ValidationError(`${input.primaryStandard} standardises ${PRIMARY_STANDARD_KIND[input.primaryStandard] === 'acid' ? 'acid' : 'base'}, and this lot is ${titrant.kind}.`, { primaryStandard: titrant.kind === 'acid' ? 'use Na2CO3 for acid (SM 2320 B)' : 'use KHP for NaOH (SM 2310 B)' });
  }
  notFuture(input.standardizedAt, 'standardizedAt');
  const settings = await benchSettings(actor.labId, tx);
  const outcome = standardize({ ...input, rsdLimitPercent: settings.standardizationRsdMaxPercent });
  const standardizedAt = new Date(input.standardizedAt);
  const validUntil = input.validUntil ? new Date(input.validUntil) : new Date(standardizedAt.getTime() + settings.standardizationValidDays * DAY_MS);
  const id = await inTransaction(tx, async (t) => {
    const row = await Standardization.create(
      {
        titrantId: titrant.id,
        organizationId: titrant.organizationId,
        primaryStandard: input.primaryStandard,
        mode: input.mode,
        standardGramsPerL: input.standardGramsPerL === undefined ? null : String(input.standardGramsPerL),
        replicates: input.replicates.map((r, i) => ({ ...r, normality: outcome.replicateNormalities[i] })),
        // Stored to 8 places; the titrations use the stored figure, so a recomputation matches.
        normality: new Dec(outcome.normality).toDecimalPlaces(8).toFixed(8),
        rsdPercent: new Dec(outcome.rsdPercent).toDecimalPlaces(6).toFixed(6),
        rsdLimitPercent: String(outcome.rsdLimitPercent),
        accepted: outcome.accepted,
        standardizedAt,
        validUntil,
        standardizedById: actor.id,
        notes: input.notes ?? null,
      },
      { transaction: t },
    );
    await audit(actor, { action: outcome.accepted ? 'standardization.accepted' : 'standardization.rejected', entity: 'standardization', entityId: row.id, organizationId: row.organizationId, after: benchSnapshot(row) }, t);
    return row.id;
  });
  const row = await Standardization.findByPk(id, { include: [{ model: User, as: 'standardizedBy', attributes: ['id', 'name'] }], transaction: tx });
  return standardizationView(row!);
}

// ---- pH meter calibrations -------------------------------------------------------------------

const calibrationOut = (c: MeterCalibration) => calibrationView(c, Math.round(nernstSlopeMvPerPh(Number(c.temperatureC)) * 10_000) / 10_000);

export async function listCalibrations(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { calibratedAt: 'calibratedAt', meterId: 'meterId' }, '-calibratedAt');
  const where: WhereOptions[] = [orgScope(actor)];
  if (typeof raw.meterId === 'string' && raw.meterId) where.push({ meterId: raw.meterId });
  const organizationId = idParam(raw.organizationId, 'organizationId');
  if (organizationId) where.push({ organizationId });
  const passed = boolParam(raw.passed, 'passed');
  if (passed !== undefined) where.push({ passed });
  const from = dateParam(raw.from, 'from');
  const to = dateParam(raw.to, 'to');
  if (from) where.push({ calibratedAt: { [Op.gte]: from } });
  if (to) where.push({ calibratedAt: { [Op.lte]: to } });
  const { rows, count } = await MeterCalibration.findAndCountAll({
    where: { [Op.and]: where },
    include: [{ model: User, as: 'calibratedBy', attributes: ['id', 'name'] }],
    order: p.order,
    limit: p.limit,
    offset: p.offset,
  });
  return { items: rows.map(calibrationOut), total: count };
}

export async function getCalibration(actor: Actor, id: number, t?: Transaction) {
  const row = await MeterCalibration.findByPk(id, { include: [{ model: User, as: 'calibratedBy', attributes: ['id', 'name'] }], transaction: t });
  if (!row) throw new NotFoundError('Calibration');
  assertInScope(actor, row.organizationId, 'Calibration');
  return calibrationOut(row);
}

/**
 * Records a calibration on the caller's own bench: slope % and offset by the shared engine,
 * passed within the lab's slope window (95–105 % by default) with any check buffer within
 * ±0.1 pH. Results of that day not yet approved are re-qualified.
 */
export async function createCalibration(actor: Actor, input: z.output<typeof calibrationCreateSchema>, tx?: Transaction) {
  notFuture(input.calibratedAt, 'calibratedAt');
  const settings = await benchSettings(actor.labId, tx);
  const window = { minPercent: settings.electrodeSlopeMinPercent, maxPercent: settings.electrodeSlopeMaxPercent };
  const outcome = meterCalibration(input.buffers, input.temperatureC, window, settings.checkBufferTolerancePh);
  const calibratedAt = new Date(input.calibratedAt);
  const id = await inTransaction(tx, async (t) => {
    const row = await MeterCalibration.create(
      {
        organizationId: actor.organizationId,
        meterId: input.meterId,
        meterName: input.meterName ?? null,
        calibratedAt,
        temperatureC: String(input.temperatureC),
        buffers: input.buffers,
        slopeMvPerPh: outcome.calibration.slopeMvPerPh.toFixed(4),
        percentSlope: outcome.calibration.percentSlope.toFixed(4),
        offsetMv: outcome.calibration.offsetMvAtPh7.toFixed(4),
        slopeMinPercent: String(window.minPercent),
        slopeMaxPercent: String(window.maxPercent),
        checks: outcome.checks,
        passed: outcome.passed,
        warnings: outcome.warnings,
        calibratedById: actor.id,
        notes: input.notes ?? null,
      },
      { transaction: t },
    );
    await audit(actor, { action: outcome.passed ? 'calibration.passed' : 'calibration.failed', entity: 'meter_calibration', entityId: row.id, organizationId: actor.organizationId, after: benchSnapshot(row) }, t);
    if (outcome.passed) {
      // A calibration recorded after the results it covers lifts their qualifier.
      const affected = await Titration.findAll({
        where: { performedByOrgId: actor.organizationId, status: { [Op.in]: ['draft', 'submitted', 'returned'] }, analysedAt: { [Op.gte]: calibratedAt, [Op.lt]: new Date(calibratedAt.getTime() + DAY_MS) } },
        transaction: t,
      });
      for (const row of affected) await refreshQualifiers(actor, row, t, settings);
    }
    return row.id;
  });
  return getCalibration(actor, id, tx);
}

// ---- QC batches ------------------------------------------------------------------------------

async function qcBatchView(actor: Actor, b: QcBatch, t?: Transaction): Promise<QcBatchView> {
  const titrations = await Titration.findAll({ where: { qcBatchId: b.id, ...orgScope(actor) }, attributes: ['id', 'sampleId', 'status', 'analysedAt'], order: [['analysedAt', 'ASC']], transaction: t });
  const analyst = b.analystId ? await User.findByPk(b.analystId, { attributes: ['id', 'name'], transaction: t }) : null;
  return {
    id: b.id,
    organizationId: b.organizationId,
    batchDate: b.batchDate,
    analysis: b.analysis,
    analyst: userRef(analyst),
    evaluation: b.evaluation,
    passed: b.passed,
    notes: b.notes,
    version: b.version,
    titrations: titrations.map((x) => ({ id: x.id, sampleId: x.sampleId, status: x.status, analysedAt: x.analysedAt.toISOString() })),
    createdAt: b.createdAt.toISOString(),
    updatedAt: b.updatedAt.toISOString(),
  };
}

/** Batches the actor may see: the lab's own; for a utility, those covering its results. */
function batchScope(actor: Actor): WhereOptions {
  if (actor.orgKind === 'laboratory') return { organizationId: { [Op.in]: actor.visibleOrgIds } };
  return { id: { [Op.in]: Titration.sequelize!.literal(`(SELECT DISTINCT qc_batch_id FROM titrations WHERE qc_batch_id IS NOT NULL AND organization_id IN (${actor.visibleOrgIds.map(Number).join(',')}))`) } };
}

export async function listQcBatches(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { batchDate: 'batchDate', createdAt: 'createdAt' }, '-batchDate');
  const where: WhereOptions[] = [batchScope(actor)];
  if (raw.analysis === 'alkalinity' || raw.analysis === 'acidity') where.push({ analysis: raw.analysis });
  const passed = boolParam(raw.passed, 'passed');
  if (passed !== undefined) where.push({ passed });
  for (const [field, op] of [['from', Op.gte], ['to', Op.lte]] as const) {
    const v = raw[field];
    if (v === undefined || v === '') continue;
    if (typeof v !== 'string' || !/^\d{4}-\d{2}-\d{2}$/.test(v) || Number.isNaN(Date.parse(v))) throw new ValidationError(`${field} must be a date.`, { [field]: 'a date YYYY-MM-DD' });
    where.push({ batchDate: { [op]: v } });
  }
  const { rows, count } = await QcBatch.findAndCountAll({ where: { [Op.and]: where }, order: p.order, limit: p.limit, offset: p.offset });
  return { items: await Promise.all(rows.map((b) => qcBatchView(actor, b))), total: count };
}

async function findBatch(actor: Actor, id: number, t?: Transaction) {
  const b = await QcBatch.findOne({ where: { [Op.and]: [{ id }, batchScope(actor)] }, transaction: t });
  if (!b) throw new NotFoundError('QC batch');
  return b;
}

export async function getQcBatch(actor: Actor, id: number, t?: Transaction) {
  return qcBatchView(actor, await findBatch(actor, id, t), t);
}

/** Links titrations to a batch: in scope, same analysis, not yet approved, not in another batch. */
async function linkable(actor: Actor, ids: number[], analysis: string, batchId: number | null, t: Transaction) {
  const rows = ids.length ? await Titration.findAll({ where: { id: { [Op.in]: ids } }, transaction: t, lock: t.LOCK.UPDATE }) : [];
  const byId = new Map(rows.map((r) => [r.id, r]));
  const errors: Record<string, string> = {};
  ids.forEach((id, i) => {
    const r = byId.get(id);
    if (!r || !actor.visibleOrgIds.includes(r.organizationId)) errors[`titrationIds.${i}`] = 'not found';
    else if (r.analysis !== analysis) errors[`titrationIds.${i}`] = `is ${r.analysis}, not ${analysis}`;
    else if (r.status === 'approved' || r.status === 'superseded') errors[`titrationIds.${i}`] = `is ${r.status}; approved results are not re-qualified`;
    else if (r.qcBatchId && r.qcBatchId !== batchId) errors[`titrationIds.${i}`] = `already in QC batch ${r.qcBatchId}`;
  });
  if (new Set(ids).size !== ids.length) errors.titrationIds = 'each titration once';
  if (Object.keys(errors).length) throw new ValidationError('Some titrations cannot join this batch.', errors);
  return rows;
}

export async function createQcBatch(actor: Actor, input: z.output<typeof qcBatchCreateSchema>, tx?: Transaction) {
  const settings = await benchSettings(actor.labId, tx);
  const limits = { duplicateRpdMaxPercent: settings.duplicateRpdMaxPercent, checkStandardRecoveryMinPercent: settings.checkStandardRecoveryMinPercent, checkStandardRecoveryMaxPercent: settings.checkStandardRecoveryMaxPercent };
  const evaluation = evaluateQc(input, limits);
  const id = await inTransaction(tx, async (t) => {
    const titrations = await linkable(actor, input.titrationIds, input.analysis, null, t);
    const b = await QcBatch.create(
      { organizationId: actor.organizationId, batchDate: input.batchDate, analysis: input.analysis, analystId: actor.id, duplicates: input.duplicates, checkStandards: input.checkStandards, blanks: input.blanks, evaluation, limits, passed: evaluation.passed, notes: input.notes ?? null },
      { transaction: t },
    );
    await audit(actor, { action: evaluation.passed ? 'qc_batch.passed' : 'qc_batch.failed', entity: 'qc_batch', entityId: b.id, organizationId: b.organizationId, after: { ...benchSnapshot(b), titrationIds: input.titrationIds } }, t);
    for (const row of titrations) {
      row.qcBatchId = b.id;
      await refreshQualifiers(actor, row, t, settings);
      if (row.changed('qcBatchId')) await row.save({ transaction: t });
    }
    return b.id;
  });
  return getQcBatch(actor, id, tx);
}

export async function updateQcBatch(actor: Actor, id: number, input: z.output<typeof qcBatchUpdateSchema>) {
  await inTransaction(undefined, async (t) => {
    const b = await findBatch(actor, id, t);
    if (actor.orgKind !== 'laboratory' || !actor.visibleOrgIds.includes(b.organizationId)) throw new NotFoundError('QC batch');
    if (input.version !== b.version) throw new ConflictError(`This batch was changed by someone else (now version ${b.version}).`, { version: `stale: current version is ${b.version}` });
    const settings = await benchSettings(actor.labId, t);
    const before = benchSnapshot(b);
    const next = {
      duplicates: input.duplicates ?? b.duplicates,
      checkStandards: input.checkStandards ?? b.checkStandards,
      blanks: input.blanks ?? b.blanks,
    };
    const evaluation = evaluateQc(next, b.limits);
    const current = await Titration.findAll({ where: { qcBatchId: b.id }, transaction: t, lock: t.LOCK.UPDATE });
    let linked = current;
    let removed: Titration[] = [];
    if (input.titrationIds) {
      const kept = new Set(input.titrationIds);
      removed = current.filter((r) => !kept.has(r.id));
      const locked = removed.filter((r) => r.status === 'approved' || r.status === 'superseded');
      if (locked.length) throw new ConflictError('Approved results stay in their batch.', { titrationIds: `titration ${locked[0].id} is ${locked[0].status}` });
      linked = await linkable(actor, input.titrationIds, b.analysis, b.id, t);
    }
    await b.update({ ...next, evaluation, passed: evaluation.passed, ...(input.batchDate ? { batchDate: input.batchDate } : {}), ...(input.notes !== undefined ? { notes: input.notes } : {}) }, { transaction: t });
    await audit(actor, { action: 'qc_batch.updated', entity: 'qc_batch', entityId: b.id, organizationId: b.organizationId, before, after: { ...benchSnapshot(b), titrationIds: linked.map((r) => r.id) } }, t);
    for (const row of removed) {
      row.qcBatchId = null;
      await refreshQualifiers(actor, row, t, settings);
      if (row.changed('qcBatchId')) await row.save({ transaction: t });
    }
    for (const row of linked) {
      row.qcBatchId = b.id;
      await refreshQualifiers(actor, row, t, settings);
      if (row.changed('qcBatchId')) await row.save({ transaction: t });
    }
  });
  return getQcBatch(actor, id);
}
