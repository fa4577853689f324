import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { BelowReportingLimitRule, Bound, Parameter, Statistic, Units } from '../../../shared/compliance/types.js';
import type { MonitoringPoint } from './MonitoringPoint.js';
import type { Permit } from './Permit.js';

export class PermitLimit extends Model<InferAttributes<PermitLimit>, InferCreationAttributes<PermitLimit>> {
  declare id: CreationOptional<number>;
  declare permitId: number;
  declare pointId: number;
  declare parameter: Parameter;
  declare statistic: Statistic;
  declare bound: Bound;
  /** DECIMAL, an exact string. */
  declare value: string;
  declare units: Units;
  declare significantFigures: number | null;
  declare decimals: number | null;
  declare reportingLimit: string | null;
  declare belowReportingLimit: CreationOptional<BelowReportingLimitRule>;
  declare effectiveFrom: string;
  declare effectiveTo: string | null;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare permit?: NonAttribute<Permit>;
  declare point?: NonAttribute<MonitoringPoint>;

  static initModel(sequelize: Sequelize) {
    PermitLimit.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        permitId: { type: DataTypes.INTEGER, allowNull: false },
        pointId: { type: DataTypes.INTEGER, allowNull: false },
        parameter: { type: DataTypes.ENUM('total_alkalinity', 'phenolphthalein_alkalinity', 'acidity', 'ph', 'bicarbonate', 'carbonate', 'hydroxide'), allowNull: false },
        statistic: { type: DataTypes.ENUM('instantaneous', 'daily', 'weekly_average', 'monthly_average'), allowNull: false },
        bound: { type: DataTypes.ENUM('minimum', 'maximum'), allowNull: false },
        value: { type: DataTypes.DECIMAL(14, 4), allowNull: false },
        units: { type: DataTypes.ENUM('mg/L as CaCO3', 'S.U.'), allowNull: false },
        significantFigures: DataTypes.TINYINT,
        decimals: DataTypes.TINYINT,
        reportingLimit: DataTypes.DECIMAL(14, 4),
        belowReportingLimit: { type: DataTypes.ENUM('zero', 'half', 'limit'), allowNull: false, defaultValue: 'zero' },
        effectiveFrom: { type: DataTypes.DATEONLY, allowNull: false },
        effectiveTo: DataTypes.DATEONLY,
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'permit_limits' },
    );
  }
}
