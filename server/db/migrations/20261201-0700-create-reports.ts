import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrate.js';

/** Monthly reports: one row per version; a certified row is frozen and keeps its PDF and hash. */
export const up: MigrationFn = async ({ context: q }) => {
  await q.createTable('reports', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' } },
    facility_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'facilities', key: 'id' } },
    month: { type: DataTypes.STRING(7), allowNull: false },
    revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    status: { type: DataTypes.ENUM('draft', 'certified', 'revised'), allowNull: false, defaultValue: 'draft' },
    previous_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'reports', key: 'id' } },
    revision_reason: { type: DataTypes.STRING(1000), allowNull: true },
    changes: { type: DataTypes.JSON, allowNull: true },
    content: { type: DataTypes.JSON, allowNull: true },
    certified_by_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    certified_at: { type: DataTypes.DATE, allowNull: true },
    certified_ip: { type: DataTypes.STRING(64), allowNull: true },
    certification_wording: { type: DataTypes.TEXT, allowNull: true },
    statement: { type: DataTypes.TEXT, allowNull: true },
    pdf: { type: DataTypes.BLOB('long'), allowNull: true },
    pdf_sha256: { type: DataTypes.STRING(64), allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('reports', ['facility_id', 'month', 'revision'], { unique: true });
  await q.addIndex('reports', ['organization_id', 'status']);
};

export const down: MigrationFn = async ({ context: q }) => {
  await q.dropTable('reports');
};
