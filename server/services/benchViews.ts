import type { Includeable } from 'sequelize';
import type {
  CalibrationView,
  QualifierCode,
  SampleView,
  StandardizationView,
  TitrantView,
  TitrationResults,
  TitrationSummary,
  TitrationView,
  UserRef,
} from '../../shared/types/bench.js';
import { Facility, MonitoringPoint, Titrant, User, type MeterCalibration, type Sample, type Standardization, type Titration } from '../db/models/index.js';
import { snapshot } from './audit.js';

/** Response shapes of the Bench (shared/types/bench.ts); DECIMAL strings become numbers here, once. */

export const num = (v: string | number | null | undefined): number | null => (v === null || v === undefined ? null : Number(v));
const iso = (d: Date | null | undefined): string | null => (d ? d.toISOString() : null);

export function userRef(u: User | null | undefined): UserRef | null {
  return u ? { id: u.id, name: u.name } : null;
}

const user = (as: string): Includeable => ({ model: User, as, attributes: ['id', 'name'] });

export const sampleIncludes = (): Includeable[] => [
  { model: MonitoringPoint, as: 'point', attributes: ['id', 'code', 'name', 'matrix', 'facilityId'] },
  { model: Facility, as: 'facility', attributes: ['id', 'name', 'timezone', 'organizationId'] },
  user('createdBy'),
];

export const titrationIncludes = (): Includeable[] => [
  { model: Titrant, as: 'titrant', attributes: ['id', 'kind', 'reagent', 'lot', 'nominalNormality'] },
  ...['analyst', 'submittedBy', 'approvedBy', 'returnedBy', 'createdBy'].map(user),
];

export function titrationSummary(t: Titration): TitrationSummary {
  const e = t.computed ? ((t.result as { engine?: Record<string, number | null> } | null)?.engine ?? null) : null;
  const pick = (k: string, analysis: string) => (e && t.analysis === analysis ? (e[k] ?? null) : null);
  return {
    id: t.id,
    analysis: t.analysis,
    method: t.method,
    status: t.status,
    revision: t.revision,
    version: t.version,
    analysedAt: t.analysedAt.toISOString(),
    phenolphthaleinAlkalinity: pick('phenolphthaleinAlkalinity', 'alkalinity'),
    totalAlkalinity: pick('totalAlkalinity', 'alkalinity'),
    mineralAcidity: pick('mineralAcidity', 'acidity'),
    totalAcidity: pick('totalAcidity', 'acidity'),
    qualifierCodes: t.qualifiers.map((q) => q.code as QualifierCode),
    warningCodes: t.warnings.map((w) => w.code),
  };
}

export function sampleView(s: Sample, titrations: Titration[] = []): SampleView {
  return {
    id: s.id,
    organizationId: s.organizationId,
    facility: { id: s.facilityId, name: s.facility?.name ?? '', timezone: s.facility?.timezone ?? 'UTC' },
    point: { id: s.pointId, code: s.point?.code ?? '', name: s.point?.name ?? '', matrix: s.point?.matrix ?? '' },
    sampleType: s.sampleType,
    compositeStartAt: iso(s.compositeStartAt),
    compositeEndAt: iso(s.compositeEndAt),
    collectedAt: s.collectedAt.toISOString(),
    collectedBy: s.collectedBy,
    receivedAt: iso(s.receivedAt),
    receiptTemperatureC: num(s.receiptTemperatureC),
    preservation: s.preservation,
    filtered: s.filtered,
    notes: s.notes,
    status: s.status,
    version: s.version,
    createdBy: userRef(s.createdBy),
    createdAt: s.createdAt.toISOString(),
    updatedAt: s.updatedAt.toISOString(),
    titrations: titrations.map(titrationSummary),
  };
}

function resultsOf(t: Titration): TitrationResults | null {
  if (!t.computed || !t.result) return null;
  const stored = t.result as { engine: Record<string, any>; volatileAcids?: TitrationResults['volatileAcids'] };
  const e = stored.engine;
  const exact = {
    phenolphthaleinAlkalinity: t.phenolphthaleinAlkalinity,
    totalAlkalinity: t.totalAlkalinity,
    totalAlkalinityMeqL: t.totalAlkalinityMeqL,
    hydroxide: t.hydroxide,
    carbonate: t.carbonate,
    bicarbonate: t.bicarbonate,
    mineralAcidity: t.mineralAcidity,
    totalAcidity: t.totalAcidity,
    endpointPVolumeMl: t.endpointPVolumeMl,
    endpointTVolumeMl: t.endpointTVolumeMl,
  };
  if (t.analysis === 'alkalinity') {
    return {
      phenolphthaleinAlkalinity: e.phenolphthaleinAlkalinity,
      totalAlkalinity: e.totalAlkalinity,
      totalAlkalinityMeqL: e.totalAlkalinityMeqL,
      species: { hydroxide: e.species.hydroxide, carbonate: e.species.carbonate, bicarbonate: e.species.bicarbonate },
      mineralAcidity: null,
      totalAcidity: null,
      endpointVolumes: { phenolphthalein: e.endpoints.phenolphthalein.volumeMl, total: e.endpoints.total.volumeMl },
      volatileAcids: stored.volatileAcids ?? null,
      exact,
      engine: e,
    };
  }
  return {
    phenolphthaleinAlkalinity: null,
    totalAlkalinity: null,
    totalAlkalinityMeqL: null,
    species: null,
    mineralAcidity: e.mineralAcidity,
    totalAcidity: e.totalAcidity,
    endpointVolumes: { mineral: num(t.endpointPVolumeMl), total: num(t.endpointTVolumeMl) },
    volatileAcids: null,
    exact,
    engine: e,
  };
}

