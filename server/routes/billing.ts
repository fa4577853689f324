import { id } from '../../shared/schemas/common.js';
import { invoiceFinaliseSchema, invoiceGenerateSchema, invoiceRefundSchema, invoiceVoidSchema, priceItemSchema, priceItemUpdateSchema } from '../../shared/schemas/billing.js';
import { parseOrThrow } from '../../shared/schemas/parse.js';
import { ValidationError } from '../errors.js';
import { actorOf } from '../services/actor.js';
import * as billing from '../services/billing.js';
import type { RouteBuilder } from './registry.js';

const idOf = (v: unknown) => {
  const parsed = id.safeParse(v);
  if (!parsed.success) throw new ValidationError('The id in the path is not valid.', { id: 'must be a positive whole number' });
  return parsed.data;
};

/** The path of the provider's webhook; app.ts gives it the raw body before the JSON parser runs. */
export const PAYMENTS_WEBHOOK_PATH = '/payments/webhook';

export function billingRoutes(r: RouteBuilder) {
  r.get('/price-items', 'billing.read', async (req, res) => {
    res.json(await billing.listPriceItems(actorOf(req), req.query as Record<string, unknown>));
  });
  r.post('/price-items', 'billing.manage', async (req, res) => {
    res.status(201).json(await billing.createPriceItem(actorOf(req), parseOrThrow(priceItemSchema, req.body)));
  });
  r.patch('/price-items/:id', 'billing.manage', async (req, res) => {
    res.json(await billing.updatePriceItem(actorOf(req), idOf(req.params.id), parseOrThrow(priceItemUpdateSchema, req.body)));
  });

  r.get('/invoices', 'billing.read', async (req, res) => {
    res.json(await billing.listInvoices(actorOf(req), req.query as Record<string, unknown>));
  });
  r.post('/invoices', 'billing.manage', async (req, res) => {
    res.status(201).json(await billing.generateInvoice(actorOf(req), parseOrThrow(invoiceGenerateSchema, req.body)));
  });
  r.get('/invoices/:id', 'billing.read', async (req, res) => {
    res.json(await billing.getInvoice(actorOf(req), idOf(req.params.id)));
  });
  r.get('/invoices/:id/events', 'billing.manage', async (req, res) => {
    res.json(await billing.invoiceEvents(actorOf(req), idOf(req.params.id)));
  });
  r.post('/invoices/:id/finalise', 'billing.manage', async (req, res) => {
    const invoiceId = idOf(req.params.id);
    res.json(await billing.finaliseInvoice(actorOf(req), invoiceId, parseOrThrow(invoiceFinaliseSchema, req.body)));
  });
  r.post('/invoices/:id/void', 'billing.manage', async (req, res) => {
    const invoiceId = idOf(req.params.id);
    res.json(await billing.voidInvoice(actorOf(req), invoiceId, parseOrThrow(invoiceVoidSchema, req.body).reason));
  });
  r.post('/invoices/:id/refund', 'billing.manage', async (req, res) => {
    const invoiceId = idOf(req.params.id);
    res.json(await billing.refundInvoice(actorOf(req), invoiceId, parseOrThrow(invoiceRefundSchema, req.body).reason));
  });
  r.post('/invoices/:id/checkout', 'billing.pay', async (req, res) => {
    res.json(await billing.startCheckout(actorOf(req), idOf(req.params.id)));
  });
  r.get('/invoices/:id/pdf', 'billing.read', async (req, res) => {
    const pdf = await billing.invoicePdfFor(actorOf(req), idOf(req.params.id));
    res.type('application/pdf').attachment(pdf.filename).send(pdf.content);
  });
  r.get('/invoices/:id/receipt', 'billing.read', async (req, res) => {
    const pdf = await billing.receiptPdfFor(actorOf(req), idOf(req.params.id));
    res.type('application/pdf').attachment(pdf.filename).send(pdf.content);
  });

  r.post(PAYMENTS_WEBHOOK_PATH, 'public', async (req, res) => {
    res.json(await billing.handleWebhook(req.body, req.get('stripe-signature')));
  });
}
