import dayjs from 'dayjs';
import timezone from 'dayjs/plugin/timezone.js';
import utc from 'dayjs/plugin/utc.js';
import {
  amendSchema,
  bulkApproveSchema,
  calibrationCreateSchema,
  qcBatchCreateSchema,
  sampleCreateSchema,
  standardizationCreateSchema,
  titrantCreateSchema,
  titrationCreateSchema,
} from '../../../shared/schemas/bench.js';
import { parseOrThrow } from '../../../shared/schemas/parse.js';
import { actorFor, type Actor } from '../../services/actor.js';
import { benchSettings } from '../../services/benchSettings.js';
import { createCalibration, createQcBatch, createStandardization, createTitrant } from '../../services/labQc.js';
import { createSample } from '../../services/samples.js';
import { amendTitration, bulkApprove, createTitration, submitTitration } from '../../services/titrations.js';
import { setSequelize } from '../current.js';
import { Facility, MonitoringPoint, Organization, User } from '../models/index.js';
import type { SeedStep } from './index.js';

dayjs.extend(utc);
dayjs.extend(timezone);

/**
 * About three months of daily alkalinity, ending today, entered through the same services
 * the API calls (so every figure is the shared engine's): titrant lots and standardisations,
 * daily meter calibrations, samples and titrations, weekly QC batches at the lab, approvals,
 * a queue awaiting review, a few qualified results and one amendment. Invented data.
 */

const DAYS = 91;
/** Results of the last two days wait in Review. */
const AWAITING_DAYS = 2;

/** Deterministic generator (mulberry32), so every demo database is the same. */
function prng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  /** Roughly normal (sum of uniforms), mean 0, SD 1. */
  const normal = () => next() + next() + next() + next() + next() + next() - 3;
  return { next, normal };
}

const round = (x: number, places: number) => Math.round(x * 10 ** places) / 10 ** places;

