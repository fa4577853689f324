import { PARAMETER_LABELS, STATISTIC_LABELS } from '../../shared/schemas/permits.js';
import { PDF_TEAL, renderPdf } from '../integrations/pdf.js';

const TEAL = PDF_TEAL;
const LIMESTONE = '#EFE9DD';

/** Status as words only: Work Sans has no check/cross glyphs. */
export const STATUS_WORDS: Record<string, string> = { within: 'Within limit', near: 'Near limit', exceeded: 'Exceeded', no_data: 'No data' };

const label = (p: string) => (PARAMETER_LABELS as Record<string, string>)[p] ?? p;
const statLabel = (s: string) => (STATISTIC_LABELS as Record<string, string>)[s] ?? s;

function headerRow(cells: string[]) {
  return cells.map((c) => ({ text: c, bold: true, fillColor: LIMESTONE }));
}

/** A daily value as shown in the tables: three significant figures (common practice for a bench titration). */
export const shown = (v: number) => String(Number(v.toPrecision(3)));

/**
 * A small line chart of one series, each limit a dashed line. No text inside the SVG: the
 * PDF would need a second font for it; the caption under the chart carries the scale.
 */
export function trendSvg(points: { sampledAt: string; value: number }[], limitValues: number[], width = 480, height = 140): { svg: string; low: number; high: number } {
  const pad = 12;
  const values = points.map((p) => p.value).concat(limitValues);
  const lowest = values.length ? Math.min(...values) : 0;
  const highest = values.length ? Math.max(...values) : 1;
  const span = highest - lowest || Math.abs(highest) || 1;
  const low = lowest - span * 0.1;
  const high = highest + span * 0.1;
  const x = (i: number) => pad + (points.length <= 1 ? 0 : (i * (width - 2 * pad)) / (points.length - 1));
  const y = (v: number) => height - pad - ((v - low) / (high - low)) * (height - 2 * pad);
  const line = points.map((p, i) => `${x(i).toFixed(1)},${y(p.value).toFixed(1)}`).join(' ');
  const dots = points.map((p, i) => `<circle cx="${x(i).toFixed(1)}" cy="${y(p.value).toFixed(1)}" r="2" fill="${TEAL}"/>`).join('');
  const limits = limitValues.map((v) => `<line x1="${pad}" x2="${width - pad}" y1="${y(v).toFixed(1)}" y2="${y(v).toFixed(1)}" stroke="#B4532A" stroke-width="1" stroke-dasharray="4,3"/>`).join('');
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}"><rect x="0" y="0" width="${width}" height="${height}" fill="#FFFFFF"/><line x1="${pad}" y1="${height - pad}" x2="${width - pad}" y2="${height - pad}" stroke="#999" stroke-width="0.5"/><line x1="${pad}" y1="${pad}" x2="${pad}" y2="${height - pad}" stroke="#999" stroke-width="0.5"/>${limits}${points.length > 1 ? `<polyline points="${line}" fill="none" stroke="${TEAL}" stroke-width="1.5"/>` : ''}${dots}</svg>`;
  return { svg, low, high };
}

