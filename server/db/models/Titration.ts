import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Analysis, TitrationMethod, TitrationStatus } from '../../../shared/schemas/bench.js';
import type { BenchWarning, Qualifier } from '../../../shared/types/bench.js';
import type { Sample } from './Sample.js';
import type { Titrant } from './Titrant.js';
import type { User } from './User.js';

/**
 * One titration of a sample: its inputs, the result the shared engine computed from them, its
 * qualifiers and warnings, and its place in the workflow and amendment chain. DECIMAL fields
 * are exact strings.
 */
export class Titration extends Model<InferAttributes<Titration>, InferCreationAttributes<Titration>> {
  declare id: CreationOptional<number>;
  declare sampleId: number;
  declare organizationId: number;
  declare pointId: number;
  declare analysis: Analysis;
  declare method: TitrationMethod;
  declare endpointMethod: 'fixed' | 'inflection' | 'gran' | null;
  declare sampleVolumeMl: string;
  declare titrantId: number;
  declare standardizationId: number | null;
  declare normalityUsed: string;
  declare normalitySource: 'standardization' | 'nominal';
  declare caco3FactorUsed: number;
  declare totalEndpointPh: string | null;
  declare volumeToPh83Ml: string | null;
  declare volumeToTotalEndpointMl: string | null;
  declare volumeToPh37Ml: string | null;
  declare lowAlkalinity: { firstEndpointPh: number; volumeToFirstEndpointMl: number; volumeToSecondEndpointMl: number; secondEndpointPh?: number | null } | null;
  declare peroxideTreatment: { acidVolumeMl: number; acidNormality: number } | null;
  declare readingCount: CreationOptional<number>;
  declare temperatureC: string | null;
  declare initialPh: string | null;
  declare tdsMgL: string | null;
  declare specificConductanceUsCm: string | null;
  declare buretteResolutionMl: string | null;
  declare volatileAcidsMgL: string | null;
  declare meterId: string | null;
  /** The organisation whose bench ran it: whose meter calibrations count. */
  declare performedByOrgId: number;
  declare analystId: number | null;
  declare analysedAt: Date;
  declare notes: string | null;
  declare computed: CreationOptional<boolean>;
  declare phenolphthaleinAlkalinity: string | null;
  declare totalAlkalinity: string | null;
  declare totalAlkalinityMeqL: string | null;
  declare hydroxide: string | null;
  declare carbonate: string | null;
  declare bicarbonate: string | null;
  declare mineralAcidity: string | null;
  declare totalAcidity: string | null;
  declare endpointPVolumeMl: string | null;
  declare endpointTVolumeMl: string | null;
  /** The engine's output (without the per-reading derivative, which is recomputed on read). */
  declare result: object | null;
  declare missingInputs: string[];
  declare warnings: BenchWarning[];
  declare qualifiers: Qualifier[];
  declare qualified: CreationOptional<boolean>;
  declare status: CreationOptional<TitrationStatus>;
  declare version: CreationOptional<number>;
  declare revision: CreationOptional<number>;
  declare amendsId: number | null;
  declare supersededById: CreationOptional<number | null>;
  declare amendReason: string | null;
  declare returnComment: CreationOptional<string | null>;
  declare qcBatchId: CreationOptional<number | null>;
  declare submittedAt: CreationOptional<Date | null>;
  declare submittedById: CreationOptional<number | null>;
  declare approvedAt: CreationOptional<Date | null>;
  declare approvedById: CreationOptional<number | null>;
  declare returnedAt: CreationOptional<Date | null>;
  declare returnedById: CreationOptional<number | null>;
  declare createdById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare sample?: NonAttribute<Sample>;
  declare titrant?: NonAttribute<Titrant>;
  declare analyst?: NonAttribute<User>;
  declare submittedBy?: NonAttribute<User>;
  declare approvedBy?: NonAttribute<User>;
  declare returnedBy?: NonAttribute<User>;
  declare createdBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    const dec = (p: number, s: number) => DataTypes.DECIMAL(p, s);
    Titration.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        sampleId: { type: DataTypes.INTEGER, allowNull: false },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        pointId: { type: DataTypes.INTEGER, allowNull: false },
        analysis: { type: DataTypes.ENUM('alkalinity', 'acidity'), allowNull: false },
        method: { type: DataTypes.ENUM('color_indicator', 'potentiometric_fixed', 'potentiometric_curve', 'low_alkalinity_two_point'), allowNull: false },
        endpointMethod: DataTypes.ENUM('fixed', 'inflection', 'gran'),
        sampleVolumeMl: { type: dec(10, 3), allowNull: false },
        titrantId: { type: DataTypes.INTEGER, allowNull: false },
        standardizationId: DataTypes.INTEGER,
        normalityUsed: { type: dec(14, 8), allowNull: false },
        normalitySource: { type: DataTypes.ENUM('standardization', 'nominal'), allowNull: false },
        caco3FactorUsed: { type: DataTypes.INTEGER, allowNull: false },
        totalEndpointPh: dec(6, 3),
        volumeToPh83Ml: dec(12, 5),
        volumeToTotalEndpointMl: dec(12, 5),
        volumeToPh37Ml: dec(12, 5),
        lowAlkalinity: DataTypes.JSON,
        peroxideTreatment: DataTypes.JSON,
        readingCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        temperatureC: dec(5, 2),
        initialPh: dec(6, 3),
        tdsMgL: { type: dec(12, 3), field: 'tds_mg_l' },
        specificConductanceUsCm: { type: dec(12, 3), field: 'specific_conductance_us_cm' },
        buretteResolutionMl: dec(8, 5),
        volatileAcidsMgL: { type: dec(12, 3), field: 'volatile_acids_mg_l' },
        meterId: DataTypes.STRING(60),
        performedByOrgId: { type: DataTypes.INTEGER, allowNull: false },
        analystId: DataTypes.INTEGER,
        analysedAt: { type: DataTypes.DATE(3), allowNull: false },
        notes: DataTypes.STRING(2000),
        computed: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        phenolphthaleinAlkalinity: dec(18, 8),
        totalAlkalinity: dec(18, 8),
        totalAlkalinityMeqL: { type: dec(18, 8), field: 'total_alkalinity_meq_l' },
        hydroxide: dec(18, 8),
        carbonate: dec(18, 8),
        bicarbonate: dec(18, 8),
        mineralAcidity: dec(18, 8),
        totalAcidity: dec(18, 8),
        endpointPVolumeMl: { type: dec(18, 8), field: 'endpoint_p_volume_ml' },
        endpointTVolumeMl: { type: dec(18, 8), field: 'endpoint_t_volume_ml' },
        result: DataTypes.JSON,
        missingInputs: { type: DataTypes.JSON, allowNull: false },
        warnings: { type: DataTypes.JSON, allowNull: false },
        qualifiers: { type: DataTypes.JSON, allowNull: false },
        qualified: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        status: { type: DataTypes.ENUM('draft', 'submitted', 'approved', 'returned', 'superseded'), allowNull: false, defaultValue: 'draft' },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        amendsId: DataTypes.INTEGER,
        supersededById: DataTypes.INTEGER,
        amendReason: DataTypes.STRING(1000),
        returnComment: DataTypes.STRING(1000),
        qcBatchId: DataTypes.INTEGER,
        submittedAt: DataTypes.DATE(3),
        submittedById: DataTypes.INTEGER,
        approvedAt: DataTypes.DATE(3),
        approvedById: DataTypes.INTEGER,
        returnedAt: DataTypes.DATE(3),
        returnedById: DataTypes.INTEGER,
        createdById: DataTypes.INTEGER,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'titrations', version: true },
    );
  }
}
