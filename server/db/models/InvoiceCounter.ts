import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** The last invoice number a lab issued in a year; locked while the next one is taken. */
export class InvoiceCounter extends Model<InferAttributes<InvoiceCounter>, InferCreationAttributes<InvoiceCounter>> {
  declare id: CreationOptional<number>;
  declare labId: number;
  declare year: number;
  declare lastNumber: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    InvoiceCounter.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        labId: { type: DataTypes.INTEGER, allowNull: false },
        year: { type: DataTypes.INTEGER, allowNull: false },
        lastNumber: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'invoice_counters' },
    );
  }
}
