import type { Page } from '@shared/schemas/common';
import type { BillingKind, InvoiceState, InvoiceStatus } from '@shared/billing/money';
import { api, download } from './client';

export interface PriceItemDto {
  id: number;
  kind: BillingKind;
  kindLabel: string;
  description: string;
  unitAmountCents: number;
  currency: string;
  clientId: number | null;
  clientName: string | null;
  effectiveFrom: string;
  effectiveTo: string | null;
  active: boolean;
}
export interface InvoiceLineDto {
  id: number;
  kind: BillingKind;
  description: string;
  quantity: number;
  unitAmountCents: number;
  amountCents: number;
  samples: { sampleId: number; titrationId: number | null; pointCode: string | null; collectedAt: string | null; analysedAt: string | null }[];
}
export interface InvoiceDto {
  id: number;
  number: string | null;
  organizationId: number;
  organizationName: string | null;
  status: InvoiceStatus;
  state: InvoiceState;
  currency: string;
  totalCents: number;
  totalFormatted: string;
  periodStart: string;
  periodEnd: string;
  issuedOn: string | null;
  dueOn: string | null;
  termsDays: number | null;
  notes: string | null;
  voidReason: string | null;
  paidCents: number | null;
  paidAt: string | null;
  paymentIntentId: string | null;
  lastPaymentError: string | null;
  lastPaymentErrorAt: string | null;
  refundedCents: number | null;
  refundedAt: string | null;
  refundReason: string | null;
  lines?: InvoiceLineDto[];
}

type Q = Record<string, unknown>;
const q = (query: Q) => query as Record<string, string | number | boolean | null | undefined>;
export const billingApi = {
  prices: (query: Q) => api.get<Page<PriceItemDto>>('/price-items', q(query)),
  createPrice: (body: object) => api.post<PriceItemDto>('/price-items', body),
  updatePrice: (id: number, body: object) => api.patch<PriceItemDto>(`/price-items/${id}`, body),
  invoices: (query: Q) => api.get<Page<InvoiceDto>>('/invoices', q(query)),
  invoice: (id: number) => api.get<InvoiceDto & { lines: InvoiceLineDto[] }>(`/invoices/${id}`),
  generate: (body: object) => api.post<InvoiceDto>('/invoices', body),
  finalise: (id: number, body: object) => api.post<InvoiceDto>(`/invoices/${id}/finalise`, body),
  void: (id: number, reason: string) => api.post<InvoiceDto>(`/invoices/${id}/void`, { reason }),
  refund: (id: number, reason: string) => api.post<InvoiceDto>(`/invoices/${id}/refund`, { reason }),
  events: (id: number) => api.get<Page<{ eventId: string; type: string; outcome: string; at: string | null }>>(`/invoices/${id}/events`),
  checkout: (id: number) => api.post<{ url: string }>(`/invoices/${id}/checkout`),
  pdf: (inv: InvoiceDto) => download(`/invoices/${inv.id}/pdf`, `${inv.number ?? `draft-${inv.id}`}.pdf`),
  receipt: (inv: InvoiceDto) => download(`/invoices/${inv.id}/receipt`, `receipt-${inv.number}.pdf`),
};
