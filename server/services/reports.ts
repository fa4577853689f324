import { createHash } from 'node:crypto';
import dayjs from 'dayjs';
import utc from 'dayjs/plugin/utc.js';
import { Op, type WhereOptions } from 'sequelize';
import { DEFAULT_CERTIFICATION_WORDING } from '../../shared/schemas/permits.js';
import { sequelize } from '../db/current.js';
import { Facility, MeterCalibration, Permit, QcBatch, Report, ReportBatch, Standardization, Titration, User } from '../db/models/index.js';
import type { ReportBatchItem } from '../db/models/ReportBatch.js';
import { ConflictError, NotFoundError, ValidationError } from '../errors.js';
import { actorFor, type Actor } from './actor.js';
import { audit } from './audit.js';
import { complianceMonth } from './compliance.js';
import { idParam } from './listing.js';
import { enqueueMail } from './outbox.js';
import { verifyPassword } from './passwords.js';
import { renderReportPdf, STATUS_WORDS } from './reportPdf.js';
import { assertInScope } from './scope.js';

dayjs.extend(utc);

const MONTH = /^\d{4}-(0[1-9]|1[0-2])$/;

async function load(actor: Actor, id: number) {
  const r = await Report.findByPk(id, { include: [{ model: Facility, as: 'facility', attributes: ['id', 'name'] }] });
  if (!r) throw new NotFoundError('Report');
  assertInScope(actor, r.organizationId, 'Report');
  return r;
}

function listView(r: Report) {
  return {
    id: Number(r.id),
    facilityId: Number(r.facilityId),
    facilityName: r.facility?.name ?? null,
    month: r.month,
    revision: r.revision,
    status: r.status,
    previousId: r.previousId === null || r.previousId === undefined ? null : Number(r.previousId),
    revisionReason: r.revisionReason,
    changes: r.changes,
    certifiedAt: r.certifiedAt,
    pdfSha256: r.pdfSha256,
    createdAt: r.createdAt,
  };
}

export async function listReports(actor: Actor, q: Record<string, unknown>) {
  const where: WhereOptions[] = [{ organizationId: actor.visibleOrgIds }];
  const facilityId = idParam(q.facilityId, 'facilityId');
  if (facilityId) where.push({ facilityId });
  if (typeof q.status === 'string' && ['draft', 'certified', 'revised'].includes(q.status)) where.push({ status: q.status });
  if (typeof q.month === 'string' && MONTH.test(q.month)) where.push({ month: q.month });
  if (typeof q.year === 'string' && /^\d{4}$/.test(q.year)) where.push({ month: { [Op.startsWith]: q.year } });
  const rows = await Report.findAll({ where: { [Op.and]: where }, include: [{ model: Facility, as: 'facility', attributes: ['id', 'name'] }], order: [['month', 'DESC'], ['facilityId', 'ASC'], ['revision', 'DESC']], limit: 500 });
  return { items: rows.map(listView), total: rows.length };
}

export async function createReport(actor: Actor, body: { facilityId?: unknown; month?: unknown }) {
  const facilityId = Number(body.facilityId);
  const month = String(body.month ?? '');
  const fields: Record<string, string> = {};
  if (!Number.isInteger(facilityId) || facilityId < 1) fields.facilityId = 'required';
  if (!MONTH.test(month)) fields.month = 'YYYY-MM';
  if (Object.keys(fields).length) throw new ValidationError('The report needs a facility and a month.', fields);
  const facility = await Facility.findByPk(facilityId);
  if (!facility) throw new NotFoundError('Facility');
  assertInScope(actor, facility.organizationId, 'Facility');
  return sequelize().transaction(async (transaction) => {
    const existing = await Report.findOne({ where: { facilityId, month }, transaction, lock: transaction.LOCK.UPDATE });
    if (existing) throw new ConflictError('A report for this facility and month already exists.', { reportId: String(existing.id) });
    const r = await Report.create({ organizationId: facility.organizationId, facilityId, month }, { transaction });
    await audit(actor, { action: 'report.created', entity: 'report', entityId: r.id, organizationId: r.organizationId, after: { facilityId, month } }, transaction);
    return listView(r);
  });
}

