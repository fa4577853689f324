import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { User } from './User.js';

export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<string>;
  declare actorUserId: number | null;
  /** The organisation whose record changed (for scoping the audit log). */
  declare organizationId: number | null;
  declare action: string;
  declare entity: string;
  declare entityId: string | null;
  declare before: object | null;
  declare after: object | null;
  declare reason: string | null;
  declare ip: string | null;
  declare createdAt: CreationOptional<Date>;
  declare actor?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    AuditEvent.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        actorUserId: DataTypes.INTEGER,
        organizationId: DataTypes.INTEGER,
        action: { type: DataTypes.STRING(60), allowNull: false },
        entity: { type: DataTypes.STRING(60), allowNull: false },
        entityId: DataTypes.STRING(40),
        before: DataTypes.JSON,
        after: DataTypes.JSON,
        reason: DataTypes.STRING(1000),
        ip: DataTypes.STRING(64),
        createdAt: DataTypes.DATE(3),
      },
      { sequelize, tableName: 'audit_events', updatedAt: false },
    );
  }
}
