import dayjs from 'dayjs';
import utc from 'dayjs/plugin/utc.js';
import jwt from 'jsonwebtoken';
import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { affectedPeriods, evaluateMonth } from '../../shared/compliance/evaluate.js';
import { projectLimit } from '../../shared/compliance/projection.js';
import type { ExceedanceRecord, Limit, LimitMonthSummary, Measurement, Parameter } from '../../shared/compliance/types.js';
import { PARAMETER_LABELS, STATISTIC_LABELS } from '../../shared/schemas/permits.js';
import type { Config } from '../config.js';
import { sequelize } from '../db/current.js';
import { Exceedance, Facility, MonitoringPoint, Notice, OutboxMessage, Permit, ProjectionAlert, Sample, Titration, User } from '../db/models/index.js';
import { NotFoundError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { audit, snapshot } from './audit.js';
import { boolParam, idParam, listParams } from './listing.js';
import { enqueueMail, onDelivered } from './outbox.js';
import { engineLimitsFor } from './permits.js';
import { assertInScope, orgScope } from './scope.js';

dayjs.extend(utc);

/** How long a notice's read-only link works. */
const NOTICE_LINK_DAYS = 60;

let appConfig: Config | null = null;
/** The app's configuration, for links and secrets in notices; set once by createApp. */
export function setComplianceConfig(config: Config) {
  appConfig = config;
}
function config(): Config {
  if (!appConfig) throw new Error('compliance configuration missing');
  return appConfig;
}

// ---- measurements from approved results ---------------------------------------------

/** Which stored result column answers each permit parameter. */
const COLUMNS: Record<Parameter, keyof Titration> = {
  total_alkalinity: 'totalAlkalinity',
  phenolphthalein_alkalinity: 'phenolphthaleinAlkalinity',
  bicarbonate: 'bicarbonate',
  carbonate: 'carbonate',
  hydroxide: 'hydroxide',
  acidity: 'totalAcidity',
  ph: 'initialPh',
};

/**
 * Approved, current results at a facility's points between two instants, as the engine's
 * measurements. A negative acidity is not a compliance value (SM 2310 B) and is left out.
 */
export async function measurementsFor(facilityId: number, from: Date, to: Date): Promise<Measurement[]> {
  const rows = await Titration.findAll({
    where: { status: 'approved', supersededById: null },
    include: [{ model: Sample, as: 'sample', required: true, where: { facilityId, collectedAt: { [Op.between]: [from, to] } }, attributes: ['id', 'collectedAt', 'pointId'] }],
    attributes: ['id', 'pointId', 'analysis', ...new Set(Object.values(COLUMNS))] as string[],
  });
  const out: Measurement[] = [];
  for (const t of rows) {
    for (const [parameter, column] of Object.entries(COLUMNS) as [Parameter, keyof Titration][]) {
      const value = t[column] as string | null;
      if (value === null || value === undefined) continue;
      if (parameter === 'acidity' && t.analysis !== 'acidity') continue;
      if (parameter !== 'acidity' && parameter !== 'ph' && t.analysis !== 'alkalinity') continue;
      if (parameter === 'acidity' && Number(value) < 0) continue;
      out.push({ resultId: t.id, pointId: t.sample!.pointId, parameter, value: String(value), sampledAt: t.sample!.collectedAt.toISOString() });
    }
  }
  return out;
}

function monthWindow(month: string): { from: Date; to: Date } {
  // A week straddling the month and a timezone offset both reach past the calendar month.
  const start = dayjs.utc(`${month}-01`);
  return { from: start.subtract(8, 'day').toDate(), to: start.add(1, 'month').add(8, 'day').toDate() };
}

export interface FacilityMonth {
  facility: Facility;
  month: string;
  permits: Array<{ permit: Permit; limits: Limit[]; evaluation: ReturnType<typeof evaluateMonth> }>;
  measurements: Measurement[];
}

/** The engine's month evaluation of every active permit of a facility (40 CFR 122.2 statistics). */
export async function evaluateFacilityMonth(facility: Facility, month: string): Promise<FacilityMonth> {
  if (!/^\d{4}-(0[1-9]|1[0-2])$/.test(month)) throw new ValidationError('The month is not valid.', { month: 'YYYY-MM' });
  const { from, to } = monthWindow(month);
  const [sets, measurements] = await Promise.all([engineLimitsFor(facility.id), measurementsFor(facility.id, from, to)]);
  const permits = sets.map(({ permit, limits }) => ({
    permit,
    limits,
    evaluation: evaluateMonth(limits, measurements, month, facility.timezone, { weekStartsOn: permit.weekStartsOn as 0, weekMonthRule: permit.weekMonthRule }),
  }));
  return { facility, month, permits, measurements };
}

// ---- exceedances and notices ----------------------------------------------------------

const keyOf = (limitId: string | number, start: string, end: string) => `${limitId}|${start}|${end}`;

/** A signed, expiring read-only link to one notice. */
export function noticeToken(noticeId: number, expiresAt: Date): string {
  return jwt.sign({ n: noticeId }, config().jwtSecret, { audience: 'notice', issuer: 'titrata', expiresIn: Math.max(1, Math.floor((expiresAt.getTime() - Date.now()) / 1000)) });
}

function fmt(v: string) {
  return String(Number(v));
}

async function recipientsFor(permit: Permit, organizationId: number, transaction?: Transaction): Promise<string[]> {
  const officers = await User.findAll({ where: { organizationId, role: 'compliance_officer', active: true }, attributes: ['email'], transaction });
  return [...new Set([...permit.regulatorContacts.map((c) => c.email.toLowerCase()), ...officers.map((u) => u.email)])];
}

function describe(e: Exceedance, point: MonitoringPoint | null) {
  const param = PARAMETER_LABELS[e.parameter as Parameter] ?? e.parameter;
  const stat = STATISTIC_LABELS[e.statistic as keyof typeof STATISTIC_LABELS] ?? e.statistic;
  const when = e.periodStart === e.periodEnd ? e.periodStart : `${e.periodStart} to ${e.periodEnd}`;
  return { param, stat, when, where: point ? `${point.code} (${point.name})` : `point ${e.pointId}` };
}

/** Writes a notice and its e-mail in the caller's transaction; the outbox delivers it. */
async function createNotice(e: Exceedance, permit: Permit, facility: Facility, kind: 'exceedance' | 'cured', transaction: Transaction) {
  const point = await MonitoringPoint.findByPk(e.pointId, { transaction });
  const d = describe(e, point);
  const recipients = await recipientsFor(permit, e.organizationId, transaction);
  const expiresAt = new Date(Date.now() + NOTICE_LINK_DAYS * 86_400_000);
  const deadline = permit.followUpDeadlineValue ? dayjs(e.detectedAt).add(permit.followUpDeadlineValue, permit.followUpDeadlineUnit === 'hours' ? 'hour' : 'day') : null;
  const subject =
    kind === 'exceedance'
      ? `Permit ${permit.number}: ${d.param} ${e.bound} exceeded at ${facility.name}, ${d.when}`
      : `Permit ${permit.number}: earlier ${d.param} exceedance at ${facility.name}, ${d.when}, no longer stands`;
  const notice = await Notice.create({ exceedanceId: e.id, organizationId: e.organizationId, kind, recipients, subject, body: '', expiresAt, outboxMessageId: null }, { transaction });
  const link = `${config().publicUrl}/public/notices/${noticeToken(notice.id, expiresAt)}`;
  const lines =
    kind === 'exceedance'
      ? [
          `An approved result breaks a limit of permit ${permit.number} (${permit.issuingAuthority}).`,
          '',
          `Facility:   ${facility.name}`,
          `Point:      ${d.where}`,
          `Parameter:  ${d.param}`,
          `Statistic:  ${d.stat} ${e.bound}`,
          `Period:     ${d.when}`,
          `Value:      ${e.reported} ${e.units} (unrounded ${fmt(e.value)})`,
          `Limit:      ${e.bound === 'minimum' ? 'at least' : 'at most'} ${fmt(e.limitValue)} ${e.units}`,
          '',
          `Follow-up the permit requires: ${permit.followUpText ?? 'see the permit.'}`,
          deadline ? `Deadline: ${deadline.utc().format('YYYY-MM-DD HH:mm')} UTC (${permit.followUpDeadlineValue} ${permit.followUpDeadlineUnit} after detection).` : '',
        ]
      : [
          `The ${d.param} ${d.stat.toLowerCase()} ${e.bound} exceedance reported for ${facility.name}, ${d.where}, ${d.when}, no longer stands:`,
          `a reviewed amendment of the results behind it brought the value within the limit. Reason recorded: ${e.closedReason ?? 'amendment'}.`,
        ];
  const text = [
    ...lines.filter((l) => l !== undefined),
    '',
    `Read-only record: ${link}`,
    `(the link expires ${dayjs(expiresAt).utc().format('YYYY-MM-DD')})`,
    '',
    'The permit and the regulator’s rules govern reporting and follow-up; this notice does not replace any report they require.',
    '— Titrata, on behalf of the permittee',
  ].join('\n');
  const msg = await enqueueMail({ dedupeKey: `notice:${notice.id}`, organizationId: e.organizationId, to: recipients, subject, text }, transaction);
  await notice.update({ body: text, outboxMessageId: msg.id }, { transaction });
  return notice;
}

// An exceedance whose notice the SMTP server accepted is 'notified'.
onDelivered(async (msg: OutboxMessage) => {
  const m = /^notice:(\d+)$/.exec(msg.dedupeKey);
  if (!m) return;
  const notice = await Notice.findByPk(Number(m[1]));
  if (notice?.kind === 'exceedance') await Exceedance.update({ status: 'notified' }, { where: { id: notice.exceedanceId, status: 'open' } });
});

/**
 * Re-evaluates the given months of a facility and brings its exceedances in line: a new
 * one is recorded with a notice; one that no longer stands (an amendment cured it) is
 * closed, says so, and its recipients are told. Only periods ending in those months are
 * touched.
 */
export async function reevaluate(facilityId: number, months: string[], actor: Actor | null = null) {
  const facility = await Facility.findByPk(facilityId);
  if (!facility) return { opened: 0, closed: 0 };
  let opened = 0;
  let closed = 0;
  for (const month of [...new Set(months)].sort()) {
    const fm = await evaluateFacilityMonth(facility, month);
    const start = `${month}-01`;
    const end = dayjs.utc(start).endOf('month').format('YYYY-MM-DD');
    await sequelize().transaction(async (transaction) => {
      for (const { permit, evaluation, limits } of fm.permits) {
        if (!limits.length) continue;
        const found = new Map<string, ExceedanceRecord>(evaluation.exceedances.map((x) => [keyOf(x.limitId, x.periodStart, x.periodEnd), x]));
        const existing = await Exceedance.findAll({
          where: { permitId: permit.id, periodEnd: { [Op.between]: [start, end] } },
          transaction,
          lock: transaction.LOCK.UPDATE,
        });
        const byKey = new Map(existing.map((e) => [keyOf(e.limitId, e.periodStart, e.periodEnd), e]));
        for (const [key, x] of found) {
          const prior = byKey.get(key);
          const fields = { value: x.value, reported: x.reported, limitValue: x.limitValue, resultIds: x.measurementIds };
          if (!prior) {
            const e = await Exceedance.create(
              {
                organizationId: facility.organizationId,
                facilityId: facility.id,
                permitId: permit.id,
                limitId: Number(x.limitId),
                pointId: Number(x.pointId),
                parameter: x.parameter,
                statistic: x.statistic,
                bound: x.bound,
                periodStart: x.periodStart,
                periodEnd: x.periodEnd,
                units: x.units,
                detectedAt: new Date(),
                ...fields,
              },
              { transaction },
            );
            await audit(actor, { action: 'exceedance.detected', entity: 'exceedance', entityId: e.id, organizationId: e.organizationId, after: snapshot(e) }, transaction);
            await createNotice(e, permit, facility, 'exceedance', transaction);
            opened++;
          } else if (prior.status === 'closed') {
            const before = snapshot(prior);
            await prior.update({ ...fields, status: 'open', closedAt: null, closedReason: null, detectedAt: new Date() }, { transaction });
            await audit(actor, { action: 'exceedance.reopened', entity: 'exceedance', entityId: prior.id, organizationId: prior.organizationId, before, after: snapshot(prior) }, transaction);
            await createNotice(prior, permit, facility, 'exceedance', transaction);
            opened++;
          } else if (prior.reported !== x.reported || JSON.stringify(prior.resultIds) !== JSON.stringify(x.measurementIds)) {
            const before = snapshot(prior);
            await prior.update(fields, { transaction });
            await audit(actor, { action: 'exceedance.updated', entity: 'exceedance', entityId: prior.id, organizationId: prior.organizationId, before, after: snapshot(prior) }, transaction);
          }
        }
        for (const [key, prior] of byKey) {
          if (found.has(key) || prior.status === 'closed') continue;
          const before = snapshot(prior);
          await prior.update(
            { status: 'closed', closedAt: new Date(), closedReason: 'Cured: after an amendment the approved results no longer exceed the limit for this period.' },
            { transaction },
          );
          await audit(actor, { action: 'exceedance.cured', entity: 'exceedance', entityId: prior.id, organizationId: prior.organizationId, before, after: snapshot(prior), reason: prior.closedReason }, transaction);
          await createNotice(prior, permit, facility, 'cured', transaction);
          closed++;
        }
      }
    });
  }
  return { opened, closed };
}

/** After a result is approved or amended: re-evaluate only the months its sample touches. */
export async function onResultChanged(sampleId: number, actor: Actor | null) {
  const sample = await Sample.findByPk(sampleId, { include: [{ model: Facility, as: 'facility' }] });
  if (!sample?.facility) return;
  const permit = await Permit.findOne({ where: { facilityId: sample.facilityId, active: true } });
  const { months } = affectedPeriods(sample.collectedAt.toISOString(), sample.facility.timezone, { weekStartsOn: (permit?.weekStartsOn ?? 0) as 0 });
  return reevaluate(sample.facilityId, months, actor);
}

// ---- views ---------------------------------------------------------------------------

function summaryView(s: LimitMonthSummary, permit: Permit, points: Map<number, MonitoringPoint>) {
  const p = points.get(Number(s.pointId));
  return {
    limitId: Number(s.limitId),
    permitId: permit.id,
    permitNumber: permit.number,
    pointId: Number(s.pointId),
    pointCode: p?.code ?? null,
    pointName: p?.name ?? null,
    parameter: s.parameter,
    statistic: s.statistic,
    bound: s.bound,
    limitValue: s.limitValue,
    units: s.units,
    value: s.value,
    reported: s.reported,
    sampleCount: s.sampleCount,
    status: s.status,
    exceedanceCount: s.exceedanceCount,
    rows: s.rows.map((r) => ({ periodStart: r.periodStart, periodEnd: r.periodEnd, value: r.value, reported: r.reported, sampleCount: r.sampleCount, status: r.status })),
  };
}

export function exceedanceView(e: Exceedance, notices: Notice[] = [], outbox = new Map<string, OutboxMessage>()) {
  return {
    id: e.id,
    facilityId: e.facilityId,
    facilityName: e.facility?.name ?? null,
    permitId: e.permitId,
    permitNumber: e.permit?.number ?? null,
    limitId: e.limitId,
    pointId: e.pointId,
    pointCode: e.point?.code ?? null,
    parameter: e.parameter,
    statistic: e.statistic,
    bound: e.bound,
    periodStart: e.periodStart,
    periodEnd: e.periodEnd,
    value: e.value,
    reported: e.reported,
    limitValue: e.limitValue,
    units: e.units,
    resultIds: e.resultIds,
    status: e.status,
    correctiveAction: e.correctiveAction,
    closedReason: e.closedReason,
    detectedAt: e.detectedAt,
    acknowledgedAt: e.acknowledgedAt,
    closedAt: e.closedAt,
    notices: notices.map((n) => {
      const m = n.outboxMessageId ? outbox.get(String(n.outboxMessageId)) : undefined;
      return {
        id: n.id,
        kind: n.kind,
        subject: n.subject,
        recipients: n.recipients,
        createdAt: n.createdAt,
        delivery: m ? { status: m.status, attempts: m.attempts, sentAt: m.sentAt, lastError: m.lastError, nextAttemptAt: m.nextAttemptAt } : null,
      };
    }),
  };
}

async function withNotices(rows: Exceedance[]) {
  const notices = rows.length ? await Notice.findAll({ where: { exceedanceId: rows.map((r) => r.id) }, order: [['id', 'ASC']] }) : [];
  const ids = notices.map((n) => n.outboxMessageId).filter((x): x is string => !!x);
  const outbox = new Map((ids.length ? await OutboxMessage.findAll({ where: { id: ids }, attributes: ['id', 'status', 'attempts', 'sentAt', 'lastError', 'nextAttemptAt'] }) : []).map((m) => [String(m.id), m]));
  return rows.map((r) => exceedanceView(r, notices.filter((n) => n.exceedanceId === r.id), outbox));
}

const exceedanceIncludes = [
  { model: Facility, as: 'facility', attributes: ['id', 'name'] },
  { model: Permit, as: 'permit', attributes: ['id', 'number'] },
  { model: MonitoringPoint, as: 'point', attributes: ['id', 'code', 'name'] },
];

/** Every limit of the facility's permits for a month, its statistic, value, count, bound and status; exceedances; projections. */
export async function complianceMonth(actor: Actor, facilityId: number, month: string, asOf?: string) {
  const facility = await Facility.findByPk(facilityId);
  if (!facility) throw new NotFoundError('Facility');
  assertInScope(actor, facility.organizationId, 'Facility');
  const fm = await evaluateFacilityMonth(facility, month);
  const points = new Map((await MonitoringPoint.findAll({ where: { facilityId } })).map((p) => [p.id, p]));
  const limits = fm.permits.flatMap(({ permit, evaluation }) => evaluation.limits.map((s) => summaryView(s, permit, points)));
  const projections = projectionsFor(fm, points, asOf ?? localToday(facility.timezone));
  const exceedances = await Exceedance.findAll({
    where: { facilityId, periodEnd: { [Op.between]: [`${month}-01`, dayjs.utc(`${month}-01`).endOf('month').format('YYYY-MM-DD')] } },
    include: exceedanceIncludes,
    order: [['periodStart', 'ASC'], ['id', 'ASC']],
  });
  return {
    facility: { id: facility.id, name: facility.name, timezone: facility.timezone },
    month,
    permits: fm.permits.map(({ permit }) => ({ id: permit.id, number: permit.number })),
    limits,
    projections,
    exceedances: await withNotices(exceedances),
    series: seriesFor(fm),
  };
}

/** Today's date in the facility's time zone. */
export function localToday(timezone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone: timezone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
}

/** Early warning: part-way through a month or week, where each average limit is heading (daily sampling due). */
function projectionsFor(fm: FacilityMonth, points: Map<number, MonitoringPoint>, today: string) {
  const out = [];
  if (!today.startsWith(fm.month)) return [];
  for (const { permit, limits } of fm.permits) {
    for (const l of limits) {
      if (l.statistic !== 'monthly_average' && l.statistic !== 'weekly_average') continue;
      try {
        const p = projectLimit(l, fm.measurements, today, { kind: 'daily' }, { timezone: fm.facility.timezone, weekStartsOn: permit.weekStartsOn as 0, weekMonthRule: permit.weekMonthRule });
        out.push({ limitId: Number(l.id), permitNumber: permit.number, pointCode: points.get(Number(l.pointId))?.code ?? null, ...p });
      } catch {
        // not in force, or nothing to project in this period
      }
    }
  }
  return out;
}

// ---- projection alerts ----------------------------------------------------------------

export async function listProjectionAlerts(actor: Actor) {
  const rows = await ProjectionAlert.findAll({ where: { userId: actor.id }, order: [['id', 'ASC']] });
  return { items: rows.map((r) => ({ id: r.id, facilityId: r.facilityId, createdAt: r.createdAt })), total: rows.length };
}

/** The compliance officer opts in to an e-mail when a projected average of this facility crosses its limit. */
export async function subscribeProjectionAlert(actor: Actor, facilityId: number) {
  const facility = await Facility.findByPk(facilityId);
  if (!facility) throw new ValidationError('Choose one of your facilities.', { facilityId: 'not found' });
  assertInScope(actor, facility.organizationId, 'Facility');
  const [row] = await ProjectionAlert.findOrCreate({ where: { userId: actor.id, facilityId }, defaults: { userId: actor.id, facilityId, organizationId: facility.organizationId } });
  await audit(actor, { action: 'projection_alert.subscribed', entity: 'facility', entityId: facilityId, organizationId: facility.organizationId });
  return { id: row.id, facilityId, createdAt: row.createdAt };
}

export async function unsubscribeProjectionAlert(actor: Actor, id: number) {
  const row = await ProjectionAlert.findByPk(id);
  if (!row || row.userId !== actor.id) throw new NotFoundError('Alert');
  await row.destroy(); // a preference, not a compliance record
  await audit(actor, { action: 'projection_alert.unsubscribed', entity: 'facility', entityId: row.facilityId, organizationId: row.organizationId });
  return { id };
}

/**
 * For every opted-in officer, e-mails each average limit whose projection crosses its limit
 * this period — once per limit and period (the outbox dedupe key), whatever the job's pace.
 */
export async function checkProjectionAlerts(): Promise<number> {
  const subs = await ProjectionAlert.findAll();
  let queued = 0;
  const byFacility = new Map<number, ProjectionAlert[]>();
  for (const s of subs) byFacility.set(s.facilityId, [...(byFacility.get(s.facilityId) ?? []), s]);
  for (const [facilityId, list] of byFacility) {
    const facility = await Facility.findByPk(facilityId);
    if (!facility) continue;
    const today = localToday(facility.timezone);
    const fm = await evaluateFacilityMonth(facility, today.slice(0, 7));
    const points = new Map((await MonitoringPoint.findAll({ where: { facilityId } })).map((p) => [p.id, p]));
    const crossing = projectionsFor(fm, points, today).filter((p) => p.crossesLimit);
    for (const sub of list) {
      const user = await User.findByPk(sub.userId);
      if (!user?.active) continue;
      for (const p of crossing) {
        const key = `projection:${user.id}:${p.limitId}:${p.periodStart}`;
        if (await OutboxMessage.findOne({ where: { dedupeKey: key } })) continue;
        await enqueueMail({
          dedupeKey: key,
          organizationId: facility.organizationId,
          to: [user.email],
          subject: `Early warning, permit ${p.permitNumber}: ${p.pointCode} average heading past its limit at ${facility.name}`,
          text: [
            `${p.pointCode}, ${p.periodStart} to ${p.periodEnd}: ${p.sentence}`,
            '',
            'This is a projection from the approved results so far, not an exceedance. The permit and the regulator’s rules govern what must be reported.',
            `Open the month: ${config().publicUrl}/compliance?facilityId=${facility.id}&month=${fm.month}`,
          ].join('\n'),
        });
        queued++;
      }
    }
  }
  return queued;
}

/** Daily measurements per point and parameter for the trend charts. */
function seriesFor(fm: FacilityMonth) {
  const wanted = new Set(fm.permits.flatMap((p) => p.limits.map((l) => `${l.pointId}|${l.parameter}`)));
  const out: Record<string, { sampledAt: string; value: number; resultId: string | number }[]> = {};
  for (const m of fm.measurements) {
    const key = `${m.pointId}|${m.parameter}`;
    if (!wanted.has(key) || !m.sampledAt.startsWith(fm.month.slice(0, 4))) continue;
    (out[key] ??= []).push({ sampledAt: m.sampledAt, value: Number(m.value), resultId: m.resultId });
  }
  for (const list of Object.values(out)) list.sort((a, b) => a.sampledAt.localeCompare(b.sampledAt));
  return out;
}

export async function listExceedances(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { periodStart: 'periodStart', detectedAt: 'detectedAt', status: 'status' }, '-periodStart');
  const where: WhereOptions[] = [orgScope(actor)];
  const facilityId = idParam(raw.facilityId, 'facilityId');
  if (facilityId) where.push({ facilityId });
  if (typeof raw.status === 'string' && raw.status) {
    const statuses = raw.status.split(',');
    if (statuses.some((s) => !['open', 'notified', 'acknowledged', 'closed'].includes(s))) throw new ValidationError('Unknown status.', { status: 'open, notified, acknowledged or closed' });
    where.push({ status: statuses });
  }
  const openOnly = boolParam(raw.open, 'open');
  if (openOnly) where.push({ status: { [Op.ne]: 'closed' } });
  const { rows, count } = await Exceedance.findAndCountAll({ where: { [Op.and]: where }, include: exceedanceIncludes, order: p.order, limit: p.limit, offset: p.offset });
  return { items: await withNotices(rows), total: count };
}