/** The report's content: frozen at certification, otherwise computed from the compliance month. */
async function contentOf(actor: Actor, r: Report): Promise<Record<string, any>> {
  if (r.status !== 'draft' && r.content) return r.content;
  const cm = await complianceMonth(actor, r.facilityId, r.month);
  const resultIds = [...new Set(Object.values(cm.series).flatMap((s) => s.map((p) => Number(p.resultId))))];
  const titrations = resultIds.length ? await Titration.findAll({ where: { id: resultIds }, attributes: ['id', 'qualifiers'] }) : [];
  const qualifiers: Record<string, number> = {};
  for (const t of titrations) for (const q of t.qualifiers ?? []) qualifiers[q.code] = (qualifiers[q.code] ?? 0) + 1;
  const start = dayjs.utc(`${r.month}-01`);
  const inMonth = { [Op.gte]: start.toDate(), [Op.lt]: start.add(1, 'month').toDate() };
  const standardizations = await Standardization.count({ where: { organizationId: actor.labId, standardizedAt: inMonth } });
  const calibrations = await MeterCalibration.findAll({ where: { organizationId: actor.labId, calibratedAt: inMonth }, attributes: ['passed'] });
  const batches = await QcBatch.findAll({ where: { organizationId: actor.labId, batchDate: { [Op.startsWith]: r.month } }, attributes: ['passed', 'duplicates', 'checkStandards', 'blanks'] });
  const permit = await Permit.findOne({ where: { facilityId: r.facilityId, active: true } });
  const daily = Object.entries(cm.series).map(([key, values]) => {
    const [pointId, parameter] = key.split('|');
    const limit = cm.limits.find((l) => String(l.pointId) === pointId && l.parameter === parameter);
    return {
      pointId: Number(pointId),
      pointCode: limit?.pointCode ?? null,
      parameter,
      units: limit?.units ?? '',
      limitValue: limit ? Number(limit.limitValue) : null,
      values: values.filter((v) => v.sampledAt.startsWith(r.month)).map((v) => ({ sampledAt: v.sampledAt, value: v.value, resultId: v.resultId })),
    };
  });
  return {
    facility: cm.facility,
    month: r.month,
    permits: cm.permits,
    limits: cm.limits.map(({ rows: _rows, ...l }) => l),
    exceedances: cm.exceedances.map((e) => ({ id: e.id, pointCode: e.pointCode, parameter: e.parameter, statistic: e.statistic, bound: e.bound, periodStart: e.periodStart, periodEnd: e.periodEnd, reported: e.reported, limitValue: e.limitValue, units: e.units, status: e.status, correctiveAction: e.correctiveAction, closedReason: e.closedReason })),
    daily,
    qc: {
      results: titrations.length,
      standardizations,
      calibrations: calibrations.length,
      calibrationsFailed: calibrations.filter((c) => !c.passed).length,
      qcBatches: batches.length,
      qcBatchesFailed: batches.filter((b) => !b.passed).length,
      duplicates: batches.reduce((n, b) => n + (b.duplicates?.length ?? 0), 0),
      checkStandards: batches.reduce((n, b) => n + (b.checkStandards?.length ?? 0), 0),
      blanks: batches.reduce((n, b) => n + (b.blanks?.length ?? 0), 0),
      qualifiers,
    },
    certification: { wording: permit?.certificationWording || DEFAULT_CERTIFICATION_WORDING, statement: null, signedBy: null, signedAt: null, ip: null },
  };
}

export async function getReport(actor: Actor, id: number) {
  const r = await load(actor, id);
  const content = await contentOf(actor, r);
  const versions = await Report.findAll({ where: { facilityId: r.facilityId, month: r.month }, attributes: ['id', 'revision', 'status', 'pdfSha256', 'certifiedAt'], order: [['revision', 'ASC']] });
  return { ...listView(r), revision: r.revision, status: r.status, content: { ...content, revision: r.revision, status: r.status }, versions: versions.map((v) => v.get({ plain: true })) };
}

/** The stored PDF of a certified version, or a freshly rendered draft. */
export async function reportPdf(actor: Actor, id: number) {
  const r = await load(actor, id);
  const name = `report-${r.facilityId}-${r.month}-r${r.revision}.pdf`;
  if (r.pdf) return { name, pdf: r.pdf };
  return { name, pdf: await renderReportPdf({ ...(await contentOf(actor, r)), revision: r.revision, status: r.status }) };
}

