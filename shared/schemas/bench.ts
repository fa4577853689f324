import Decimal from 'decimal.js';
import { z } from 'zod';
import { BENCH_READINGS_LIMIT } from '../chemistry/bench';
import { id, optionalText, text } from './common.js';

/**
 * Request bodies of the Bench (samples, titrations, titrant lots, standardisations, meter
 * calibrations, QC batches, review). Objects are strict so a misspelt field is named, not
 * dropped. Numbers carry at most the decimals the record stores, so a result recomputed from
 * the stored inputs is the result that was shown.
 */

export const SAMPLE_TYPES = ['grab', 'composite'] as const;
export const ANALYSES = ['alkalinity', 'acidity'] as const;
export const TITRATION_METHODS = ['color_indicator', 'potentiometric_fixed', 'potentiometric_curve', 'low_alkalinity_two_point'] as const;
export const TITRATION_METHOD_LABELS: Record<(typeof TITRATION_METHODS)[number], string> = {
  color_indicator: 'Colour indicator',
  potentiometric_fixed: 'pH meter, fixed endpoint',
  potentiometric_curve: 'pH meter, recorded curve',
  low_alkalinity_two_point: 'Low alkalinity, two-point (SM 2320 B ¶4d)',
};
/** Methods read with a pH meter, which need a passing calibration that day. */
export const POTENTIOMETRIC_METHODS: ReadonlyArray<(typeof TITRATION_METHODS)[number]> = ['potentiometric_fixed', 'potentiometric_curve', 'low_alkalinity_two_point'];
export const TITRATION_STATUSES = ['draft', 'submitted', 'approved', 'returned', 'superseded'] as const;
export const SAMPLE_STATUSES = ['received', 'in_progress', 'submitted', 'approved'] as const;
export const TITRANT_KINDS = ['acid', 'base'] as const;
export const REAGENTS = ['H2SO4', 'HCl', 'NaOH'] as const;
export const REAGENT_KIND: Record<(typeof REAGENTS)[number], (typeof TITRANT_KINDS)[number]> = { H2SO4: 'acid', HCl: 'acid', NaOH: 'base' };
export const PRIMARY_STANDARDS = ['Na2CO3', 'KHP'] as const;
/** Na2CO3 standardises acid [SM 2320 B ¶3]; KHP standardises NaOH [SM 2310 B ¶3]. */
export const PRIMARY_STANDARD_KIND: Record<(typeof PRIMARY_STANDARDS)[number], (typeof TITRANT_KINDS)[number]> = { Na2CO3: 'acid', KHP: 'base' };

export type Analysis = (typeof ANALYSES)[number];
export type TitrationMethod = (typeof TITRATION_METHODS)[number];
export type TitrationStatus = (typeof TITRATION_STATUSES)[number];
export type SampleStatus = (typeof SAMPLE_STATUSES)[number];

const oneOf = (values: readonly string[]) => ({ error: `one of ${values.join(', ')}` });

function num() {
  return z.number({ error: (issue) => (issue.input === undefined ? 'required' : 'must be a number') });
}
/** A number with at most `places` decimals (the column's scale). */
function scaled(places: number, min: number, max: number, unit: string, opts: { exclusiveMin?: boolean } = {}) {
  const base = opts.exclusiveMin ? num().gt(min, { error: `must be greater than ${min}` }) : num().gte(min, { error: `must be ${min} or more` });
  return base
    .lte(max, { error: `must be at most ${max} ${unit}`.trim() })
    .refine((v) => !Number.isFinite(v) || new Decimal(v).decimalPlaces() <= places, { error: `at most ${places} decimal places` });
}

const volumeMl = () => scaled(5, 0, 1000, 'mL');
const positiveVolumeMl = () => scaled(5, 0, 1000, 'mL', { exclusiveMin: true });
const ph = () =>
  num()
    .gte(0, { error: 'must be between 0 and 14' })
    .lte(14, { error: 'must be between 0 and 14' })
    .refine((v) => !Number.isFinite(v) || new Decimal(v).decimalPlaces() <= 3, { error: 'at most 3 decimal places' });
const temperatureC = () => scaled(2, 0, 90, '°C');
const normality = () => scaled(8, 0, 10, 'N', { exclusiveMin: true });
export const versionField = z.number({ error: (issue) => (issue.input === undefined ? 'required: send the version you read' : 'must be a whole number') }).int('must be a whole number').min(0);

