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

/** The OpenAPI 3.1 description: calculation routes in full, every other route listed with its access rule. */
export function openApiDocument() {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const r of routeTable.values()) {
    const path = r.path.replace(/:(\w+)/g, '{$1}');
    const calc = calcDocs[r.path];
    const billing = billingDocs[`${r.method.toUpperCase()} ${r.path}`];
    const op: Record<string, unknown> = {
      summary: calc?.summary ?? billing?.summary ?? `${r.method.toUpperCase()} ${r.path}`,
      ...(calc ? { description: calc.description } : {}),
      security: r.rule === 'public' ? [] : [{ bearer: [] }],
      'x-titrata-access': r.rule,
      parameters: [...r.path.matchAll(/:(\w+)/g)].map((m) => ({ name: m[1], in: 'path', required: true, schema: { type: 'string' } })),
      responses: {
        '200': { description: 'OK' },
        '400': { description: 'Bad input', content: { 'application/json': { schema: errorSchema } } },
        ...(r.rule === 'public' ? {} : { '401': { description: 'Not signed in' }, '403': { description: 'Role not allowed' } }),
      },
    };
    if (calc) op.requestBody = { required: true, content: { 'application/json': { schema: jsonSchema(calc.schema) } } };
    if (billing?.schema) op.requestBody = { required: true, content: { 'application/json': { schema: jsonSchema(billing.schema) } } };
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