const csvCell = (v: unknown) => {
  const s = v === null || v === undefined ? '' : String(v);
  return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
};

/** One row per limit and one per daily value. */
export async function reportCsv(actor: Actor, id: number) {
  const r = await load(actor, id);
  const c = await contentOf(actor, r);
  const lines = [['kind', 'point', 'parameter', 'statistic', 'bound', 'limit', 'units', 'value', 'reported', 'samples', 'status', 'sampled_at'].join(',')];
  for (const l of c.limits) lines.push(['limit', l.pointCode, l.parameter, l.statistic, l.bound, l.limitValue, l.units, l.value, l.reported, l.sampleCount, l.status, ''].map(csvCell).join(','));
  for (const d of c.daily) for (const v of d.values) lines.push(['daily', d.pointCode, d.parameter, '', '', '', d.units, v.value, '', '', '', v.sampledAt].map(csvCell).join(','));
  return { name: `report-${r.facilityId}-${r.month}-r${r.revision}.csv`, csv: lines.join('\n') + '\n' };
}

export async function certifyReport(actor: Actor, id: number, body: { password?: unknown; statement?: unknown }) {
  const password = typeof body.password === 'string' ? body.password : '';
  if (!password) throw new ValidationError('Enter your password to certify.', { password: 'required' });
  const r = await load(actor, id);
  if (r.status !== 'draft') throw new ConflictError('This report is certified and cannot change; create a revision.');
  const user = await User.findByPk(actor.id);
  if (!user || !(await verifyPassword(password, user.passwordHash))) throw new ValidationError('The password is not correct.', { password: 'incorrect' });
  const statement = typeof body.statement === 'string' && body.statement.trim() ? body.statement.trim().slice(0, 4000) : null;
  const draft = await contentOf(actor, r);
  const signedAt = new Date();
  const content = { ...draft, certification: { ...draft.certification, statement, signedBy: `${user.name} <${user.email}>`, signedAt: signedAt.toISOString(), ip: actor.ip } };
  const pdf = await renderReportPdf({ ...content, revision: r.revision, status: 'certified' });
  const sha = createHash('sha256').update(pdf).digest('hex');
  const permit = await Permit.findOne({ where: { facilityId: r.facilityId, active: true } });
  await sequelize().transaction(async (transaction) => {
    const locked = await Report.findByPk(r.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!locked || locked.status !== 'draft') throw new ConflictError('This report is certified and cannot change; create a revision.');
    await locked.update({ status: 'certified', content, certifiedById: user.id, certifiedAt: signedAt, certifiedIp: actor.ip, certificationWording: draft.certification.wording, statement, pdf, pdfSha256: sha }, { transaction });
    if (r.previousId) await Report.update({ status: 'revised' }, { where: { id: r.previousId }, transaction });
    await audit(actor, { action: 'report.certified', entity: 'report', entityId: r.id, organizationId: r.organizationId, after: { revision: r.revision, pdfSha256: sha } }, transaction);
    const to = [...new Set((permit?.regulatorContacts ?? []).map((x) => x.email.toLowerCase()))];
    if (to.length) {
      const subject = `Monitoring report ${r.month}, revision ${r.revision}: ${draft.facility.name}`;
      const text = [
        `The certified monitoring report of ${draft.facility.name} for ${r.month} (revision ${r.revision}) is attached.`,
        `Permit: ${permit?.number ?? ''}`,
        `SHA-256 of the attached PDF: ${sha}`,
        r.revisionReason ? `This revision replaces an earlier version. Reason: ${r.revisionReason}` : '',
        '',
        '— Titrata, on behalf of the permittee',
      ].join('\n');
      await enqueueMail({ dedupeKey: `report:${r.id}:v${r.revision}`, organizationId: r.organizationId, to, subject, text, attachments: [{ filename: `report-${r.month}-r${r.revision}.pdf`, contentType: 'application/pdf', content: pdf }] }, transaction);
    }
  });
  return getReport(actor, id);
}

