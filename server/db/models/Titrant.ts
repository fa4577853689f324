import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Standardization } from './Standardization.js';

export type TitrantKind = 'acid' | 'base';
export type Reagent = 'H2SO4' | 'HCl' | 'NaOH';

/** A lot of standard acid or base; its normality comes from its standardisations. */
export class Titrant extends Model<InferAttributes<Titrant>, InferCreationAttributes<Titrant>> {
  declare id: CreationOptional<number>;
  declare organizationId: number;
  declare kind: TitrantKind;
  declare reagent: Reagent;
  /** DECIMAL: an exact string. */
  declare nominalNormality: string;
  declare lot: string;
  declare preparedOn: CreationOptional<string | null>;
  declare expiresOn: string;
  declare active: CreationOptional<boolean>;
  declare notes: CreationOptional<string | null>;
  declare createdById: number | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare standardizations?: NonAttribute<Standardization[]>;

  static initModel(sequelize: Sequelize) {
    Titrant.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.ENUM('acid', 'base'), allowNull: false },
        reagent: { type: DataTypes.ENUM('H2SO4', 'HCl', 'NaOH'), allowNull: false },
        nominalNormality: { type: DataTypes.DECIMAL(14, 8), allowNull: false },
        lot: { type: DataTypes.STRING(60), allowNull: false },
        preparedOn: DataTypes.DATEONLY,
        expiresOn: { type: DataTypes.DATEONLY, allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        notes: DataTypes.STRING(1000),
        createdById: DataTypes.INTEGER,
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'titrants', version: true },
    );
  }
}
