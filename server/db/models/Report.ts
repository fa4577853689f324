import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Facility } from './Facility.js';
import type { User } from './User.js';

export type ReportStatus = 'draft' | 'certified' | 'revised';

/** One version of a facility's monthly report; certified versions are never updated except to mark them revised. */
export class Report extends Model<InferAttributes<Report>, InferCreationAttributes<Report>> {
  declare id: CreationOptional<number>;
  declare organizationId: number;
  declare facilityId: number;
  declare month: string;
  declare revision: CreationOptional<number>;
  declare status: CreationOptional<ReportStatus>;
  declare previousId: CreationOptional<number | null>;
  declare revisionReason: CreationOptional<string | null>;
  declare changes: CreationOptional<unknown[] | null>;
  declare content: CreationOptional<Record<string, any> | null>;
  declare certifiedById: CreationOptional<number | null>;
  declare certifiedAt: CreationOptional<Date | null>;
  declare certifiedIp: CreationOptional<string | null>;
  declare certificationWording: CreationOptional<string | null>;
  declare statement: CreationOptional<string | null>;
  declare pdf: CreationOptional<Buffer | null>;
  declare pdfSha256: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare facility?: NonAttribute<Facility>;
  declare certifiedBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    Report.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        facilityId: { type: DataTypes.INTEGER, allowNull: false },
        month: { type: DataTypes.STRING(7), allowNull: false },
        revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        status: { type: DataTypes.ENUM('draft', 'certified', 'revised'), allowNull: false, defaultValue: 'draft' },
        previousId: DataTypes.INTEGER,
        revisionReason: DataTypes.STRING(1000),
        changes: DataTypes.JSON,
        content: DataTypes.JSON,
        certifiedById: DataTypes.INTEGER,
        certifiedAt: DataTypes.DATE,
        certifiedIp: DataTypes.STRING(64),
        certificationWording: DataTypes.TEXT,
        statement: DataTypes.TEXT,
        pdf: DataTypes.BLOB('long'),
        pdfSha256: DataTypes.STRING(64),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'reports' },
    );
  }
}
