import { z } from 'zod';
import { nonNegative, number, ph, positive, temperatureC } from './numbers';
import { CACO3_FACTORS } from '../chemistry/constants';
import { ALKALINITY_CHEMICAL_KEYS, type AlkalinityChemical } from '../chemistry/tools/alkalinityDose';

/**
 * Request bodies of the tools' calculation routes (POST /api/v1/calc/ccpp, toc-removal,
 * nitrification, alkalinity-dose, digester, endpoint-error). Same style as calc.ts: strict
 * objects, short field-level reasons; alkalinity and hardness are mg/L as CaCO3.
 */


const temperatureF = () =>
  number()
    .gte(32, { error: 'must be between 32 and 194 °F (range of the equilibrium constants)' })
    .lte(194, { error: 'must be between 32 and 194 °F (range of the equilibrium constants)' });
const mgL = () => nonNegative(100_000, 'mg/L');
const positiveMgL = () => positive(100_000, 'mg/L');
const purityPercent = () => positive(100, '%');
const flowMgd = () => positive(10_000, 'MGD');
const flowM3PerDay = () => positive(40_000_000, 'm³/d');
const chemical = () =>
  z.enum(ALKALINITY_CHEMICAL_KEYS as [AlkalinityChemical, ...AlkalinityChemical[]], {
    error: `must be one of ${ALKALINITY_CHEMICAL_KEYS.join(', ')}`,
  });

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
/** Runs a refinement even when other fields failed, so an empty body names every missing field. */
const always = { when: (payload: { value: unknown }) => isObject(payload.value) };

function notBoth(body: Record<string, unknown>, ctx: z.core.$RefinementCtx<unknown>, a: string, b: string) {
  if (body[a] !== undefined && body[b] !== undefined) ctx.addIssue({ code: 'custom', path: [b], message: `give ${a} or ${b}, not both` });
}

export const ccppRequestSchema = z
  .strictObject({
    pH: ph(),
    temperatureC: temperatureC().optional(),
    temperatureF: temperatureF().optional(),
    tdsMgL: positiveMgL(),
    calciumHardness: positiveMgL(),
    totalAlkalinity: positiveMgL(),
    /** Overrides 2.5 × 10⁻⁵ × TDS. */
    ionicStrength: nonNegative(1, 'mol/L').optional(),
  })
  .superRefine((raw, ctx) => notBoth(raw as Record<string, unknown>, ctx, 'temperatureC', 'temperatureF'), always);

export const tocRemovalRequestSchema = z.strictObject({
  sourceTocMgL: nonNegative(1000, 'mg/L'),
  sourceAlkalinity: mgL(),
  /** Treated (combined filter effluent) TOC, for the removal achieved. */
  treatedTocMgL: nonNegative(1000, 'mg/L').optional(),
  /** Softening systems use the > 120 mg/L column whatever the alkalinity. */
  softening: z.boolean({ error: 'must be true or false' }).optional(),
});

export const nitrificationRequestSchema = z
  .strictObject({
    influentAlkalinity: mgL(),
    /** NH4-N nitrified, mg/L as N. */
    nitrifiedNh4NMgL: nonNegative(10_000, 'mg/L'),
    /** NO3-N denitrified, mg/L as N. */
    denitrifiedNo3NMgL: nonNegative(10_000, 'mg/L').optional(),
    targetResidualAlkalinity: mgL().optional(),
    /** Chemical to make up a shortfall (default caustic_soda). */
    chemical: chemical().optional(),
    purityPercent: purityPercent().optional(),
    flowMgd: flowMgd().optional(),
    flowM3PerDay: flowM3PerDay().optional(),
  })
  .superRefine((raw, ctx) => notBoth(raw as Record<string, unknown>, ctx, 'flowMgd', 'flowM3PerDay'), always);

export const alkalinityDoseRequestSchema = z
  .strictObject({
    chemical: chemical(),
    /** Increase wanted, mg/L as CaCO3; or give currentAlkalinity and targetAlkalinity. */
    alkalinityIncrease: positiveMgL().optional(),
    currentAlkalinity: mgL().optional(),
    targetAlkalinity: mgL().optional(),
    purityPercent: purityPercent().optional(),
    flowMgd: flowMgd().optional(),
    flowM3PerDay: flowM3PerDay().optional(),
  })
  .superRefine((raw, ctx) => {
    const body = raw as Record<string, unknown>;
    const has = (k: string) => body[k] !== undefined;
    notBoth(body, ctx, 'flowMgd', 'flowM3PerDay');
    if (has('alkalinityIncrease')) {
      for (const k of ['currentAlkalinity', 'targetAlkalinity']) {
        if (has(k)) ctx.addIssue({ code: 'custom', path: [k], message: 'give alkalinityIncrease, or currentAlkalinity and targetAlkalinity, not both' });
      }
    } else if (!has('currentAlkalinity') && !has('targetAlkalinity')) {
      ctx.addIssue({ code: 'custom', path: ['alkalinityIncrease'], message: 'required: give alkalinityIncrease, or currentAlkalinity and targetAlkalinity' });
    } else {
      for (const k of ['currentAlkalinity', 'targetAlkalinity']) {
        if (!has(k)) ctx.addIssue({ code: 'custom', path: [k], message: 'required with the other of currentAlkalinity and targetAlkalinity' });
      }
    }
  }, always)
  .superRefine((body, ctx) => {
    if (body.currentAlkalinity !== undefined && body.targetAlkalinity !== undefined && body.targetAlkalinity <= body.currentAlkalinity) {
      ctx.addIssue({ code: 'custom', path: ['targetAlkalinity'], message: 'must be greater than currentAlkalinity' });
    }
  });

export const digesterRequestSchema = z.strictObject({
  /** Volatile acids, mg/L as acetic acid. */
  volatileAcidsMgL: mgL(),
  /** Alkalinity, mg/L as CaCO3. */
  alkalinity: positiveMgL(),
  /** Earlier ratios, oldest first, for the trend. */
  previousRatios: z
    .array(nonNegative(100, ''), { error: 'must be a list of ratios' })
    .max(100, { error: 'at most 100 ratios' })
    .optional(),
  /** Ratio the alkalinity-needed figure aims at (default 0.25, the top of the stable band). */
  targetRatio: positive(10, '').optional(),
});

export const endpointErrorRequestSchema = z.strictObject({
  sampleVolumeMl: positive(5000, 'mL'),
  titrantNormality: positive(10, 'N'),
  totalAlkalinity: positive(100_000, 'mg/L'),
  initialPh: ph(),
  temperatureC: temperatureC().optional(),
  tdsMgL: mgL().optional(),
  /** Fixed P endpoint (default 8.3); used when the sample starts above it. */
  phenolphthaleinEndpointPh: ph().optional(),
  /** Fixed total endpoint (default 4.5). */
  totalEndpointPh: ph().optional(),
  caco3Factor: z
    .union(
      CACO3_FACTORS.map((f) => z.literal(f)),
      { error: `must be one of ${CACO3_FACTORS.join(', ')}` },
    )
    .optional(),
});

export type CcppRequest = z.input<typeof ccppRequestSchema>;
export type TocRemovalRequest = z.input<typeof tocRemovalRequestSchema>;
export type NitrificationRequest = z.input<typeof nitrificationRequestSchema>;
export type AlkalinityDoseRequest = z.input<typeof alkalinityDoseRequestSchema>;
export type DigesterRequest = z.input<typeof digesterRequestSchema>;
export type EndpointErrorRequest = z.input<typeof endpointErrorRequestSchema>;
