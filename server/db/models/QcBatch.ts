import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { QcEvaluation, QcInput, QcLimits } from '../../../shared/chemistry/bench.js';
import type { Titration } from './Titration.js';
import type { User } from './User.js';

/** A day's QC for one analysis: duplicates, check standards, blanks, and the titrations it covers. */
export class QcBatch extends Model<InferAttributes<QcBatch>, InferCreationAttributes<QcBatch>> {
  declare id: CreationOptional<number>;
  declare organizationId: number;
  declare batchDate: string;
  declare analysis: 'alkalinity' | 'acidity';
  declare analystId: number | null;
  declare duplicates: QcInput['duplicates'];
  declare checkStandards: QcInput['checkStandards'];
  declare blanks: QcInput['blanks'];
  declare evaluation: QcEvaluation;
  declare limits: QcLimits;
  declare passed: boolean;
  declare notes: string | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare analyst?: NonAttribute<User>;
  declare titrations?: NonAttribute<Titration[]>;

  static initModel(sequelize: Sequelize) {
    QcBatch.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        batchDate: { type: DataTypes.DATEONLY, allowNull: false },
        analysis: { type: DataTypes.ENUM('alkalinity', 'acidity'), allowNull: false },
        analystId: DataTypes.INTEGER,
        duplicates: { type: DataTypes.JSON, allowNull: false },
        checkStandards: { type: DataTypes.JSON, allowNull: false },
        blanks: { type: DataTypes.JSON, allowNull: false },
        evaluation: { type: DataTypes.JSON, allowNull: false },
        limits: { type: DataTypes.JSON, allowNull: false },
        passed: { type: DataTypes.BOOLEAN, allowNull: false },
        notes: DataTypes.STRING(1000),
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'qc_batches', version: true },
    );
  }
}
