import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrate.js';

/** Laboratory-wide settings (CaCO3 factor, QC acceptance limits, ...) as key → JSON value. */
export const up: MigrationFn = async ({ context: q }) => {
  await q.createTable('lab_settings', {
    key: { type: DataTypes.STRING(80), primaryKey: true },
    value: { type: DataTypes.JSON, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
};

export const down: MigrationFn = async ({ context: q }) => {
  await q.dropTable('lab_settings');
};