/** An instant with Z or an offset; "2026-03-01T08:00" alone would be read in the host's zone. */
export const instant = () =>
  z.iso.datetime({ offset: true, error: (issue) => (issue.input === undefined ? 'required' : 'an ISO 8601 date-time with Z or an offset') });
export const isoDate = () => z.iso.date({ error: (issue) => (issue.input === undefined ? 'required' : 'a date written YYYY-MM-DD') });

// ---- samples -------------------------------------------------------------------------------

const sampleFields = {
  pointId: id,
  sampleType: z.enum(SAMPLE_TYPES, oneOf(SAMPLE_TYPES)),
  compositeStartAt: instant().nullish(),
  compositeEndAt: instant().nullish(),
  collectedAt: instant(),
  collectedBy: optionalText(120),
  receivedAt: instant().nullish(),
  /** °C measured on receipt; ≤ 6 °C is the preservation requirement [40 CFR 136.3 Table II]. */
  receiptTemperatureC: scaled(1, -20, 60, '°C').nullish(),
  preservation: optionalText(200),
  /** Filtered samples are reported as alkalinity, unfiltered as ANC [USGS NFM A6.6]. */
  filtered: z.boolean({ error: 'true or false' }).optional(),
  notes: optionalText(2000),
};

/** Cross-field rules of a sample, for a whole record (create, or a patch merged onto the stored one). */
export function sampleRuleErrors(s: {
  sampleType?: string;
  compositeStartAt?: string | null;
  compositeEndAt?: string | null;
  collectedAt?: string | null;
  receivedAt?: string | null;
}): Record<string, string> {
  const out: Record<string, string> = {};
  const t = (v?: string | null) => (v ? Date.parse(v) : undefined);
  if (s.sampleType === 'composite') {
    if (!s.compositeStartAt) out.compositeStartAt = 'required for a composite sample';
    if (!s.compositeEndAt) out.compositeEndAt = 'required for a composite sample';
    const start = t(s.compositeStartAt);
    const end = t(s.compositeEndAt);
    if (start !== undefined && end !== undefined && !(start < end)) out.compositeEndAt = 'must be after compositeStartAt';
    const collected = t(s.collectedAt);
    if (end !== undefined && collected !== undefined && end > collected) out.compositeEndAt = 'must not be after collectedAt (the composite is complete when collected)';
  } else if (s.sampleType === 'grab') {
    if (s.compositeStartAt) out.compositeStartAt = 'only for a composite sample';
    if (s.compositeEndAt) out.compositeEndAt = 'only for a composite sample';
  }
  const collected = t(s.collectedAt);
  const received = t(s.receivedAt);
  if (collected !== undefined && received !== undefined && received < collected) out.receivedAt = 'must not be before collectedAt';
  return out;
}

export const sampleCreateSchema = z.strictObject(sampleFields).superRefine((body, ctx) => {
  for (const [field, message] of Object.entries(sampleRuleErrors(body))) ctx.addIssue({ code: 'custom', path: [field], message });
});

export const sampleUpdateSchema = z.strictObject(sampleFields).partial().extend({ version: versionField });

// ---- titrations ----------------------------------------------------------------------------

export const benchReadingSchema = z.strictObject({
  volumeMl: volumeMl(),
  pH: ph(),
  temperatureC: temperatureC().nullish(),
});

export const benchReadingsSchema = z
  .array(benchReadingSchema, { error: 'must be a list of {volumeMl, pH, temperatureC}' })
  .max(BENCH_READINGS_LIMIT, { error: `at most ${BENCH_READINGS_LIMIT} readings` })
  .superRefine((readings, ctx) => {
    for (let i = 1; i < readings.length; i++) {
      if (readings[i].volumeMl < readings[i - 1].volumeMl) {
        ctx.addIssue({ code: 'custom', path: [i, 'volumeMl'], message: `must not be less than the previous reading's volume (${readings[i - 1].volumeMl} mL); volumes are cumulative` });
      }
    }
  });

