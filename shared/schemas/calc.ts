import { z } from 'zod';
import { nonNegative, number, ph, positive, temperatureC } from './numbers.js';
import { CACO3_FACTORS } from '../chemistry/constants.js';

/**
 * Request bodies of the public calculation API (POST /api/v1/calc/*). Reasons are short and
 * field-level; parseOrThrow (parse.ts) turns them into an InputError keyed by dotted path.
 * Objects are strict: a misspelt optional field would otherwise be dropped silently and the
 * default used in its place.
 */


const sampleVolumeMl = () => positive(5000, 'mL');
const titrantNormality = () => positive(10, 'N');
const titrantVolumeMl = () => nonNegative(1000, 'mL');
const concentrationMgL = () => nonNegative(100_000, 'mg/L');
const conductance = () => nonNegative(200_000, 'µS/cm');
const ionicStrength = () => nonNegative(1, 'mol/L');
const caco3Factor = () =>
  z.union(
    CACO3_FACTORS.map((f) => z.literal(f)),
    { error: `must be one of ${CACO3_FACTORS.join(', ')}` },
  );
const buretteResolutionMl = () => positive(1, 'mL');

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
/** Runs a refinement even when other fields failed, so an empty body names every missing field. */
const always = { when: (payload: { value: unknown }) => isObject(payload.value) };

export const readingSchema = z.strictObject({
  volumeMl: titrantVolumeMl(),
  pH: ph(),
});

/** Readings with cumulative, non-decreasing volumes. */
export const readingsSchema = z
  .array(readingSchema, { error: 'must be a list of {volumeMl, pH}' })
  .min(2, { error: 'at least two readings are needed' })
  .max(2000, { error: 'at most 2000 readings' })
  .superRefine((readings, ctx) => {
    for (let i = 1; i < readings.length; i++) {
      if (readings[i].volumeMl < readings[i - 1].volumeMl) {
        ctx.addIssue({
          code: 'custom',
          path: [i, 'volumeMl'],
          message: `must not be less than the previous reading's volume (${readings[i - 1].volumeMl} mL); volumes are cumulative`,
        });
      }
    }
  });

export const lowAlkalinitySchema = z.strictObject({
  firstEndpointPh: ph(),
  volumeToFirstEndpointMl: positive(1000, 'mL'),
  volumeToSecondEndpointMl: positive(1000, 'mL'),
  /** Optional: the pH actually read at the second point, checked against first − 0.30. */
  secondEndpointPh: ph().optional(),
});

export const endpointMethodSchema = z.enum(['fixed', 'inflection', 'gran'], { error: 'must be fixed, inflection or gran' });

export const alkalinityRequestSchema = z
  .strictObject({
    sampleVolumeMl: sampleVolumeMl(),
    titrantNormality: titrantNormality(),
    volumeToPh83Ml: titrantVolumeMl().optional(),
    volumeToTotalEndpointMl: titrantVolumeMl().optional(),
    totalEndpointPh: ph().optional(),
    readings: readingsSchema.optional(),
    endpointMethod: endpointMethodSchema.optional(),
    lowAlkalinity: lowAlkalinitySchema.optional(),
    temperatureC: temperatureC().optional(),
    initialPh: ph().optional(),
    tdsMgL: concentrationMgL().optional(),
    specificConductanceUsCm: conductance().optional(),
    caco3Factor: caco3Factor().optional(),
    buretteResolutionMl: buretteResolutionMl().optional(),
  })
  .superRefine((raw, ctx) => {
    const body = raw as Record<string, unknown>;
    const has = (key: string) => body[key] !== undefined;
    const modes = ['volumeToTotalEndpointMl', 'readings', 'lowAlkalinity'].filter(has);
    if (modes.length === 0) {
      ctx.addIssue({
        code: 'custom',
        path: ['volumeToTotalEndpointMl'],
        message: 'required: give volumeToPh83Ml and volumeToTotalEndpointMl, or readings, or lowAlkalinity',
      });
    }
    if (modes.length > 1) {
      ctx.addIssue({ code: 'custom', path: [modes[1]], message: `give only one of ${modes.join(', ')}` });
    }
    if (modes.length === 0 || (modes.length === 1 && modes[0] === 'volumeToTotalEndpointMl')) {
      if (!has('volumeToPh83Ml')) ctx.addIssue({ code: 'custom', path: ['volumeToPh83Ml'], message: 'required' });
    }
    if (has('readings') && has('volumeToPh83Ml')) {
      ctx.addIssue({ code: 'custom', path: ['volumeToPh83Ml'], message: 'not used with readings: the pH 8.3 volume is read from the curve' });
    }
    if (has('endpointMethod') && !has('readings')) {
      ctx.addIssue({ code: 'custom', path: ['endpointMethod'], message: 'applies only when readings are given' });
    }
    if (has('lowAlkalinity') && has('totalEndpointPh')) {
      ctx.addIssue({ code: 'custom', path: ['totalEndpointPh'], message: 'not used with lowAlkalinity: give lowAlkalinity.firstEndpointPh' });
    }
    if (has('tdsMgL') && has('specificConductanceUsCm')) {
      ctx.addIssue({ code: 'custom', path: ['specificConductanceUsCm'], message: 'give tdsMgL or specificConductanceUsCm, not both' });
    }
  }, always)
  .superRefine((body, ctx) => {
    if (body.volumeToPh83Ml !== undefined && body.volumeToTotalEndpointMl !== undefined && body.volumeToPh83Ml > body.volumeToTotalEndpointMl) {
      ctx.addIssue({
        code: 'custom',
        path: ['volumeToPh83Ml'],
        message: 'must not exceed volumeToTotalEndpointMl (volumes are cumulative from the start)',
      });
    }
    const low = body.lowAlkalinity;
    if (low) {
      if (low.volumeToSecondEndpointMl <= low.volumeToFirstEndpointMl) {
        ctx.addIssue({
          code: 'custom',
          path: ['lowAlkalinity', 'volumeToSecondEndpointMl'],
          message: 'must be greater than volumeToFirstEndpointMl (volumes are cumulative)',
        });
      }
      if (body.volumeToPh83Ml !== undefined && body.volumeToPh83Ml > low.volumeToFirstEndpointMl) {
        ctx.addIssue({ code: 'custom', path: ['volumeToPh83Ml'], message: 'must not exceed lowAlkalinity.volumeToFirstEndpointMl' });
      }
    }
  });