async function findExceedance(actor: Actor, id: number) {
  const e = await Exceedance.findByPk(id, { include: exceedanceIncludes });
  if (!e) throw new NotFoundError('Exceedance');
  assertInScope(actor, e.organizationId, 'Exceedance');
  return e;
}

export async function getExceedance(actor: Actor, id: number) {
  return (await withNotices([await findExceedance(actor, id)]))[0];
}

/** The compliance officer acknowledges an exceedance and records the corrective action taken. */
export async function acknowledgeExceedance(actor: Actor, id: number, correctiveAction: string) {
  const e = await findExceedance(actor, id);
  if (e.status === 'closed') throw new ValidationError('This exceedance is closed.', { status: 'closed' });
  const before = snapshot(e);
  await sequelize().transaction(async (transaction) => {
    await e.update({ status: 'acknowledged', correctiveAction, acknowledgedAt: new Date(), acknowledgedById: actor.id }, { transaction });
    await audit(actor, { action: 'exceedance.acknowledged', entity: 'exceedance', entityId: e.id, organizationId: e.organizationId, before, after: snapshot(e), reason: correctiveAction }, transaction);
  });
  return getExceedance(actor, id);
}

/** Closes an acknowledged exceedance once its follow-up is done. */
export async function closeExceedance(actor: Actor, id: number, reason: string) {
  const e = await findExceedance(actor, id);
  if (e.status !== 'acknowledged') throw new ValidationError('Acknowledge the exceedance with its corrective action first.', { status: `is ${e.status}` });
  const before = snapshot(e);
  await sequelize().transaction(async (transaction) => {
    await e.update({ status: 'closed', closedAt: new Date(), closedReason: reason }, { transaction });
    await audit(actor, { action: 'exceedance.closed', entity: 'exceedance', entityId: e.id, organizationId: e.organizationId, before, after: snapshot(e), reason }, transaction);
  });
  return getExceedance(actor, id);
}

