import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class Organization extends Model<InferAttributes<Organization>, InferCreationAttributes<Organization>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare kind: 'laboratory' | 'utility';
  /** For a utility: the laboratory that serves it. */
  declare labId: number | null;
  declare contactEmail: CreationOptional<string | null>;
  declare billingEmail: CreationOptional<string | null>;
  declare address: CreationOptional<string | null>;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Organization.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        name: { type: DataTypes.STRING(160), allowNull: false },
        kind: { type: DataTypes.ENUM('laboratory', 'utility'), allowNull: false },
        labId: { type: DataTypes.INTEGER, allowNull: true },
        contactEmail: DataTypes.STRING(254),
        billingEmail: DataTypes.STRING(254),
        address: DataTypes.STRING(400),
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'organizations' },
    );
  }
}
