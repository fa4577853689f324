import { Op, UniqueConstraintError, type Transaction, type WhereOptions } from 'sequelize';
import type Stripe from 'stripe';
import {
  BILLING_KINDS,
  BILLING_KIND_LABELS,
  addDays,
  formatMoney,
  invoiceState,
  lineAmountCents,
  sumCents,
  type BillingKind,
  type InvoiceStatus,
} from '../../shared/billing/money.js';
import { ErrorCode } from '../../shared/errors.js';
import type { InvoiceFinaliseInput, InvoiceGenerateInput, PriceItemInput, PriceItemUpdate } from '../../shared/schemas/billing.js';
import type { Config } from '../config.js';
import { sequelize } from '../db/current.js';
import {
  BillingAccount,
  Invoice,
  InvoiceCounter,
  InvoiceLine,
  InvoiceLineSample,
  MonitoringPoint,
  Organization,
  PaymentEvent,
  PriceItem,
  Sample,
  Titration,
  User,
} from '../db/models/index.js';
import { AppError, ConflictError, NotFoundError, ValidationError } from '../errors.js';
import { createPaymentsClient } from '../integrations/payments.js';
import type { Actor } from './actor.js';
import { audit, snapshot } from './audit.js';
import { invoicePdf, receiptPdf, type InvoiceDocument } from './billingPdf.js';
import { idParam, listParams } from './listing.js';
import { enqueueMail } from './outbox.js';
import { assertInScope, orgScope } from './scope.js';
import { inTransaction } from './transaction.js';

// ---- configuration ------------------------------------------------------------------------

let appConfig: Config | null = null;
let client: Stripe | null = null;
/** Called by createApp: the payment SDK and the links in e-mails come from configuration. */
export function setBillingConfig(config: Config) {
  appConfig = config;
  client = null;
}
function config(): Config {
  if (!appConfig) throw new Error('billing configuration missing');
  return appConfig;
}
function payments(): Stripe {
  client ??= createPaymentsClient(config());
  return client;
}

/** The payment service did not answer or refused: 503 for an outage, 402 for a refusal, never a 500. */
export class PaymentServiceError extends AppError {
  constructor(status: number, message: string) {
    super(status, status === 503 ? ErrorCode.unavailable : ErrorCode.paymentFailed, message);
  }
}
async function provider<T>(what: string, call: () => Promise<T>): Promise<T> {
  try {
    return await call();
  } catch (err) {
    const e = err as { type?: string; message?: string; statusCode?: number };
    if (e.type === 'StripeConnectionError' || e.type === 'StripeAPIError' || !e.statusCode || e.statusCode >= 500) {
      throw new PaymentServiceError(503, `The payment service could not be reached (${what}); nothing was charged. Try again shortly.`);
    }
    throw new PaymentServiceError(402, `The payment service refused to ${what}: ${e.message ?? 'no reason given'}`);
  }
}

const today = () => new Date().toISOString().slice(0, 10);

// ---- price list ---------------------------------------------------------------------------

export function priceItemView(p: PriceItem) {
  return {
    id: p.id,
    kind: p.kind,
    kindLabel: BILLING_KIND_LABELS[p.kind],
    description: p.description,
    unitAmountCents: p.unitAmountCents,
    currency: p.currency,
    clientId: p.clientId,
    clientName: p.client?.name ?? null,
    effectiveFrom: p.effectiveFrom,
    effectiveTo: p.effectiveTo,
    active: p.active,
  };
}

/** The lab's list prices and overrides; a client's billing contact sees the list and its own overrides. */
export async function listPriceItems(actor: Actor, raw: Record<string, unknown>) {
  const { limit, offset, order } = listParams(raw, { kind: 'kind', effectiveFrom: 'effectiveFrom', unitAmountCents: 'unitAmountCents' }, 'kind');
  const where: WhereOptions = { labId: actor.labId };
  const and: WhereOptions[] = [];
  if (actor.orgKind === 'utility') and.push({ [Op.or]: [{ clientId: null }, { clientId: actor.organizationId }] }, { active: true });
  const clientId = idParam(raw.clientId, 'clientId');
  if (clientId !== undefined) and.push({ [Op.or]: [{ clientId: null }, { clientId }] });
  if (typeof raw.kind === 'string' && raw.kind) {
    if (!(BILLING_KINDS as readonly string[]).includes(raw.kind)) throw new ValidationError('Unknown analysis kind.', { kind: `one of ${BILLING_KINDS.join(', ')}` });
    and.push({ kind: raw.kind });
  }
  const { rows, count } = await PriceItem.findAndCountAll({
    where: { ...where, [Op.and]: and },
    include: [{ model: Organization, as: 'client', attributes: ['id', 'name'] }],
    order,
    limit,
    offset,
  });
  return { items: rows.map(priceItemView), total: count };
}

async function assertClientOfLab(actor: Actor, orgId: number, field: string, t?: Transaction): Promise<Organization> {
  const org = await Organization.findOne({ where: { id: orgId, labId: actor.labId, kind: 'utility' }, transaction: t, lock: t ? t.LOCK.UPDATE : undefined });
  if (!org) throw new ValidationError('That organisation is not a client of this laboratory.', { [field]: 'not a client of this laboratory' });
  return org;
}

