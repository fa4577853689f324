import { z } from 'zod';
import { BELOW_RL_RULES, BOUNDS, PARAMETERS, ROUNDING_MODES, STATISTICS, UNITS } from '../compliance/types.js';
import { email, id, optionalText, text } from './common.js';

export const PARAMETER_LABELS: Record<(typeof PARAMETERS)[number], string> = {
  total_alkalinity: 'Total alkalinity',
  phenolphthalein_alkalinity: 'Phenolphthalein alkalinity',
  acidity: 'Acidity',
  ph: 'pH',
  bicarbonate: 'Bicarbonate',
  carbonate: 'Carbonate',
  hydroxide: 'Hydroxide',
};
export const STATISTIC_LABELS: Record<(typeof STATISTICS)[number], string> = {
  instantaneous: 'Instantaneous',
  daily: 'Daily',
  weekly_average: 'Weekly average',
  monthly_average: 'Monthly average',
};

const date = z.string({ error: 'required' }).regex(/^\d{4}-\d{2}-\d{2}$/, 'a date as YYYY-MM-DD');
const optionalDate = z
  .union([z.literal(''), date])
  .nullish()
  .transform((v) => (v ? v : null));
/** A decimal figure, accepted as a number or a string and kept as an exact string. */
export const decimalString = z
  .union([z.number({ error: 'must be a number' }).finite(), z.string().trim()], { error: 'must be a number' })
  .transform((v) => String(v))
  .refine((v) => /^-?\d+(\.\d+)?$/.test(v), 'must be a number');

/** The default certification wording, in our own words; the permit's required wording governs. */
export const DEFAULT_CERTIFICATION_WORDING =
  'I certify that this report was prepared under my direction from results recorded and reviewed under the laboratory’s quality system, and that, to the best of my knowledge, it is true, accurate and complete. Where the permit or the regulator prescribes its own certification statement, that statement governs and is incorporated here by reference.';

export const regulatorContactSchema = z.object({ name: text(160), email });

export const permitSchema = z
  .object({
    facilityId: id,
    number: text(60),
    issuingAuthority: text(200),
    effectiveFrom: date,
    expiresOn: optionalDate,
    regulatorContacts: z.array(regulatorContactSchema, { error: 'a list of {name, email}' }).min(1, 'at least one regulator contact').max(10, 'at most 10'),
    followUpText: optionalText(4000),
    followUpDeadlineValue: z.coerce.number().int('a whole number').min(1, 'at least 1').max(10_000).nullish().transform((v) => v ?? null),
    followUpDeadlineUnit: z.enum(['hours', 'days']).nullish().transform((v) => v ?? null),
    certificationWording: optionalText(8000),
    roundingMode: z.enum(ROUNDING_MODES, { error: 'half_up or half_even' }).default('half_up'),
    weekStartsOn: z.coerce.number().int().min(0).max(6).default(0),
    weekMonthRule: z.enum(['week_end_month', 'split']).default('week_end_month'),
  })
  .superRefine((p, ctx) => {
    if (p.expiresOn && p.expiresOn < p.effectiveFrom) ctx.addIssue({ code: 'custom', path: ['expiresOn'], message: 'must not be before effectiveFrom' });
    if ((p.followUpDeadlineValue === null) !== (p.followUpDeadlineUnit === null)) {
      ctx.addIssue({ code: 'custom', path: ['followUpDeadlineUnit'], message: 'give the deadline as a number with hours or days' });
    }
  });
export const permitUpdateSchema = z
  .object({
    number: text(60).optional(),
    issuingAuthority: text(200).optional(),
    effectiveFrom: date.optional(),
    expiresOn: optionalDate.optional(),
    regulatorContacts: z.array(regulatorContactSchema).min(1, 'at least one regulator contact').max(10).optional(),
    followUpText: optionalText(4000).optional(),
    followUpDeadlineValue: z.coerce.number().int().min(1).max(10_000).nullish(),
    followUpDeadlineUnit: z.enum(['hours', 'days']).nullish(),
    certificationWording: optionalText(8000).optional(),
    roundingMode: z.enum(ROUNDING_MODES).optional(),
    weekStartsOn: z.coerce.number().int().min(0).max(6).optional(),
    weekMonthRule: z.enum(['week_end_month', 'split']).optional(),
    active: z.boolean().optional(),
  });

export const limitSchema = z.object({
  pointId: id,
  parameter: z.enum(PARAMETERS, { error: `one of ${PARAMETERS.join(', ')}` }),
  statistic: z.enum(STATISTICS, { error: `one of ${STATISTICS.join(', ')}` }),
  bound: z.enum(BOUNDS, { error: 'minimum or maximum' }),
  value: decimalString,
  units: z.enum(UNITS, { error: `one of ${UNITS.join(', ')}` }),
  significantFigures: z.coerce.number().int().nullish().transform((v) => v ?? null),
  decimals: z.coerce.number().int().nullish().transform((v) => v ?? null),
  reportingLimit: z
    .union([z.literal(''), decimalString])
    .nullish()
    .transform((v) => (v ? v : null)),
  belowReportingLimit: z.enum(BELOW_RL_RULES, { error: 'zero, half or limit' }).default('zero'),
  effectiveFrom: date,
  effectiveTo: optionalDate,
});
export const limitUpdateSchema = limitSchema.partial().extend({ active: z.boolean().optional() });
