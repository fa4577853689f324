import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** The payment provider's customer of one client organisation, created once on its first payment. */
export class BillingAccount extends Model<InferAttributes<BillingAccount>, InferCreationAttributes<BillingAccount>> {
  declare id: CreationOptional<number>;
  declare organizationId: number;
  declare providerCustomerId: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    BillingAccount.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        providerCustomerId: { type: DataTypes.STRING(100), allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'billing_accounts' },
    );
  }
}
