import { z } from 'zod';
import { text } from './common.js';

export const acknowledgeSchema = z.object({ correctiveAction: text(4000) });
export const closeExceedanceSchema = z.object({ reason: text(1000) });
export const complianceQuerySchema = z.object({
  facilityId: z.coerce.number({ error: 'must be an id' }).int('must be an id').positive('must be an id'),
  month: z.string({ error: 'required' }).regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'a month as YYYY-MM'),
});
export const projectionAlertSchema = z.object({
  facilityId: z.coerce.number({ error: 'must be an id' }).int('must be an id').positive('must be an id'),
});