export async function createPriceItem(actor: Actor, input: PriceItemInput) {
  return inTransaction(undefined, async (t) => {
    if (input.clientId !== null) await assertClientOfLab(actor, input.clientId, 'clientId', t);
    const item = await PriceItem.create({ ...input, labId: actor.labId, createdById: actor.id }, { transaction: t });
    await audit(actor, { action: 'price_item.create', entity: 'price_item', entityId: item.id, organizationId: actor.labId, after: snapshot(item) }, t);
    await item.reload({ include: [{ model: Organization, as: 'client', attributes: ['id', 'name'] }], transaction: t });
    return priceItemView(item);
  });
}

export async function updatePriceItem(actor: Actor, id: number, input: PriceItemUpdate) {
  return inTransaction(undefined, async (t) => {
    const item = await PriceItem.findOne({ where: { id, labId: actor.labId }, transaction: t, lock: t.LOCK.UPDATE });
    if (!item) throw new NotFoundError('Price item');
    const before = snapshot(item);
    const effectiveTo = input.effectiveTo === undefined ? item.effectiveTo : input.effectiveTo;
    if (effectiveTo && effectiveTo < item.effectiveFrom) throw new ValidationError('The price would end before it starts.', { effectiveTo: 'must not be before effectiveFrom' });
    await item.update({ ...input, effectiveTo: effectiveTo ?? null }, { transaction: t });
    await audit(actor, { action: 'price_item.update', entity: 'price_item', entityId: item.id, organizationId: actor.labId, before, after: snapshot(item) }, t);
    await item.reload({ include: [{ model: Organization, as: 'client', attributes: ['id', 'name'] }], transaction: t });
    return priceItemView(item);
  });
}

/**
 * The price of `kind` for a client on a day: the client's override when one is in effect, else
 * the list price; among several in effect, the one that started latest.
 */
function priceOn(prices: PriceItem[], kind: BillingKind, clientId: number, day: string): PriceItem | null {
  const inEffect = prices.filter((p) => p.active && p.kind === kind && p.effectiveFrom <= day && (!p.effectiveTo || p.effectiveTo >= day));
  const pick = (list: PriceItem[]) => list.sort((a, b) => (a.effectiveFrom === b.effectiveFrom ? b.id - a.id : a.effectiveFrom < b.effectiveFrom ? 1 : -1))[0] ?? null;
  return pick(inEffect.filter((p) => p.clientId === clientId)) ?? pick(inEffect.filter((p) => p.clientId === null));
}

// ---- invoices: views ----------------------------------------------------------------------

type InvoiceWithLines = Invoice;

export function invoiceView(inv: InvoiceWithLines, withLines = false) {
  return {
    id: inv.id,
    number: inv.number,
    organizationId: inv.organizationId,
    organizationName: inv.organization?.name ?? null,
    status: inv.status,
    state: invoiceState(inv.status, inv.dueOn, today()),
    currency: inv.currency,
    totalCents: inv.totalCents,
    totalFormatted: formatMoney(inv.totalCents, inv.currency),
    periodStart: inv.periodStart,
    periodEnd: inv.periodEnd,
    issuedOn: inv.issuedOn,
    dueOn: inv.dueOn,
    termsDays: inv.termsDays,
    notes: inv.notes,
    finalisedAt: inv.finalisedAt,
    voidedAt: inv.voidedAt,
    voidReason: inv.voidReason,
    paidCents: inv.paidCents,
    paidAt: inv.paidAt,
    paymentIntentId: inv.paymentIntentId,
    lastPaymentError: inv.lastPaymentError,
    lastPaymentErrorAt: inv.lastPaymentErrorAt,
    refundedCents: inv.refundedCents,
    refundedAt: inv.refundedAt,
    refundReason: inv.refundReason,
    version: inv.version,
    createdAt: inv.createdAt,
    ...(withLines
      ? {
          lines: (inv.lines ?? [])
            .slice()
            .sort((a, b) => a.position - b.position)
            .map((l) => ({
              id: l.id,
              kind: l.kind,
              description: l.description,
              quantity: l.quantity,
              unitAmountCents: l.unitAmountCents,
              amountCents: l.amountCents,
              samples: (l.samples ?? [])
                .slice()
                .sort((a, b) => a.sampleId - b.sampleId)
                .map((s) => ({ sampleId: s.sampleId, titrationId: s.titrationId, pointCode: s.sample?.point?.code ?? null, collectedAt: s.sample?.collectedAt ?? null, analysedAt: s.analysedAt })),
            })),
        }
      : {}),
  };
}
export type InvoiceView = ReturnType<typeof invoiceView>;

const fullInclude = () => [
  { model: Organization, as: 'organization', attributes: ['id', 'name', 'address', 'billingEmail', 'labId'] },
  {
    model: InvoiceLine,
    as: 'lines',
    include: [{ model: InvoiceLineSample, as: 'samples', include: [{ model: Sample, as: 'sample', attributes: ['id', 'collectedAt', 'pointId'], include: [{ model: MonitoringPoint, as: 'point', attributes: ['id', 'code'] }] }] }],
  },
];

/** Drafts are the lab's working copies: the client sees an invoice once it is issued. */
function visibleWhere(actor: Actor): WhereOptions {
  return actor.orgKind === 'laboratory' ? { labId: actor.labId } : { ...orgScope(actor), status: { [Op.ne]: 'draft' } };
}

