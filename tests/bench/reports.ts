import { Organization, Facility, User } from '../../server/db/models/index.js';
import { actorFor } from '../../server/services/actor.js';
import { createBatch, getBatch, processReportBatches } from '../../server/services/reports.js';
import { renderReportPdf } from '../../server/services/reportPdf.js';

/** A large facility month: 12 points × 4 parameters × 31 daily values, one limit per series. */
export function largeMonthContent() {
  const parameters = ['total_alkalinity', 'ph', 'phenolphthalein_alkalinity', 'acidity'];
  const limits: object[] = [];
  const daily: object[] = [];
  for (let p = 1; p <= 12; p++) {
    for (const parameter of parameters) {
      const pointCode = `PT-${String(p).padStart(3, '0')}`;
      const limitValue = parameter === 'ph' ? 6 : 50;
      limits.push({ limitId: limits.length + 1, permitNumber: 'BENCH-1', pointCode, parameter, statistic: 'daily', bound: 'minimum', limitValue: String(limitValue), units: parameter === 'ph' ? 'S.U.' : 'mg/L as CaCO3', value: '61.2', reported: '61', sampleCount: 31, status: 'within' });
      daily.push({
        pointId: p,
        pointCode,
        parameter,
        units: parameter === 'ph' ? 'S.U.' : 'mg/L as CaCO3',
        limitValue,
        values: Array.from({ length: 31 }, (_, d) => ({ sampledAt: `2026-10-${String(d + 1).padStart(2, '0')}T14:00:00.000Z`, value: limitValue * (1.2 + 0.1 * Math.sin(d + p)), resultId: d })),
      });
    }
  }
  return {
    facility: { id: 1, name: 'Bench Large Facility' },
    month: '2026-10',
    revision: 1,
    status: 'draft',
    permits: [{ id: 1, number: 'BENCH-1' }],
    limits,
    exceedances: [],
    daily,
    qc: { results: 1488, standardizations: 4, calibrations: 31, calibrationsFailed: 0, qcBatches: 20, qcBatchesFailed: 1, duplicates: 20, checkStandards: 20, blanks: 20, qualifiers: { holding_time_exceeded: 2 } },
    certification: { wording: 'Bench wording.', statement: null, signedBy: null, signedAt: null, ip: null },
  };
}

/** PDF time (median of three) and the peak resident memory seen while rendering. */
export async function pdfTimings() {
  const content = largeMonthContent();
  const base = process.memoryUsage().rss;
  let peak = base;
  const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 5);
  await renderReportPdf(content); // warm-up: fonts loaded, code compiled
  const times: number[] = [];
  let bytes = 0;
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    bytes = (await renderReportPdf(content)).length;
    times.push(performance.now() - t0);
    peak = Math.max(peak, process.memoryUsage().rss);
  }
  clearInterval(sampler);
  times.sort((a, b) => a - b);
  return { series: 48, dailyValues: 48 * 31, medianMs: Math.round(times[1]), bytes, peakRssMiB: Math.round(peak / 2 ** 20), rssGrowthMiB: Math.round((peak - base) / 2 ** 20) /* above the process before the first render */ };
}

/** A year batch for the three demo facilities, run through the same job function as the app. */
export async function yearBatchTiming() {
  const user = await User.findOne({ where: { email: 'admin@marrowfield.example' }, include: [{ model: Organization, as: 'organization' }] });
  if (!user) throw new Error('demo lab administrator missing');
  const actor = await actorFor(user);
  const facilities = await Facility.findAll({ where: { organizationId: actor.visibleOrgIds }, order: [['id', 'ASC']], limit: 3 });
  const t0 = performance.now();
  const batch = await createBatch(actor, { facilityIds: facilities.map((f) => f.id), year: new Date().getFullYear() });
  while ((await getBatch(actor, batch.id)).status !== 'finished') {
    if ((await processReportBatches(12)) === 0) await new Promise((r) => setTimeout(r, 50));
  }
  const done = await getBatch(actor, batch.id);
  return { facilities: facilities.length, reports: done.total, failed: done.failed, totalMs: Math.round(performance.now() - t0) };
}