/** What differs between two contents: limit values and statuses, and daily values. */
export function diffContents(before: Record<string, any>, after: Record<string, any>) {
  const changes: Array<{ kind: string; key: string; before: unknown; after: unknown }> = [];
  const lk = (l: any) => `${l.pointCode ?? l.pointId} ${l.parameter} ${l.statistic} ${l.bound}`;
  const oldL = new Map((before.limits as any[]).map((l) => [lk(l), l]));
  const newL = new Map((after.limits as any[]).map((l) => [lk(l), l]));
  for (const key of new Set([...oldL.keys(), ...newL.keys()])) {
    const a = oldL.get(key);
    const b = newL.get(key);
    if ((a?.reported ?? null) !== (b?.reported ?? null)) changes.push({ kind: 'limit_value', key, before: a?.reported ?? null, after: b?.reported ?? null });
    if ((a?.status ?? null) !== (b?.status ?? null)) changes.push({ kind: 'limit_status', key, before: STATUS_WORDS[a?.status] ?? null, after: STATUS_WORDS[b?.status] ?? null });
  }
  const dv = (c: Record<string, any>) => new Map((c.daily as any[]).flatMap((d) => (d.values as any[]).map((v) => [`${d.pointCode ?? d.pointId} ${d.parameter} ${v.sampledAt}`, v.value])));
  const oldD = dv(before);
  const newD = dv(after);
  for (const key of new Set([...oldD.keys(), ...newD.keys()])) {
    if ((oldD.get(key) ?? null) !== (newD.get(key) ?? null)) changes.push({ kind: 'daily_value', key, before: oldD.get(key) ?? null, after: newD.get(key) ?? null });
  }
  return changes;
}

/** What the record says now against a certified version's frozen content. */
async function changesSince(actor: Actor, r: Report) {
  const now = Report.build({ organizationId: r.organizationId, facilityId: r.facilityId, month: r.month, status: 'draft' });
  return diffContents(r.content ?? {}, await contentOf(actor, now));
}

/** What a revision made now would change against this certified version (shown before confirming). */
export async function pendingChanges(actor: Actor, id: number) {
  const r = await load(actor, id);
  return { changes: r.status === 'draft' ? [] : await changesSince(actor, r) };
}

export async function reviseReport(actor: Actor, id: number, body: { reason?: unknown }) {
  const reason = typeof body.reason === 'string' ? body.reason.trim() : '';
  if (reason.length < 3) throw new ValidationError('A revision needs a reason.', { reason: 'required' });
  const r = await load(actor, id);
  if (r.status !== 'certified') throw new ConflictError('Only the current certified version can be revised.');
  const latest = await Report.max<number, Report>('revision', { where: { facilityId: r.facilityId, month: r.month } });
  if (latest !== r.revision) throw new ConflictError('A newer version of this report exists.');
  const changes = await changesSince(actor, r);
  return sequelize().transaction(async (transaction) => {
    const next = await Report.create({ organizationId: r.organizationId, facilityId: r.facilityId, month: r.month, revision: r.revision + 1, previousId: r.id, revisionReason: reason.slice(0, 1000), changes }, { transaction });
    await audit(actor, { action: 'report.revised', entity: 'report', entityId: next.id, organizationId: r.organizationId, after: { previousId: r.id, revision: next.revision, changes: changes.length }, reason }, transaction);
    return listView(next);
  });
}

// ---------------------------------------------------------------------------------------------
// Batches: a year of drafts for several facilities, made by the job runner a few at a time.

function batchView(b: ReportBatch) {
  return {
    id: Number(b.id),
    year: b.year,
    status: b.status,
    total: b.total,
    done: b.done,
    failed: b.failed,
    items: b.items,
    createdAt: b.createdAt,
    finishedAt: b.finishedAt,
  };
}

export async function createBatch(actor: Actor, body: { facilityIds?: unknown; year?: unknown }) {
  const year = Number(body.year);
  const ids = Array.isArray(body.facilityIds) ? [...new Set(body.facilityIds.map(Number))] : [];
  const fields: Record<string, string> = {};
  if (!Number.isInteger(year) || year < 2000 || year > 2100) fields.year = 'a year between 2000 and 2100';
  if (!ids.length || ids.some((i) => !Number.isInteger(i) || i < 1)) fields.facilityIds = 'one or more facility ids';
  else if (ids.length > 50) fields.facilityIds = 'at most 50 facilities per batch';
  if (Object.keys(fields).length) throw new ValidationError('The batch needs facilities and a year.', fields);
  const facilities = await Facility.findAll({ where: { id: ids, organizationId: actor.visibleOrgIds } });
  if (facilities.length !== ids.length) throw new NotFoundError('Facility');
  const items: ReportBatchItem[] = [];
  for (const f of facilities) for (let m = 1; m <= 12; m++) items.push({ facilityId: Number(f.id), month: `${year}-${String(m).padStart(2, '0')}`, state: 'pending', reportId: null, error: null });
  return sequelize().transaction(async (transaction) => {
    const b = await ReportBatch.create({ organizationId: actor.organizationId, createdById: actor.id, year, items, total: items.length }, { transaction });
    await audit(actor, { action: 'report_batch.created', entity: 'report_batch', entityId: b.id, organizationId: actor.organizationId, after: { year, facilityIds: ids } }, transaction);
    return batchView(b);
  });
}