async function findInvoice(actor: Actor, id: number, t?: Transaction, lock = false): Promise<InvoiceWithLines> {
  const inv = await Invoice.findOne({ where: { id, ...visibleWhere(actor) }, transaction: t, lock: lock && t ? t.LOCK.UPDATE : undefined });
  if (!inv) throw new NotFoundError('Invoice');
  assertInScope(actor, inv.organizationId, 'Invoice');
  return inv;
}
async function loadFull(id: number, t?: Transaction): Promise<InvoiceWithLines> {
  return (await Invoice.findByPk(id, { include: fullInclude(), transaction: t })) as InvoiceWithLines;
}

export async function listInvoices(actor: Actor, raw: Record<string, unknown>) {
  const { limit, offset, order } = listParams(
    raw,
    { number: 'number', dueOn: 'dueOn', issuedOn: 'issuedOn', periodStart: 'periodStart', totalCents: 'totalCents', createdAt: 'createdAt', status: 'status' },
    '-createdAt',
  );
  const and: WhereOptions[] = [visibleWhere(actor)];
  const orgId = idParam(raw.organizationId, 'organizationId');
  if (orgId !== undefined) and.push({ organizationId: orgId });
  const state = typeof raw.state === 'string' && raw.state ? raw.state : undefined;
  if (state) {
    const t = today();
    if (state === 'overdue') and.push({ status: 'open', dueOn: { [Op.lt]: t } });
    else if (state === 'unpaid') and.push({ status: 'open' });
    else if (state === 'open') and.push({ status: 'open', [Op.or]: [{ dueOn: null }, { dueOn: { [Op.gte]: t } }] });
    else if (['draft', 'paid', 'void', 'refunded'].includes(state)) and.push({ status: state });
    else throw new ValidationError('Unknown invoice state.', { state: 'one of draft, open, overdue, unpaid, paid, void, refunded' });
  }
  const { rows, count } = await Invoice.findAndCountAll({
    where: { [Op.and]: and },
    include: [{ model: Organization, as: 'organization', attributes: ['id', 'name'] }],
    order,
    limit,
    offset,
  });
  return { items: rows.map((i) => invoiceView(i)), total: count };
}

export async function getInvoice(actor: Actor, id: number) {
  await findInvoice(actor, id);
  return invoiceView(await loadFull(id), true);
}

// ---- invoices: generate, finalise, void ---------------------------------------------------

/**
 * What an approved titration is billed as: acidity; full carbonate speciation when the inputs of
 * the equilibrium split were measured (initial pH and an ionic-strength figure, TDS or
 * conductance); otherwise alkalinity (P and T, with the species from P and T).
 */
function billingKindOf(t: Titration): BillingKind {
  if (t.analysis === 'acidity') return 'acidity';
  const has = (v: string | null | undefined) => v !== null && v !== undefined;
  return has(t.initialPh) && (has(t.tdsMgL) || has(t.specificConductanceUsCm)) ? 'speciation' : 'alkalinity';
}

const dayOf = (d: Date) => d.toISOString().slice(0, 10);

/**
 * A draft invoice for a client and period from its approved analyses: one charge per sample and
 * kind (a duplicate or an amendment is not billed twice, nor a sample already on another
 * invoice that is not void), priced on the day of analysis, grouped into one line per kind and
 * price (count × unit price), with the samples behind each line.
 */
