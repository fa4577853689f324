import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Titrant } from './Titrant.js';
import type { User } from './User.js';

export interface StoredReplicate {
  standardVolumeMl?: number;
  standardGrams?: number;
  titrantVolumeMl: number;
  /** This replicate's normality (exact decimal). */
  normality: string;
}

/** One standardisation of a titrant lot against a primary standard; never edited (a new one replaces it). */
export class Standardization extends Model<InferAttributes<Standardization>, InferCreationAttributes<Standardization>> {
  declare id: CreationOptional<number>;
  declare titrantId: number;
  declare organizationId: number;
  declare primaryStandard: 'Na2CO3' | 'KHP';
  declare mode: 'solution' | 'mass';
  declare standardGramsPerL: string | null;
  declare replicates: StoredReplicate[];
  declare normality: string;
  declare rsdPercent: string;
  declare rsdLimitPercent: string;
  declare accepted: boolean;
  declare standardizedAt: Date;
  declare validUntil: Date;
  declare standardizedById: number | null;
  declare notes: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare titrant?: NonAttribute<Titrant>;
  declare standardizedBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    Standardization.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        titrantId: { type: DataTypes.INTEGER, allowNull: false },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        primaryStandard: { type: DataTypes.ENUM('Na2CO3', 'KHP'), allowNull: false },
        mode: { type: DataTypes.ENUM('solution', 'mass'), allowNull: false },
        standardGramsPerL: DataTypes.DECIMAL(12, 5),
        replicates: { type: DataTypes.JSON, allowNull: false },
        normality: { type: DataTypes.DECIMAL(14, 8), allowNull: false },
        rsdPercent: { type: DataTypes.DECIMAL(12, 6), allowNull: false },
        rsdLimitPercent: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
        accepted: { type: DataTypes.BOOLEAN, allowNull: false },
        standardizedAt: { type: DataTypes.DATE(3), allowNull: false },
        validUntil: { type: DataTypes.DATE(3), allowNull: false },
        standardizedById: DataTypes.INTEGER,
        notes: DataTypes.STRING(1000),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'standardizations' },
    );
  }
}
