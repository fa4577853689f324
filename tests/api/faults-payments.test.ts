import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startPaymentsFake, type PaymentsFakeHandle } from '../../fakes/payments/server.js';
import { Invoice, Organization } from '../../server/db/models/index.js';
import { as, demo } from '../fixtures/auth.js';
import { apiTestApp } from '../setup/db.js';

/**
 * Fault: the payment service is down when the payer presses Pay. The payer gets a clear 503,
 * nothing is marked paid or half-started, and paying works again once the service is back.
 */
let pay: PaymentsFakeHandle;
let ctx: ReturnType<typeof apiTestApp>;
let port: number;

beforeAll(async () => {
  pay = await startPaymentsFake({ port: 0, webhookUrl: null, webhookSecret: 'whsec_faults' });
  port = pay.port;
  ctx = apiTestApp({ PAYMENTS_PORT: String(port), PAYMENTS_HOST: '127.0.0.1', PAYMENTS_PROTOCOL: 'http', PAYMENTS_WEBHOOK_SECRET: 'whsec_faults' });
});
afterAll(async () => {
  await pay.close();
  await ctx.sequelize.close();
});

describe('payment service stopped', () => {
  it('answers the payer 503 with a clear message, marks nothing, and recovers when the service returns', async () => {
    const kf = await Organization.findOne({ where: { name: 'Kestrel Ford Sanitary District' } });
    const invoice = await Invoice.findOne({ where: { organizationId: kf!.id, status: 'open' }, order: [['id', 'ASC']] });
    expect(invoice, 'the demo has an open Kestrel Ford invoice').toBeTruthy();
    const before = invoice!.get({ plain: true });
    const payer = await as(ctx.app, demo.billing);

    await pay.close();
    const down = await payer.post(`/api/v1/invoices/${invoice!.id}/checkout`);
    expect(down.status).toBe(503);
    expect(down.body.error.message).toMatch(/could not be reached.*nothing was charged/i);
    const after = (await Invoice.findByPk(invoice!.id))!.get({ plain: true });
    expect(after.status).toBe('open');
    expect(after.checkoutSessionId).toBe(before.checkoutSessionId);
    expect(after.version).toBe(before.version);

    pay = await startPaymentsFake({ port, webhookUrl: null, webhookSecret: 'whsec_faults' });
    const up = await payer.post(`/api/v1/invoices/${invoice!.id}/checkout`);
    expect(up.status, JSON.stringify(up.body)).toBe(200);
    expect(String(up.body.url)).toContain(`127.0.0.1:${port}`);
    expect((await Invoice.findByPk(invoice!.id))!.status).toBe('open');
  });
});