export async function generateInvoice(actor: Actor, input: InvoiceGenerateInput) {
  return inTransaction(undefined, async (t) => {
    // The client row is locked, so two generations for one client cannot bill a sample twice.
    const org = await assertClientOfLab(actor, input.organizationId, 'organizationId', t);
    const from = new Date(`${input.periodStart}T00:00:00Z`);
    const to = new Date(`${addDays(input.periodEnd, 1)}T00:00:00Z`);
    const titrations = await Titration.findAll({
      where: { organizationId: org.id, status: 'approved', analysedAt: { [Op.gte]: from, [Op.lt]: to } },
      attributes: ['id', 'sampleId', 'analysis', 'initialPh', 'tdsMgL', 'specificConductanceUsCm', 'analysedAt'],
      order: [['analysedAt', 'ASC'], ['id', 'ASC']],
      transaction: t,
    });
    const billed = await InvoiceLineSample.findAll({
      where: { sampleId: { [Op.in]: [...new Set(titrations.map((x) => x.sampleId)), ...input.rushSampleIds] } },
      transaction: t,
    });
    const liveInvoices = new Set(
      (await Invoice.findAll({ where: { id: { [Op.in]: [...new Set(billed.map((b) => b.invoiceId))] }, status: { [Op.ne]: 'void' } }, attributes: ['id'], transaction: t })).map((i) => i.id),
    );
    const already = new Set(billed.filter((b) => liveInvoices.has(b.invoiceId)).map((b) => `${b.sampleId}:${b.kind}`));

    interface Unit { sampleId: number; titrationId: number | null; kind: BillingKind; analysedAt: Date }
    const units = new Map<string, Unit>();
    for (const x of titrations) {
      const kind = billingKindOf(x);
      const key = `${x.sampleId}:${kind}`;
      if (already.has(key) || units.has(key)) continue;
      units.set(key, { sampleId: x.sampleId, titrationId: x.id, kind, analysedAt: x.analysedAt });
    }
    input.rushSampleIds.forEach((sampleId, i) => {
      const first = [...units.values()].find((u) => u.sampleId === sampleId);
      if (!first) throw new ValidationError('A rush sample must be among this invoice’s analyses.', { [`rushSampleIds.${i}`]: 'not among the approved, unbilled analyses of this client in the period' });
      const key = `${sampleId}:rush`;
      if (already.has(key)) throw new ValidationError('That sample’s rush surcharge is already billed.', { [`rushSampleIds.${i}`]: 'rush surcharge already billed' });
      units.set(key, { sampleId, titrationId: null, kind: 'rush', analysedAt: first.analysedAt });
    });
    if (!units.size) throw new ValidationError('Nothing to bill: no approved, unbilled analyses for this client in the period.', { periodStart: 'no approved, unbilled analyses in this period' });

    const prices = await PriceItem.findAll({ where: { labId: actor.labId, [Op.or]: [{ clientId: null }, { clientId: org.id }] }, transaction: t });
    const groups = new Map<number, { price: PriceItem; units: Unit[] }>();
    for (const u of units.values()) {
      const day = dayOf(u.analysedAt);
      const price = priceOn(prices, u.kind, org.id, day);
      if (!price) throw new ValidationError(`No price for ${BILLING_KIND_LABELS[u.kind]} on ${day}; add one to the price list first.`, { [`priceList.${u.kind}`]: `no price in effect on ${day}` });
      const g = groups.get(price.id) ?? { price, units: [] };
      g.units.push(u);
      groups.set(price.id, g);
    }
    const currencies = new Set([...groups.values()].map((g) => g.price.currency));
    if (currencies.size > 1) throw new ValidationError('The prices in effect are in different currencies; one invoice has one currency.', { priceList: `mixed currencies: ${[...currencies].join(', ')}` });

    const ordered = [...groups.values()].sort((a, b) => BILLING_KINDS.indexOf(a.price.kind) - BILLING_KINDS.indexOf(b.price.kind) || a.price.effectiveFrom.localeCompare(b.price.effectiveFrom));
    const lines = ordered.map((g, i) => ({ ...g, position: i + 1, amountCents: lineAmountCents(g.units.length, g.price.unitAmountCents) }));
    const invoice = await Invoice.create(
      {
        labId: actor.labId,
        organizationId: org.id,
        currency: [...currencies][0],
        periodStart: input.periodStart,
        periodEnd: input.periodEnd,
        totalCents: sumCents(lines.map((l) => l.amountCents)),
        notes: input.notes,
        createdById: actor.id,
      },
      { transaction: t },
    );
    for (const l of lines) {
      const line = await InvoiceLine.create(
        { invoiceId: invoice.id, position: l.position, kind: l.price.kind, description: l.price.description, priceItemId: l.price.id, quantity: l.units.length, unitAmountCents: l.price.unitAmountCents, amountCents: l.amountCents },
        { transaction: t },
      );
      await InvoiceLineSample.bulkCreate(
        l.units.map((u) => ({ lineId: line.id, invoiceId: invoice.id, sampleId: u.sampleId, titrationId: u.titrationId, kind: u.kind, analysedAt: u.analysedAt })),
        { transaction: t },
      );
    }
    await audit(actor, { action: 'invoice.generate', entity: 'invoice', entityId: invoice.id, organizationId: org.id, after: { ...snapshot(invoice), lines: lines.map((l) => ({ kind: l.price.kind, quantity: l.units.length, unitAmountCents: l.price.unitAmountCents, amountCents: l.amountCents })) } }, t);
    return invoiceView(await loadFull(invoice.id, t), true);
  });
}

function labPrefix(name: string): string {
  const initials = name
    .split(/\s+/)
    .map((w) => w.replace(/[^A-Za-z]/g, '').charAt(0).toUpperCase())
    .join('');
  return initials.slice(0, 4) || 'INV';
}

async function documentOf(inv: InvoiceWithLines, t?: Transaction): Promise<InvoiceDocument> {
  const lab = await Organization.findByPk(inv.labId, { transaction: t });
  const org = inv.organization ?? (await Organization.findByPk(inv.organizationId, { transaction: t }))!;
  const view = invoiceView(inv, true);
  return {
    number: inv.number,
    status: inv.status,
    currency: inv.currency,
    periodStart: inv.periodStart,
    periodEnd: inv.periodEnd,
    issuedOn: inv.issuedOn,
    dueOn: inv.dueOn,
    totalCents: inv.totalCents,
    lab: { name: lab?.name ?? 'Laboratory', address: lab?.address ?? null },
    client: { name: org.name, address: org.address ?? null },
    lines: (view.lines ?? []).map((l) => ({ ...l, samples: l.samples.map((s) => ({ sampleId: s.sampleId, pointCode: s.pointCode, collectedAt: s.collectedAt ? new Date(s.collectedAt).toISOString() : null })) })),
    notes: inv.notes,
    paidAt: inv.paidAt,
    paidCents: inv.paidCents,
    paymentIntentId: inv.paymentIntentId,
    refundedAt: inv.refundedAt,
    refundedCents: inv.refundedCents,
  };
}

/** The client's billing contacts: its active billing users and the organisation's billing address. */
async function billingRecipients(orgId: number, t?: Transaction): Promise<string[]> {
  const org = await Organization.findByPk(orgId, { transaction: t });
  const users = await User.findAll({ where: { organizationId: orgId, role: 'billing', active: true }, attributes: ['email'], transaction: t });
  return [...new Set([...(org?.billingEmail ? [org.billingEmail] : []), ...users.map((u) => u.email)])];
}

