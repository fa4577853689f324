import { z } from 'zod';
import {
  acidityRequestSchema,
  alkalinityRequestSchema,
  curveRequestSchema,
  lsiRequestSchema,
  speciationRequestSchema,
} from '../../shared/schemas/calc.js';
import { loginSchema } from '../../shared/schemas/auth.js';
import {
  alkalinityDoseRequestSchema,
  ccppRequestSchema,
  digesterRequestSchema,
  endpointErrorRequestSchema,
  nitrificationRequestSchema,
  tocRemovalRequestSchema,
} from '../../shared/schemas/tools.js';
import { invoiceFinaliseSchema, invoiceGenerateSchema, invoiceRefundSchema, invoiceVoidSchema, priceItemSchema, priceItemUpdateSchema } from '../../shared/schemas/billing.js';
import {
  amendSchema,
  benchEntrySchema,
  benchImportSchema,
  benchSettingsSchema,
  benchReadingsSchema,
  bulkApproveSchema,
  calibrationCreateSchema,
  qcBatchCreateSchema,
  qcBatchUpdateSchema,
  returnSchema,
  sampleCreateSchema,
  sampleUpdateSchema,
  standardizationCreateSchema,
  titrantCreateSchema,
  titrantUpdateSchema,
  titrationCreateSchema,
  titrationUpdateSchema,
  transitionSchema,
  versionField,
} from '../../shared/schemas/bench.js';
import { routeTable, type RouteBuilder } from './registry.js';

const errorSchema = {
  type: 'object',
  required: ['error'],
  properties: {
    error: {
      type: 'object',
      required: ['code', 'message'],
      properties: {
        code: { type: 'string', examples: ['validation_failed'] },
        message: { type: 'string' },
        fields: { type: 'object', additionalProperties: { type: 'string' }, description: 'input name (dotted path) → reason' },
      },
    },
  },
};

const calcDocs: Record<string, { schema: z.ZodType; summary: string; description: string }> = {
  '/calc/alkalinity': {
    schema: alkalinityRequestSchema,
    summary: 'Alkalinity from endpoint volumes or a pH curve',
    description:
      'Phenolphthalein (pH 8.3) and total alkalinity in mg/L as CaCO3 (SM 2320 B: A × N × 50,000 / V), meq/L, hydroxide/carbonate/bicarbonate from P and T, equilibrium speciation when initialPh is given, the endpoints used and warnings. Volumes are cumulative from the start of the titration.',
  },
  '/calc/acidity': {
    schema: acidityRequestSchema,
    summary: 'Mineral (pH 3.7) and total (pH 8.3) acidity',
    description: 'SM 2310 B: [(A × B) − (C × D)] × 50,000 / V, with the optional hydrogen-peroxide pretreatment term. A negative result is returned signed with a warning.',
  },
  '/calc/speciation': {
    schema: speciationRequestSchema,
    summary: 'Hydroxide, carbonate and bicarbonate from pH, temperature and total alkalinity',
    description: 'Plummer and Busenberg (1982) K1, K2; Harned and Robinson Kw; Davies activity coefficients from ionic strength estimated from TDS or specific conductance.',
  },
  '/calc/curve': {
    schema: curveRequestSchema,
    summary: 'Model titration curve, true equivalence points and the endpoint error',
    description: 'Charge-balance model of a carbonate water (or strong acid/base) titrated with strong acid or base, with dilution; returns pH against volume, the equivalence points and how far a fixed endpoint pH is from them in mL and mg/L as CaCO3.',
  },
  '/calc/lsi': {
    schema: lsiRequestSchema,
    summary: 'Langelier saturation index and Ryznar stability index',
    description: 'pHs by the approximation in Roberge (2008) and by the exact SM 2330 form; LSI = pH − pHs, RSI = 2 pHs − pH.',
  },
  '/calc/ccpp': {
    schema: ccppRequestSchema,
    summary: 'Calcium carbonate precipitation potential',
    description: 'mg/L as CaCO3 that would precipitate (positive) or dissolve (negative) to reach calcite saturation; closed system, ionic strength held constant, bisection (SM 2330; DIN 38404-10). Returns the final pH, hardness, alkalinity and C_T. Temperature in °C or °F.',
  },
  '/calc/toc-removal': {
    schema: tocRemovalRequestSchema,
    summary: 'Enhanced coagulation: Step 1 TOC removal required and achieved',
    description: 'Required % TOC removal from source TOC and alkalinity (40 CFR 141.135(b)(2); none at or below 2.0 mg/L TOC; softening uses the > 120 column), the removal achieved from source and treated TOC and the removal ratio.',
  },
  '/calc/nitrification': {
    schema: nitrificationRequestSchema,
    summary: 'Nitrification alkalinity budget',
    description: 'Residual alkalinity = influent − 7.14 × NH4-N nitrified + 3.57 × NO3-N denitrified (mg/L as CaCO3), against a target (default 50), the shortfall and the chemical to make it up; daily loads in kg/d and lb/d when a flow (MGD or m³/d) is given.',
  },
  '/calc/alkalinity-dose': {
    schema: alkalinityDoseRequestSchema,
    summary: 'Chemical dose to raise alkalinity',
    description: 'Lime, quicklime, caustic soda, soda ash, sodium bicarbonate or magnesium hydroxide: mg/L = ΔAlk × equivalent weight ÷ 50.04, ÷ purity; kg/d and lb/d (8.34) at a flow in MGD or m³/d; handling cautions.',
  },
  '/calc/digester': {
    schema: digesterRequestSchema,
    summary: 'Anaerobic digester volatile acids / alkalinity ratio',
    description: 'VA (mg/L as acetic acid) ÷ alkalinity (mg/L as CaCO3) with guidance bands (≤ 0.25 stable, > 0.3 act; common practice), the trend over earlier ratios and the alkalinity for a target ratio.',
  },
  '/calc/endpoint-error': {
    schema: endpointErrorRequestSchema,
    summary: 'Curve insight: endpoint error of fixed endpoints against the true equivalence points',
    description: 'Model curve of a carbonate water titrated with strong acid; the true equivalence points, the error of the fixed P and T endpoints in mL, mg/L as CaCO3, meq/L and %, whether each lies on the steep part of the curve (|dpH/dV| ≥ 75 % of its peak), the SM 2320 B Table 2320:I recommended endpoint and the indicator colour-change ranges.',
  },
};

