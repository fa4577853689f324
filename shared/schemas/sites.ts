import { z } from 'zod';
import { email, id, optionalEmail, optionalText, text, timezone } from './common.js';

export const FACILITY_KINDS = ['drinking_water', 'wastewater', 'industrial'] as const;
export const FACILITY_KIND_LABELS: Record<(typeof FACILITY_KINDS)[number], string> = {
  drinking_water: 'Drinking water',
  wastewater: 'Wastewater',
  industrial: 'Industrial',
};
export const POINT_MATRICES = ['raw', 'finished', 'influent', 'effluent', 'process', 'digester'] as const;
export const POINT_MATRIX_LABELS: Record<(typeof POINT_MATRICES)[number], string> = {
  raw: 'Raw water',
  finished: 'Finished water',
  influent: 'Influent',
  effluent: 'Effluent',
  process: 'Process',
  digester: 'Digester',
};

export const organizationSchema = z.object({
  name: text(160),
  contactEmail: optionalEmail,
  billingEmail: optionalEmail,
  address: optionalText(400),
});
export const organizationUpdateSchema = organizationSchema.partial().extend({ active: z.boolean().optional() });

export const facilitySchema = z.object({
  organizationId: id,
  name: text(160),
  kind: z.enum(FACILITY_KINDS, { error: 'one of drinking_water, wastewater, industrial' }),
  address: optionalText(400),
  timezone,
});
export const facilityUpdateSchema = facilitySchema.omit({ organizationId: true }).partial().extend({ active: z.boolean().optional() });

export const pointSchema = z.object({
  code: z.string({ error: 'required' }).trim().min(1, 'required').max(32, 'at most 32 characters').regex(/^[A-Za-z0-9._-]+$/, 'letters, digits, dot, dash or underscore'),
  name: text(160),
  matrix: z.enum(POINT_MATRICES, { error: `one of ${POINT_MATRICES.join(', ')}` }),
});
export const pointUpdateSchema = pointSchema.partial().extend({ active: z.boolean().optional() });

export { email };