export async function listNotices(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { createdAt: 'createdAt' }, '-createdAt');
  const where: WhereOptions[] = [orgScope(actor)];
  const exceedanceId = idParam(raw.exceedanceId, 'exceedanceId');
  if (exceedanceId) where.push({ exceedanceId });
  const { rows, count } = await Notice.findAndCountAll({ where: { [Op.and]: where }, order: p.order, limit: p.limit, offset: p.offset });
  const outbox = new Map((await OutboxMessage.findAll({ where: { id: rows.map((n) => n.outboxMessageId).filter((x): x is string => !!x) } })).map((m) => [String(m.id), m]));
  return {
    items: rows.map((n) => {
      const m = n.outboxMessageId ? outbox.get(String(n.outboxMessageId)) : undefined;
      return { id: n.id, exceedanceId: n.exceedanceId, kind: n.kind, subject: n.subject, recipients: n.recipients, createdAt: n.createdAt, expiresAt: n.expiresAt, delivery: m ? { status: m.status, attempts: m.attempts, sentAt: m.sentAt, lastError: m.lastError } : null };
    }),
    total: count,
  };
}

/** The public read-only view behind a notice's signed link; a tampered or expired token is a 404. */
export async function publicNotice(token: string) {
  let id: number;
  try {
    const claims = jwt.verify(token, config().jwtSecret, { audience: 'notice', issuer: 'titrata', algorithms: ['HS256'] }) as { n: number };
    id = Number(claims.n);
  } catch {
    throw new NotFoundError('Notice');
  }
  const notice = await Notice.findByPk(id, { include: [{ model: Exceedance, as: 'exceedance', include: exceedanceIncludes }] });
  if (!notice || notice.expiresAt < new Date()) throw new NotFoundError('Notice');
  const e = notice.exceedance!;
  return {
    kind: notice.kind,
    subject: notice.subject,
    body: notice.body,
    sentAt: notice.createdAt,
    expiresAt: notice.expiresAt,
    exceedance: {
      facilityName: e.facility?.name ?? null,
      permitNumber: e.permit?.number ?? null,
      pointCode: e.point?.code ?? null,
      parameter: e.parameter,
      statistic: e.statistic,
      bound: e.bound,
      periodStart: e.periodStart,
      periodEnd: e.periodEnd,
      reported: e.reported,
      limitValue: e.limitValue,
      units: e.units,
      status: e.status,
      correctiveAction: e.correctiveAction,
      closedReason: e.closedReason,
    },
  };
}
