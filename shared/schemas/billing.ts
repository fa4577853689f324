import { z } from 'zod';
import { BILLING_KINDS, CURRENCIES, MAX_CENTS } from '../billing/money.js';
import { id, optionalText, text } from './common.js';

const date = z.string({ error: 'required' }).regex(/^\d{4}-\d{2}-\d{2}$/, 'a date as YYYY-MM-DD');
const cents = z
  .number({ error: 'whole cents, e.g. 2450 for 24.50' })
  .int('whole cents, e.g. 2450 for 24.50')
  .min(0, 'must not be negative')
  .max(MAX_CENTS, 'too large');

export const priceItemSchema = z
  .object({
    kind: z.enum(BILLING_KINDS, { error: `one of ${BILLING_KINDS.join(', ')}` }),
    description: text(200),
    unitAmountCents: cents,
    currency: z.enum(CURRENCIES, { error: `one of ${CURRENCIES.join(', ')}` }).default('usd'),
    clientId: id.nullish().transform((v) => v ?? null),
    effectiveFrom: date,
    effectiveTo: date.nullish().transform((v) => v ?? null),
  })
  .strict()
  .superRefine((p, ctx) => {
    if (p.effectiveTo && p.effectiveTo < p.effectiveFrom) ctx.addIssue({ code: 'custom', path: ['effectiveTo'], message: 'must not be before effectiveFrom' });
  });

export const priceItemUpdateSchema = z
  .object({
    description: text(200).optional(),
    unitAmountCents: cents.optional(),
    effectiveTo: date.nullish(),
    active: z.boolean({ error: 'true or false' }).optional(),
  })
  .strict();

export const invoiceGenerateSchema = z
  .object({
    organizationId: id,
    periodStart: date,
    periodEnd: date,
    /** Samples the lab ran on rush turnaround: each adds the rush surcharge. */
    rushSampleIds: z.array(id, { error: 'a list of sample ids' }).max(2000).default([]),
    notes: optionalText(1000),
  })
  .strict()
  .superRefine((p, ctx) => {
    if (p.periodEnd < p.periodStart) ctx.addIssue({ code: 'custom', path: ['periodEnd'], message: 'must not be before periodStart' });
  });

export const invoiceFinaliseSchema = z
  .object({
    termsDays: z.number({ error: 'a whole number of days' }).int('a whole number of days').min(0, 'at least 0').max(180, 'at most 180').default(30),
    issuedOn: date.optional(),
  })
  .strict();

export const invoiceVoidSchema = z.object({ reason: text(1000) }).strict();
export const invoiceRefundSchema = z.object({ reason: text(1000) }).strict();

export type PriceItemInput = z.output<typeof priceItemSchema>;
export type PriceItemUpdate = z.output<typeof priceItemUpdateSchema>;
export type InvoiceGenerateInput = z.output<typeof invoiceGenerateSchema>;
export type InvoiceFinaliseInput = z.output<typeof invoiceFinaliseSchema>;