interface BenchDoc {
  summary: string;
  description: string;
  /** JSON request body. */
  schema?: z.ZodType;
  /** Query filters of a list, besides page, pageSize and sort. */
  query?: Record<string, string>;
  /** 201 for a create. */
  created?: boolean;
  multipart?: boolean;
  /** May answer 409 besides a stale version (a duplicate). */
  conflict?: boolean;
}

const LIST_QUERY = { page: 'page number, from 1', pageSize: 'rows per page (at most 200)', sort: 'field, with a leading - for descending' };
const STALE = 'A stale `version` answers 409 with the current version named in fields.version.';

/** The Bench routes (issue 5), keyed "METHOD path" as the route table records them. */
const benchDocs: Record<string, BenchDoc> = {
  'GET /samples': {
    summary: 'List samples with their current titrations',
    description: 'Samples in the caller’s scope (an operator: their utility’s facilities; the laboratory: every client), newest first by default. Dates are read in the facility’s time zone.',
    query: { ...LIST_QUERY, facilityId: 'facility id', pointId: 'monitoring point id', from: 'collected on or after (YYYY-MM-DD or an instant)', to: 'collected on or before', status: 'received, in_progress, submitted or approved' },
  },
  'POST /samples': { summary: 'Log a sample', description: 'Monitoring point, grab or composite (with start and end), collected at and by, received at, temperature on receipt (≤ 6 °C, 40 CFR 136.3 Table II), preservation, notes. Times must not be in the future.', schema: sampleCreateSchema, created: true },
  'GET /samples/{id}': { summary: 'One sample with its current titrations', description: 'A sample outside the caller’s scope answers 404.' },
  'PATCH /samples/{id}': { summary: 'Edit a sample', description: `Once a result of the sample is approved only the notes may change; results not yet approved are re-qualified. ${STALE}`, schema: sampleUpdateSchema },
  'GET /samples/{id}/titrations': { summary: 'Every titration of a sample, superseded versions included', description: 'Oldest first.', query: LIST_QUERY },
  'POST /samples/{id}/titrations': {
    summary: 'Add a titration to a sample (a draft)',
    description:
      'Alkalinity or acidity by colour indicator, potentiometric fixed endpoint, potentiometric curve (readings) or the low-alkalinity two-point method. The server recomputes the result with the shared engine using the titrant lot’s standardisation valid at analysedAt (else its nominal normality, qualified) and stores inputs and results; incomplete drafts list missingInputs.',
    schema: titrationCreateSchema,
    created: true,
  },
  'POST /bench/entries': {
    summary: 'Daily entry: a sample and its titration together, all or nothing',
    description: 'One row of the Bench entry grid: creates the sample, its titration and (with submit: true) submits it, in one transaction. Field errors are named under their part: sample.pointId, titration.volumeToTotalEndpointMl. Answers {sample, titration}.',
    schema: benchEntrySchema,
    created: true,
  },
  'POST /bench/entries/import': {
    summary: 'Import many entries at once, all or nothing',
    description: 'Up to 500 entries of the same shape as POST /bench/entries (a day’s sheet, an export of another system), each checked and computed exactly as one typed in the grid, in one transaction. The first refusal undoes them all and is named by position: entries.3.titration.titrantId. Answers {created, items: [{sampleId, titrationId, status}]}.',
    schema: benchImportSchema,
    created: true,
  },
  'GET /titrations/{id}': { summary: 'A titration with readings, derivative, sample, versions and history', description: 'The record as stored: inputs, results (with the engine’s full output and exact decimals), qualifiers, warnings, workflow stamps, every version of the result and how it compares with the point’s recent approved values.' },
  'PATCH /titrations/{id}': { summary: 'Edit a draft or returned titration', description: `Recomputes the result. Approved results are never edited; amend them instead. ${STALE}`, schema: titrationUpdateSchema },
  'POST /titrations/{id}/submit': { summary: 'Submit a draft or returned titration for review', description: `Refused (400) while inputs needed for the result are missing; qualifiers are re-decided. ${STALE}`, schema: transitionSchema },
  'POST /titrations/{id}/approve': { summary: 'Approve a submitted titration', description: `Analysts and lab administrators. Approval re-evaluates the permit periods the result touches. ${STALE}`, schema: transitionSchema },
  'POST /titrations/{id}/return': { summary: 'Return a submitted titration with a comment', description: `The comment is required. ${STALE}`, schema: returnSchema },
  'POST /titrations/{id}/amend': { summary: 'Amend an approved result', description: 'Makes a new version (draft) with a mandatory reason and the corrections; once approved it supersedes the old one. Both stay visible with the audit trail.', schema: amendSchema, created: true },
  'POST /titrations/{id}/readings': {
    summary: 'Replace a curve titration’s readings (CSV upload or JSON)',
    description:
      'multipart/form-data with one CSV file in the field "file" (header line naming volume_ml and ph, optional temperature_c; comma-separated, decimal point, cumulative volumes) and an optional version; or JSON {readings: [{volumeMl, pH, temperatureC}], version}. Errors name the line and the column; over UPLOAD_LIMIT_BYTES answers 413; up to 5,000 rows. The result is recomputed.',
    multipart: true,
  },
  'GET /titrations/{id}/audit': { summary: 'The audit trail of a result and its versions', description: 'Who, when, what changed (before and after) and why.', query: LIST_QUERY },
  'GET /review': {
    summary: 'The review queue',
    description: 'Submitted results with their qualifiers and an "unusual" flag for a value beyond three standard deviations of the point’s last 30 approved values.',
    query: { ...LIST_QUERY, facilityId: 'facility id', pointId: 'monitoring point id', analysis: 'alkalinity or acidity', qualified: 'true: only qualified results' },
  },
  'POST /review/approve': { summary: 'Approve many submitted results at once', description: 'Up to 200 {id, version} pairs; all or none.', schema: bulkApproveSchema },
  'GET /titrants': { summary: 'Titrant lots with their current standardisation', description: 'The lab’s lots (and a utility’s own); currentStandardization is the latest accepted one and whether it is still valid.', query: { ...LIST_QUERY, kind: 'acid or base', active: 'true or false', q: 'lot contains' } },
  'POST /titrants': { summary: 'Register a titrant lot', description: 'Kind, reagent (H2SO4 or HCl for acid, NaOH for base), nominal normality, lot (unique per organisation: 409 otherwise), prepared and expiry dates.', schema: titrantCreateSchema, created: true, conflict: true },
  'GET /titrants/{id}': { summary: 'One titrant lot', description: 'With its current standardisation.' },
  'PATCH /titrants/{id}': { summary: 'Edit or retire a titrant lot', description: `active: false retires the lot. ${STALE}`, schema: titrantUpdateSchema },
  'GET /titrants/{id}/standardizations': { summary: 'A lot’s standardisations', description: 'Newest first.', query: LIST_QUERY },
  'POST /titrants/{id}/standardizations': {
    summary: 'Standardise a lot against its primary standard',
    description: 'Na2CO3 for acid (SM 2320 B: N = A × B / (53.00 × C)), KHP for NaOH (SM 2310 B), as aliquots of a solution or weighed directly, in at least duplicate. The mean normality is accepted when the replicates’ RSD is within the lab’s limit (0.5 % by default) and is valid for 30 days by default.',
    schema: standardizationCreateSchema,
    created: true,
  },
  'GET /calibrations': { summary: 'pH meter calibrations', description: 'Newest first.', query: { ...LIST_QUERY, meterId: 'meter id', organizationId: 'organisation id', passed: 'true or false', from: 'calibrated at or after', to: 'calibrated at or before' } },
  'POST /calibrations': {
    summary: 'Record a pH meter calibration',
    description: 'The first two buffers give the slope (as % of the Nernst slope at the temperature) and the offset at pH 7; further buffers are read back as checks (±0.1 pH by default). Passes within the lab’s slope window (95–105 % by default). Results of that day not yet approved are re-qualified.',
    schema: calibrationCreateSchema,
    created: true,
  },
  'GET /calibrations/{id}': { summary: 'One meter calibration', description: 'With its checks and warnings.' },
  'GET /qc-batches': { summary: 'QC batches', description: 'The lab’s batches; a utility sees those covering its results.', query: { ...LIST_QUERY, analysis: 'alkalinity or acidity', passed: 'true or false', from: 'batch date on or after (YYYY-MM-DD)', to: 'batch date on or before' } },
  'POST /qc-batches': {
    summary: 'Record a QC batch',
    description: 'Duplicate pairs (RPD ≤ 10 % by default), check standards (recovery 90–110 %; true value as CaCO3 or as Na2CO3 × 100.09/105.99) and blanks below the reporting limit. A failed batch qualifies the titrations it covers (titrationIds: not yet approved, same analysis, in no other batch).',
    schema: qcBatchCreateSchema,
    created: true,
  },
  'GET /qc-batches/{id}': { summary: 'One QC batch with its evaluation', description: 'Each check against its limit, and the titrations it covers.' },
  'PATCH /qc-batches/{id}': { summary: 'Correct a QC batch', description: `Re-evaluates and re-qualifies its results. ${STALE}`, schema: qcBatchUpdateSchema },
  'GET /tools/inputs': {
    summary: 'A monitoring point’s latest approved figures for the Tools pages',
    description: 'Total and phenolphthalein alkalinity, pH, temperature, TDS, conductance, volatile acids, acidity and the titration’s sample volume, normality and endpoint volumes, each from the most recent approved result at the point that records it, with that result’s id and date; previousVolatileAcidsRatios lists the VA/alkalinity ratios of up to five earlier approved results, oldest first, for the digester trend. Answers values: {} when nothing is approved yet.',
    query: { pointId: 'monitoring point id (required)' },
  },
  'PATCH /lab-settings/bench': { summary: 'Change the lab’s bench limits', description: 'Lab administrators. Applies to results computed from now on; the change is audited.', schema: benchSettingsSchema },
  'GET /lab-settings/bench': { summary: 'The lab’s bench limits', description: 'Acceptance limits and defaults: CaCO3 factor, duplicate RPD, recovery window, electrode slope window, check-buffer tolerance, standardisation validity and RSD, holding time, receipt temperature, the review flag.' },
};

