import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrate.js';

const stamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};

/** Permits and their limits; the e-mail outbox every notice and report goes through. */
export const up: MigrationFn = async ({ context: q }) => {
  await q.createTable('permits', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' } },
    facility_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'facilities', key: 'id' } },
    number: { type: DataTypes.STRING(60), allowNull: false },
    issuing_authority: { type: DataTypes.STRING(200), allowNull: false },
    effective_from: { type: DataTypes.DATEONLY, allowNull: false },
    expires_on: { type: DataTypes.DATEONLY, allowNull: true },
    regulator_contacts: { type: DataTypes.JSON, allowNull: false },
    follow_up_text: { type: DataTypes.TEXT, allowNull: true },
    follow_up_deadline_value: { type: DataTypes.INTEGER, allowNull: true },
    follow_up_deadline_unit: { type: DataTypes.ENUM('hours', 'days'), allowNull: true },
    certification_wording: { type: DataTypes.TEXT, allowNull: true },
    rounding_mode: { type: DataTypes.ENUM('half_up', 'half_even'), allowNull: false, defaultValue: 'half_up' },
    week_starts_on: { type: DataTypes.TINYINT, allowNull: false, defaultValue: 0 },
    week_month_rule: { type: DataTypes.ENUM('week_end_month', 'split'), allowNull: false, defaultValue: 'week_end_month' },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...stamps,
  });
  await q.addIndex('permits', ['facility_id', 'number'], { unique: true });
  await q.addIndex('permits', ['organization_id']);

  await q.createTable('permit_limits', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    permit_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'permits', key: 'id' } },
    point_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'monitoring_points', key: 'id' } },
    parameter: { type: DataTypes.ENUM('total_alkalinity', 'phenolphthalein_alkalinity', 'acidity', 'ph', 'bicarbonate', 'carbonate', 'hydroxide'), allowNull: false },
    statistic: { type: DataTypes.ENUM('instantaneous', 'daily', 'weekly_average', 'monthly_average'), allowNull: false },
    bound: { type: DataTypes.ENUM('minimum', 'maximum'), allowNull: false },
    value: { type: DataTypes.DECIMAL(14, 4), allowNull: false },
    units: { type: DataTypes.ENUM('mg/L as CaCO3', 'S.U.'), allowNull: false },
    significant_figures: { type: DataTypes.TINYINT, allowNull: true },
    decimals: { type: DataTypes.TINYINT, allowNull: true },
    reporting_limit: { type: DataTypes.DECIMAL(14, 4), allowNull: true },
    below_reporting_limit: { type: DataTypes.ENUM('zero', 'half', 'limit'), allowNull: false, defaultValue: 'zero' },
    effective_from: { type: DataTypes.DATEONLY, allowNull: false },
    effective_to: { type: DataTypes.DATEONLY, allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...stamps,
  });
  await q.addIndex('permit_limits', ['permit_id']);
  await q.addIndex('permit_limits', ['point_id', 'parameter']);

  await q.createTable('outbox_messages', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    /** What this message is for, unique: enqueuing the same thing twice is a no-op. */
    dedupe_key: { type: DataTypes.STRING(120), allowNull: false, unique: true },
    organization_id: { type: DataTypes.INTEGER, allowNull: true },
    to_addresses: { type: DataTypes.JSON, allowNull: false },
    cc_addresses: { type: DataTypes.JSON, allowNull: true },
    subject: { type: DataTypes.STRING(300), allowNull: false },
    text_body: { type: DataTypes.TEXT('medium'), allowNull: false },
    html_body: { type: DataTypes.TEXT('medium'), allowNull: true },
    status: { type: DataTypes.ENUM('pending', 'sending', 'sent', 'failed'), allowNull: false, defaultValue: 'pending' },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    next_attempt_at: { type: DataTypes.DATE(3), allowNull: false },
    locked_until: { type: DataTypes.DATE(3), allowNull: true },
    last_error: { type: DataTypes.STRING(1000), allowNull: true },
    message_id: { type: DataTypes.STRING(200), allowNull: true },
    sent_at: { type: DataTypes.DATE(3), allowNull: true },
    ...stamps,
  });
  await q.addIndex('outbox_messages', ['status', 'next_attempt_at']);

  await q.createTable('outbox_attachments', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    message_id: { type: DataTypes.BIGINT, allowNull: false, references: { model: 'outbox_messages', key: 'id' } },
    filename: { type: DataTypes.STRING(200), allowNull: false },
    content_type: { type: DataTypes.STRING(100), allowNull: false },
    content: { type: DataTypes.BLOB('long'), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('outbox_attachments', ['message_id']);
};

export const down: MigrationFn = async ({ context: q }) => {
  for (const t of ['outbox_attachments', 'outbox_messages', 'permit_limits', 'permits']) await q.dropTable(t);
};
