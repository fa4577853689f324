import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrate.js';

const stamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};
const ref = (model: string, allowNull = false) => ({ type: DataTypes.INTEGER, allowNull, references: { model, key: 'id' } });
/** Recorded figures: DECIMAL so they come back as exact strings (bigNumberStrings). */
const dec = (precision: number, scale: number, allowNull = true) => ({ type: DataTypes.DECIMAL(precision, scale), allowNull });
const result = () => dec(18, 8);

/**
 * The Bench: titrant lots and their standardisations, pH meter calibrations, samples,
 * QC batches, titrations (inputs, recomputed results, workflow and amendment chain) and the
 * readings of recorded curves.
 */
export const up: MigrationFn = async ({ context: q }) => {
  await q.createTable('titrants', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: ref('organizations'),
    kind: { type: DataTypes.ENUM('acid', 'base'), allowNull: false },
    reagent: { type: DataTypes.ENUM('H2SO4', 'HCl', 'NaOH'), allowNull: false },
    nominal_normality: dec(14, 8, false),
    lot: { type: DataTypes.STRING(60), allowNull: false },
    prepared_on: { type: DataTypes.DATEONLY, allowNull: true },
    expires_on: { type: DataTypes.DATEONLY, allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    notes: { type: DataTypes.STRING(1000), allowNull: true },
    created_by_id: ref('users', true),
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...stamps,
  });
  await q.addIndex('titrants', ['organization_id', 'lot'], { unique: true });

  await q.createTable('standardizations', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    titrant_id: ref('titrants'),
    organization_id: ref('organizations'),
    primary_standard: { type: DataTypes.ENUM('Na2CO3', 'KHP'), allowNull: false },
    mode: { type: DataTypes.ENUM('solution', 'mass'), allowNull: false },
    standard_grams_per_l: dec(12, 5),
    replicates: { type: DataTypes.JSON, allowNull: false },
    normality: dec(14, 8, false),
    rsd_percent: dec(12, 6, false),
    rsd_limit_percent: dec(8, 3, false),
    accepted: { type: DataTypes.BOOLEAN, allowNull: false },
    standardized_at: { type: DataTypes.DATE(3), allowNull: false },
    valid_until: { type: DataTypes.DATE(3), allowNull: false },
    standardized_by_id: ref('users', true),
    notes: { type: DataTypes.STRING(1000), allowNull: true },
    ...stamps,
  });
  await q.addIndex('standardizations', ['titrant_id', 'standardized_at']);

  await q.createTable('meter_calibrations', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: ref('organizations'),
    meter_id: { type: DataTypes.STRING(60), allowNull: false },
    meter_name: { type: DataTypes.STRING(120), allowNull: true },
    calibrated_at: { type: DataTypes.DATE(3), allowNull: false },
    temperature_c: dec(5, 2, false),
    buffers: { type: DataTypes.JSON, allowNull: false },
    slope_mv_per_ph: dec(10, 4, false),
    percent_slope: dec(10, 4, false),
    offset_mv: dec(10, 4, false),
    slope_min_percent: dec(8, 3, false),
    slope_max_percent: dec(8, 3, false),
    checks: { type: DataTypes.JSON, allowNull: false },
    passed: { type: DataTypes.BOOLEAN, allowNull: false },
    warnings: { type: DataTypes.JSON, allowNull: false },
    calibrated_by_id: ref('users', true),
    notes: { type: DataTypes.STRING(1000), allowNull: true },
    ...stamps,
  });
  await q.addIndex('meter_calibrations', ['organization_id', 'calibrated_at']);
  await q.addIndex('meter_calibrations', ['organization_id', 'meter_id', 'calibrated_at']);

  await q.createTable('samples', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: ref('organizations'),
    facility_id: ref('facilities'),
    point_id: ref('monitoring_points'),
    sample_type: { type: DataTypes.ENUM('grab', 'composite'), allowNull: false },
    composite_start_at: { type: DataTypes.DATE(3), allowNull: true },
    composite_end_at: { type: DataTypes.DATE(3), allowNull: true },
    collected_at: { type: DataTypes.DATE(3), allowNull: false },
    collected_by: { type: DataTypes.STRING(120), allowNull: true },
    received_at: { type: DataTypes.DATE(3), allowNull: true },
    receipt_temperature_c: dec(5, 1),
    preservation: { type: DataTypes.STRING(200), allowNull: true },
    filtered: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    notes: { type: DataTypes.STRING(2000), allowNull: true },
    status: { type: DataTypes.ENUM('received', 'in_progress', 'submitted', 'approved'), allowNull: false, defaultValue: 'received' },
    created_by_id: ref('users', true),
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...stamps,
  });
  await q.addIndex('samples', ['organization_id', 'collected_at']);
  await q.addIndex('samples', ['facility_id', 'collected_at']);
  await q.addIndex('samples', ['point_id', 'collected_at']);
  await q.addIndex('samples', ['status', 'collected_at']);
  // The lab's list spans all its clients: newest first straight off this index.
  await q.addIndex('samples', ['collected_at']);

  await q.createTable('qc_batches', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organization_id: ref('organizations'),
    batch_date: { type: DataTypes.DATEONLY, allowNull: false },
    analysis: { type: DataTypes.ENUM('alkalinity', 'acidity'), allowNull: false },
    analyst_id: ref('users', true),
    duplicates: { type: DataTypes.JSON, allowNull: false },
    check_standards: { type: DataTypes.JSON, allowNull: false },
    blanks: { type: DataTypes.JSON, allowNull: false },
    evaluation: { type: DataTypes.JSON, allowNull: false },
    limits: { type: DataTypes.JSON, allowNull: false },
    passed: { type: DataTypes.BOOLEAN, allowNull: false },
    notes: { type: DataTypes.STRING(1000), allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...stamps,
  });
  await q.addIndex('qc_batches', ['organization_id', 'batch_date']);

  await q.createTable('titrations', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    sample_id: ref('samples'),
    organization_id: ref('organizations'),
    point_id: ref('monitoring_points'),
    analysis: { type: DataTypes.ENUM('alkalinity', 'acidity'), allowNull: false },
    method: { type: DataTypes.ENUM('color_indicator', 'potentiometric_fixed', 'potentiometric_curve', 'low_alkalinity_two_point'), allowNull: false },
    endpoint_method: { type: DataTypes.ENUM('fixed', 'inflection', 'gran'), allowNull: true },
    // inputs
    sample_volume_ml: dec(10, 3, false),
    titrant_id: ref('titrants'),
    standardization_id: ref('standardizations', true),
    normality_used: dec(14, 8, false),
    normality_source: { type: DataTypes.ENUM('standardization', 'nominal'), allowNull: false },
    caco3_factor_used: { type: DataTypes.INTEGER, allowNull: false },
    total_endpoint_ph: dec(6, 3),
    volume_to_ph83_ml: dec(12, 5),
    volume_to_total_endpoint_ml: dec(12, 5),
    volume_to_ph37_ml: dec(12, 5),
    low_alkalinity: { type: DataTypes.JSON, allowNull: true },
    peroxide_treatment: { type: DataTypes.JSON, allowNull: true },
    reading_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    temperature_c: dec(5, 2),
    initial_ph: dec(6, 3),
    tds_mg_l: dec(12, 3),
    specific_conductance_us_cm: dec(12, 3),
    burette_resolution_ml: dec(8, 5),
    volatile_acids_mg_l: dec(12, 3),
    meter_id: { type: DataTypes.STRING(60), allowNull: true },
    performed_by_org_id: ref('organizations'),
    analyst_id: ref('users', true),
    analysed_at: { type: DataTypes.DATE(3), allowNull: false },
    notes: { type: DataTypes.STRING(2000), allowNull: true },
    // results, recomputed by the shared engine on every change
    computed: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    phenolphthalein_alkalinity: result(),
    total_alkalinity: result(),
    total_alkalinity_meq_l: result(),
    hydroxide: result(),
    carbonate: result(),
    bicarbonate: result(),
    mineral_acidity: result(),
    total_acidity: result(),
    endpoint_p_volume_ml: result(),
    endpoint_t_volume_ml: result(),
    result: { type: DataTypes.JSON, allowNull: true },
    missing_inputs: { type: DataTypes.JSON, allowNull: false },
    warnings: { type: DataTypes.JSON, allowNull: false },
    qualifiers: { type: DataTypes.JSON, allowNull: false },
    qualified: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    // workflow
    status: { type: DataTypes.ENUM('draft', 'submitted', 'approved', 'returned', 'superseded'), allowNull: false, defaultValue: 'draft' },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    amends_id: ref('titrations', true),
    superseded_by_id: ref('titrations', true),
    amend_reason: { type: DataTypes.STRING(1000), allowNull: true },
    return_comment: { type: DataTypes.STRING(1000), allowNull: true },
    qc_batch_id: ref('qc_batches', true),
    submitted_at: { type: DataTypes.DATE(3), allowNull: true },
    submitted_by_id: ref('users', true),
    approved_at: { type: DataTypes.DATE(3), allowNull: true },
    approved_by_id: ref('users', true),
    returned_at: { type: DataTypes.DATE(3), allowNull: true },
    returned_by_id: ref('users', true),
    created_by_id: ref('users', true),
    ...stamps,
  });
  await q.addIndex('titrations', ['sample_id']);
  await q.addIndex('titrations', ['organization_id', 'status', 'analysed_at']);
  // The review's history: a point's last approved values of one parameter.
  await q.addIndex('titrations', ['point_id', 'analysis', 'status', 'analysed_at']);
  await q.addIndex('titrations', ['qc_batch_id']);
  await q.addIndex('titrations', ['amends_id']);

  await q.createTable('titration_readings', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    titration_id: ref('titrations'),
    seq: { type: DataTypes.INTEGER, allowNull: false },
    volume_ml: dec(12, 5, false),
    ph: dec(6, 3, false),
    temperature_c: dec(5, 2),
  });
  await q.addIndex('titration_readings', ['titration_id', 'seq'], { unique: true });
};

export const down: MigrationFn = async ({ context: q }) => {
  for (const t of ['titration_readings', 'titrations', 'qc_batches', 'samples', 'meter_calibrations', 'standardizations', 'titrants']) await q.dropTable(t);
};