/** Issues a draft: numbered (lab initials, year, sequence), dated, due after the terms, frozen; e-mails it with its PDF. */
export async function finaliseInvoice(actor: Actor, id: number, input: InvoiceFinaliseInput) {
  return inTransaction(undefined, async (t) => {
    const inv = await findInvoice(actor, id, t, true);
    if (inv.status !== 'draft') throw new ConflictError(`This invoice is already ${inv.status}; only a draft can be finalised.`, { status: inv.status });
    const before = snapshot(inv);
    const issuedOn = input.issuedOn ?? today();
    if (issuedOn < inv.periodEnd && issuedOn < today()) throw new ValidationError('An invoice cannot be issued before the end of its period in the past.', { issuedOn: 'must not be before periodEnd' });
    const year = Number(issuedOn.slice(0, 4));
    const [counter] = await InvoiceCounter.findOrCreate({ where: { labId: inv.labId, year }, defaults: { labId: inv.labId, year, lastNumber: 0 }, transaction: t });
    await counter.reload({ transaction: t, lock: t.LOCK.UPDATE });
    const seq = counter.lastNumber + 1;
    await counter.update({ lastNumber: seq }, { transaction: t });
    const lab = await Organization.findByPk(inv.labId, { transaction: t });
    await inv.update(
      { status: 'open', number: `${labPrefix(lab?.name ?? '')}-${year}-${String(seq).padStart(4, '0')}`, issuedOn, termsDays: input.termsDays, dueOn: addDays(issuedOn, input.termsDays), finalisedAt: new Date(), finalisedById: actor.id, version: inv.version + 1 },
      { transaction: t },
    );
    await audit(actor, { action: 'invoice.finalise', entity: 'invoice', entityId: inv.id, organizationId: inv.organizationId, before, after: snapshot(inv) }, t);
    const full = await loadFull(inv.id, t);
    const to = await billingRecipients(inv.organizationId, t);
    if (to.length) {
      const pdf = await invoicePdf(await documentOf(full, t));
      const total = formatMoney(full.totalCents, full.currency);
      await enqueueMail(
        {
          dedupeKey: `invoice:${full.id}`,
          organizationId: full.organizationId,
          to,
          subject: `Invoice ${full.number} from ${lab?.name ?? 'your laboratory'}: ${total} due ${full.dueOn}`,
          text: `Invoice ${full.number} for analyses from ${full.periodStart} to ${full.periodEnd} is attached: ${total}, due ${full.dueOn}.\n\nPay online: ${config().publicUrl}/billing/invoices/${full.id}\n`,
          attachments: [{ filename: `${full.number}.pdf`, contentType: 'application/pdf', content: pdf }],
        },
        t,
      );
    }
    return invoiceView(full, true);
  });
}

/** Voids a draft or an unpaid invoice with a reason; an open payment page is closed first. */
export async function voidInvoice(actor: Actor, id: number, reason: string) {
  const current = await findInvoice(actor, id);
  if (!['draft', 'open'].includes(current.status)) throw new ConflictError(`A ${current.status} invoice cannot be voided${current.status === 'paid' ? '; refund it instead' : ''}.`, { status: current.status });
  if (current.checkoutSessionId) {
    const session = await provider('look up the payment page', () => payments().checkout.sessions.retrieve(current.checkoutSessionId!));
    if (session.status === 'complete') throw new ConflictError('A payment for this invoice has just completed; it cannot be voided.', { status: 'paid' });
    if (session.status === 'open') await provider('close the payment page', () => payments().checkout.sessions.expire(session.id));
  }
  return inTransaction(undefined, async (t) => {
    const inv = await findInvoice(actor, id, t, true);
    if (!['draft', 'open'].includes(inv.status)) throw new ConflictError(`A ${inv.status} invoice cannot be voided.`, { status: inv.status });
    const before = snapshot(inv);
    await inv.update({ status: 'void', voidReason: reason, voidedAt: new Date(), voidedById: actor.id, version: inv.version + 1 }, { transaction: t });
    await audit(actor, { action: 'invoice.void', entity: 'invoice', entityId: inv.id, organizationId: inv.organizationId, before, after: snapshot(inv), reason }, t);
    return invoiceView(await loadFull(inv.id, t), true);
  });
}

// ---- documents ----------------------------------------------------------------------------

export async function invoicePdfFor(actor: Actor, id: number) {
  await findInvoice(actor, id);
  const full = await loadFull(id);
  return { filename: `${full.number ?? `draft-${full.id}`}.pdf`, content: await invoicePdf(await documentOf(full)) };
}

export async function receiptPdfFor(actor: Actor, id: number) {
  await findInvoice(actor, id);
  const full = await loadFull(id);
  if (!full.paidAt) throw new ConflictError('There is no receipt: this invoice has not been paid.', { status: full.status });
  return { filename: `receipt-${full.number}.pdf`, content: await receiptPdf(await documentOf(full)) };
}

// ---- paying -------------------------------------------------------------------------------

