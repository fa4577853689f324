import type { z } from 'zod';
import { InputError } from '../errors.js';

/** Dotted field path of a zod issue (`readings.3.pH`); issues on the whole body use `body`. */
export function issuePath(path: ReadonlyArray<PropertyKey>): string {
  return path.length === 0 ? 'body' : path.map((p) => String(p)).join('.');
}

/**
 * Field → reason for every zod issue, first reason per field. An unknown key is reported on the
 * key itself so the client can point at it.
 */
export function issuesToFields(issues: ReadonlyArray<z.core.$ZodIssue>): Record<string, string> {
  const fields: Record<string, string> = {};
  const put = (field: string, reason: string) => {
    if (!(field in fields)) fields[field] = reason;
  };
  for (const issue of issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) put(issuePath([...issue.path, key]), 'unknown field');
    } else {
      put(issuePath(issue.path), issue.message);
    }
  }
  return fields;
}

/**
 * Parses a request body or throws an InputError with field-level reasons. A missing body
 * (undefined or null) is parsed as `{}`, so the error names every missing required field.
 */
export function parseOrThrow<S extends z.ZodType>(schema: S, body: unknown): z.output<S> {
  const result = schema.safeParse(body === undefined || body === null ? {} : body);
  if (result.success) return result.data;
  const fields = issuesToFields(result.error.issues);
  const summary = Object.entries(fields)
    .slice(0, 5)
    .map(([field, reason]) => `${field}: ${reason}`)
    .join('; ');
  const more = Object.keys(fields).length > 5 ? ` (and ${Object.keys(fields).length - 5} more)` : '';
  throw new InputError(`Invalid input: ${summary}${more}`, fields);
}