const titrationFields = {
  analysis: z.enum(ANALYSES, oneOf(ANALYSES)),
  method: z.enum(TITRATION_METHODS, oneOf(TITRATION_METHODS)),
  /** Curve titrations only: how the endpoint is read off the curve. */
  endpointMethod: z.enum(['fixed', 'inflection', 'gran'], oneOf(['fixed', 'inflection', 'gran'])).nullish(),
  sampleVolumeMl: scaled(3, 0, 5000, 'mL', { exclusiveMin: true }),
  titrantId: id,
  totalEndpointPh: ph().nullish(),
  volumeToPh83Ml: volumeMl().nullish(),
  volumeToTotalEndpointMl: volumeMl().nullish(),
  volumeToPh37Ml: volumeMl().nullish(),
  lowAlkalinity: z
    .strictObject({
      firstEndpointPh: ph(),
      volumeToFirstEndpointMl: positiveVolumeMl(),
      volumeToSecondEndpointMl: positiveVolumeMl(),
      secondEndpointPh: ph().nullish(),
    })
    .nullish(),
  peroxideTreatment: z.strictObject({ acidVolumeMl: positiveVolumeMl(), acidNormality: normality() }).nullish(),
  readings: benchReadingsSchema.nullish(),
  temperatureC: temperatureC().nullish(),
  initialPh: ph().nullish(),
  tdsMgL: scaled(3, 0, 100_000, 'mg/L').nullish(),
  specificConductanceUsCm: scaled(3, 0, 200_000, 'µS/cm').nullish(),
  buretteResolutionMl: scaled(5, 0, 1, 'mL', { exclusiveMin: true }).nullish(),
  /** Digester samples: volatile acids, mg/L as acetic acid, for the VA/alkalinity ratio. */
  volatileAcidsMgL: scaled(3, 0, 100_000, 'mg/L').nullish(),
  meterId: optionalText(60),
  /** A user of the caller's own organisation; the caller by default. */
  analystId: id.optional(),
  analysedAt: instant().optional(),
  notes: optionalText(2000),
};

export const titrationCreateSchema = z.strictObject(titrationFields);

export const titrationUpdateSchema = titrationCreateSchema.partial().extend({ version: versionField });

export const transitionSchema = z.strictObject({ version: versionField.optional() });
export const returnSchema = z.strictObject({ comment: text(1000), version: versionField.optional() });
/** An amendment: the reason, and the corrections to carry into the new version. */
export const amendSchema = titrationCreateSchema.partial().extend({ reason: text(1000), version: versionField.optional() });
export const bulkApproveSchema = z.strictObject({
  items: z
    .array(z.strictObject({ id, version: versionField.optional() }), { error: 'must be a list of {id, version}' })
    .min(1, { error: 'choose at least one result' })
    .max(200, { error: 'at most 200 at a time' }),
});

/**
 * One row of the daily entry grid: a sample and its titration, saved together (and submitted
 * when asked) in one transaction, so a row is either all saved or not at all.
 */
export const benchEntrySchema = z.strictObject({
  sample: sampleCreateSchema,
  titration: titrationCreateSchema,
  submit: z.boolean({ error: 'true or false' }).optional(),
});

/** A batch of entries (a day's sheet, an import from another system): all saved, or none. */
export const BENCH_IMPORT_LIMIT = 500;
export const benchImportSchema = z.strictObject({
  entries: z.array(benchEntrySchema).min(1, { error: 'at least one entry' }).max(BENCH_IMPORT_LIMIT, { error: `at most ${BENCH_IMPORT_LIMIT} entries per request` }),
});

export type TitrationInput = z.output<typeof titrationCreateSchema>;
export type TitrationPatch = z.output<typeof titrationUpdateSchema>;

// ---- titrant lots and standardisations -------------------------------------------------------

export const titrantCreateSchema = z
  .strictObject({
    kind: z.enum(TITRANT_KINDS, oneOf(TITRANT_KINDS)),
    reagent: z.enum(REAGENTS, oneOf(REAGENTS)),
    nominalNormality: normality(),
    lot: text(60),
    expiresOn: isoDate(),
    preparedOn: isoDate().nullish(),
    /** The lab by default; a client utility that keeps its own titrant. */
    organizationId: id.optional(),
    notes: optionalText(1000),
  })
  .superRefine((body, ctx) => {
    if (body.reagent && body.kind && REAGENT_KIND[body.reagent] !== body.kind) {
      ctx.addIssue({ code: 'custom', path: ['reagent'], message: `${body.reagent} is ${REAGENT_KIND[body.reagent] === 'acid' ? 'an acid' : 'a base'}` });
    }
  });

export const titrantUpdateSchema = z.strictObject({
  lot: text(60).optional(),
  expiresOn: isoDate().optional(),
  notes: optionalText(1000),
  active: z.boolean({ error: 'true or false' }).optional(),
  version: versionField,
});

