import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrate.js';

/** Compliance officers who asked to be e-mailed when a projected average crosses its limit. */
export const up: MigrationFn = async ({ context: q }) => {
  await q.createTable('projection_alerts', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' } },
    facility_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'facilities', key: 'id' } },
    organization_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' } },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('projection_alerts', ['user_id', 'facility_id'], { unique: true });
};

export const down: MigrationFn = async ({ context: q }) => {
  await q.dropTable('projection_alerts');
};
