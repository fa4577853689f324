import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Facility } from './Facility.js';

export type PointMatrix = 'raw' | 'finished' | 'influent' | 'effluent' | 'process' | 'digester';

export class MonitoringPoint extends Model<InferAttributes<MonitoringPoint>, InferCreationAttributes<MonitoringPoint>> {
  declare id: CreationOptional<number>;
  declare facilityId: number;
  declare code: string;
  declare name: string;
  declare matrix: PointMatrix;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare facility?: NonAttribute<Facility>;

  static initModel(sequelize: Sequelize) {
    MonitoringPoint.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        facilityId: { type: DataTypes.INTEGER, allowNull: false },
        code: { type: DataTypes.STRING(32), allowNull: false },
        name: { type: DataTypes.STRING(160), allowNull: false },
        matrix: { type: DataTypes.ENUM('raw', 'finished', 'influent', 'effluent', 'process', 'digester'), allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'monitoring_points' },
    );
  }
}
