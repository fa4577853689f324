import { Op, type Transaction } from 'sequelize';
import { holdingTime } from '../../shared/chemistry/qc.js';
import { POTENTIOMETRIC_METHODS, type BenchSettings, type TitrationMethod } from '../../shared/schemas/bench.js';
import type { Qualifier } from '../../shared/types/bench.js';
import { MeterCalibration, QcBatch, type Sample, type Standardization, type Titrant } from '../db/models/index.js';

/**
 * Data qualifiers of a result, each decided on its own evidence [40 CFR 136.3 Table II for
 * holding time and temperature; domain.md 5 and 6 for standardisation, QC and calibration].
 * Recomputed on every change until the result is approved, then frozen with it.
 */

export interface QualifierContext {
  method: TitrationMethod;
  analysedAt: Date;
  meterId: string | null;
  performedByOrgId: number;
  qcBatchId: number | null;
  normalitySource: 'standardization' | 'nominal';
  sample: Pick<Sample, 'collectedAt' | 'receiptTemperatureC'>;
  timezone: string;
  titrant: Pick<Titrant, 'expiresOn' | 'lot'>;
  standardization: Pick<Standardization, 'id' | 'validUntil' | 'standardizedAt'> | null;
  settings: BenchSettings;
  /** Passing calibrations of an organisation in a window, latest first (an import reads them once for its batch). */
  calibrations?: (q: { organizationId: number; meterId: string | null; from: Date; to: Date }) => Promise<Array<Pick<MeterCalibration, 'id' | 'calibratedAt' | 'meterId'>>>;
}

const hours = (h: number) => Math.round(h * 10) / 10;

const dayFormats = new Map<string, Intl.DateTimeFormat>();
/** The calendar date (YYYY-MM-DD) of an instant in the facility's time zone. */
export function localDay(at: Date, zone: string): string {
  let f = dayFormats.get(zone);
  if (!f) dayFormats.set(zone, (f = new Intl.DateTimeFormat('en-CA', { timeZone: zone, year: 'numeric', month: '2-digit', day: '2-digit' })));
  return f.format(at);
}

export async function qualifiersFor(c: QualifierContext, transaction?: Transaction): Promise<Qualifier[]> {
  const out: Qualifier[] = [];
  const analysedDay = localDay(c.analysedAt, c.timezone);

  const hold = holdingTime(c.sample.collectedAt, c.analysedAt, c.settings.holdingTimeHours);
  if (hold.exceeded) {
    out.push({
      code: 'hold_time_exceeded',
      message: `Analysed ${hours(hold.elapsedHours)} h after collection; the holding time is ${hold.limitHours} h (40 CFR 136.3 Table II: 14 days).`,
      detail: { elapsedHours: hours(hold.elapsedHours), limitHours: hold.limitHours, deadline: hold.deadline, exceededByHours: hours(hold.exceededByHours) },
    });
  }

  if (c.sample.receiptTemperatureC !== null && Number(c.sample.receiptTemperatureC) > c.settings.receiptTemperatureMaxC) {
    out.push({
      code: 'receipt_temperature',
      message: `Received at ${Number(c.sample.receiptTemperatureC)} °C; the sample must be kept at ≤ ${c.settings.receiptTemperatureMaxC} °C (40 CFR 136.3 Table II).`,
      detail: { receiptTemperatureC: Number(c.sample.receiptTemperatureC), maxC: c.settings.receiptTemperatureMaxC },
    });
  }

  if (c.normalitySource === 'nominal' || !c.standardization) {
    out.push({
      code: 'standardization_expired',
      message: 'The titrant lot had no accepted standardisation before this analysis; the nominal normality was used.',
      detail: { reason: 'missing' },
    });
  } else if (c.standardization.validUntil.getTime() < c.analysedAt.getTime()) {
    out.push({
      code: 'standardization_expired',
      message: `The titrant's standardisation expired ${c.standardization.validUntil.toISOString()} before this analysis (restandardise monthly, USGS NFM A6.6.2).`,
      detail: { reason: 'expired', standardizationId: c.standardization.id, validUntil: c.standardization.validUntil.toISOString() },
    });
  }

  if (c.titrant.expiresOn < analysedDay) {
    out.push({
      code: 'titrant_lot_expired',
      message: `Titrant lot ${c.titrant.lot} expired on ${c.titrant.expiresOn}, before this analysis on ${analysedDay}.`,
      detail: { expiresOn: c.titrant.expiresOn },
    });
  }

  if (c.qcBatchId) {
    const batch = await QcBatch.findByPk(c.qcBatchId, { transaction });
    if (batch && !batch.passed) {
      out.push({
        code: 'qc_failure',
        message: `QC batch ${batch.id} of ${batch.batchDate} failed (${batch.evaluation.failures.join(', ')}).`,
        detail: { qcBatchId: batch.id, failures: batch.evaluation.failures },
      });
    }
  }

  if (POTENTIOMETRIC_METHODS.includes(c.method)) {
    // A passing calibration on the bench that ran it, earlier the same local day, of the meter used when named.
    const window = { organizationId: c.performedByOrgId, meterId: c.meterId, from: new Date(c.analysedAt.getTime() - 36 * 3_600_000), to: c.analysedAt };
    const candidates = c.calibrations ? await c.calibrations(window) : await MeterCalibration.findAll({
      where: {
        organizationId: window.organizationId,
        passed: true,
        calibratedAt: { [Op.lte]: window.to, [Op.gte]: window.from },
        ...(c.meterId ? { meterId: c.meterId } : {}),
      },
      attributes: ['id', 'calibratedAt', 'meterId'],
      order: [['calibratedAt', 'DESC']],
      transaction,
    });
    const sameDay = candidates.find((m) => localDay(m.calibratedAt, c.timezone) === analysedDay);
    if (!sameDay) {
      out.push({
        code: 'meter_not_calibrated',
        message: `No passing pH meter calibration${c.meterId ? ` of meter ${c.meterId}` : ''} on ${analysedDay} before the analysis.`,
        detail: { day: analysedDay, meterId: c.meterId },
      });
    }
  }
  return out;
}
