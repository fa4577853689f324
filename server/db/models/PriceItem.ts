import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { BillingKind } from '../../../shared/billing/money.js';
import type { Organization } from './Organization.js';

/** One price of the lab's list (clientId null) or a client's override, from effectiveFrom to effectiveTo. */
export class PriceItem extends Model<InferAttributes<PriceItem>, InferCreationAttributes<PriceItem>> {
  declare id: CreationOptional<number>;
  declare labId: number;
  declare clientId: number | null;
  declare kind: BillingKind;
  declare description: string;
  declare unitAmountCents: number;
  declare currency: string;
  declare effectiveFrom: string;
  declare effectiveTo: string | null;
  declare active: CreationOptional<boolean>;
  declare createdById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare client?: NonAttribute<Organization | null>;

  static initModel(sequelize: Sequelize) {
    PriceItem.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        labId: { type: DataTypes.INTEGER, allowNull: false },
        clientId: DataTypes.INTEGER,
        kind: { type: DataTypes.ENUM('alkalinity', 'acidity', 'speciation', 'rush'), allowNull: false },
        description: { type: DataTypes.STRING(200), allowNull: false },
        unitAmountCents: { type: DataTypes.INTEGER, allowNull: false },
        currency: { type: DataTypes.CHAR(3), allowNull: false },
        effectiveFrom: { type: DataTypes.DATEONLY, allowNull: false },
        effectiveTo: DataTypes.DATEONLY,
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdById: DataTypes.INTEGER,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'price_items' },
    );
  }
}
