import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** One point of a recorded curve; its own table so uploads of thousands of rows stay cheap. */
export class TitrationReading extends Model<InferAttributes<TitrationReading>, InferCreationAttributes<TitrationReading>> {
  declare id: CreationOptional<string>;
  declare titrationId: number;
  declare seq: number;
  declare volumeMl: string;
  declare ph: string;
  declare temperatureC: string | null;

  static initModel(sequelize: Sequelize) {
    TitrationReading.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        titrationId: { type: DataTypes.INTEGER, allowNull: false },
        seq: { type: DataTypes.INTEGER, allowNull: false },
        volumeMl: { type: DataTypes.DECIMAL(12, 5), allowNull: false },
        ph: { type: DataTypes.DECIMAL(6, 3), allowNull: false },
        temperatureC: DataTypes.DECIMAL(5, 2),
      },
      { sequelize, tableName: 'titration_readings', timestamps: false },
    );
  }
}