export function titrationView(t: Titration): TitrationView {
  return {
    id: t.id,
    sampleId: t.sampleId,
    organizationId: t.organizationId,
    pointId: t.pointId,
    analysis: t.analysis,
    method: t.method,
    endpointMethod: t.endpointMethod,
    status: t.status,
    version: t.version,
    revision: t.revision,
    amendsId: t.amendsId,
    supersededById: t.supersededById ?? null,
    amendReason: t.amendReason,
    returnComment: t.returnComment ?? null,
    sampleVolumeMl: Number(t.sampleVolumeMl),
    titrantId: t.titrantId,
    totalEndpointPh: num(t.totalEndpointPh),
    volumeToPh83Ml: num(t.volumeToPh83Ml),
    volumeToTotalEndpointMl: num(t.volumeToTotalEndpointMl),
    volumeToPh37Ml: num(t.volumeToPh37Ml),
    lowAlkalinity: t.lowAlkalinity,
    peroxideTreatment: t.peroxideTreatment,
    temperatureC: num(t.temperatureC),
    initialPh: num(t.initialPh),
    tdsMgL: num(t.tdsMgL),
    specificConductanceUsCm: num(t.specificConductanceUsCm),
    buretteResolutionMl: num(t.buretteResolutionMl),
    volatileAcidsMgL: num(t.volatileAcidsMgL),
    meterId: t.meterId,
    analysedAt: t.analysedAt.toISOString(),
    notes: t.notes,
    readingCount: t.readingCount,
    titrant: t.titrant
      ? { id: t.titrant.id, kind: t.titrant.kind, reagent: t.titrant.reagent, lot: t.titrant.lot, nominalNormality: Number(t.titrant.nominalNormality) }
      : null,
    standardizationId: t.standardizationId,
    normalityUsed: Number(t.normalityUsed),
    normalitySource: t.normalitySource,
    caco3FactorUsed: t.caco3FactorUsed,
    qcBatchId: t.qcBatchId ?? null,
    results: resultsOf(t),
    missingInputs: t.missingInputs,
    warnings: t.warnings,
    qualifiers: t.qualifiers,
    analyst: userRef(t.analyst),
    submittedAt: iso(t.submittedAt),
    submittedBy: userRef(t.submittedBy),
    approvedAt: iso(t.approvedAt),
    approvedBy: userRef(t.approvedBy),
    returnedAt: iso(t.returnedAt),
    returnedBy: userRef(t.returnedBy),
    createdBy: userRef(t.createdBy),
    createdAt: t.createdAt.toISOString(),
    updatedAt: t.updatedAt.toISOString(),
  };
}

export function titrantView(t: Titrant, current: Standardization | null, now = new Date()): TitrantView {
  return {
    id: t.id,
    organizationId: t.organizationId,
    kind: t.kind,
    reagent: t.reagent,
    nominalNormality: Number(t.nominalNormality),
    lot: t.lot,
    preparedOn: t.preparedOn ?? null,
    expiresOn: t.expiresOn,
    active: t.active,
    notes: t.notes ?? null,
    version: t.version,
    currentStandardization: current
      ? {
          id: current.id,
          normality: Number(current.normality),
          standardizedAt: current.standardizedAt.toISOString(),
          validUntil: current.validUntil.toISOString(),
          valid: current.validUntil.getTime() >= now.getTime(),
        }
      : null,
    createdAt: t.createdAt.toISOString(),
  };
}

export function standardizationView(s: Standardization): StandardizationView {
  return {
    id: s.id,
    titrantId: s.titrantId,
    primaryStandard: s.primaryStandard,
    mode: s.mode,
    standardGramsPerL: num(s.standardGramsPerL),
    replicates: s.replicates.map((r) => ({ ...r, normality: Number(r.normality) })),
    normality: Number(s.normality),
    normalityExact: s.normality,
    rsdPercent: Number(s.rsdPercent),
    rsdLimitPercent: Number(s.rsdLimitPercent),
    accepted: s.accepted,
    standardizedAt: s.standardizedAt.toISOString(),
    validUntil: s.validUntil.toISOString(),
    standardizedBy: userRef(s.standardizedBy),
    notes: s.notes,
    createdAt: s.createdAt.toISOString(),
  };
}

export function calibrationView(c: MeterCalibration, theoreticalSlopeMvPerPh: number): CalibrationView {
  return {
    id: c.id,
    organizationId: c.organizationId,
    meterId: c.meterId,
    meterName: c.meterName,
    calibratedAt: c.calibratedAt.toISOString(),
    temperatureC: Number(c.temperatureC),
    buffers: c.buffers,
    slopeMvPerPh: Number(c.slopeMvPerPh),
    theoreticalSlopeMvPerPh,
    percentSlope: Number(c.percentSlope),
    offsetMv: Number(c.offsetMv),
    window: { minPercent: Number(c.slopeMinPercent), maxPercent: Number(c.slopeMaxPercent) },
    checks: c.checks,
    passed: c.passed,
    warnings: c.warnings as CalibrationView['warnings'],
    calibratedBy: userRef(c.calibratedBy),
    notes: c.notes,
    createdAt: c.createdAt.toISOString(),
  };
}

const BENCH_ASSOCIATIONS = new Set(['readings', 'analyst', 'submittedBy', 'approvedBy', 'returnedBy', 'createdBy', 'standardizations', 'standardizedBy', 'calibratedBy', 'titrations']);

/**
 * snapshot() for the audit log, also leaving out the Bench's associations and a titration's
 * full engine output (its inputs and stored result columns are what the trail compares).
 */
export function benchSnapshot(record: object | null | undefined): object | null {
  return snapshot(record, (k) => BENCH_ASSOCIATIONS.has(k) || k === 'result');
}