const readingsUploadBody = {
  required: true,
  content: {
    'multipart/form-data': {
      schema: { type: 'object', required: ['file'], properties: { file: { type: 'string', format: 'binary', description: 'CSV: volume_ml,ph[,temperature_c]' }, version: { type: 'integer', minimum: 0 } } },
    },
    'application/json': { schema: undefined as unknown },
  },
};

function jsonSchema(schema: z.ZodType) {
  return z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' });
}

/** Billing routes: what each does, and its request body where it has one. Money is integer cents. */
const billingDocs: Record<string, { summary: string; schema?: z.ZodType }> = {
  'GET /price-items': { summary: 'The lab’s price list and client overrides (unitAmountCents, currency, effectiveFrom/To); filter by kind, clientId' },
  'POST /price-items': { summary: 'Add a list price (clientId null) or a client’s own price, in effect from a date', schema: priceItemSchema },
  'PATCH /price-items/:id': { summary: 'Change a price’s wording, amount or end date, or withdraw it', schema: priceItemUpdateSchema },
  'GET /invoices': { summary: 'Invoices in scope, with state (draft, open, overdue, paid, void, refunded); filter by state (also unpaid), organizationId' },
  'POST /invoices': { summary: 'Make a draft invoice for a client and period from its approved, unbilled analyses (one line per kind and price: count × unit price)', schema: invoiceGenerateSchema },
  'GET /invoices/:id': { summary: 'One invoice with its lines and the samples behind each line' },
  'GET /invoices/:id/events': { summary: 'The payment-service events applied to an invoice and what each changed' },
  'POST /invoices/:id/finalise': { summary: 'Issue a draft: number, issue date, due date after termsDays; e-mailed with its PDF', schema: invoiceFinaliseSchema },
  'POST /invoices/:id/void': { summary: 'Void a draft or unpaid invoice with a reason', schema: invoiceVoidSchema },
  'POST /invoices/:id/refund': { summary: 'Refund a paid invoice in full through the payment service', schema: invoiceRefundSchema },
  'POST /invoices/:id/checkout': { summary: 'The invoice’s own utility starts paying: answers {url} of the hosted payment page' },
  'GET /invoices/:id/pdf': { summary: 'The invoice as PDF' },
  'GET /invoices/:id/receipt': { summary: 'The receipt of a paid invoice as PDF' },
  'POST /payments/webhook': { summary: 'Payment-service events, signed (Stripe-Signature header over the raw body); a repeated event id changes nothing' },
};

