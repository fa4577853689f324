import dayjs from 'dayjs';
import timezone from 'dayjs/plugin/timezone.js';
import utc from 'dayjs/plugin/utc.js';
import { Op, type Order, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { SAMPLE_STATUSES, sampleRuleErrors, type sampleCreateSchema, type sampleUpdateSchema } from '../../shared/schemas/bench.js';
import type { SampleView } from '../../shared/types/bench.js';
import { Facility, MonitoringPoint, Sample, Titration } from '../db/models/index.js';
import { ConflictError, NotFoundError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { audit } from './audit.js';
import { benchSettings } from './benchSettings.js';
import { benchSnapshot, sampleIncludes, sampleView } from './benchViews.js';
import { idParam, listParams } from './listing.js';
import { assertInScope, orgScope } from './scope.js';
import { findPoint } from './sites.js';
import { refreshQualifiers } from './titrations.js';
import { inTransaction } from './transaction.js';

dayjs.extend(utc);
dayjs.extend(timezone);

const FUTURE_SLACK_MS = 5 * 60_000;

/** A list bound: an instant, or a date read in `zone` (the start of `from`'s day, the end of `to`'s). */
function boundParam(raw: unknown, field: string, zone: string, end: boolean): Date | undefined {
  if (raw === undefined || raw === '') return undefined;
  const text = String(raw);
  if (/^\d{4}-\d{2}-\d{2}$/.test(text)) {
    const day = dayjs.tz(text, zone);
    if (!day.isValid() || day.format('YYYY-MM-DD') !== text) throw new ValidationError(`${field} is not a real date.`, { [field]: 'a date YYYY-MM-DD or an ISO date-time' });
    return (end ? day.add(1, 'day') : day).toDate();
  }
  const d = new Date(text);
  if (Number.isNaN(d.getTime()) || !/[zZ]|[+-]\d{2}:\d{2}$/.test(text)) throw new ValidationError(`${field} must be a date.`, { [field]: 'a date YYYY-MM-DD or an ISO date-time with Z or an offset' });
  return d;
}

async function withTitrations(samples: Sample[], t?: Transaction): Promise<SampleView[]> {
  const ids = samples.map((s) => s.id);
  const titrations = ids.length
    ? await Titration.findAll({
        where: { sampleId: { [Op.in]: ids }, status: { [Op.ne]: 'superseded' } },
        attributes: ['id', 'sampleId', 'analysis', 'method', 'status', 'revision', 'version', 'analysedAt', 'computed', 'result', 'qualifiers', 'warnings'],
        order: [['analysedAt', 'ASC'], ['id', 'ASC']],
        transaction: t,
      })
    : [];
  const bySample = new Map<number, Titration[]>();
  for (const row of titrations) bySample.set(row.sampleId, [...(bySample.get(row.sampleId) ?? []), row]);
  return samples.map((s) => sampleView(s, bySample.get(s.id) ?? []));
}

/** The Bench list: samples in scope with their current titrations; filters facilityId, pointId, from, to, status. */
export async function listSamples(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { collectedAt: 'collectedAt', receivedAt: 'receivedAt', createdAt: 'createdAt', status: 'status', point: 'point.code' }, '-collectedAt');
  const where: WhereOptions[] = [orgScope(actor)];
  const facilityId = idParam(raw.facilityId, 'facilityId');
  const pointId = idParam(raw.pointId, 'pointId');
  if (facilityId) where.push({ facilityId });
  if (pointId) where.push({ pointId });
  let zone = 'UTC';
  if (facilityId || pointId) {
    // Plain dates are days of the facility's own calendar.
    const f = facilityId
      ? await Facility.findByPk(facilityId, { attributes: ['timezone'] })
      : ((await MonitoringPoint.findByPk(pointId!, { include: [{ model: Facility, as: 'facility', attributes: ['timezone'] }] }))?.facility ?? null);
    if (f) zone = f.timezone;
  }
  const from = boundParam(raw.from, 'from', zone, false);
  const to = boundParam(raw.to, 'to', zone, true);
  if (from) where.push({ collectedAt: { [Op.gte]: from } });
  if (to) where.push({ collectedAt: { [/^\d{4}-\d{2}-\d{2}$/.test(String(raw.to)) ? Op.lt : Op.lte]: to } });
  if (raw.status !== undefined && raw.status !== '') {
    const statuses = String(raw.status).split(',');
    for (const s of statuses) if (!(SAMPLE_STATUSES as readonly string[]).includes(s)) throw new ValidationError('Unknown sample status.', { status: `one or more of ${SAMPLE_STATUSES.join(', ')}` });
    where.push({ status: { [Op.in]: statuses } });
  }
  // The page's ids first, from the index alone (the tie-break on id runs the same way as the
  // sort so the index order serves it), then those rows with their associations.
  const order = (p.order as Array<[...string[]]>).map((o, i, all) => (i === all.length - 1 ? ['id', all[0][all[0].length - 1]] : o)) as Order;
  const sortedByOwnColumn = !String((p.order as string[][])[0][0]).includes('point');
  const filter = { [Op.and]: where };
  const [count, ids] = await Promise.all([
    Sample.count({ where: filter }),
    sortedByOwnColumn
      ? Sample.findAll({ attributes: ['id'], where: filter, order, limit: p.limit, offset: p.offset }).then((r) => r.map((x) => x.id))
      : Sample.findAll({ attributes: ['id'], where: filter, include: [{ model: MonitoringPoint, as: 'point', attributes: [] }], order, limit: p.limit, offset: p.offset }).then((r) => r.map((x) => x.id)),
  ]);
  const rows = ids.length ? await Sample.findAll({ where: { id: { [Op.in]: ids } }, include: sampleIncludes() }) : [];
  const byId = new Map(rows.map((r) => [r.id, r]));
  return { items: await withTitrations(ids.map((id) => byId.get(id)!)), total: count };
}

async function findSample(actor: Actor, id: number, t?: Transaction) {
  const s = await Sample.findByPk(id, { include: sampleIncludes(), transaction: t });
  if (!s) throw new NotFoundError('Sample');
  assertInScope(actor, s.organizationId, 'Sample');
  return s;
}

export async function getSample(actor: Actor, id: number, t?: Transaction): Promise<SampleView> {
  return (await withTitrations([await findSample(actor, id, t)], t))[0];
}

function notInFuture(fields: Record<string, string | null | undefined>) {
  const errors: Record<string, string> = {};
  for (const [k, v] of Object.entries(fields)) if (v && Date.parse(v) > Date.now() + FUTURE_SLACK_MS) errors[k] = 'must not be in the future';
  if (Object.keys(errors).length) throw new ValidationError('A time is in the future.', errors);
}

const toDate = (v: string | null | undefined) => (v ? new Date(v) : null);

/** An operator logs a sample at one of their utility's points; the lab may log one for any client. */
/** The point a new sample is logged at, in the actor's scope and in use. */
export async function pointForSample(actor: Actor, pointId: number, tx?: Transaction): Promise<MonitoringPoint & { facility: Facility }> {
  const point = await findPoint(actor, pointId, tx).catch((e) => {
    if (e instanceof NotFoundError) throw new ValidationError('Choose one of your monitoring points.', { pointId: 'not found' });
    throw e;
  });
  if (!point.active || !point.facility!.active) throw new ValidationError('This monitoring point is no longer in use.', { pointId: 'inactive point' });
  return point as MonitoringPoint & { facility: Facility };
}

/** A new sample's row, checked but not saved (an import saves a batch at once). */
export function buildSample(actor: Actor, point: MonitoringPoint & { facility: Facility }, input: z.output<typeof sampleCreateSchema>): Sample & { facility: Facility } {
  notInFuture({ collectedAt: input.collectedAt, receivedAt: input.receivedAt, compositeEndAt: input.compositeEndAt });
  const s = Sample.build(sampleFields(actor, point, input), { raw: true }) as Sample & { facility: Facility };
  s.facility = point.facility;
  return s;
}

function sampleFields(actor: Actor, point: MonitoringPoint & { facility: Facility }, input: z.output<typeof sampleCreateSchema>) {
  return {
    organizationId: point.facility.organizationId,
    facilityId: point.facilityId,
    pointId: point.id,
    sampleType: input.sampleType,
    compositeStartAt: toDate(input.compositeStartAt),
    compositeEndAt: toDate(input.compositeEndAt),
    collectedAt: new Date(input.collectedAt),
    collectedBy: input.collectedBy,
    receivedAt: toDate(input.receivedAt),
    receiptTemperatureC: input.receiptTemperatureC === null || input.receiptTemperatureC === undefined ? null : String(input.receiptTemperatureC),
    preservation: input.preservation,
    filtered: input.filtered ?? false,
    notes: input.notes,
    createdById: actor.id,
  };
}

export async function createSample(actor: Actor, input: z.output<typeof sampleCreateSchema>, tx?: Transaction): Promise<SampleView> {
  const point = await pointForSample(actor, input.pointId, tx);
  notInFuture({ collectedAt: input.collectedAt, receivedAt: input.receivedAt, compositeEndAt: input.compositeEndAt });
  const created = await inTransaction(tx, async (t) => {
    const s = await Sample.create(
      sampleFields(actor, point, input),
      { transaction: t },
    );
    await audit(actor, { action: 'sample.created', entity: 'sample', entityId: s.id, organizationId: s.organizationId, after: benchSnapshot(s) }, t);
    return s;
  });
  // Inside a caller's transaction (the seed) the new row is returned as it stands.
  return tx ? sampleView(created) : getSample(actor, created.id);
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

/**
 * Edits a sample (optimistic lock on `version`). Once one of its results is approved only the
 * notes may change, since the rest decides that record's qualifiers; results not yet approved
 * are re-qualified with the new details.
 */
export async function updateSample(actor: Actor, id: number, input: z.output<typeof sampleUpdateSchema>): Promise<SampleView> {
  await inTransaction(undefined, async (t) => {
    const s = await Sample.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
    if (!s) throw new NotFoundError('Sample');
    assertInScope(actor, s.organizationId, 'Sample');
    if (input.version !== s.version) throw new ConflictError(`This sample was changed by someone else (now version ${s.version}); reload it and try again.`, { version: `stale: current version is ${s.version}` });
    const { version: _v, ...changes } = input;
    const titrations = await Titration.findAll({ where: { sampleId: s.id }, transaction: t });
    const locked = titrations.some((x) => x.status === 'approved' || x.status === 'superseded');
    const changed = Object.keys(changes).filter((k) => (changes as Record<string, unknown>)[k] !== undefined);
    if (locked && changed.some((k) => k !== 'notes')) {
      throw new ConflictError('This sample has approved results: only its notes can change. Amend the result to correct it.', Object.fromEntries(changed.filter((k) => k !== 'notes').map((k) => [k, 'locked by an approved result'])));
    }
    if (changes.pointId !== undefined && changes.pointId !== s.pointId) {
      if (titrations.length) throw new ConflictError('A sample with titrations cannot move to another point.', { pointId: 'the sample has titrations' });
      const point = await findPoint(actor, changes.pointId).catch(() => {
        throw new ValidationError('Choose one of your monitoring points.', { pointId: 'not found' });
      });
      s.set({ pointId: point.id, facilityId: point.facilityId, organizationId: point.facility!.organizationId });
    }
    const merged = {
      sampleType: changes.sampleType ?? s.sampleType,
      compositeStartAt: changes.compositeStartAt !== undefined ? changes.compositeStartAt : iso(s.compositeStartAt),
      compositeEndAt: changes.compositeEndAt !== undefined ? changes.compositeEndAt : iso(s.compositeEndAt),
      collectedAt: changes.collectedAt ?? iso(s.collectedAt),
      receivedAt: changes.receivedAt !== undefined ? changes.receivedAt : iso(s.receivedAt),
    };
    const errors = sampleRuleErrors(merged);
    if (Object.keys(errors).length) throw new ValidationError('The sample’s times do not fit together.', errors);
    notInFuture({ collectedAt: changes.collectedAt, receivedAt: changes.receivedAt, compositeEndAt: changes.compositeEndAt });
    const earliestAnalysis = titrations.reduce<number | null>((m, x) => (m === null || x.analysedAt.getTime() < m ? x.analysedAt.getTime() : m), null);
    if (earliestAnalysis !== null && Date.parse(merged.collectedAt!) > earliestAnalysis) throw new ValidationError('A titration of this sample was analysed before that time.', { collectedAt: 'must not be after an analysis of the sample' });

    const before = benchSnapshot(s);
    if (changes.sampleType !== undefined) s.sampleType = changes.sampleType;
    if (changes.compositeStartAt !== undefined) s.compositeStartAt = toDate(changes.compositeStartAt);
    if (changes.compositeEndAt !== undefined) s.compositeEndAt = toDate(changes.compositeEndAt);
    if (changes.collectedAt !== undefined) s.collectedAt = new Date(changes.collectedAt);
    if (changes.receivedAt !== undefined) s.receivedAt = toDate(changes.receivedAt);
    if (changes.receiptTemperatureC !== undefined) s.receiptTemperatureC = changes.receiptTemperatureC === null ? null : String(changes.receiptTemperatureC);
    for (const k of ['collectedBy', 'preservation', 'notes'] as const) if (changes[k] !== undefined) s[k] = changes[k] ?? null;
    if (changes.filtered !== undefined) s.filtered = changes.filtered;
    await s.save({ transaction: t });
    await audit(actor, { action: 'sample.updated', entity: 'sample', entityId: s.id, organizationId: s.organizationId, before, after: benchSnapshot(s) }, t);
    const settings = await benchSettings(actor.labId, t);
    for (const row of titrations) await refreshQualifiers(actor, row, t, settings);
  });
  return getSample(actor, id);
}
