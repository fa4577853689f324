import type { Content, TableCell, TDocumentDefinitions } from 'pdfmake/interfaces.js';
import { BILLING_KIND_LABELS, formatMoney } from '../../shared/billing/money.js';
import { PDF_TEAL, renderPdf } from '../integrations/pdf.js';

const TEAL = PDF_TEAL;
const SLATE = '#334155';

export interface InvoiceDocument {
  number: string | null;
  status: string;
  currency: string;
  periodStart: string;
  periodEnd: string;
  issuedOn: string | null;
  dueOn: string | null;
  totalCents: number;
  lab: { name: string; address: string | null };
  client: { name: string; address: string | null };
  lines: { kind: keyof typeof BILLING_KIND_LABELS; description: string; quantity: number; unitAmountCents: number; amountCents: number; samples: { sampleId: number; pointCode: string | null; collectedAt: string | null }[] }[];
  notes: string | null;
  paidAt?: Date | null;
  paidCents?: number | null;
  paymentIntentId?: string | null;
  refundedAt?: Date | null;
  refundedCents?: number | null;
}

const money = (doc: InvoiceDocument, cents: number) => formatMoney(cents, doc.currency);

function header(doc: InvoiceDocument, title: string): Content[] {
  return [
    {
      columns: [
        { stack: [{ text: doc.lab.name, style: 'org' }, { text: doc.lab.address ?? '', style: 'muted' }] },
        { stack: [{ text: title, style: 'title', alignment: 'right' }, { text: doc.number ?? 'Draft — not yet issued', alignment: 'right', bold: true }] },
      ],
    },
    { canvas: [{ type: 'line', x1: 0, y1: 6, x2: 515, y2: 6, lineWidth: 1.2, lineColor: TEAL }], margin: [0, 0, 0, 12] },
    {
      columns: [
        { stack: [{ text: 'Billed to', style: 'label' }, { text: doc.client.name, bold: true }, { text: doc.client.address ?? '', style: 'muted' }] },
        {
          table: {
            widths: ['auto', 'auto'],
            body: [
              [{ text: 'Analyses from', style: 'label' }, `${doc.periodStart} to ${doc.periodEnd}`],
              [{ text: 'Issued', style: 'label' }, doc.issuedOn ?? '—'],
              [{ text: 'Due', style: 'label' }, doc.dueOn ?? '—'],
              [{ text: 'Currency', style: 'label' }, doc.currency.toUpperCase()],
            ],
          },
          layout: 'noBorders',
          alignment: 'right',
        },
      ],
      margin: [0, 0, 0, 16],
    },
  ];
}

function linesTable(doc: InvoiceDocument): Content {
  const body: TableCell[][] = [[{ text: 'Analysis', style: 'th' }, { text: 'Count', style: 'th', alignment: 'right' }, { text: 'Unit price', style: 'th', alignment: 'right' }, { text: 'Amount', style: 'th', alignment: 'right' }]];
  for (const l of doc.lines) {
    body.push([
      { text: l.description },
      { text: String(l.quantity), alignment: 'right' },
      { text: money(doc, l.unitAmountCents), alignment: 'right' },
      { text: money(doc, l.amountCents), alignment: 'right' },
    ]);
  }
  body.push([{ text: 'Total', bold: true, colSpan: 3 }, {}, {}, { text: money(doc, doc.totalCents), bold: true, alignment: 'right' }]);
  return { table: { headerRows: 1, widths: ['*', 50, 80, 90], body }, layout: 'lightHorizontalLines', margin: [0, 0, 0, 14] };
}

function samplesList(doc: InvoiceDocument): Content[] {
  const out: Content[] = [{ text: 'Samples behind each line', style: 'h2' }];
  for (const l of doc.lines) {
    const ids = l.samples.map((s) => `#${s.sampleId}${s.pointCode ? ` ${s.pointCode}` : ''}${s.collectedAt ? ` ${s.collectedAt.slice(0, 10)}` : ''}`);
    out.push({ text: [{ text: `${BILLING_KIND_LABELS[l.kind]} (${l.quantity}): `, bold: true }, ids.join('; ')], fontSize: 7.5, margin: [0, 0, 0, 4] });
  }
  return out;
}

function definition(content: Content[]): TDocumentDefinitions {
  return {
    pageSize: 'A4',
    pageMargins: [40, 40, 40, 50],
    defaultStyle: { font: 'WorkSans', fontSize: 9.5, color: SLATE },
    styles: {
      org: { fontSize: 14, bold: true, color: TEAL },
      title: { fontSize: 18, bold: true, color: TEAL },
      label: { fontSize: 8, color: '#64748b' },
      muted: { fontSize: 8.5, color: '#64748b' },
      th: { bold: true, color: TEAL },
      h2: { fontSize: 11, bold: true, color: TEAL, margin: [0, 6, 0, 4] },
    },
    footer: (page, pages) => ({ text: `Titrata · page ${page} of ${pages}`, alignment: 'center', fontSize: 7.5, color: '#64748b' }),
    content,
  };
}

/** The invoice as a PDF: lines (count × unit price), total, due date and the samples behind each line. */
export async function invoicePdf(doc: InvoiceDocument): Promise<Buffer> {
  const content: Content[] = [
    ...header(doc, 'Invoice'),
    linesTable(doc),
    { text: doc.dueOn ? `Please pay ${money(doc, doc.totalCents)} by ${doc.dueOn}. Pay online from Billing in Titrata.` : 'This draft is not payable until the laboratory issues it.', margin: [0, 0, 0, 10] },
    ...(doc.notes ? [{ text: doc.notes, italics: true, margin: [0, 0, 0, 10] } as Content] : []),
    ...samplesList(doc),
  ];
  return renderPdf(definition(content));
}

/** The receipt of a paid invoice: what was paid, when, and the payment reference. */
export async function receiptPdf(doc: InvoiceDocument): Promise<Buffer> {
  const paid: TableCell[][] = [
    [{ text: 'Amount paid', style: 'label' }, { text: money(doc, doc.paidCents ?? 0), bold: true }],
    [{ text: 'Paid on', style: 'label' }, doc.paidAt ? doc.paidAt.toISOString().slice(0, 16).replace('T', ' ') + ' UTC' : '—'],
    [{ text: 'Payment reference', style: 'label' }, doc.paymentIntentId ?? '—'],
  ];
  if (doc.refundedAt) paid.push([{ text: 'Refunded', style: 'label' }, `${money(doc, doc.refundedCents ?? 0)} on ${doc.refundedAt.toISOString().slice(0, 10)}`]);
  const content: Content[] = [...header(doc, 'Receipt'), { table: { widths: [120, '*'], body: paid }, layout: 'noBorders', margin: [0, 0, 0, 14] }, linesTable(doc), { text: 'Thank you for your payment.' }];
  return renderPdf(definition(content));
}