export const standardizationCreateSchema = z
  .strictObject({
    primaryStandard: z.enum(PRIMARY_STANDARDS, oneOf(PRIMARY_STANDARDS)),
    mode: z.enum(['solution', 'mass'], oneOf(['solution', 'mass'])),
    /** Solution mode: g of primary standard per litre (A in N = A × B / (53.00 × C)). */
    standardGramsPerL: scaled(5, 0, 1000, 'g/L', { exclusiveMin: true }).optional(),
    replicates: z
      .array(
        z.strictObject({
          standardVolumeMl: positiveVolumeMl().optional(),
          standardGrams: scaled(5, 0, 100, 'g', { exclusiveMin: true }).optional(),
          titrantVolumeMl: positiveVolumeMl(),
        }),
        { error: 'must be a list of replicate titrations' },
      )
      .min(2, { error: 'titrate at least in duplicate' })
      .max(10, { error: 'at most 10 replicates' }),
    standardizedAt: instant(),
    /** Default: 30 days later, the monthly re-standardisation of USGS NFM A6.6.2. */
    validUntil: instant().optional(),
    notes: optionalText(1000),
  })
  .superRefine((body, ctx) => {
    if (body.mode === 'solution' && body.standardGramsPerL === undefined) ctx.addIssue({ code: 'custom', path: ['standardGramsPerL'], message: 'required for a standard solution' });
    if (body.mode === 'mass' && body.standardGramsPerL !== undefined) ctx.addIssue({ code: 'custom', path: ['standardGramsPerL'], message: 'only for mode solution' });
    (body.replicates ?? []).forEach((r, i) => {
      if (body.mode === 'solution' && r.standardVolumeMl === undefined) ctx.addIssue({ code: 'custom', path: ['replicates', i, 'standardVolumeMl'], message: 'required for a standard solution' });
      if (body.mode === 'mass' && r.standardGrams === undefined) ctx.addIssue({ code: 'custom', path: ['replicates', i, 'standardGrams'], message: 'required when weighing directly' });
    });
    if (body.validUntil && body.standardizedAt && Date.parse(body.validUntil) <= Date.parse(body.standardizedAt)) {
      ctx.addIssue({ code: 'custom', path: ['validUntil'], message: 'must be after standardizedAt' });
    }
  });

// ---- meter calibrations ----------------------------------------------------------------------

export const calibrationCreateSchema = z
  .strictObject({
    meterId: text(60),
    meterName: optionalText(120),
    calibratedAt: instant(),
    temperatureC: temperatureC(),
    /** The first two calibrate; any further buffer is read back as a check. */
    buffers: z
      .array(z.strictObject({ nominalPh: ph(), mV: scaled(2, -2000, 2000, 'mV') }), { error: 'must be a list of {nominalPh, mV}' })
      .min(2, { error: 'at least two buffers are needed' })
      .max(5, { error: 'at most 5 buffers' }),
    notes: optionalText(1000),
  })
  .superRefine((body, ctx) => {
    const b = body.buffers ?? [];
    if (b.length >= 2 && b[0].nominalPh === b[1].nominalPh) ctx.addIssue({ code: 'custom', path: ['buffers', 1, 'nominalPh'], message: 'the two calibration buffers must differ in pH' });
  });

// ---- QC batches ------------------------------------------------------------------------------

const mgL = () => scaled(4, 0, 100_000, 'mg/L');
export const qcBatchFields = {
  batchDate: isoDate(),
  analysis: z.enum(ANALYSES, oneOf(ANALYSES)),
  duplicates: z.array(z.strictObject({ label: optionalText(120), firstResult: mgL(), secondResult: mgL() })).max(100, { error: 'at most 100' }),
  checkStandards: z
    .array(
      z.strictObject({
        label: optionalText(120),
        /** mg/L as CaCO3. */
        trueValue: scaled(4, 0, 100_000, 'mg/L', { exclusiveMin: true }).optional(),
        /** A Na2CO3 standard's strength, mg/L Na2CO3 (× 0.9443 to CaCO3). */
        trueValueNa2co3MgL: scaled(4, 0, 100_000, 'mg/L', { exclusiveMin: true }).optional(),
        measured: mgL(),
      }),
    )
    .max(100, { error: 'at most 100' }),
  blanks: z.array(z.strictObject({ label: optionalText(120), measured: mgL(), reportingLimit: scaled(4, 0, 100_000, 'mg/L', { exclusiveMin: true }) })).max(100, { error: 'at most 100' }),
  titrationIds: z.array(id).max(500, { error: 'at most 500' }),
  notes: optionalText(1000),
};

