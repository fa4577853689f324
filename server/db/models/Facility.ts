import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Organization } from './Organization.js';

export type FacilityKind = 'drinking_water' | 'wastewater' | 'industrial';

export class Facility extends Model<InferAttributes<Facility>, InferCreationAttributes<Facility>> {
  declare id: CreationOptional<number>;
  declare organizationId: number;
  declare name: string;
  declare kind: FacilityKind;
  declare address: CreationOptional<string | null>;
  /** IANA zone; decides which calendar day a sample belongs to. */
  declare timezone: string;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare organization?: NonAttribute<Organization>;

  static initModel(sequelize: Sequelize) {
    Facility.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(160), allowNull: false },
        kind: { type: DataTypes.ENUM('drinking_water', 'wastewater', 'industrial'), allowNull: false },
        address: DataTypes.STRING(400),
        timezone: { type: DataTypes.STRING(64), allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'facilities' },
    );
  }
}
