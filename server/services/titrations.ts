import { onResultChanged } from './compliance.js';
import { Op, OptimisticLockError, QueryTypes, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { historyComparison } from '../../shared/chemistry/bench.js';
import type { Caco3Factor } from '../../shared/chemistry/constants.js';
import { derivativeSeries } from '../../shared/chemistry/endpoints.js';
import type {
  amendSchema,
  bulkApproveSchema,
  returnSchema,
  transitionSchema,
  TitrationInput,
  TitrationPatch,
} from '../../shared/schemas/bench.js';
import { REAGENT_KIND, type BenchSettings } from '../../shared/schemas/bench.js';
import type { ReviewHistory, TitrationDetail, TitrationView } from '../../shared/types/bench.js';
import { batchInsert, insertBuilt } from '../db/batchInsert.js';
import { sequelize } from '../db/current.js';
import { fromRow, rawFind, selectList } from '../db/rawRows.js';
import { AuditEvent, Facility, MeterCalibration, Sample, Standardization, Titrant, Titration, TitrationReading, User } from '../db/models/index.js';
import { ConflictError, NotFoundError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { audit } from './audit.js';
import { benchSettings } from './benchSettings.js';
import { benchSnapshot, num, sampleIncludes, sampleView, titrationIncludes, titrationView } from './benchViews.js';
import { listParams } from './listing.js';
import { qualifiersFor, type QualifierContext } from './qualifiers.js';
import { assertInScope, orgScope } from './scope.js';
import { computeTitration, EMPTY_COLUMNS, fieldsUsed, inapplicableFieldErrors, missingInputs, type ComputeInputs } from './titrationCompute.js';
import { inTransaction } from './transaction.js';

/**
 * Titrations: entry, recomputation with the shared engine, qualifiers, and the workflow
 * draft → submitted → approved | returned, with amendments as new versions. Every change is
 * one transaction with its audit event.
 */

export type Reading = { volumeMl: number; pH: number; temperatureC?: number | null };

/** Allowed clock skew for "not in the future" checks. */
const FUTURE_SLACK_MS = 5 * 60_000;

// ---- loading ---------------------------------------------------------------------------------

async function lockTitration(actor: Actor, id: number, t: Transaction): Promise<Titration> {
  const row = await Titration.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
  if (!row) throw new NotFoundError('Titration');
  assertInScope(actor, row.organizationId, 'Titration');
  return row;
}

async function sampleFor(actor: Actor, sampleId: number, t?: Transaction, lock = false): Promise<Sample & { facility: Facility }> {
  // Lock the sample row alone: FOR UPDATE on a join would also lock the facility row, which
  // every concurrent sample insert holds a shared lock on through its foreign key (a deadlock).
  if (lock && t) await sequelize().query('SELECT id FROM samples WHERE id = ? FOR UPDATE', { replacements: [sampleId], type: QueryTypes.SELECT, transaction: t });
  sampleSql ??= `SELECT ${selectList(Sample, 's')}, ${selectList(Facility, 'f', 'facility.', FACILITY_ATTRIBUTES)}
    FROM samples s LEFT JOIN facilities f ON f.id = s.facility_id WHERE s.id = ?`;
  const [found] = await sequelize().query<Record<string, unknown>>(sampleSql, { replacements: [sampleId], type: QueryTypes.SELECT, transaction: t });
  if (!found) throw new NotFoundError('Sample');
  const sample = fromRow(Sample, found);
  assertInScope(actor, sample.organizationId, 'Sample');
  sample.facility = fromRow(Facility, found, 'facility.', FACILITY_ATTRIBUTES);
  return sample as Sample & { facility: Facility };
}

const FACILITY_ATTRIBUTES = ['id', 'name', 'timezone', 'organizationId'] as const;
let sampleSql: string | null = null;

export async function loadReadings(titrationId: number, t?: Transaction): Promise<Reading[]> {
  const rows = await sequelize().query<{ volume_ml: string; ph: string; temperature_c: string | null }>(
    'SELECT volume_ml, ph, temperature_c FROM titration_readings WHERE titration_id = :id ORDER BY seq',
    { replacements: { id: titrationId }, type: QueryTypes.SELECT, transaction: t },
  );
  return rows.map((r) => ({ volumeMl: Number(r.volume_ml), pH: Number(r.ph), temperatureC: num(r.temperature_c) }));
}

async function writeReadings(titrationId: number, readings: Reading[], t: Transaction) {
  await TitrationReading.destroy({ where: { titrationId }, transaction: t });
  for (let i = 0; i < readings.length; i += 1000) {
    await TitrationReading.bulkCreate(
      readings.slice(i, i + 1000).map((r, k) => ({ titrationId, seq: i + k + 1, volumeMl: String(r.volumeMl), ph: String(r.pH), temperatureC: r.temperatureC === null || r.temperatureC === undefined ? null : String(r.temperatureC) })),
      { transaction: t },
    );
  }
}

function checkVersion(row: { version: number }, version: number | undefined, what = 'result') {
  if (version !== undefined && version !== row.version) {
    throw new ConflictError(`This ${what} was changed by someone else (now version ${row.version}); reload it and try again.`, { version: `stale: current version is ${row.version}` });
  }
}

/** Saves with the optimistic lock; a concurrent save in between answers 409. */
async function save(row: Titration, t: Transaction) {
  try {
    await row.save({ transaction: t });
  } catch (e) {
    if (e instanceof OptimisticLockError) throw new ConflictError('This result was changed by someone else; reload it and try again.', { version: 'stale' });
    throw e;
  }
}

// ---- inputs and recomputation ----------------------------------------------------------------

const INPUT_DECIMALS = ['sampleVolumeMl', 'totalEndpointPh', 'volumeToPh83Ml', 'volumeToTotalEndpointMl', 'volumeToPh37Ml', 'temperatureC', 'initialPh', 'tdsMgL', 'specificConductanceUsCm', 'buretteResolutionMl', 'volatileAcidsMgL'] as const;
const INPUT_JSON = ['lowAlkalinity', 'peroxideTreatment'] as const;
const INPUT_KEYS = [...INPUT_DECIMALS, ...INPUT_JSON, 'endpointMethod', 'meterId'] as const;

function storedInputs(row: Titration): ComputeInputs {
  const out: Record<string, unknown> = { analysis: row.analysis, method: row.method, endpointMethod: row.endpointMethod, meterId: row.meterId };
  for (const k of INPUT_DECIMALS) out[k] = num(row[k]);
  for (const k of INPUT_JSON) out[k] = row[k];
  return out as unknown as ComputeInputs;
}

/** The current accepted standardisation of a lot at an instant: the latest one made before it. */
export async function standardizationAt(titrantId: number, at: Date, t?: Transaction) {
  const [found] = await rawFind(Standardization, 'x.titrant_id = ? AND x.accepted = 1 AND x.standardized_at <= ? ORDER BY x.standardized_at DESC, x.id DESC LIMIT 1', [titrantId, at], t);
  return found ?? null;
}

/**
 * What computing a new or changed result reads besides its sample: the analyst, the lot, the
 * lot's standardisation at the analysis time and the meter calibrations. One entry reads them
 * from the database; an import reads each once for the whole batch (`batchLookups`), so both
 * decide with the same rules.
 */
export interface EntryLookups {
  user(id: number, t: Transaction): Promise<User | null>;
  titrant(id: number, t: Transaction): Promise<Titrant | null>;
  standardizationAt(titrantId: number, at: Date, t: Transaction): Promise<Standardization | null>;
  calibrations?: QualifierContext['calibrations'];
}

export const databaseLookups: EntryLookups = {
  user: (id, t) => User.findByPk(id, { transaction: t }),
  titrant: async (id, t) => (await rawFind(Titrant, 'x.id = ?', [id], t))[0] ?? null,
  standardizationAt: (titrantId, at, t) => standardizationAt(titrantId, at, t),
};

/** What picking a same-day calibration needs of each (plain rows: no instances for a batch's hundred). */
const CALIBRATION_ATTRIBUTES = ['id', 'calibratedAt', 'meterId', 'organizationId'] as const;

const latestFirst = (a: { at: Date; id: number }, b: { at: Date; id: number }) => b.at.getTime() - a.at.getTime() || b.id - a.id;

/**
 * Lookups for a batch of new entries, each read once: the lots named, all their accepted
 * standardisations up to the latest analysis, and the passing calibrations of the organisations
 * in the batch's time window; each entry then picks from them exactly as the queries would.
 */
export async function batchLookups(inputs: Array<{ titrantId: number; analysedAt: Date; performedByOrgId: number }>, t: Transaction): Promise<EntryLookups> {
  const titrantIds = [...new Set(inputs.map((i) => i.titrantId))];
  const times = inputs.map((i) => i.analysedAt.getTime());
  // wide enough for an entry whose analysis time is "now", taken a moment later; each pick below applies the exact bounds
  const latest = new Date(Math.max(...times, Date.now()) + FUTURE_SLACK_MS);
  const earliest = new Date(Math.min(...times) - 36 * 3_600_000);
  // raw reads (a batch's window can hold a hundred calibrations: instances of them cost more than the statement)
  const [titrants, standardizations, calibrations, users] = await Promise.all([
    rawFind(Titrant, 'x.id IN (?)', [titrantIds], t),
    rawFind(Standardization, 'x.titrant_id IN (?) AND x.accepted = 1 AND x.standardized_at <= ?', [titrantIds, latest], t),
    sequelize().query<Pick<MeterCalibration, (typeof CALIBRATION_ATTRIBUTES)[number]>>(
      `SELECT ${selectList(MeterCalibration, 'x', '', CALIBRATION_ATTRIBUTES)} FROM meter_calibrations x WHERE x.organization_id IN (?) AND x.passed = 1 AND x.calibrated_at <= ? AND x.calibrated_at >= ?`,
      { replacements: [[...new Set(inputs.map((i) => i.performedByOrgId))], latest, earliest], type: QueryTypes.SELECT, transaction: t },
    ),
    new Map<number, Promise<User | null>>(),
  ]);
  const byTitrant = new Map<number, Standardization[]>();
  for (const s of standardizations.sort((a, b) => latestFirst({ at: a.standardizedAt, id: a.id }, { at: b.standardizedAt, id: b.id }))) {
    byTitrant.set(s.titrantId, [...(byTitrant.get(s.titrantId) ?? []), s]);
  }
  const sortedCalibrations = calibrations.sort((a, b) => latestFirst({ at: a.calibratedAt, id: a.id }, { at: b.calibratedAt, id: b.id }));
  return {
    user: (id, tx) => {
      if (!users.has(id)) users.set(id, User.findByPk(id, { transaction: tx }));
      return users.get(id)!;
    },
    titrant: async (id) => titrants.find((x) => x.id === id) ?? null,
    standardizationAt: async (titrantId, at) => (byTitrant.get(titrantId) ?? []).find((s) => s.standardizedAt.getTime() <= at.getTime()) ?? null,
    calibrations: async ({ organizationId, meterId, from, to }) =>
      sortedCalibrations.filter((m) => m.organizationId === organizationId && m.calibratedAt.getTime() <= to.getTime() && m.calibratedAt.getTime() >= from.getTime() && (!meterId || m.meterId === meterId)),
  };
}

interface ApplyOptions {
  creating: boolean;
  /** Readings to carry over when the body gives none (amendments). */
  carryReadings?: Reading[];
  settings?: BenchSettings;
  lookups?: EntryLookups;
}

/**
 * Applies a body to a titration row (new or stored) and recomputes everything derived: the
 * normality from the lot's standardisation at the analysis time, the engine's result, the
 * bench's warnings and the qualifiers. Returns the readings to write when they changed.
 */
async function applyInputs(actor: Actor, row: Titration, sample: Sample & { facility: Facility }, body: Partial<TitrationInput>, opts: ApplyOptions, t: Transaction): Promise<Reading[] | null> {
  const lookups = opts.lookups ?? databaseLookups;
  const analysis = body.analysis ?? row.analysis;
  const method = body.method ?? row.method;
  const fieldErrors: Record<string, string> = inapplicableFieldErrors(analysis, method, body as Record<string, unknown>);
  if (Object.keys(fieldErrors).length) throw new ValidationError('Some inputs do not belong to this analysis and method.', fieldErrors);

  // Inputs: stored ones (cleared when the method no longer uses them), then the body's.
  const used = fieldsUsed(analysis, method);
  const inputs: Record<string, unknown> = opts.creating ? {} : { ...storedInputs(row) };
  for (const k of INPUT_KEYS) if (body[k] !== undefined) inputs[k] = body[k];
  inputs.analysis = analysis;
  inputs.method = method;
  for (const k of INPUT_KEYS) if (!used.has(k)) inputs[k] = null;
  const ci = inputs as unknown as ComputeInputs;

  // Who ran it, and when.
  let analystId = row.analystId ?? actor.id;
  let performedByOrgId = row.performedByOrgId ?? actor.organizationId;
  if (body.analystId !== undefined && body.analystId !== row.analystId) {
    const analyst = await lookups.user(body.analystId, t);
    if (!analyst || !analyst.active || analyst.organizationId !== actor.organizationId) throw new ValidationError('Choose an active user of your organisation.', { analystId: 'not a user of your organisation' });
    analystId = analyst.id;
    performedByOrgId = analyst.organizationId;
  }
  const analysedAt = body.analysedAt ? new Date(body.analysedAt) : (row.analysedAt ?? new Date());
  if (analysedAt.getTime() < sample.collectedAt.getTime()) {
    throw new ValidationError('The analysis cannot come before the sample was collected.', { analysedAt: `must not be before the collection (${sample.collectedAt.toISOString()})` });
  }
  if (analysedAt.getTime() > Date.now() + FUTURE_SLACK_MS) throw new ValidationError('The analysis time is in the future.', { analysedAt: 'must not be in the future' });

  // The lot, and the normality its standardisation gives at the analysis time.
  const titrantId = body.titrantId ?? row.titrantId;
  const titrant = await lookups.titrant(titrantId, t);
  if (!titrant || ![sample.organizationId, actor.labId].includes(titrant.organizationId)) throw new ValidationError('Choose a titrant lot of the lab or of this utility.', { titrantId: 'not found' });
  if (body.titrantId !== undefined && body.titrantId !== row.titrantId && !titrant.active) throw new ValidationError('This titrant lot is no longer in use.', { titrantId: 'inactive lot' });
  const needed = analysis === 'alkalinity' ? 'acid' : 'base';
  if (REAGENT_KIND[titrant.reagent] !== needed) throw new ValidationError(`${analysis === 'alkalinity' ? 'Alkalinity is titrated with acid' : 'Acidity is titrated with base'}.`, { titrantId: `must be a standard ${needed}` });
  row.titrant = titrant; // the lot in the view of a new result (createdView)
  const standardization = await lookups.standardizationAt(titrant.id, analysedAt, t);
  const normalityUsed = standardization ? standardization.normality : titrant.nominalNormality;

  const settings = opts.settings ?? (await benchSettings(actor.labId, t));
  const caco3Factor = settings.caco3Factor as Caco3Factor;

  // Readings: the body's, the carried ones, or the stored ones when the curve is recomputed.
  let newReadings: Reading[] | null = null;
  let readings: Reading[] = [];
  if (body.readings !== undefined && body.readings !== null) {
    newReadings = body.readings;
    readings = body.readings;
  } else if (opts.carryReadings) {
    newReadings = opts.carryReadings;
    readings = opts.carryReadings;
  } else if (method === 'potentiometric_curve' && !opts.creating && row.id) {
    readings = await loadReadings(row.id, t);
  }
  if (method !== 'potentiometric_curve' && (row.readingCount ?? 0) > 0 && newReadings === null) {
    // Readings belong to curve titrations only; a method change away from a curve drops them from the computation (they stay in the audit log).
    newReadings = [];
  }
  ci.readings = readings;

  const missing = missingInputs(ci, readings.length);
  let computed = null;
  if (missing.length === 0) computed = computeTitration(ci, Number(normalityUsed), Number(titrant.nominalNormality), caco3Factor);

  const qualifiers = await qualifiersFor(
    {
      method,
      analysedAt,
      meterId: (ci.meterId as string | null) ?? null,
      performedByOrgId,
      qcBatchId: row.qcBatchId ?? null,
      normalitySource: standardization ? 'standardization' : 'nominal',
      sample: sample,
      timezone: sample.facility.timezone,
      titrant,
      standardization,
      settings,
      calibrations: lookups.calibrations,
    },
    t,
  );

  // A new row has nothing to compare against: set raw (no per-field change detection; the
  // types' sanitizers still run). A stored row is set normally so that save writes the changes.
  const setOptions = opts.creating ? { raw: true } : {};
  row.set({
    analysis,
    method,
    endpointMethod: (ci.endpointMethod as Titration['endpointMethod']) ?? null,
    sampleVolumeMl: String(ci.sampleVolumeMl),
    titrantId: titrant.id,
    standardizationId: standardization?.id ?? null,
    normalityUsed: String(normalityUsed),
    normalitySource: standardization ? 'standardization' : 'nominal',
    caco3FactorUsed: caco3Factor,
    lowAlkalinity: ci.lowAlkalinity ?? null,
    peroxideTreatment: ci.peroxideTreatment ?? null,
    meterId: (ci.meterId as string | null) ?? null,
    analystId,
    performedByOrgId,
    analysedAt,
    computed: computed !== null,
    ...(computed ? computed.columns : EMPTY_COLUMNS),
    result: computed ? computed.result : null,
    missingInputs: missing,
    warnings: computed ? computed.warnings : [],
    qualifiers,
    qualified: qualifiers.length > 0,
    readingCount: newReadings ? newReadings.length : row.readingCount ?? 0,
  }, setOptions);
  for (const k of INPUT_DECIMALS) if (k !== 'sampleVolumeMl') row.set(k, ci[k] === null || ci[k] === undefined ? null : String(ci[k]), setOptions);
  if (body.notes !== undefined) row.notes = body.notes;
  return newReadings;
}

/** Re-decides the qualifiers of a result not yet approved (after its sample, calibrations or QC batch changed). */
export async function refreshQualifiers(actor: Actor, row: Titration, t: Transaction, settings?: BenchSettings) {
  if (row.status === 'approved' || row.status === 'superseded') return;
  const sample = await sampleFor(actor, row.sampleId, t);
  const titrant = (await Titrant.findByPk(row.titrantId, { transaction: t }))!;
  const standardization = row.standardizationId ? await Standardization.findByPk(row.standardizationId, { transaction: t }) : null;
  const qualifiers = await qualifiersFor(
    {
      method: row.method,
      analysedAt: row.analysedAt,
      meterId: row.meterId,
      performedByOrgId: row.performedByOrgId,
      qcBatchId: row.qcBatchId ?? null,
      normalitySource: row.normalitySource,
      sample,
      timezone: sample.facility.timezone,
      titrant,
      standardization,
      settings: settings ?? (await benchSettings(actor.labId, t)),
    },
    t,
  );
  if (JSON.stringify(qualifiers) === JSON.stringify(row.qualifiers)) return;
  const before = { qualifiers: row.qualifiers };
  row.set({ qualifiers, qualified: qualifiers.length > 0 });
  await save(row, t);
  await audit(actor, { action: 'titration.requalified', entity: 'titration', entityId: row.id, organizationId: row.organizationId, before, after: { qualifiers } }, t);
}

/** The sample's status from its current titrations, in one statement (one sample or many). */
export async function refreshSampleStatus(sampleId: number | number[], t: Transaction) {
  await sequelize().query(
    `UPDATE samples s SET s.status = (
       SELECT CASE
         WHEN COUNT(x.id) = 0 THEN 'received'
         WHEN SUM(x.status IN ('draft', 'returned')) > 0 THEN 'in_progress'
         WHEN SUM(x.status = 'submitted') > 0 THEN 'submitted'
         ELSE 'approved' END
       FROM titrations x WHERE x.sample_id = s.id AND x.status <> 'superseded'), s.updated_at = s.updated_at
     WHERE s.id IN (:sampleId)`,
    { replacements: { sampleId }, type: QueryTypes.UPDATE, transaction: t },
  );
}

// ---- reading -------------------------------------------------------------------------------

async function viewOf(id: number, t?: Transaction): Promise<TitrationView> {
  const row = await Titration.findByPk(id, { include: titrationIncludes(), transaction: t });
  return titrationView(row!);
}

/** How a value compares with its point's last approved values of the same parameter (review's "unusual"). */
export async function historyFor(row: Titration, settings: BenchSettings, t?: Transaction): Promise<ReviewHistory> {
  const parameter = row.analysis === 'alkalinity' ? 'totalAlkalinity' : 'totalAcidity';
  const exclude = [row.id, ...(row.amendsId ? [row.amendsId] : [])];
  const previous = await Titration.findAll({
    where: { pointId: row.pointId, analysis: row.analysis, status: 'approved', computed: true, analysedAt: { [Op.lt]: row.analysedAt }, id: { [Op.notIn]: exclude } },
    attributes: ['id', 'analysedAt', parameter],
    order: [['analysedAt', 'DESC']],
    limit: settings.unusualHistoryCount,
    transaction: t,
  });
  const value = row.computed ? row[parameter] : null;
  const values = previous.map((p) => p[parameter] as string);
  const comparison =
    value === null ? { n: values.length, mean: null, standardDeviation: null, zScore: null, unusual: null } : historyComparison(value, values, { sdMultiplier: settings.unusualSdMultiplier, minCount: settings.unusualMinHistory });
  return {
    parameter,
    value: num(value),
    ...comparison,
    previous: previous.slice(0, 5).map((p) => ({ titrationId: p.id, analysedAt: p.analysedAt.toISOString(), value: Number(p[parameter]) })),
  };
}

async function chainOf(row: Titration, t?: Transaction): Promise<Titration[]> {
  const ids = new Set<number>([row.id]);
  let frontier = [row.id];
  for (let guard = 0; guard < 50 && frontier.length; guard++) {
    const found = await Titration.findAll({ where: { [Op.or]: [{ id: { [Op.in]: frontier } }, { amendsId: { [Op.in]: frontier } }] }, attributes: ['id', 'amendsId'], transaction: t });
    const next = found.flatMap((f) => [f.id, f.amendsId]).filter((x): x is number => !!x && !ids.has(x));
    next.forEach((x) => ids.add(x));
    frontier = next;
  }
  return Titration.findAll({ where: { id: { [Op.in]: [...ids] } }, attributes: ['id', 'revision', 'status', 'analysedAt', 'approvedAt', 'amendReason'], order: [['revision', 'ASC'], ['id', 'ASC']], transaction: t });
}

export async function getTitration(actor: Actor, id: number): Promise<TitrationDetail> {
  const row = await Titration.findByPk(id, { include: titrationIncludes() });
  if (!row) throw new NotFoundError('Titration');
  assertInScope(actor, row.organizationId, 'Titration');
  const sample = await Sample.findByPk(row.sampleId, { include: sampleIncludes() });
  const readings = await loadReadings(row.id);
  const settings = await benchSettings(actor.labId);
  const versions = await chainOf(row);
  const { titrations: _t, ...sampleOut } = sampleView(sample!);
  return {
    ...titrationView(row),
    readings: readings.map((r, i) => ({ seq: i + 1, volumeMl: r.volumeMl, pH: r.pH, temperatureC: r.temperatureC ?? null })),
    derivative: readings.length >= 2 ? derivativeSeries(readings) : [],
    sample: sampleOut,
    versions: versions.map((v) => ({ id: v.id, revision: v.revision, status: v.status, analysedAt: v.analysedAt.toISOString(), approvedAt: v.approvedAt ? v.approvedAt.toISOString() : null, amendReason: v.amendReason })),
    history: await historyFor(row, settings),
  };
}

export async function listSampleTitrations(actor: Actor, sampleId: number, raw: Record<string, unknown>) {
  await sampleFor(actor, sampleId);
  const p = listParams(raw, { analysedAt: 'analysedAt', revision: 'revision', status: 'status', createdAt: 'createdAt' }, 'analysedAt');
  const where: WhereOptions[] = [{ sampleId }, orgScope(actor)];
  if (typeof raw.status === 'string' && raw.status) where.push({ status: raw.status });
  const { rows, count } = await Titration.findAndCountAll({ where: { [Op.and]: where }, include: titrationIncludes(), order: p.order, limit: p.limit, offset: p.offset, distinct: true });
  return { items: rows.map(titrationView), total: count };
}

/** That result's audit trail: every event of every version of it. */
export async function titrationAudit(actor: Actor, id: number, raw: Record<string, unknown>) {
  const row = await Titration.findByPk(id);
  if (!row) throw new NotFoundError('Titration');
  assertInScope(actor, row.organizationId, 'Titration');
  const ids = (await chainOf(row)).map((v) => String(v.id));
  const p = listParams(raw, { createdAt: 'createdAt', action: 'action' }, 'createdAt');
  const { rows, count } = await AuditEvent.findAndCountAll({
    where: { entity: 'titration', entityId: { [Op.in]: ids } },
    include: [{ model: User, as: 'actor', attributes: ['id', 'name', 'email'] }],
    order: p.order,
    limit: p.limit,
    offset: p.offset,
  });
  return {
    items: rows.map((e) => ({
      id: e.id,
      createdAt: e.createdAt,
      action: e.action,
      titrationId: Number(e.entityId),
      actor: e.actor ? { id: e.actor.id, name: e.actor.name, email: e.actor.email } : null,
      before: e.before,
      after: e.after,
      reason: e.reason,
    })),
    total: count,
  };
}

// ---- writing ---------------------------------------------------------------------------------

/**
 * A new titration of a sample, checked and computed but not saved: the row and its readings.
 * The sample may be one not yet inserted (an import saves a batch at once); its id is set then.
 */
export async function buildTitration(
  actor: Actor,
  sample: Sample & { facility: Facility },
  input: TitrationInput,
  opts: { settings?: BenchSettings; lookups?: EntryLookups },
  t: Transaction,
): Promise<{ row: Titration; readings: Reading[] | null }> {
  const row = Titration.build({
    sampleId: sample.id,
    organizationId: sample.organizationId,
    pointId: sample.pointId,
    analysis: input.analysis,
    method: input.method,
    createdById: actor.id,
    analystId: actor.id,
    performedByOrgId: actor.organizationId,
    amendsId: null,
    amendReason: null,
    notes: null,
  } as never, { raw: true });
  const readings = await applyInputs(actor, row, sample, input, { creating: true, settings: opts.settings, lookups: opts.lookups }, t);
  return { row, readings };
}

/** Readings of many new titrations in batched inserts. */
export async function insertReadings(rows: Array<{ titrationId: number; readings: Reading[] }>, t: Transaction) {
  const all = rows.flatMap(({ titrationId, readings }) =>
    readings.map((r, k) => ({ titrationId, seq: k + 1, volumeMl: String(r.volumeMl), ph: String(r.pH), temperatureC: r.temperatureC === null || r.temperatureC === undefined ? null : String(r.temperatureC) })),
  );
  await batchInsert(TitrationReading, all, t);
}

export async function createTitration(actor: Actor, sampleId: number, input: TitrationInput, tx?: Transaction, opts: { settings?: BenchSettings } = {}): Promise<TitrationView> {
  const created = await inTransaction(tx, async (t) => {
    const sample = await sampleFor(actor, sampleId, t, true);
    const { row, readings } = await buildTitration(actor, sample, input, opts, t);
    // a new row: the import's one-statement insert (no optimistic lock to check yet)
    await insertBuilt(Titration, [row], t);
    if (readings?.length) await writeReadings(row.id, readings, t);
    await audit(actor, { action: 'titration.created', entity: 'titration', entityId: row.id, organizationId: row.organizationId, after: benchSnapshot(row) }, t);
    await refreshSampleStatus(sample.id, t);
    return row;
  });
  // Inside a caller's transaction (the seed) the row itself is returned, without the user names.
  return tx ? titrationView(created) : createdView(actor, created);
}

/**
 * The view of a titration the actor has just created: the stored row read back (the database's
 * rounding of every figure), with the lot `applyInputs` attached and the people the request
 * holds; the same view as `viewOf` without the six-way join (a new row has no submitter,
 * approver or returner yet).
 */
async function createdView(actor: Actor, created: Titration): Promise<TitrationView> {
  const [[row], analyst] = await Promise.all([
    rawFind(Titration, 'x.id = ?', [created.id]),
    created.analystId === actor.id ? actor.user : User.findByPk(created.analystId!, { attributes: ['id', 'name'] }),
  ]);
  return titrationView(Object.assign(row, { titrant: created.titrant, analyst, createdBy: actor.user }));
}

const EDITABLE = new Set(['draft', 'returned']);

export async function updateTitration(actor: Actor, id: number, patch: TitrationPatch): Promise<TitrationView> {
  await inTransaction(undefined, async (t) => {
    const row = await lockTitration(actor, id, t);
    checkVersion(row, patch.version);
    if (!EDITABLE.has(row.status)) throw new ConflictError(`A ${row.status} result cannot be edited${row.status === 'approved' ? '; amend it instead' : ''}.`, { status: row.status });
    const sample = await sampleFor(actor, row.sampleId, t);
    const before: Record<string, unknown> = { ...benchSnapshot(row) };
    const { version: _v, ...body } = patch;
    const oldCount = row.readingCount;
    const readings = await applyInputs(actor, row, sample, body, { creating: false }, t);
    // Replaced readings stay in the audit trail.
    if (readings && oldCount > 0) before.readings = (await loadReadings(row.id, t)).map((r) => [r.volumeMl, r.pH, r.temperatureC ?? null]);
    await save(row, t);
    if (readings) await writeReadings(row.id, readings, t);
    await audit(actor, { action: 'titration.updated', entity: 'titration', entityId: row.id, organizationId: row.organizationId, before, after: benchSnapshot(row) }, t);
  });
  return viewOf(id);
}

/** Replaces a curve's readings (CSV upload or pasted table) and recomputes; the replaced readings stay in the audit event. */
export async function replaceReadings(actor: Actor, id: number, readings: Reading[], version: number | undefined, source: string): Promise<TitrationDetail> {
  await inTransaction(undefined, async (t) => {
    const row = await lockTitration(actor, id, t);
    checkVersion(row, version);
    if (!EDITABLE.has(row.status)) throw new ConflictError(`A ${row.status} result cannot be edited${row.status === 'approved' ? '; amend it instead' : ''}.`, { status: row.status });
    if (row.method !== 'potentiometric_curve') throw new ValidationError('Readings belong to a recorded curve.', { method: 'must be potentiometric_curve to take readings' });
    const sample = await sampleFor(actor, row.sampleId, t);
    const old = await loadReadings(row.id, t);
    const before = { ...benchSnapshot(row), readings: old.map((r) => [r.volumeMl, r.pH, r.temperatureC ?? null]) };
    await applyInputs(actor, row, sample, { readings }, { creating: false }, t);
    await save(row, t);
    await writeReadings(row.id, readings, t);
    await audit(
      actor,
      { action: 'titration.readings_replaced', entity: 'titration', entityId: row.id, organizationId: row.organizationId, before, after: { ...benchSnapshot(row), readingCount: readings.length, source } },
      t,
    );
  });
  return getTitration(actor, id);
}

export async function submitTitration(actor: Actor, id: number, body: z.output<typeof transitionSchema>, tx?: Transaction): Promise<TitrationView> {
  const submitted = await inTransaction(tx, async (t) => {
    const row = await lockTitration(actor, id, t);
    checkVersion(row, body.version);
    if (!EDITABLE.has(row.status)) throw new ConflictError(`Only a draft or returned result can be submitted; this one is ${row.status}.`, { status: row.status });
    if (!row.computed) {
      throw new ValidationError('Complete the titration before submitting it.', Object.fromEntries(row.missingInputs.map((f) => [f, 'required to compute the result'])));
    }
    const before = benchSnapshot(row);
    await refreshQualifiersInPlace(actor, row, t);
    row.set({ status: 'submitted', submittedAt: new Date(), submittedById: actor.id });
    await save(row, t);
    await audit(actor, { action: 'titration.submitted', entity: 'titration', entityId: row.id, organizationId: row.organizationId, before, after: benchSnapshot(row) }, t);
    await refreshSampleStatus(row.sampleId, t);
    return row;
  });
  return tx ? titrationView(submitted) : viewOf(id);
}

/** Qualifiers re-decided without a separate save (the caller saves with its own change). */
async function refreshQualifiersInPlace(actor: Actor, row: Titration, t: Transaction, settings?: BenchSettings) {
  const sample = await sampleFor(actor, row.sampleId, t);
  const titrant = (await Titrant.findByPk(row.titrantId, { transaction: t }))!;
  const standardization = row.standardizationId ? await Standardization.findByPk(row.standardizationId, { transaction: t }) : null;
  const qualifiers = await qualifiersFor(
    {
      method: row.method,
      analysedAt: row.analysedAt,
      meterId: row.meterId,
      performedByOrgId: row.performedByOrgId,
      qcBatchId: row.qcBatchId ?? null,
      normalitySource: row.normalitySource,
      sample,
      timezone: sample.facility.timezone,
      titrant,
      standardization,
      settings: settings ?? (await benchSettings(actor.labId, t)),
    },
    t,
  );
  row.set({ qualifiers, qualified: qualifiers.length > 0 });
}

async function approveLocked(actor: Actor, row: Titration, t: Transaction, settings: BenchSettings) {
  const before = benchSnapshot(row);
  await refreshQualifiersInPlace(actor, row, t, settings);
  row.set({ status: 'approved', approvedAt: new Date(), approvedById: actor.id, returnComment: null });
  await save(row, t);
  await audit(actor, { action: 'titration.approved', entity: 'titration', entityId: row.id, organizationId: row.organizationId, before, after: benchSnapshot(row) }, t);
  if (row.amendsId) {
    // The amendment is now the record; the version it corrects stays, marked superseded.
    const old = await Titration.findByPk(row.amendsId, { transaction: t, lock: t.LOCK.UPDATE });
    if (old && old.status === 'approved') {
      const oldBefore = benchSnapshot(old);
      old.set({ status: 'superseded', supersededById: row.id });
      await save(old, t);
      await audit(actor, { action: 'titration.superseded', entity: 'titration', entityId: old.id, organizationId: old.organizationId, before: oldBefore, after: benchSnapshot(old), reason: row.amendReason }, t);
    }
  }
  await refreshSampleStatus(row.sampleId, t);
}

export async function approveTitration(actor: Actor, id: number, body: z.output<typeof transitionSchema>): Promise<TitrationView> {
  const sampleId = await inTransaction(undefined, async (t) => {
    const row = await lockTitration(actor, id, t);
    checkVersion(row, body.version);
    if (row.status !== 'submitted') throw new ConflictError(`Only a submitted result can be approved; this one is ${row.status}.`, { status: row.status });
    await approveLocked(actor, row, t, await benchSettings(actor.labId, t));
    return row.sampleId;
  });
  await judgeAgainstPermits(actor, [sampleId]);
  return viewOf(id);
}

/**
 * After approvals commit: re-evaluate the permit periods the samples touch (new exceedances
 * get notices, cured ones close). The approval stands even if this fails; the Compliance view
 * computes the month afresh, and the next approval or a restart's seed pass catches up.
 */
async function judgeAgainstPermits(actor: Actor, sampleIds: number[]) {
  for (const sampleId of new Set(sampleIds)) {
    try {
      await onResultChanged(sampleId, actor);
    } catch (err) {
      console.warn(`compliance re-evaluation failed for sample ${sampleId}: ${(err as Error).message}`);
    }
  }
}

/** Approves many submitted results at once: all of them or, if any cannot be, none. */
export async function bulkApprove(actor: Actor, body: z.output<typeof bulkApproveSchema>, tx?: Transaction): Promise<{ approved: number[]; items: TitrationView[] }> {
  const ids = body.items.map((i) => i.id);
  if (new Set(ids).size !== ids.length) throw new ValidationError('A result is listed twice.', { items: 'each id once' });
  const sampleIds = await inTransaction(tx, async (t) => {
    const rows = await Titration.findAll({ where: { id: { [Op.in]: ids } }, transaction: t, lock: t.LOCK.UPDATE });
    const byId = new Map(rows.map((r) => [r.id, r]));
    const notFound: Record<string, string> = {};
    const stale: Record<string, string> = {};
    const wrong: Record<string, string> = {};
    body.items.forEach((item, i) => {
      const row = byId.get(item.id);
      if (!row || !actor.visibleOrgIds.includes(row.organizationId)) notFound[`items.${i}.id`] = 'not found';
      else if (item.version !== undefined && item.version !== row.version) stale[`items.${i}.version`] = `stale: current version is ${row.version}`;
      else if (row.status !== 'submitted') wrong[`items.${i}.id`] = `is ${row.status}, not submitted`;
    });
    if (Object.keys(notFound).length) throw new ValidationError('Some results were not found; nothing was approved.', notFound);
    if (Object.keys(stale).length) throw new ConflictError('Some results changed since you read them; nothing was approved.', stale);
    if (Object.keys(wrong).length) throw new ConflictError('Only submitted results can be approved; nothing was approved.', wrong);
    const settings = await benchSettings(actor.labId, t);
    for (const id of ids) await approveLocked(actor, byId.get(id)!, t, settings);
    return rows.map((r) => r.sampleId);
  });
  // Inside a caller's transaction (the demo seed) the caller judges once at the end.
  if (!tx) await judgeAgainstPermits(actor, sampleIds);
  const items = await Titration.findAll({ where: { id: { [Op.in]: ids } }, include: titrationIncludes(), transaction: tx });
  return { approved: ids, items: items.map(titrationView) };
}

export async function returnTitration(actor: Actor, id: number, body: z.output<typeof returnSchema>): Promise<TitrationView> {
  await inTransaction(undefined, async (t) => {
    const row = await lockTitration(actor, id, t);
    checkVersion(row, body.version);
    if (row.status !== 'submitted') throw new ConflictError(`Only a submitted result can be returned; this one is ${row.status}.`, { status: row.status });
    const before = benchSnapshot(row);
    row.set({ status: 'returned', returnComment: body.comment, returnedAt: new Date(), returnedById: actor.id });
    await save(row, t);
    await audit(actor, { action: 'titration.returned', entity: 'titration', entityId: row.id, organizationId: row.organizationId, before, after: benchSnapshot(row), reason: body.comment }, t);
    await refreshSampleStatus(row.sampleId, t);
  });
  return viewOf(id);
}

const COPIED = [
  'analysis', 'method', 'endpointMethod', 'sampleVolumeMl', 'titrantId', 'totalEndpointPh', 'volumeToPh83Ml', 'volumeToTotalEndpointMl', 'volumeToPh37Ml',
  'lowAlkalinity', 'peroxideTreatment', 'temperatureC', 'initialPh', 'tdsMgL', 'specificConductanceUsCm', 'buretteResolutionMl', 'volatileAcidsMgL',
  'meterId', 'analystId', 'performedByOrgId', 'analysedAt', 'notes', 'qcBatchId', 'sampleId', 'organizationId', 'pointId', 'readingCount',
] as const;

/**
 * Amends an approved result: a new version (revision + 1, a draft) carrying the corrections and
 * the mandatory reason; the approved version stays the record until the amendment is approved,
 * then it is kept as superseded. Both stay visible.
 */
export async function amendTitration(actor: Actor, id: number, body: z.output<typeof amendSchema>, tx?: Transaction): Promise<TitrationView> {
  const newId = await inTransaction(tx, async (t) => {
    const old = await lockTitration(actor, id, t);
    checkVersion(old, body.version);
    if (old.status !== 'approved') throw new ConflictError(`Only an approved result is amended; this one is ${old.status}${EDITABLE.has(old.status) ? ' and can be edited' : ''}.`, { status: old.status });
    const pending = await Titration.findOne({ where: { amendsId: old.id, status: { [Op.in]: ['draft', 'submitted', 'returned'] } }, transaction: t });
    if (pending) throw new ConflictError(`An amendment of this result is already in progress (titration ${pending.id}).`, { amendment: String(pending.id) });
    const sample = await sampleFor(actor, old.sampleId, t);
    const copy: Record<string, unknown> = {};
    for (const k of COPIED) copy[k] = old[k];
    const row = Titration.build({ ...copy, revision: old.revision + 1, amendsId: old.id, amendReason: body.reason, createdById: actor.id, status: 'draft' } as never);
    const { reason: _r, version: _v, ...changes } = body;
    const carry = changes.readings === undefined && old.method === 'potentiometric_curve' && (changes.method ?? old.method) === 'potentiometric_curve' ? await loadReadings(old.id, t) : undefined;
    const readings = await applyInputs(actor, row, sample, changes, { creating: false, carryReadings: carry }, t);
    await save(row, t);
    if (readings?.length) await writeReadings(row.id, readings, t);
    await audit(actor, { action: 'titration.amendment_created', entity: 'titration', entityId: row.id, organizationId: row.organizationId, after: benchSnapshot(row), reason: body.reason }, t);
    await audit(actor, { action: 'titration.amended', entity: 'titration', entityId: old.id, organizationId: old.organizationId, before: null, after: { amendmentId: row.id, revision: row.revision }, reason: body.reason }, t);
    await refreshSampleStatus(old.sampleId, t);
    return row.id;
  });
  return viewOf(newId, tx);
}