export const seedBench: SeedStep['run'] = async ({ sequelize, transaction: t }) => {
  setSequelize(sequelize);
  const rnd = prng(20261201);
  const now = dayjs();

  const actor = async (email: string): Promise<Actor> => actorFor((await User.findOne({ where: { email }, include: [{ model: Organization, as: 'organization' }], transaction: t }))!);
  const analyst = await actor('analyst@marrowfield.example');
  const kestrel = await actor('operator@kestrelford.example');
  const brindlemoor = await actor('operator@brindlemoor.example');
  const quillon = await actor('operator@quillonbay.example');
  const settings = await benchSettings(analyst.labId, t);

  const pointsOf = async (orgId: number) => {
    const f = (await Facility.findOne({ where: { organizationId: orgId }, transaction: t }))!;
    const pts = await MonitoringPoint.findAll({ where: { facilityId: f.id }, transaction: t });
    return { facility: f, point: (code: string) => pts.find((p) => p.code === code)! };
  };
  const kf = await pointsOf(kestrel.organizationId);
  const bw = await pointsOf(brindlemoor.organizationId);
  const qb = await pointsOf(quillon.organizationId);

  // ---- titrant lots and monthly standardisations (SM 2320 B ¶3; NFM A6.6.2) ----
  const start = now.subtract(DAYS + 10, 'day');
  const lot = async (reagent: 'H2SO4' | 'NaOH', normality: number, code: string) =>
    createTitrant(
      analyst,
      parseOrThrow(titrantCreateSchema, { kind: reagent === 'NaOH' ? 'base' : 'acid', reagent, nominalNormality: normality, lot: code, preparedOn: start.format('YYYY-MM-DD'), expiresOn: now.add(180, 'day').format('YYYY-MM-DD'), notes: null }),
      t,
    );
  const acid02 = await lot('H2SO4', 0.02, 'MA-H2SO4-0.02-2611');
  const acid10 = await lot('H2SO4', 0.1, 'MA-H2SO4-0.10-2611');
  const base02 = await lot('NaOH', 0.02, 'MA-NaOH-0.02-2611');
  const trueNormality = new Map([
    [acid02.id, 0.01987],
    [acid10.id, 0.09952],
    [base02.id, 0.02004],
  ]);
  // Lot 0.02 N is restandardised every 28 days except once at 33, which leaves a few days expired.
  for (const [titrantId, days] of [
    [acid02.id, [0, 28, 56, 89]],
    [acid10.id, [0, 28, 56, 84]],
  ] as const) {
    for (const d of days) {
      const at = start.add(d, 'day').hour(14).minute(0);
      if (at.isAfter(now)) continue;
      const n = trueNormality.get(titrantId)!;
      // 20.00 mL of 1.060 g/L Na2CO3 (0.02 N) or 40.00 mL of 2.650 g/L (0.05 N): C = A × B / (53.00 × N).
      const [grams, aliquot] = n < 0.05 ? [1.06, 20] : [2.65, 40];
      await createStandardization(
        analyst,
        titrantId,
        parseOrThrow(standardizationCreateSchema, {
          primaryStandard: 'Na2CO3',
          mode: 'solution',
          standardGramsPerL: grams,
          replicates: [0, 1, 2].map(() => ({ standardVolumeMl: aliquot, titrantVolumeMl: round((grams * aliquot) / (53 * n) + rnd.normal() * 0.015, 2) })),
          standardizedAt: at.toISOString(),
        }),
        t,
      );
    }
  }
  await createStandardization(
    analyst,
    base02.id,
    parseOrThrow(standardizationCreateSchema, { primaryStandard: 'KHP', mode: 'mass', replicates: [0, 1].map(() => ({ standardGrams: round(0.0817 + rnd.normal() * 0.0001, 4), titrantVolumeMl: 20 })), standardizedAt: now.subtract(20, 'day').toISOString() }),
    t,
  );

  // ---- daily calibrations: the plant meter at Kestrel Ford, the lab's meter ----
  const kfSkipped = new Set([23, 61]);
  const buffers = () => {
    const slope = 59.16 * (0.965 + rnd.next() * 0.03);
    const offset = round(rnd.normal() * 3, 1);
    return [
      { nominalPh: 7, mV: offset },
      { nominalPh: 4, mV: round(offset + 3 * slope, 1) },
      { nominalPh: 10, mV: round(offset - 3 * slope + rnd.normal() * 0.8, 1) },
    ];
  };
  const localDay = (tz: string, d: number) => now.tz(tz).subtract(DAYS - 1 - d, 'day').format('YYYY-MM-DD');
  for (let d = 0; d < DAYS; d++) {
    const kfAt = dayjs.tz(`${localDay(kf.facility.timezone, d)} 06:45`, kf.facility.timezone);
    if (!kfSkipped.has(d) && kfAt.isBefore(now)) {
      await createCalibration(kestrel, parseOrThrow(calibrationCreateSchema, { meterId: 'KF-PH-1', meterName: 'Plant lab bench meter', calibratedAt: kfAt.toISOString(), temperatureC: 21, buffers: buffers(), notes: null }), t);
    }
    const labAt = dayjs.tz(`${localDay(qb.facility.timezone, d)} 08:30`, qb.facility.timezone);
    if (labAt.isBefore(now)) {
      await createCalibration(analyst, parseOrThrow(calibrationCreateSchema, { meterId: 'MA-PH-2', meterName: 'Lab titrator electrode', calibratedAt: labAt.toISOString(), temperatureC: 22, buffers: buffers(), notes: null }), t);
    }
  }

  // ---- samples and titrations ----
  interface Entry {
    id: number;
    day: number;
    creator: Actor;
    quillonWeek?: string;
  }
  const entries: Entry[] = [];
  const effluentLow = new Set([17, 44, 45, 71]);
  const receiptWarm = new Set([12, 58]);
  const lateAnalysis = new Set([30, 63]);
  let amendTarget: number | null = null;

  const titrate = async (who: Actor, sampleId: number, day: number, body: Record<string, unknown>, extra: Partial<Entry> = {}) => {
    const created = await createTitration(who, sampleId, parseOrThrow(titrationCreateSchema, { analysis: 'alkalinity', ...body }), t, { settings });
    await submitTitration(who, created.id, {}, t);
    entries.push({ id: created.id, day, creator: who, ...extra });
    return created.id;
  };
  const titreFor = (alk: number, volume: number, titrantId: number) => round((alk * volume) / (trueNormality.get(titrantId)! * 50_000), 2);

  for (let d = 0; d < DAYS; d++) {

    // Kestrel Ford: 24-h composites of influent and effluent, a digester grab; pH meter at the plant.
    {
      const tz = kf.facility.timezone;
      const day = localDay(tz, d);
      const end = dayjs.tz(`${day} 07:00`, tz);
      const analysedAt = end.add(2, 'hour').add(Math.floor(rnd.next() * 40), 'minute');
      // the last of the day's three titrations is 25 minutes after the first: all must be past
      if (analysedAt.add(25, 'minute').isBefore(now)) {
        const composite = async (code: string) =>
          createSample(
            kestrel,
            parseOrThrow(sampleCreateSchema, {
              pointId: kf.point(code).id,
              sampleType: 'composite',
              compositeStartAt: end.subtract(1, 'day').toISOString(),
              compositeEndAt: end.toISOString(),
              collectedAt: end.toISOString(),
              collectedBy: 'R. Quade',
              receivedAt: end.add(20, 'minute').toISOString(),
              receiptTemperatureC: round(3.5 + rnd.next() * 1.5, 1),
              preservation: 'Refrigerated composite sampler, ≤ 6 °C',
              notes: null,
            }),
            t,
          );
        const inf = await composite('INF-1');
        await titrate(kestrel, inf.id, d, {
          method: 'potentiometric_fixed',
          sampleVolumeMl: 100,
          titrantId: acid02.id,
          volumeToPh83Ml: 0,
          volumeToTotalEndpointMl: titreFor(220 + rnd.normal() * 12, 100, acid02.id),
          totalEndpointPh: 4.5,
          initialPh: round(7.3 + rnd.normal() * 0.1, 2),
          temperatureC: 19,
          meterId: 'KF-PH-1',
          analysedAt: analysedAt.toISOString(),
        });
        const eff = await composite('EFF-001');
        const yesterday = d === DAYS - 2;
        const effAlk = yesterday ? 121 : effluentLow.has(d) ? 44 + rnd.next() * 5 : 70 + rnd.normal() * 4.5;
        const effId = await titrate(kestrel, eff.id, d, {
          method: 'potentiometric_fixed',
          sampleVolumeMl: 100,
          titrantId: acid02.id,
          volumeToPh83Ml: 0,
          // Day 50 was entered with its digits swapped (1.75 for 7.15 mL) and is amended below.
          volumeToTotalEndpointMl: d === 50 ? 1.75 : titreFor(effAlk, 100, acid02.id),
          totalEndpointPh: 4.5,
          initialPh: round(7.1 + rnd.normal() * 0.1, 2),
          temperatureC: 19,
          meterId: 'KF-PH-1',
          analysedAt: analysedAt.add(10, 'minute').toISOString(),
        });
        if (d === 50) amendTarget = effId;
        const dig = await createSample(
          kestrel,
          parseOrThrow(sampleCreateSchema, { pointId: kf.point('DIG-1').id, sampleType: 'grab', collectedAt: end.add(30, 'minute').toISOString(), collectedBy: 'R. Quade', receivedAt: end.add(45, 'minute').toISOString() }),
          t,
        );
        const digAlk = 2500 + rnd.normal() * 80;
        await titrate(kestrel, dig.id, d, {
          method: 'potentiometric_fixed',
          sampleVolumeMl: 25,
          titrantId: acid10.id,
          volumeToPh83Ml: 0,
          volumeToTotalEndpointMl: titreFor(digAlk, 25, acid10.id),
          totalEndpointPh: 4.3,
          initialPh: round(7.0 + rnd.normal() * 0.05, 2),
          temperatureC: 35,
          volatileAcidsMgL: round(digAlk * (d >= 80 && d <= 82 ? 0.32 : 0.12 + rnd.next() * 0.08), 0),
          meterId: 'KF-PH-1',
          analysedAt: analysedAt.add(25, 'minute').toISOString(),
        });
      }
    }

    // Brindlemoor: raw and finished water grabs, colour indicator at the plant.
    {
      const tz = bw.facility.timezone;
      const at = dayjs.tz(`${localDay(tz, d)} 08:00`, tz);
      const analysedAt = at.add(1, 'hour');
      if (analysedAt.isBefore(now)) {
        for (const [code, alk, ph, p] of [
          ['RAW-1', 45 + rnd.normal() * 3, 7.4, 0],
          ['FIN-1', 35 + rnd.normal() * 2.5, 8.6, round(1.5 + rnd.next(), 1)],
        ] as const) {
          const s = await createSample(brindlemoor, parseOrThrow(sampleCreateSchema, { pointId: bw.point(code).id, sampleType: 'grab', collectedAt: at.toISOString(), collectedBy: 'C. Wynn', receivedAt: at.add(10, 'minute').toISOString() }), t);
          await titrate(brindlemoor, s.id, d, {
            method: 'color_indicator',
            sampleVolumeMl: 100,
            titrantId: acid02.id,
            volumeToPh83Ml: titreFor(p, 100, acid02.id),
            volumeToTotalEndpointMl: titreFor(alk, 100, acid02.id),
            totalEndpointPh: 4.9,
            initialPh: ph,
            temperatureC: 16,
            analysedAt: analysedAt.toISOString(),
          });
        }
      }
    }

    // Quillon Bay: the operator samples well 3, the lab analyses it the same afternoon.
    {
      const tz = qb.facility.timezone;
      const at = dayjs.tz(`${localDay(tz, d)} 07:00`, tz);
      const late = lateAnalysis.has(d) && d + 15 < DAYS - AWAITING_DAYS;
      const analysedAt = late ? at.add(15, 'day').add(2, 'hour') : at.add(6, 'hour');
      if (analysedAt.isBefore(now)) {
        const s = await createSample(
          quillon,
          parseOrThrow(sampleCreateSchema, {
            pointId: qb.point('WELL-3').id,
            sampleType: 'grab',
            collectedAt: at.toISOString(),
            collectedBy: 'D. Marsh',
            receivedAt: at.add(4, 'hour').toISOString(),
            receiptTemperatureC: receiptWarm.has(d) ? 8.5 : round(3 + rnd.next() * 2, 1),
            preservation: 'Iced cooler',
            notes: late ? 'Bottle mislaid in the walk-in; analysed late.' : null,
          }),
          t,
        );
        await titrate(
          analyst,
          s.id,
          d,
          {
            method: 'potentiometric_fixed',
            sampleVolumeMl: 100,
            titrantId: acid02.id,
            volumeToPh83Ml: 0,
            volumeToTotalEndpointMl: titreFor(180 + rnd.normal() * 7, 100, acid02.id),
            totalEndpointPh: 4.5,
            initialPh: round(7.6 + rnd.normal() * 0.08, 2),
            temperatureC: 21,
            tdsMgL: 320,
            meterId: 'MA-PH-2',
            analysedAt: analysedAt.toISOString(),
          },
          { quillonWeek: analysedAt.tz(tz).startOf('week').format('YYYY-MM-DD') },
        );
      }
    }
  }

  // ---- weekly QC at the lab for the Quillon Bay results; one week's duplicate fails ----
  const weeks = new Map<string, number[]>();
  for (const e of entries) if (e.quillonWeek && e.day < DAYS - AWAITING_DAYS) weeks.set(e.quillonWeek, [...(weeks.get(e.quillonWeek) ?? []), e.id]);
  let w = 0;
  for (const [week, ids] of weeks) {
    const failing = w++ === 6;
    const base = 180 + rnd.normal() * 5;
    await createQcBatch(
      analyst,
      parseOrThrow(qcBatchCreateSchema, {
        batchDate: week,
        analysis: 'alkalinity',
        duplicates: [{ label: 'WELL-3 duplicate', firstResult: round(base, 1), secondResult: round(failing ? base * 0.87 : base * (1 + rnd.normal() * 0.01), 1) }],
        checkStandards: [{ label: 'Na2CO3 LCS 106 mg/L', trueValueNa2co3MgL: 106, measured: round(100.1 * (1 + rnd.normal() * 0.015), 1) }],
        blanks: [{ label: 'Reagent water', measured: round(0.2 + rnd.next() * 0.3, 1), reportingLimit: 2 }],
        titrationIds: ids,
        notes: failing ? 'Duplicate outside 10 % RPD; electrode replaced the next week.' : null,
      }),
      t,
    );
  }

  // ---- approvals: everything before the last two days ----
  const toApprove = entries.filter((e) => e.day < DAYS - AWAITING_DAYS).map((e) => e.id);
  for (let i = 0; i < toApprove.length; i += 200) await bulkApprove(analyst, parseOrThrow(bulkApproveSchema, { items: toApprove.slice(i, i + 200).map((id) => ({ id })) }), t);

  // ---- the amendment: a transposed burette reading on day 50's effluent ----
  if (amendTarget) {
    const amended = await amendTitration(analyst, amendTarget, parseOrThrow(amendSchema, { reason: 'Transcription error on the bench sheet: the burette read 7.15 mL, entered as 1.75 mL.', volumeToTotalEndpointMl: 7.15 }), t);
    await submitTitration(analyst, amended.id, {}, t);
    await bulkApprove(analyst, parseOrThrow(bulkApproveSchema, { items: [{ id: amended.id }] }), t);
  }
};
