import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Facility } from './Facility.js';
import type { PermitLimit } from './PermitLimit.js';

export interface RegulatorContact {
  name: string;
  email: string;
}

export class Permit extends Model<InferAttributes<Permit>, InferCreationAttributes<Permit>> {
  declare id: CreationOptional<number>;
  declare organizationId: number;
  declare facilityId: number;
  declare number: string;
  declare issuingAuthority: string;
  declare effectiveFrom: string;
  declare expiresOn: string | null;
  declare regulatorContacts: RegulatorContact[];
  declare followUpText: string | null;
  declare followUpDeadlineValue: number | null;
  declare followUpDeadlineUnit: 'hours' | 'days' | null;
  declare certificationWording: string | null;
  declare roundingMode: CreationOptional<'half_up' | 'half_even'>;
  declare weekStartsOn: CreationOptional<number>;
  declare weekMonthRule: CreationOptional<'week_end_month' | 'split'>;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare facility?: NonAttribute<Facility>;
  declare limits?: NonAttribute<PermitLimit[]>;

  static initModel(sequelize: Sequelize) {
    Permit.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        facilityId: { type: DataTypes.INTEGER, allowNull: false },
        number: { type: DataTypes.STRING(60), allowNull: false },
        issuingAuthority: { type: DataTypes.STRING(200), allowNull: false },
        effectiveFrom: { type: DataTypes.DATEONLY, allowNull: false },
        expiresOn: DataTypes.DATEONLY,
        regulatorContacts: { type: DataTypes.JSON, allowNull: false },
        followUpText: DataTypes.TEXT,
        followUpDeadlineValue: DataTypes.INTEGER,
        followUpDeadlineUnit: DataTypes.ENUM('hours', 'days'),
        certificationWording: DataTypes.TEXT,
        roundingMode: { type: DataTypes.ENUM('half_up', 'half_even'), allowNull: false, defaultValue: 'half_up' },
        weekStartsOn: { type: DataTypes.TINYINT, allowNull: false, defaultValue: 0 },
        weekMonthRule: { type: DataTypes.ENUM('week_end_month', 'split'), allowNull: false, defaultValue: 'week_end_month' },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'permits' },
    );
  }
}