/** The provider's customer for a client, created once (an idempotency key covers a retried create). */
async function customerFor(actor: Actor, org: Organization): Promise<string> {
  const existing = await BillingAccount.findOne({ where: { organizationId: org.id } });
  if (existing) return existing.providerCustomerId;
  const email = (await billingRecipients(org.id))[0];
  const customer = await provider('register the payer', () =>
    payments().customers.create({ name: org.name, ...(email ? { email } : {}), metadata: { organization_id: String(org.id) } }, { idempotencyKey: `titrata-customer-org-${org.id}` }),
  );
  try {
    await inTransaction(undefined, async (t) => {
      const account = await BillingAccount.create({ organizationId: org.id, providerCustomerId: customer.id }, { transaction: t });
      await audit(actor, { action: 'billing_account.create', entity: 'billing_account', entityId: account.id, organizationId: org.id, after: snapshot(account) }, t);
    });
  } catch (err) {
    if (!(err instanceof UniqueConstraintError)) throw err;
  }
  return (await BillingAccount.findOne({ where: { organizationId: org.id } }))!.providerCustomerId;
}

/**
 * Starts paying an open invoice: a checkout session for its lines on the provider's hosted page.
 * Only the invoice's own utility may pay it; another organisation gets 404. An open page is reused.
 */
export async function startCheckout(actor: Actor, id: number): Promise<{ url: string }> {
  const inv = await findInvoice(actor, id);
  if (inv.organizationId !== actor.organizationId) throw new NotFoundError('Invoice');
  if (inv.status !== 'open') throw new ConflictError(inv.status === 'paid' || inv.status === 'refunded' ? 'This invoice has already been paid.' : `A ${inv.status} invoice cannot be paid.`, { status: inv.status });
  if (inv.totalCents <= 0) throw new ConflictError('Nothing is owed on this invoice.', { totalCents: 'zero' });
  if (inv.checkoutSessionId) {
    const previous = await provider('look up the payment page', () => payments().checkout.sessions.retrieve(inv.checkoutSessionId!));
    if (previous.status === 'open' && previous.url) return { url: previous.url };
    if (previous.status === 'complete') throw new ConflictError('This invoice has just been paid; the confirmation is on its way.', { status: 'paid' });
  }
  const full = await loadFull(inv.id);
  const org = full.organization!;
  const customer = await customerFor(actor, org);
  const base = config().publicUrl;
  const metadata = { invoice_id: String(inv.id), invoice_number: inv.number ?? '' };
  const session = await provider('open a payment page', () =>
    payments().checkout.sessions.create(
      {
        mode: 'payment',
        customer,
        client_reference_id: String(inv.id),
        line_items: (full.lines ?? [])
          .slice()
          .sort((a, b) => a.position - b.position)
          .map((l) => ({ quantity: l.quantity, price_data: { currency: full.currency, unit_amount: l.unitAmountCents, product_data: { name: l.description } } })),
        metadata,
        payment_intent_data: { description: `Invoice ${inv.number}`, metadata },
        success_url: `${base}/billing/invoices/${inv.id}?checkout=return&session={CHECKOUT_SESSION_ID}`,
        cancel_url: `${base}/billing/invoices/${inv.id}?checkout=cancelled`,
      },
      // A double click before the first answer is saved opens the same page, not two.
      { idempotencyKey: `titrata-checkout-${inv.id}-after-${inv.checkoutSessionId ?? 'none'}` },
    ),
  );
  if (session.amount_total !== inv.totalCents) {
    await provider('close the payment page', () => payments().checkout.sessions.expire(session.id)).catch(() => undefined);
    throw new ConflictError('The payment page total did not match the invoice; nothing was charged.', { totalCents: String(inv.totalCents) });
  }
  await inTransaction(undefined, async (t) => {
    const locked = await Invoice.findByPk(inv.id, { transaction: t, lock: t.LOCK.UPDATE });
    if (!locked || locked.status !== 'open') throw new ConflictError('The invoice changed while the payment page was opened; try again.', { status: locked?.status ?? 'unknown' });
    const before = snapshot(locked);
    await locked.update({ checkoutSessionId: session.id, version: locked.version + 1 }, { transaction: t });
    await audit(actor, { action: 'invoice.checkout', entity: 'invoice', entityId: inv.id, organizationId: inv.organizationId, before, after: snapshot(locked) }, t);
  });
  if (!session.url) throw new PaymentServiceError(503, 'The payment service gave no payment page.');
  return { url: session.url };
}

/** The lab gives the whole payment back through the provider; the invoice becomes refunded. */
export async function refundInvoice(actor: Actor, id: number, reason: string) {
  const inv = await findInvoice(actor, id);
  if (!inv.paidAt || inv.refundedAt) throw new ConflictError(inv.refundedAt ? 'This invoice has already been refunded.' : 'Only a paid invoice can be refunded.', { status: inv.status });
  if (!inv.paymentIntentId) throw new ConflictError('The payment reference is not known yet; try again in a minute.', { status: inv.status });
  const refund = await provider('refund the payment', () =>
    payments().refunds.create(
      { payment_intent: inv.paymentIntentId!, reason: 'requested_by_customer', metadata: { invoice_id: String(inv.id) } },
      { idempotencyKey: `titrata-refund-${inv.id}` },
    ),
  );
  return inTransaction(undefined, async (t) => {
    const locked = (await Invoice.findByPk(inv.id, { transaction: t, lock: t.LOCK.UPDATE }))!;
    const before = snapshot(locked);
    if (!locked.refundedAt) {
      await locked.update({ status: locked.status === 'void' ? 'void' : 'refunded', refundId: refund.id, refundedCents: refund.amount, refundedAt: new Date(refund.created * 1000), refundReason: reason, version: locked.version + 1 }, { transaction: t });
    } else {
      await locked.update({ refundReason: reason }, { transaction: t });
    }
    await audit(actor, { action: 'invoice.refund', entity: 'invoice', entityId: locked.id, organizationId: locked.organizationId, before, after: snapshot(locked), reason }, t);
    return invoiceView(await loadFull(locked.id, t), true);
  });
}

