import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrate.js';

/** Exceedances found by the compliance engine, and the notices sent about them. */
export const up: MigrationFn = async ({ context: q }) => {
  await q.createTable('exceedances', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' } },
    facility_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'facilities', key: 'id' } },
    permit_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'permits', key: 'id' } },
    limit_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'permit_limits', key: 'id' } },
    point_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'monitoring_points', key: 'id' } },
    parameter: { type: DataTypes.STRING(40), allowNull: false },
    statistic: { type: DataTypes.STRING(40), allowNull: false },
    bound: { type: DataTypes.STRING(10), allowNull: false },
    period_start: { type: DataTypes.DATEONLY, allowNull: false },
    period_end: { type: DataTypes.DATEONLY, allowNull: false },
    value: { type: DataTypes.DECIMAL(18, 6), allowNull: false },
    reported: { type: DataTypes.STRING(40), allowNull: false },
    limit_value: { type: DataTypes.DECIMAL(14, 4), allowNull: false },
    units: { type: DataTypes.STRING(20), allowNull: false },
    result_ids: { type: DataTypes.JSON, allowNull: false },
    status: { type: DataTypes.ENUM('open', 'notified', 'acknowledged', 'closed'), allowNull: false, defaultValue: 'open' },
    corrective_action: { type: DataTypes.TEXT, allowNull: true },
    closed_reason: { type: DataTypes.STRING(400), allowNull: true },
    detected_at: { type: DataTypes.DATE, allowNull: false },
    acknowledged_at: { type: DataTypes.DATE, allowNull: true },
    acknowledged_by_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    closed_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  // One exceedance per limit and period: re-evaluation updates it instead of adding another.
  await q.addIndex('exceedances', ['limit_id', 'period_start', 'period_end'], { unique: true });
  await q.addIndex('exceedances', ['facility_id', 'period_start']);
  await q.addIndex('exceedances', ['organization_id', 'status']);

  await q.createTable('notices', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    exceedance_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'exceedances', key: 'id' } },
    organization_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' } },
    kind: { type: DataTypes.ENUM('exceedance', 'cured'), allowNull: false, defaultValue: 'exceedance' },
    recipients: { type: DataTypes.JSON, allowNull: false },
    subject: { type: DataTypes.STRING(300), allowNull: false },
    body: { type: DataTypes.TEXT, allowNull: false },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    outbox_message_id: { type: DataTypes.BIGINT, allowNull: true, references: { model: 'outbox_messages', key: 'id' } },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('notices', ['exceedance_id']);
};

export const down: MigrationFn = async ({ context: q }) => {
  await q.dropTable('notices');
  await q.dropTable('exceedances');
};
