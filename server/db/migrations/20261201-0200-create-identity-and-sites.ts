import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrate.js';

const stamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};

/** Organisations (the lab and its client utilities), users, facilities, monitoring points, audit events. */
export const up: MigrationFn = async ({ context: q }) => {
  await q.createTable('organizations', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    name: { type: DataTypes.STRING(160), allowNull: false, unique: true },
    kind: { type: DataTypes.ENUM('laboratory', 'utility'), allowNull: false },
    lab_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'organizations', key: 'id' } },
    contact_email: { type: DataTypes.STRING(254), allowNull: true },
    billing_email: { type: DataTypes.STRING(254), allowNull: true },
    address: { type: DataTypes.STRING(400), allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...stamps,
  });
  await q.addIndex('organizations', ['lab_id']);

  await q.createTable('users', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' } },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    role: { type: DataTypes.ENUM('lab_admin', 'analyst', 'operator', 'compliance_officer', 'billing'), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    must_change_password: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    failed_logins: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    locked_until: { type: DataTypes.DATE, allowNull: true },
    token_version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    last_login_at: { type: DataTypes.DATE, allowNull: true },
    ...stamps,
  });
  await q.addIndex('users', ['organization_id']);

  await q.createTable('facilities', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' } },
    name: { type: DataTypes.STRING(160), allowNull: false },
    kind: { type: DataTypes.ENUM('drinking_water', 'wastewater', 'industrial'), allowNull: false },
    address: { type: DataTypes.STRING(400), allowNull: true },
    timezone: { type: DataTypes.STRING(64), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...stamps,
  });
  await q.addIndex('facilities', ['organization_id', 'name'], { unique: true });

  await q.createTable('monitoring_points', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    facility_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'facilities', key: 'id' } },
    code: { type: DataTypes.STRING(32), allowNull: false },
    name: { type: DataTypes.STRING(160), allowNull: false },
    matrix: { type: DataTypes.ENUM('raw', 'finished', 'influent', 'effluent', 'process', 'digester'), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...stamps,
  });
  await q.addIndex('monitoring_points', ['facility_id', 'code'], { unique: true });

  await q.createTable('audit_events', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    actor_user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    organization_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'organizations', key: 'id' } },
    action: { type: DataTypes.STRING(60), allowNull: false },
    entity: { type: DataTypes.STRING(60), allowNull: false },
    entity_id: { type: DataTypes.STRING(40), allowNull: true },
    before: { type: DataTypes.JSON, allowNull: true },
    after: { type: DataTypes.JSON, allowNull: true },
    reason: { type: DataTypes.STRING(1000), allowNull: true },
    ip: { type: DataTypes.STRING(64), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex('audit_events', ['entity', 'entity_id']);
  await q.addIndex('audit_events', ['actor_user_id', 'created_at']);
  await q.addIndex('audit_events', ['organization_id', 'created_at']);
};

export const down: MigrationFn = async ({ context: q }) => {
  for (const t of ['audit_events', 'monitoring_points', 'facilities', 'users', 'organizations']) await q.dropTable(t);
};
