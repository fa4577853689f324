import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrate.js';

const stamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};
const ref = (model: string, allowNull = false) => ({ type: DataTypes.INTEGER, allowNull, references: { model, key: 'id' } });
/** Money is whole cents in an INTEGER with its ISO 4217 currency beside it, never a float. */
const cents = (allowNull = false) => ({ type: DataTypes.INTEGER, allowNull, ...(allowNull ? {} : { defaultValue: 0 }) });

/**
 * Billing: the lab's price list (with per-client overrides and effective dates), invoices with
 * their lines and the samples behind each line, the payment provider's customer per client,
 * per-year invoice numbering, and the provider's events already applied (idempotency).
 */
export const up: MigrationFn = async ({ context: q }) => {
  await q.createTable('price_items', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    lab_id: ref('organizations'),
    /** null: the lab's list price; set: that client's override. */
    client_id: ref('organizations', true),
    kind: { type: DataTypes.ENUM('alkalinity', 'acidity', 'speciation', 'rush'), allowNull: false },
    description: { type: DataTypes.STRING(200), allowNull: false },
    unit_amount_cents: cents(),
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    effective_from: { type: DataTypes.DATEONLY, allowNull: false },
    effective_to: { type: DataTypes.DATEONLY, allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    created_by_id: ref('users', true),
    ...stamps,
  });
  await q.addIndex('price_items', ['lab_id', 'kind', 'client_id', 'effective_from']);

  await q.createTable('billing_accounts', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: ref('organizations'),
    provider_customer_id: { type: DataTypes.STRING(100), allowNull: false },
    ...stamps,
  });
  await q.addIndex('billing_accounts', ['organization_id'], { unique: true });

  await q.createTable('invoice_counters', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    lab_id: ref('organizations'),
    year: { type: DataTypes.INTEGER, allowNull: false },
    last_number: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...stamps,
  });
  await q.addIndex('invoice_counters', ['lab_id', 'year'], { unique: true });

  await q.createTable('invoices', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    lab_id: ref('organizations'),
    organization_id: ref('organizations'),
    number: { type: DataTypes.STRING(40), allowNull: true, unique: true },
    status: { type: DataTypes.ENUM('draft', 'open', 'paid', 'void', 'refunded'), allowNull: false, defaultValue: 'draft' },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    period_start: { type: DataTypes.DATEONLY, allowNull: false },
    period_end: { type: DataTypes.DATEONLY, allowNull: false },
    total_cents: cents(),
    terms_days: { type: DataTypes.INTEGER, allowNull: true },
    issued_on: { type: DataTypes.DATEONLY, allowNull: true },
    due_on: { type: DataTypes.DATEONLY, allowNull: true },
    notes: { type: DataTypes.STRING(1000), allowNull: true },
    finalised_at: { type: DataTypes.DATE(3), allowNull: true },
    finalised_by_id: ref('users', true),
    voided_at: { type: DataTypes.DATE(3), allowNull: true },
    voided_by_id: ref('users', true),
    void_reason: { type: DataTypes.STRING(1000), allowNull: true },
    checkout_session_id: { type: DataTypes.STRING(100), allowNull: true },
    payment_intent_id: { type: DataTypes.STRING(100), allowNull: true },
    paid_cents: cents(true),
    paid_at: { type: DataTypes.DATE(3), allowNull: true },
    last_payment_error: { type: DataTypes.STRING(500), allowNull: true },
    last_payment_error_at: { type: DataTypes.DATE(3), allowNull: true },
    refund_id: { type: DataTypes.STRING(100), allowNull: true },
    refunded_cents: cents(true),
    refunded_at: { type: DataTypes.DATE(3), allowNull: true },
    refund_reason: { type: DataTypes.STRING(1000), allowNull: true },
    created_by_id: ref('users', true),
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...stamps,
  });
  await q.addIndex('invoices', ['organization_id', 'status', 'due_on']);
  await q.addIndex('invoices', ['lab_id', 'period_start']);
  await q.addIndex('invoices', ['payment_intent_id']);
  await q.addIndex('invoices', ['checkout_session_id']);

  await q.createTable('invoice_lines', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    invoice_id: ref('invoices'),
    position: { type: DataTypes.INTEGER, allowNull: false },
    kind: { type: DataTypes.ENUM('alkalinity', 'acidity', 'speciation', 'rush'), allowNull: false },
    description: { type: DataTypes.STRING(200), allowNull: false },
    price_item_id: ref('price_items', true),
    quantity: { type: DataTypes.INTEGER, allowNull: false },
    unit_amount_cents: cents(),
    amount_cents: cents(),
    ...stamps,
  });
  await q.addIndex('invoice_lines', ['invoice_id', 'position'], { unique: true });

  await q.createTable('invoice_line_samples', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    line_id: ref('invoice_lines'),
    invoice_id: ref('invoices'),
    sample_id: ref('samples'),
    titration_id: ref('titrations', true),
    kind: { type: DataTypes.ENUM('alkalinity', 'acidity', 'speciation', 'rush'), allowNull: false },
    analysed_at: { type: DataTypes.DATE(3), allowNull: true },
  });
  await q.addIndex('invoice_line_samples', ['line_id']);
  await q.addIndex('invoice_line_samples', ['sample_id', 'kind']);
  await q.addIndex('invoice_line_samples', ['invoice_id']);

  await q.createTable('payment_events', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    /** The provider's event id (evt_…): a second delivery of it is recognised and changes nothing. */
    event_id: { type: DataTypes.STRING(100), allowNull: false, unique: true },
    type: { type: DataTypes.STRING(80), allowNull: false },
    invoice_id: ref('invoices', true),
    outcome: { type: DataTypes.STRING(60), allowNull: false },
    provider_created_at: { type: DataTypes.DATE(3), allowNull: true },
    summary: { type: DataTypes.JSON, allowNull: true },
    ...stamps,
  });
  await q.addIndex('payment_events', ['invoice_id']);
};

export const down: MigrationFn = async ({ context: q }) => {
  for (const t of ['payment_events', 'invoice_line_samples', 'invoice_lines', 'invoices', 'invoice_counters', 'billing_accounts', 'price_items']) await q.dropTable(t);
};
