import { z } from 'zod';

export const PASSWORD_MIN_LENGTH = 10;

const email = z.string({ error: 'required' }).trim().toLowerCase().email('not a valid e-mail address').max(254);

export const loginSchema = z.object({
  email,
  password: z.string({ error: 'required' }).min(1, 'required').max(200),
});

/** Length here; the server adds the common-password check (its dictionary is too large for the client). */
export const newPasswordSchema = z
  .string({ error: 'required' })
  .min(PASSWORD_MIN_LENGTH, `at least ${PASSWORD_MIN_LENGTH} characters`)
  .max(200, 'at most 200 characters');

export const changePasswordSchema = z.object({
  currentPassword: z.string({ error: 'required' }).min(1, 'required'),
  newPassword: newPasswordSchema,
});
