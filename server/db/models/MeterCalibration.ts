import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { User } from './User.js';

/** One pH meter calibration; a wrong one is followed by a new one, not edited. */
export class MeterCalibration extends Model<InferAttributes<MeterCalibration>, InferCreationAttributes<MeterCalibration>> {
  declare id: CreationOptional<number>;
  /** The organisation whose bench the meter is on (the lab or a utility's plant). */
  declare organizationId: number;
  declare meterId: string;
  declare meterName: string | null;
  declare calibratedAt: Date;
  declare temperatureC: string;
  declare buffers: Array<{ nominalPh: number; mV: number }>;
  declare slopeMvPerPh: string;
  declare percentSlope: string;
  declare offsetMv: string;
  declare slopeMinPercent: string;
  declare slopeMaxPercent: string;
  declare checks: Array<{ nominalPh: number; mV: number; readPh: number; errorPh: number; passed: boolean }>;
  declare passed: boolean;
  declare warnings: Array<{ code: string; message: string; field?: string }>;
  declare calibratedById: number | null;
  declare notes: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare calibratedBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    MeterCalibration.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        meterId: { type: DataTypes.STRING(60), allowNull: false },
        meterName: DataTypes.STRING(120),
        calibratedAt: { type: DataTypes.DATE(3), allowNull: false },
        temperatureC: { type: DataTypes.DECIMAL(5, 2), allowNull: false },
        buffers: { type: DataTypes.JSON, allowNull: false },
        slopeMvPerPh: { type: DataTypes.DECIMAL(10, 4), allowNull: false },
        percentSlope: { type: DataTypes.DECIMAL(10, 4), allowNull: false },
        offsetMv: { type: DataTypes.DECIMAL(10, 4), allowNull: false },
        slopeMinPercent: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
        slopeMaxPercent: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
        checks: { type: DataTypes.JSON, allowNull: false },
        passed: { type: DataTypes.BOOLEAN, allowNull: false },
        warnings: { type: DataTypes.JSON, allowNull: false },
        calibratedById: DataTypes.INTEGER,
        notes: DataTypes.STRING(1000),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'meter_calibrations' },
    );
  }
}
