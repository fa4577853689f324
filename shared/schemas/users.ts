import { z } from 'zod';
import { ROLES } from '../roles.js';
import { email, id, text } from './common.js';

export const userCreateSchema = z.object({
  email,
  name: text(160),
  role: z.enum(ROLES, { error: `one of ${ROLES.join(', ')}` }),
  organizationId: id,
});
export const userUpdateSchema = z.object({
  name: text(160).optional(),
  role: z.enum(ROLES, { error: `one of ${ROLES.join(', ')}` }).optional(),
  active: z.boolean().optional(),
});