async function loadBatch(actor: Actor, id: number) {
  const b = await ReportBatch.findByPk(id);
  if (!b || Number(b.createdById) !== Number(actor.id)) throw new NotFoundError('Report batch');
  return b;
}

export async function listBatches(actor: Actor) {
  const rows = await ReportBatch.findAll({ where: { createdById: actor.id }, order: [['id', 'DESC']], limit: 20 });
  return { items: rows.map(batchView), total: rows.length };
}

export async function getBatch(actor: Actor, id: number) {
  return batchView(await loadBatch(actor, id));
}

/** Pause or resume: a paused batch keeps its progress and carries on from the next pending item. */
export async function setBatchState(actor: Actor, id: number, body: { action?: unknown }) {
  const action = body.action;
  if (action !== 'pause' && action !== 'resume') throw new ValidationError('Say pause or resume.', { action: 'pause or resume' });
  const b = await loadBatch(actor, id);
  if (b.status === 'finished') throw new ConflictError('This batch has finished.');
  await b.update({ status: action === 'pause' ? 'paused' : 'running' });
  return batchView(b);
}

/**
 * One round of the job: up to `maxItems` pending items of running batches, each in its own
 * transaction (a draft per facility-month; an existing report is left as it is). Returns how
 * many items it handled.
 */
let processing = false;
export async function processReportBatches(maxItems = 12): Promise<number> {
  // One round at a time per process (the job runner and a caller may overlap).
  if (processing) return 0;
  processing = true;
  try {
    return await processRound(maxItems);
  } finally {
    processing = false;
  }
}

async function processRound(maxItems: number): Promise<number> {
  let handled = 0;
  const batches = await ReportBatch.findAll({ where: { status: 'running' }, order: [['id', 'ASC']], limit: 5 });
  for (const b of batches) {
    const user = await User.findByPk(b.createdById, { include: [{ association: 'organization' }] });
    if (!user || !user.active) {
      await b.update({ status: 'paused' });
      continue;
    }
    const actor = await actorFor(user);
    const items = b.items.map((i) => ({ ...i }));
    for (const item of items) {
      if (handled >= maxItems) break;
      if (item.state !== 'pending') continue;
      handled++;
      try {
        const existing = await Report.findOne({ where: { facilityId: item.facilityId, month: item.month }, order: [['revision', 'DESC']] });
        if (existing) {
          Object.assign(item, { state: 'existing', reportId: Number(existing.id) });
        } else {
          const made = await createReport(actor, { facilityId: item.facilityId, month: item.month });
          // Compute the content once so that a month that cannot be evaluated is reported here.
          await contentOf(actor, (await Report.findByPk(made.id))!);
          Object.assign(item, { state: 'made', reportId: made.id });
        }
      } catch (err) {
        // Another process made it first: that report is this item's.
        const made = err instanceof ConflictError ? await Report.findOne({ where: { facilityId: item.facilityId, month: item.month }, order: [['revision', 'DESC']] }) : null;
        if (made) Object.assign(item, { state: 'existing', reportId: Number(made.id) });
        else Object.assign(item, { state: 'failed', error: (err as Error).message.slice(0, 300) });
      }
    }
    const done = items.filter((i) => i.state !== 'pending').length;
    const failed = items.filter((i) => i.state === 'failed').length;
    const fresh = await ReportBatch.findByPk(b.id);
    const status = done === b.total ? 'finished' : (fresh?.status ?? b.status);
    await b.update({ items, done, failed, status, finishedAt: status === 'finished' ? new Date() : null });
    if (handled >= maxItems) break;
  }
  return handled;
}