/** The OpenAPI 3.1 description: calculation and bench routes in full, every other route listed with its access rule. */
export function openApiDocument() {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const r of routeTable.values()) {
    const path = r.path.replace(/:(\w+)/g, '{$1}');
    const calc = calcDocs[r.path];
    const billing = billingDocs[`${r.method.toUpperCase()} ${r.path}`];
    const bench = benchDocs[`${r.method.toUpperCase()} ${path}`];
    const doc = calc ?? bench;
    const query = bench?.query ?? {};
    const op: Record<string, unknown> = {
      summary: doc?.summary ?? billing?.summary ?? `${r.method.toUpperCase()} ${r.path}`,
      ...(doc ? { description: doc.description } : {}),
      security: r.rule === 'public' ? [] : [{ bearer: [] }],
      'x-titrata-access': r.rule,
      parameters: [
        ...[...r.path.matchAll(/:(\w+)/g)].map((m) => ({ name: m[1], in: 'path', required: true, schema: { type: 'string' } })),
        ...Object.entries(query).map(([name, description]) => ({ name, in: 'query', required: false, description, schema: { type: 'string' } })),
      ],
      responses: {
        [bench?.created ? '201' : '200']: { description: bench?.created ? 'Created' : 'OK' },
        ...(r.path.includes(':') ? { '404': { description: 'Not found, or outside the caller’s scope' } } : {}),
        '400': { description: 'Bad input', content: { 'application/json': { schema: errorSchema } } },
        ...(r.rule === 'public' ? {} : { '401': { description: 'Not signed in' }, '403': { description: 'Role not allowed' } }),
      },
    };
    if (calc) op.requestBody = { required: true, content: { 'application/json': { schema: jsonSchema(calc.schema) } } };
    if (billing?.schema) op.requestBody = { required: true, content: { 'application/json': { schema: jsonSchema(billing.schema) } } };
    if (bench?.schema) op.requestBody = { required: true, content: { 'application/json': { schema: jsonSchema(bench.schema) } } };
    if (bench?.multipart) {
      const json = jsonSchema(z.object({ readings: benchReadingsSchema, version: versionField.optional() }));
      op.requestBody = { ...readingsUploadBody, content: { ...readingsUploadBody.content, 'application/json': { schema: json } } };
    }
    if (bench?.conflict || (bench?.schema && /"version"/.test(JSON.stringify(jsonSchema(bench.schema))))) (op.responses as Record<string, unknown>)['409'] = { description: 'Stale version, or a duplicate' };
    if (r.path === '/auth/login') op.requestBody = { required: true, content: { 'application/json': { schema: jsonSchema(loginSchema) } } };
    (paths[path] ??= {})[r.method] = op;
  }
  return {
    openapi: '3.1.0',
    info: {
      title: 'Titrata API',
      version: '1',
      description: 'JSON, camelCase. Sign in with POST /api/v1/auth/login and send `Authorization: Bearer <token>`. Errors: {error: {code, message, fields}}. Lists take page, pageSize, sort and answer {items, total}.',
    },
    servers: [{ url: '/api/v1' }],
    components: { securitySchemes: { bearer: { type: 'http', scheme: 'bearer', bearerFormat: 'JWT' } } },
    paths,
  };
}

export function openApiRoutes(r: RouteBuilder) {
  r.get('/openapi.json', 'public', (_req, res) => {
    res.json(openApiDocument());
  });
}
