import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export type ReportBatchStatus = 'running' | 'paused' | 'finished';
/** One facility-month of a batch: pending until the job has made (or found) its report. */
export interface ReportBatchItem {
  facilityId: number;
  month: string;
  state: 'pending' | 'made' | 'existing' | 'failed';
  reportId: number | null;
  error: string | null;
}

/** Background generation of a year of draft reports; progress survives restarts. */
export class ReportBatch extends Model<InferAttributes<ReportBatch>, InferCreationAttributes<ReportBatch>> {
  declare id: CreationOptional<number>;
  declare organizationId: number;
  declare createdById: number;
  declare year: number;
  declare status: CreationOptional<ReportBatchStatus>;
  declare items: ReportBatchItem[];
  declare total: number;
  declare done: CreationOptional<number>;
  declare failed: CreationOptional<number>;
  declare finishedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ReportBatch.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        createdById: { type: DataTypes.INTEGER, allowNull: false },
        year: { type: DataTypes.INTEGER, allowNull: false },
        status: { type: DataTypes.ENUM('running', 'paused', 'finished'), allowNull: false, defaultValue: 'running' },
        items: { type: DataTypes.JSON, allowNull: false },
        total: { type: DataTypes.INTEGER, allowNull: false },
        done: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        failed: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        finishedAt: DataTypes.DATE,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'report_batches' },
    );
  }
}