// ---- webhook ------------------------------------------------------------------------------

type Outcome = string;
interface ProviderObject {
  id: string;
  object: string;
  metadata?: Record<string, string> | null;
  client_reference_id?: string | null;
  payment_intent?: string | { id: string } | null;
  payment_status?: string;
  amount_total?: number | null;
  amount?: number;
  amount_received?: number;
  amount_refunded?: number;
  currency?: string;
  status?: string;
  refunded?: boolean;
  last_payment_error?: { message?: string; decline_code?: string; code?: string } | null;
  failure_message?: string | null;
  charge?: string | null;
}

const piId = (o: ProviderObject) => (typeof o.payment_intent === 'string' ? o.payment_intent : (o.payment_intent?.id ?? (o.object === 'payment_intent' ? o.id : null)));

async function invoiceForEvent(o: ProviderObject, t: Transaction): Promise<Invoice | null> {
  const byMeta = Number(o.metadata?.invoice_id ?? o.client_reference_id ?? NaN);
  if (Number.isInteger(byMeta) && byMeta > 0) return Invoice.findByPk(byMeta, { transaction: t, lock: t.LOCK.UPDATE });
  const pi = piId(o);
  if (pi) return Invoice.findOne({ where: { paymentIntentId: pi }, transaction: t, lock: t.LOCK.UPDATE });
  if (o.object === 'checkout.session') return Invoice.findOne({ where: { checkoutSessionId: o.id }, transaction: t, lock: t.LOCK.UPDATE });
  return null;
}

/**
 * Applies one payment fact to an invoice. Facts only accumulate (paid, then refunded), so the
 * order in which the provider's events arrive does not matter: a late failure after a success,
 * or a success after the refund, changes nothing.
 */
async function markPaid(inv: Invoice, amount: number, currency: string, paymentIntent: string | null, at: Date, t: Transaction): Promise<Outcome> {
  if (currency.toLowerCase() !== inv.currency.toLowerCase() || amount !== inv.totalCents) {
    await audit(null, { action: 'invoice.payment_mismatch', entity: 'invoice', entityId: inv.id, organizationId: inv.organizationId, after: { amount, currency, expected: inv.totalCents, expectedCurrency: inv.currency } }, t);
    return 'amount_mismatch';
  }
  if (inv.paidAt) {
    if (!inv.paymentIntentId && paymentIntent) await inv.update({ paymentIntentId: paymentIntent }, { transaction: t });
    return 'already_paid';
  }
  const before = snapshot(inv);
  await inv.update(
    { status: inv.status === 'open' ? 'paid' : inv.status, paidCents: amount, paidAt: at, paymentIntentId: paymentIntent ?? inv.paymentIntentId, lastPaymentError: null, lastPaymentErrorAt: null, version: inv.version + 1 },
    { transaction: t },
  );
  await audit(null, { action: 'invoice.paid', entity: 'invoice', entityId: inv.id, organizationId: inv.organizationId, before, after: snapshot(inv), reason: inv.status === 'void' ? 'payment arrived for a void invoice; refund it' : null }, t);
  const to = await billingRecipients(inv.organizationId, t);
  if (to.length) {
    const full = await loadFull(inv.id, t);
    const pdf = await receiptPdf(await documentOf(full, t));
    await enqueueMail(
      {
        dedupeKey: `receipt:${inv.id}`,
        organizationId: inv.organizationId,
        to,
        subject: `Receipt for invoice ${inv.number}: ${formatMoney(amount, inv.currency)} paid`,
        text: `Thank you: ${formatMoney(amount, inv.currency)} was paid on ${at.toISOString().slice(0, 10)} for invoice ${inv.number}. The receipt is attached.\n`,
        attachments: [{ filename: `receipt-${inv.number}.pdf`, contentType: 'application/pdf', content: pdf }],
      },
      t,
    );
  }
  return inv.status === 'void' ? 'paid_while_void' : 'paid';
}

async function markRefunded(inv: Invoice, refunded: number, chargeAmount: number | null, refundId: string | null, paymentIntent: string | null, at: Date, t: Transaction): Promise<Outcome> {
  if (inv.refundedAt) {
    if (!inv.refundId && refundId) await inv.update({ refundId }, { transaction: t });
    return 'already_refunded';
  }
  const before = snapshot(inv);
  // A refund implies the payment: when its event is still on the way, the refund records both.
  const paidCents = inv.paidCents ?? chargeAmount ?? refunded;
  const whole = refunded >= paidCents;
  await inv.update(
    {
      paidAt: inv.paidAt ?? at,
      paidCents,
      paymentIntentId: inv.paymentIntentId ?? paymentIntent,
      ...(whole ? { status: inv.status === 'void' ? 'void' : ('refunded' as InvoiceStatus), refundedAt: at } : {}),
      refundedCents: refunded,
      refundId: refundId ?? inv.refundId,
      version: inv.version + 1,
    },
    { transaction: t },
  );
  await audit(null, { action: 'invoice.refunded', entity: 'invoice', entityId: inv.id, organizationId: inv.organizationId, before, after: snapshot(inv) }, t);
  return whole ? 'refunded' : 'partly_refunded';
}

