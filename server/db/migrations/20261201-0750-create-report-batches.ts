import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrate.js';

/** A year of draft reports for several facilities, generated in the background item by item. */
export const up: MigrationFn = async ({ context: q }) => {
  await q.createTable('report_batches', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' } },
    created_by_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' } },
    year: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.ENUM('running', 'paused', 'finished'), allowNull: false, defaultValue: 'running' },
    items: { type: DataTypes.JSON, allowNull: false },
    total: { type: DataTypes.INTEGER, allowNull: false },
    done: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    failed: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    finished_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('report_batches', ['status']);
};

export const down: MigrationFn = async ({ context: q }) => {
  await q.dropTable('report_batches');
};