export const acidityRequestSchema = z
  .strictObject({
    sampleVolumeMl: sampleVolumeMl(),
    titrantNormality: titrantNormality(),
    volumeToPh37Ml: titrantVolumeMl().optional(),
    volumeToPh83Ml: titrantVolumeMl(),
    /** Total-acidity endpoint actually used: 8.3 (SM 2310 B) or 8.2 (EPA 305.1). */
    totalEndpointPh: ph().optional(),
    peroxideTreatment: z
      .strictObject({
        acidVolumeMl: positive(1000, 'mL'),
        acidNormality: titrantNormality(),
      })
      .optional(),
    caco3Factor: caco3Factor().optional(),
    buretteResolutionMl: buretteResolutionMl().optional(),
  })
  .superRefine((body, ctx) => {
    if (body.volumeToPh37Ml !== undefined && body.volumeToPh37Ml > body.volumeToPh83Ml) {
      ctx.addIssue({
        code: 'custom',
        path: ['volumeToPh37Ml'],
        message: 'must not exceed volumeToPh83Ml (volumes are cumulative from the start)',
      });
    }
  });

function oneIonicStrengthSource(body: Record<string, unknown>, ctx: z.core.$RefinementCtx<unknown>) {
  const given = ['tdsMgL', 'specificConductanceUsCm', 'ionicStrength'].filter((k) => body[k] !== undefined);
  if (given.length > 1) {
    ctx.addIssue({ code: 'custom', path: [given[1]], message: `give only one of ${given.join(', ')}` });
  }
}

export const speciationRequestSchema = z
  .strictObject({
    pH: ph(),
    totalAlkalinity: concentrationMgL(),
    phenolphthaleinAlkalinity: concentrationMgL().optional(),
    temperatureC: temperatureC().optional(),
    tdsMgL: concentrationMgL().optional(),
    specificConductanceUsCm: conductance().optional(),
    ionicStrength: ionicStrength().optional(),
    caco3Factor: caco3Factor().optional(),
  })
  .superRefine((raw, ctx) => oneIonicStrengthSource(raw as Record<string, unknown>, ctx), always)
  .superRefine((body, ctx) => {
    if (body.phenolphthaleinAlkalinity !== undefined && body.phenolphthaleinAlkalinity > body.totalAlkalinity) {
      ctx.addIssue({ code: 'custom', path: ['phenolphthaleinAlkalinity'], message: 'must not exceed totalAlkalinity' });
    }
  });

