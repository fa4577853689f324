import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { SampleStatus } from '../../../shared/schemas/bench.js';
import type { Facility } from './Facility.js';
import type { MonitoringPoint } from './MonitoringPoint.js';
import type { Titration } from './Titration.js';
import type { User } from './User.js';

/** A grab or composite sample from a monitoring point. */
export class Sample extends Model<InferAttributes<Sample>, InferCreationAttributes<Sample>> {
  declare id: CreationOptional<number>;
  /** The point's utility, kept here so every query scopes on one column. */
  declare organizationId: number;
  declare facilityId: number;
  declare pointId: number;
  declare sampleType: 'grab' | 'composite';
  declare compositeStartAt: Date | null;
  declare compositeEndAt: Date | null;
  declare collectedAt: Date;
  declare collectedBy: string | null;
  declare receivedAt: Date | null;
  declare receiptTemperatureC: string | null;
  declare preservation: string | null;
  declare filtered: CreationOptional<boolean>;
  declare notes: string | null;
  /** Summary of its current titrations, kept by the titration workflow. */
  declare status: CreationOptional<SampleStatus>;
  declare createdById: number | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare point?: NonAttribute<MonitoringPoint>;
  declare facility?: NonAttribute<Facility>;
  declare titrations?: NonAttribute<Titration[]>;
  declare createdBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    Sample.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        facilityId: { type: DataTypes.INTEGER, allowNull: false },
        pointId: { type: DataTypes.INTEGER, allowNull: false },
        sampleType: { type: DataTypes.ENUM('grab', 'composite'), allowNull: false },
        compositeStartAt: DataTypes.DATE(3),
        compositeEndAt: DataTypes.DATE(3),
        collectedAt: { type: DataTypes.DATE(3), allowNull: false },
        collectedBy: DataTypes.STRING(120),
        receivedAt: DataTypes.DATE(3),
        receiptTemperatureC: DataTypes.DECIMAL(5, 1),
        preservation: DataTypes.STRING(200),
        filtered: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        notes: DataTypes.STRING(2000),
        status: { type: DataTypes.ENUM('received', 'in_progress', 'submitted', 'approved'), allowNull: false, defaultValue: 'received' },
        createdById: DataTypes.INTEGER,
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'samples', version: true },
    );
  }
}