/** The report's PDF: our own layout, Work Sans, page header and footer with page numbers. */
export async function renderReportPdf(c: Record<string, any>): Promise<Buffer> {
  const title = `${c.facility.name} — monitoring report ${c.month}`;
  const limits = c.limits as any[];
  const content: any[] = [
    { text: c.facility.name, style: 'h1' },
    { text: `Monthly monitoring report · ${c.month} · revision ${c.revision} · ${c.status}`, margin: [0, 0, 0, 8] },
    { text: `Permits: ${(c.permits as any[]).map((p) => p.number).join(', ') || 'none'}`, margin: [0, 0, 0, 10] },
    { text: 'Limits', style: 'h2' },
    {
      table: {
        headerRows: 1,
        widths: ['auto', '*', '*', 'auto', 'auto', 'auto', 'auto'],
        body: [
          headerRow(['Point', 'Parameter', 'Statistic', 'Limit', 'Value', 'Samples', 'Status']),
          ...limits.map((l) => [
            l.pointCode ?? '',
            label(l.parameter),
            `${statLabel(l.statistic)} ${l.bound}`,
            { text: `${l.bound === 'minimum' ? '≥' : '≤'} ${Number(l.limitValue)} ${l.units}`, noWrap: true },
            { text: l.reported !== null && l.reported !== undefined ? `${l.reported} ${l.units}` : '—', noWrap: true },
            String(l.sampleCount),
            { text: STATUS_WORDS[l.status] ?? l.status, bold: l.status === 'exceeded', color: l.status === 'exceeded' ? '#B4532A' : '#1F2A2E' },
          ]),
        ],
      },
      layout: 'lightHorizontalLines',
      fontSize: 8,
    },
    { text: 'Exceedances', style: 'h2' },
    (c.exceedances as any[]).length
      ? {
          table: {
            headerRows: 1,
            widths: ['auto', 'auto', 'auto', '*', '*'],
            body: [
              headerRow(['Period', 'Parameter', 'Value / limit', 'Explanation', 'Corrective action']),
              ...(c.exceedances as any[]).map((e) => [
                e.periodStart === e.periodEnd ? e.periodStart : `${e.periodStart} – ${e.periodEnd}`,
                `${label(e.parameter)} (${e.pointCode ?? ''})`,
                `${e.reported} / ${Number(e.limitValue)} ${e.units}`,
                e.closedReason ?? `${statLabel(e.statistic)} ${e.bound} not met`,
                e.correctiveAction ?? '—',
              ]),
            ],
          },
          fontSize: 8,
          layout: 'lightHorizontalLines',
        }
      : { text: 'None this month.' },
    { text: 'Quality control', style: 'h2' },
    {
      table: {
        headerRows: 1,
        widths: ['*', 'auto'],
        body: [
          headerRow(['Item', 'Count']),
          ['Approved results', String(c.qc.results)],
          ['Titrant standardisations', String(c.qc.standardizations)],
          ['pH meter calibrations (failed)', `${c.qc.calibrations ?? 0} (${c.qc.calibrationsFailed ?? 0})`],
          ['QC batches (failed)', `${c.qc.qcBatches ?? 0} (${c.qc.qcBatchesFailed ?? 0})`],
          ['Duplicate pairs', String(c.qc.duplicates ?? 0)],
          ['Check standards', String(c.qc.checkStandards ?? 0)],
          ['Blanks', String(c.qc.blanks ?? 0)],
          ...Object.entries(c.qc.qualifiers as Record<string, number>).map(([k, v]) => [`Qualified: ${k}`, String(v)]),
        ],
      },
      fontSize: 8,
      layout: 'lightHorizontalLines',
    },
  ];
  for (const d of c.daily as any[]) {
    content.push({ text: `${d.pointCode ?? d.pointId} · ${label(d.parameter)} (${d.units})`, style: 'h2', pageBreak: undefined });
    const lims = limits.filter((l) => l.pointCode === d.pointCode && l.parameter === d.parameter);
    const chart = trendSvg(d.values, lims.map((l) => Number(l.limitValue)));
    content.push({ svg: chart.svg, width: 480, margin: [0, 0, 0, 2] });
    content.push({
      text: `Daily values in ${d.units}, first to last sample of the month; scale ${shown(chart.low)} to ${shown(chart.high)}.${lims.length ? ` Dashed: ${lims.map((l) => `${statLabel(l.statistic).toLowerCase()} ${l.bound} ${Number(l.limitValue)}`).join('; ')}.` : ''}`,
      fontSize: 7,
      color: '#5B6577',
      margin: [0, 0, 0, 6],
    });
    content.push({
      table: { headerRows: 1, widths: ['auto', 'auto'], body: [headerRow(['Sampled (UTC)', `Value (${d.units})`]), ...(d.values as any[]).map((v) => [String(v.sampledAt).slice(0, 16).replace('T', ' '), shown(v.value)])] },
      fontSize: 8,
      layout: 'lightHorizontalLines',
    });
  }
  content.push({ text: 'Certification', style: 'h2' });
  content.push({ text: c.certification.wording, margin: [0, 0, 0, 6] });
  if (c.certification.statement) content.push({ text: c.certification.statement, margin: [0, 0, 0, 6] });
  content.push({
    text: c.certification.signedBy ? `Signed by ${c.certification.signedBy} on ${c.certification.signedAt} from ${c.certification.ip ?? 'unknown address'}` : 'Not yet certified (draft).',
    bold: true,
  });
  const doc = {
    info: { title },
    pageSize: 'A4',
    pageMargins: [40, 56, 40, 48],
    defaultStyle: { font: 'WorkSans', fontSize: 9, color: '#1F2A2E' },
    styles: { h1: { fontSize: 18, bold: true, color: TEAL }, h2: { fontSize: 12, bold: true, color: TEAL, margin: [0, 12, 0, 4] } },
    header: () => ({ text: `Titrata · ${title}`, margin: [40, 20, 40, 0], fontSize: 8, color: TEAL }),
    footer: (page: number, pages: number) => ({ columns: [{ text: `Revision ${c.revision}` }, { text: `Page ${page} of ${pages}`, alignment: 'right' }], margin: [40, 12, 40, 0], fontSize: 8 }),
    content,
  };
  return renderPdf(doc);
}
