import { z } from 'zod';

/** List query: page (1-based), pageSize (≤ 200), sort (`field` or `-field`), free-text `q`. */
export const listQuerySchema = z.object({
  page: z.coerce.number({ error: 'must be a whole number' }).int('must be a whole number').min(1, 'must be 1 or more').default(1),
  pageSize: z.coerce.number({ error: 'must be a whole number' }).int('must be a whole number').min(1, 'must be 1 or more').max(200, 'at most 200').default(25),
  sort: z.string().max(60).regex(/^-?[A-Za-z][A-Za-z0-9]*$/, 'a field name, optionally prefixed by -').optional(),
  q: z.string().max(120).optional(),
});
export type ListQuery = z.infer<typeof listQuerySchema>;

export interface Page<T> {
  items: T[];
  total: number;
}

/** Text fields: trimmed, with a length cap; empty → null for optional ones. */
export const text = (max: number) => z.string({ error: 'required' }).trim().min(1, 'required').max(max, `at most ${max} characters`);
export const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `at most ${max} characters`)
    .nullish()
    .transform((v) => (v ? v : null));
export const email = z.string({ error: 'required' }).trim().toLowerCase().email('not a valid e-mail address').max(254);
export const optionalEmail = z
  .union([z.literal(''), email])
  .nullish()
  .transform((v) => (v ? v : null));
export const id = z.coerce.number({ error: 'must be an id' }).int('must be an id').positive('must be an id');

/** IANA time zone names the runtime knows. */
export const timezone = z.string({ error: 'required' }).refine((tz) => {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: tz });
    return tz.includes('/') || tz === 'UTC';
  } catch {
    return false;
  }
}, 'not a known time zone (e.g. America/Chicago)');
