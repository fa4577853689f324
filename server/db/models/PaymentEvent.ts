import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A payment-provider event already applied, by its id: a replay or a duplicate changes nothing. */
export class PaymentEvent extends Model<InferAttributes<PaymentEvent>, InferCreationAttributes<PaymentEvent>> {
  declare id: CreationOptional<number>;
  declare eventId: string;
  declare type: string;
  declare invoiceId: number | null;
  declare outcome: string;
  declare providerCreatedAt: Date | null;
  declare summary: object | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    PaymentEvent.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        eventId: { type: DataTypes.STRING(100), allowNull: false },
        type: { type: DataTypes.STRING(80), allowNull: false },
        invoiceId: DataTypes.INTEGER,
        outcome: { type: DataTypes.STRING(60), allowNull: false },
        providerCreatedAt: DataTypes.DATE(3),
        summary: DataTypes.JSON,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'payment_events' },
    );
  }
}
