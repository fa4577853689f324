import dayjs from 'dayjs';
import { actorFor, type Actor } from '../../services/actor.js';
import { audit, snapshot } from '../../services/audit.js';
import { createPriceItem, finaliseInvoice, generateInvoice, setBillingConfig } from '../../services/billing.js';
import { ValidationError } from '../../errors.js';
import { setSequelize } from '../current.js';
import { Op } from 'sequelize';
import { Invoice, Organization, Titration, User } from '../models/index.js';
import type { SeedStep } from './index.js';

/**
 * Demo billing (invented): Marrowfield's price list in US dollars, a volume price for Kestrel
 * Ford, and invoices built by the same services the API calls from the approved bench results:
 * for Kestrel Ford one paid (by bank transfer, before online payment), one overdue and one
 * open; for Brindlemoor one paid and one open; for Quillon Bay a draft still being reviewed.
 */
export const seedBilling: SeedStep['run'] = async ({ sequelize, config }) => {
  setSequelize(sequelize);
  setBillingConfig(config);
  const admin: Actor = await actorFor((await User.findOne({ where: { email: 'admin@marrowfield.example' }, include: [{ model: Organization, as: 'organization' }] }))!);
  const org = async (name: string) => (await Organization.findOne({ where: { name } }))!;
  const kestrel = await org('Kestrel Ford Sanitary District');
  const brindlemoor = await org('Brindlemoor Water Authority');
  const quillon = await org('Quillon Bay Utilities');

  const from = dayjs().subtract(1, 'year').startOf('year').format('YYYY-MM-DD');
  const list = [
    { kind: 'alkalinity', description: 'Alkalinity, P and T to mg/L as CaCO3', unitAmountCents: 2450 },
    { kind: 'acidity', description: 'Acidity, mineral and total', unitAmountCents: 2600 },
    { kind: 'speciation', description: 'Full carbonate speciation (pH, temperature, ionic strength)', unitAmountCents: 3875 },
    { kind: 'rush', description: 'Rush turnaround, results within 24 h', unitAmountCents: 1500 },
  ] as const;
  for (const p of list) await createPriceItem(admin, { ...p, currency: 'usd', clientId: null, effectiveFrom: from, effectiveTo: null });
  await createPriceItem(admin, { kind: 'alkalinity', description: 'Alkalinity, P and T (daily-programme price)', unitAmountCents: 2200, currency: 'usd', clientId: kestrel.id, effectiveFrom: from, effectiveTo: null });

  const month = (monthsAgo: number) => {
    const m = dayjs().subtract(monthsAgo, 'month');
    return { periodStart: m.startOf('month').format('YYYY-MM-DD'), periodEnd: m.endOf('month').format('YYYY-MM-DD') };
  };
  const firstOf = (monthsAgo: number) => dayjs().subtract(monthsAgo, 'month').startOf('month').format('YYYY-MM-DD');

  const invoice = async (clientId: number, monthsAgo: number, rushCount = 0) => {
    const period = month(monthsAgo);
    // The first few samples of the month came in on rush turnaround.
    const rushed = rushCount
      ? await Titration.findAll({
          where: { organizationId: clientId, status: 'approved', analysedAt: { [Op.gte]: new Date(`${period.periodStart}T00:00:00Z`), [Op.lte]: new Date(`${period.periodEnd}T23:59:59Z`) } },
          order: [['analysedAt', 'ASC']],
          limit: rushCount,
        })
      : [];
    try {
      return await generateInvoice(admin, { organizationId: clientId, ...period, rushSampleIds: [...new Set(rushed.map((r) => r.sampleId))], notes: null });
    } catch (err) {
      // Nothing approved in that month for this client: no invoice. Anything else is a bug.
      if (err instanceof ValidationError && err.fields && 'periodStart' in err.fields) return null;
      throw err;
    }
  };
  const paidByTransfer = async (id: number, paidOn: string) => {
    await sequelize.transaction(async (t) => {
      const inv = (await Invoice.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE }))!;
      const before = snapshot(inv);
      await inv.update({ status: 'paid', paidCents: inv.totalCents, paidAt: dayjs(`${paidOn}T15:00:00Z`).toDate(), version: inv.version + 1 }, { transaction: t });
      await audit(admin, { action: 'invoice.paid', entity: 'invoice', entityId: id, organizationId: inv.organizationId, before, after: snapshot(inv), reason: 'Paid by bank transfer' }, t);
    });
  };

  // Kestrel Ford: three months ago paid, two months ago overdue, last month open.
  const k3 = await invoice(kestrel.id, 3);
  if (k3) {
    await finaliseInvoice(admin, k3.id, { termsDays: 14, issuedOn: firstOf(2) });
    await paidByTransfer(k3.id, dayjs(firstOf(2)).add(9, 'day').format('YYYY-MM-DD'));
  }
  const k2 = await invoice(kestrel.id, 2);
  if (k2) await finaliseInvoice(admin, k2.id, { termsDays: 14, issuedOn: firstOf(1) });
  const k1 = await invoice(kestrel.id, 1, 2);
  if (k1) await finaliseInvoice(admin, k1.id, { termsDays: 30, issuedOn: dayjs().format('YYYY-MM-DD') });

  // Brindlemoor: two months ago paid, last month open.
  const b2 = await invoice(brindlemoor.id, 2);
  if (b2) {
    await finaliseInvoice(admin, b2.id, { termsDays: 30, issuedOn: firstOf(1) });
    await paidByTransfer(b2.id, dayjs(firstOf(1)).add(12, 'day').format('YYYY-MM-DD'));
  }
  const b1 = await invoice(brindlemoor.id, 1);
  if (b1) await finaliseInvoice(admin, b1.id, { termsDays: 30, issuedOn: dayjs().format('YYYY-MM-DD') });

  // Quillon Bay: last month's draft, not yet issued.
  await invoice(quillon.id, 1);
};