async function applyEvent(event: Stripe.Event, t: Transaction): Promise<{ invoiceId: number | null; outcome: Outcome }> {
  const o = event.data.object as unknown as ProviderObject;
  const inv = await invoiceForEvent(o, t);
  if (!inv) return { invoiceId: null, outcome: 'no_invoice' };
  const at = new Date(event.created * 1000);
  let outcome: Outcome = 'ignored';
  switch (event.type) {
    case 'checkout.session.completed':
      outcome = o.payment_status === 'paid' ? await markPaid(inv, o.amount_total ?? -1, o.currency ?? '', piId(o), at, t) : 'not_paid_yet';
      break;
    case 'payment_intent.succeeded':
      outcome = await markPaid(inv, o.amount_received ?? o.amount ?? -1, o.currency ?? '', o.id, at, t);
      break;
    case 'charge.succeeded':
      outcome = await markPaid(inv, o.amount ?? -1, o.currency ?? '', piId(o), at, t);
      break;
    case 'payment_intent.payment_failed':
    case 'charge.failed': {
      if (inv.paidAt || inv.status !== 'open') {
        outcome = 'ignored_settled';
        break;
      }
      // An older failure arriving after a newer one does not overwrite it.
      if (inv.lastPaymentErrorAt && inv.lastPaymentErrorAt > at) {
        outcome = 'ignored_stale';
        break;
      }
      const reason = event.type === 'charge.failed' ? (o.failure_message ?? 'The card was declined.') : (o.last_payment_error?.message ?? 'The card was declined.');
      const before = snapshot(inv);
      await inv.update({ lastPaymentError: reason.slice(0, 500), lastPaymentErrorAt: at, paymentIntentId: inv.paymentIntentId ?? piId(o) }, { transaction: t });
      await audit(null, { action: 'invoice.payment_failed', entity: 'invoice', entityId: inv.id, organizationId: inv.organizationId, before, after: snapshot(inv), reason }, t);
      outcome = 'payment_failed';
      break;
    }
    case 'charge.refunded':
      outcome = await markRefunded(inv, o.amount_refunded ?? 0, o.amount ?? null, null, piId(o), at, t);
      break;
    case 'refund.created':
    case 'refund.updated':
      outcome = o.status === 'succeeded' ? await markRefunded(inv, o.amount ?? 0, null, o.id, piId(o), at, t) : 'refund_pending';
      break;
    case 'checkout.session.expired':
      if (inv.checkoutSessionId === o.id) {
        const before = snapshot(inv);
        await inv.update({ checkoutSessionId: null }, { transaction: t });
        await audit(null, { action: 'invoice.checkout_expired', entity: 'invoice', entityId: inv.id, organizationId: inv.organizationId, before, after: snapshot(inv) }, t);
        outcome = 'page_expired';
      }
      break;
    default:
      outcome = 'ignored';
  }
  return { invoiceId: inv.id, outcome };
}

/**
 * The provider's webhook: the signature is checked by the SDK over the raw body (400 and no
 * change when it fails), the event id is stored with what it changed in one transaction, and
 * an event already stored is answered 200 without being applied again.
 */
export async function handleWebhook(rawBody: unknown, signature: string | undefined) {
  if (!Buffer.isBuffer(rawBody) || !rawBody.length) throw new ValidationError('The webhook body is missing.', { body: 'required' });
  if (!signature) throw new ValidationError('The webhook is not signed.', { 'stripe-signature': 'required' });
  let event: Stripe.Event;
  try {
    event = payments().webhooks.constructEvent(rawBody, signature, config().PAYMENTS_WEBHOOK_SECRET);
  } catch (err) {
    throw new ValidationError('The webhook signature does not verify.', { 'stripe-signature': (err as Error).message.slice(0, 200) });
  }
  try {
    return await sequelize().transaction(async (t) => {
      const seen = await PaymentEvent.findOne({ where: { eventId: event.id }, transaction: t });
      if (seen) return { received: true, duplicate: true, outcome: seen.outcome };
      const { invoiceId, outcome } = await applyEvent(event, t);
      await PaymentEvent.create({ eventId: event.id, type: event.type, invoiceId, outcome, providerCreatedAt: new Date(event.created * 1000), summary: { object: (event.data.object as { id?: string }).id ?? null } }, { transaction: t });
      return { received: true, duplicate: false, outcome };
    });
  } catch (err) {
    // Two deliveries of one event at the same moment: the second loses the unique key and changed nothing.
    if (err instanceof UniqueConstraintError) return { received: true, duplicate: true, outcome: 'concurrent_duplicate' };
    throw err;
  }
}

/** The events applied to one invoice, for the lab's payment history. */
export async function invoiceEvents(actor: Actor, id: number) {
  await findInvoice(actor, id);
  const rows = await PaymentEvent.findAll({ where: { invoiceId: id }, order: [['providerCreatedAt', 'ASC'], ['id', 'ASC']] });
  return { items: rows.map((r) => ({ eventId: r.eventId, type: r.type, outcome: r.outcome, at: r.providerCreatedAt })), total: rows.length };
}
