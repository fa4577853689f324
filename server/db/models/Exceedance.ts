import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Facility } from './Facility.js';
import type { MonitoringPoint } from './MonitoringPoint.js';
import type { Permit } from './Permit.js';
import type { PermitLimit } from './PermitLimit.js';

export type ExceedanceStatus = 'open' | 'notified' | 'acknowledged' | 'closed';

export class Exceedance extends Model<InferAttributes<Exceedance>, InferCreationAttributes<Exceedance>> {
  declare id: CreationOptional<number>;
  declare organizationId: number;
  declare facilityId: number;
  declare permitId: number;
  declare limitId: number;
  declare pointId: number;
  declare parameter: string;
  declare statistic: string;
  declare bound: string;
  declare periodStart: string;
  declare periodEnd: string;
  declare value: string;
  declare reported: string;
  declare limitValue: string;
  declare units: string;
  declare resultIds: Array<number | string>;
  declare status: CreationOptional<ExceedanceStatus>;
  declare correctiveAction: CreationOptional<string | null>;
  declare closedReason: CreationOptional<string | null>;
  declare detectedAt: Date;
  declare acknowledgedAt: CreationOptional<Date | null>;
  declare acknowledgedById: CreationOptional<number | null>;
  declare closedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare facility?: NonAttribute<Facility>;
  declare point?: NonAttribute<MonitoringPoint>;
  declare permit?: NonAttribute<Permit>;
  declare limit?: NonAttribute<PermitLimit>;

  static initModel(sequelize: Sequelize) {
    Exceedance.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        facilityId: { type: DataTypes.INTEGER, allowNull: false },
        permitId: { type: DataTypes.INTEGER, allowNull: false },
        limitId: { type: DataTypes.INTEGER, allowNull: false },
        pointId: { type: DataTypes.INTEGER, allowNull: false },
        parameter: { type: DataTypes.STRING(40), allowNull: false },
        statistic: { type: DataTypes.STRING(40), allowNull: false },
        bound: { type: DataTypes.STRING(10), allowNull: false },
        periodStart: { type: DataTypes.DATEONLY, allowNull: false },
        periodEnd: { type: DataTypes.DATEONLY, allowNull: false },
        value: { type: DataTypes.DECIMAL(18, 6), allowNull: false },
        reported: { type: DataTypes.STRING(40), allowNull: false },
        limitValue: { type: DataTypes.DECIMAL(14, 4), allowNull: false },
        units: { type: DataTypes.STRING(20), allowNull: false },
        resultIds: { type: DataTypes.JSON, allowNull: false },
        status: { type: DataTypes.ENUM('open', 'notified', 'acknowledged', 'closed'), allowNull: false, defaultValue: 'open' },
        correctiveAction: DataTypes.TEXT,
        closedReason: DataTypes.STRING(400),
        detectedAt: { type: DataTypes.DATE, allowNull: false },
        acknowledgedAt: DataTypes.DATE,
        acknowledgedById: DataTypes.INTEGER,
        closedAt: DataTypes.DATE,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'exceedances' },
    );
  }
}

export class Notice extends Model<InferAttributes<Notice>, InferCreationAttributes<Notice>> {
  declare id: CreationOptional<number>;
  declare exceedanceId: number;
  declare organizationId: number;
  declare kind: CreationOptional<'exceedance' | 'cured'>;
  declare recipients: string[];
  declare subject: string;
  declare body: string;
  declare expiresAt: Date;
  declare outboxMessageId: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare exceedance?: NonAttribute<Exceedance>;

  static initModel(sequelize: Sequelize) {
    Notice.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        exceedanceId: { type: DataTypes.INTEGER, allowNull: false },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.ENUM('exceedance', 'cured'), allowNull: false, defaultValue: 'exceedance' },
        recipients: { type: DataTypes.JSON, allowNull: false },
        subject: { type: DataTypes.STRING(300), allowNull: false },
        body: { type: DataTypes.TEXT, allowNull: false },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        outboxMessageId: DataTypes.BIGINT,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'notices' },
    );
  }
}
