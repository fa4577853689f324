import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class ProjectionAlert extends Model<InferAttributes<ProjectionAlert>, InferCreationAttributes<ProjectionAlert>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare facilityId: number;
  declare organizationId: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ProjectionAlert.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        facilityId: { type: DataTypes.INTEGER, allowNull: false },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'projection_alerts' },
    );
  }
}