export const curveRequestSchema = z
  .strictObject({
    sampleVolumeMl: sampleVolumeMl(),
    titrantNormality: titrantNormality(),
    titrant: z.enum(['acid', 'base'], { error: 'must be acid or base' }).optional(),
    sampleType: z.enum(['carbonate', 'strongAcid', 'strongBase'], { error: 'must be carbonate, strongAcid or strongBase' }).optional(),
    initialPh: ph().optional(),
    /** mg/L as CaCO3, for a carbonate sample. */
    totalAlkalinity: concentrationMgL().optional(),
    /** C_T, mmol/L, for a carbonate sample (the alternative to totalAlkalinity). */
    totalCarbonateMmolL: nonNegative(1000, 'mmol/L').optional(),
    /** mol/L, for a strong acid or strong base sample. */
    concentrationM: positive(10, 'mol/L').optional(),
    temperatureC: temperatureC().optional(),
    tdsMgL: concentrationMgL().optional(),
    specificConductanceUsCm: conductance().optional(),
    ionicStrength: ionicStrength().optional(),
    volumesMl: z
      .array(titrantVolumeMl(), { error: 'must be a list of volumes' })
      .min(2, { error: 'at least two volumes are needed' })
      .max(2000, { error: 'at most 2000 volumes' })
      .optional(),
    maxVolumeMl: positive(1000, 'mL').optional(),
    intervals: number()
      .int({ error: 'must be a whole number' })
      .gte(2, { error: 'must be at least 2' })
      .lte(2000, { error: 'must be at most 2000' })
      .optional(),
    endpointPh: z.array(ph(), { error: 'must be a list of pH values' }).max(10, { error: 'at most 10 endpoints' }).optional(),
    caco3Factor: caco3Factor().optional(),
  })
  .superRefine((raw, ctx) => {
    const body = raw as Record<string, unknown>;
    const has = (key: string) => body[key] !== undefined;
    oneIonicStrengthSource(body, ctx);
    const type = body.sampleType ?? 'carbonate';
    if (type === 'carbonate') {
      if (!has('initialPh')) ctx.addIssue({ code: 'custom', path: ['initialPh'], message: 'required for a carbonate sample' });
      if (has('totalAlkalinity') === has('totalCarbonateMmolL')) {
        ctx.addIssue({
          code: 'custom',
          path: [has('totalAlkalinity') ? 'totalCarbonateMmolL' : 'totalAlkalinity'],
          message: has('totalAlkalinity') ? 'give totalAlkalinity or totalCarbonateMmolL, not both' : 'required: give totalAlkalinity or totalCarbonateMmolL',
        });
      }
      if (has('concentrationM')) ctx.addIssue({ code: 'custom', path: ['concentrationM'], message: 'used only with sampleType strongAcid or strongBase' });
    } else {
      if (!has('concentrationM')) ctx.addIssue({ code: 'custom', path: ['concentrationM'], message: `required for sampleType ${String(type)}` });
      for (const key of ['initialPh', 'totalAlkalinity', 'totalCarbonateMmolL']) {
        if (has(key)) ctx.addIssue({ code: 'custom', path: [key], message: 'used only with sampleType carbonate' });
      }
      if ((type === 'strongAcid' && body.titrant === 'acid') || (type === 'strongBase' && body.titrant === 'base')) {
        ctx.addIssue({ code: 'custom', path: ['titrant'], message: `a ${String(type)} sample is titrated with ${type === 'strongAcid' ? 'base' : 'acid'}` });
      }
    }
    if (has('volumesMl') && (has('maxVolumeMl') || has('intervals'))) {
      ctx.addIssue({ code: 'custom', path: ['volumesMl'], message: 'give volumesMl, or maxVolumeMl and intervals, not both' });
    }
  }, always)
  .superRefine((body, ctx) => {
    const volumes = body.volumesMl;
    if (volumes) {
      for (let i = 1; i < volumes.length; i++) {
        if (volumes[i] < volumes[i - 1]) {
          ctx.addIssue({ code: 'custom', path: ['volumesMl', i], message: 'must not be less than the previous volume; volumes are cumulative' });
        }
      }
    }
  });

export const lsiRequestSchema = z
  .strictObject({
    pH: ph(),
    temperatureC: temperatureC().optional(),
    tdsMgL: positive(100_000, 'mg/L'),
    /** Calcium hardness, mg/L as CaCO3. */
    calciumHardness: positive(100_000, 'mg/L'),
    /** Total alkalinity, mg/L as CaCO3. */
    totalAlkalinity: positive(100_000, 'mg/L'),
    /** Overrides 2.5 × 10⁻⁵ × TDS for the exact form. */
    ionicStrength: ionicStrength().optional(),
  });

export type AlkalinityRequest = z.input<typeof alkalinityRequestSchema>;
export type AcidityRequest = z.input<typeof acidityRequestSchema>;
export type SpeciationRequest = z.input<typeof speciationRequestSchema>;
export type CurveRequest = z.input<typeof curveRequestSchema>;
export type LsiRequest = z.input<typeof lsiRequestSchema>;