function checkStandardRules(body: { checkStandards?: Array<{ trueValue?: number; trueValueNa2co3MgL?: number }> }, ctx: z.core.$RefinementCtx<unknown>) {
  (body.checkStandards ?? []).forEach((s, i) => {
    if ((s.trueValue === undefined) === (s.trueValueNa2co3MgL === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['checkStandards', i, 'trueValue'], message: 'give trueValue (as CaCO3) or trueValueNa2co3MgL, one of them' });
    }
  });
}

export const qcBatchCreateSchema = z
  .strictObject({
    ...qcBatchFields,
    duplicates: qcBatchFields.duplicates.default([]),
    checkStandards: qcBatchFields.checkStandards.default([]),
    blanks: qcBatchFields.blanks.default([]),
    titrationIds: qcBatchFields.titrationIds.default([]),
  })
  .superRefine(checkStandardRules);

export const qcBatchUpdateSchema = z
  .strictObject({
    batchDate: qcBatchFields.batchDate.optional(),
    duplicates: qcBatchFields.duplicates.optional(),
    checkStandards: qcBatchFields.checkStandards.optional(),
    blanks: qcBatchFields.blanks.optional(),
    titrationIds: qcBatchFields.titrationIds.optional(),
    notes: qcBatchFields.notes,
    version: versionField,
  })
  .superRefine(checkStandardRules);

// ---- lab settings of the bench ---------------------------------------------------------------

/** Limits a laboratory may change; defaults in BENCH_SETTING_DEFAULTS (domain.md 1, 5, 6). */
export const benchSettingsSchema = z.strictObject({
  caco3Factor: z.union([z.literal(50000), z.literal(50044)], { error: 'one of 50000, 50044' }).optional(),
  duplicateRpdMaxPercent: scaled(3, 0, 100, '%', { exclusiveMin: true }).optional(),
  checkStandardRecoveryMinPercent: scaled(3, 0, 100, '%').optional(),
  checkStandardRecoveryMaxPercent: scaled(3, 100, 200, '%').optional(),
  electrodeSlopeMinPercent: scaled(3, 50, 100, '%').optional(),
  electrodeSlopeMaxPercent: scaled(3, 100, 150, '%').optional(),
  checkBufferTolerancePh: scaled(3, 0, 1, '', { exclusiveMin: true }).optional(),
  standardizationValidDays: z.number({ error: 'must be a whole number' }).int('must be a whole number').min(1).max(366).optional(),
  standardizationRsdMaxPercent: scaled(3, 0, 10, '%', { exclusiveMin: true }).optional(),
  holdingTimeHours: z.number({ error: 'must be a whole number' }).int('must be a whole number').min(1).max(24 * 60).optional(),
  receiptTemperatureMaxC: scaled(1, 0, 30, '°C').optional(),
  unusualSdMultiplier: scaled(2, 1, 10, '').optional(),
  unusualHistoryCount: z.number({ error: 'must be a whole number' }).int('must be a whole number').min(3).max(365).optional(),
  unusualMinHistory: z.number({ error: 'must be a whole number' }).int('must be a whole number').min(2).max(365).optional(),
});
export type BenchSettings = Required<z.output<typeof benchSettingsSchema>>;

/**
 * Defaults: CaCO3 factor 50,000 [SM 2320 B]; duplicate RPD ≤ 10 % and recovery 90–110 %
 * [common practice, domain.md 6]; electrode slope 95–105 % [common practice]; check buffer
 * ±0.1 pH [common practice]; standardisation valid 30 days [USGS NFM A6.6.2 monthly], RSD ≤ 0.5 %
 * [common practice]; holding time 336 h and receipt ≤ 6 °C [40 CFR 136.3 Table II]; review flag
 * beyond 3 SD of the last 30 approved values, judged from 10 on [SM 1020 B ±3s, from memory].
 */
export const BENCH_SETTING_DEFAULTS: BenchSettings = {
  caco3Factor: 50000,
  duplicateRpdMaxPercent: 10,
  checkStandardRecoveryMinPercent: 90,
  checkStandardRecoveryMaxPercent: 110,
  electrodeSlopeMinPercent: 95,
  electrodeSlopeMaxPercent: 105,
  checkBufferTolerancePh: 0.1,
  standardizationValidDays: 30,
  standardizationRsdMaxPercent: 0.5,
  holdingTimeHours: 336,
  receiptTemperatureMaxC: 6,
  unusualSdMultiplier: 3,
  unusualHistoryCount: 30,
  unusualMinHistory: 10,
};
