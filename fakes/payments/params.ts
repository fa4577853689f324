// Reading form-encoded parameters the way the provider does. Requests arrive as
// application/x-www-form-urlencoded with bracketed keys (`metadata[invoiceId]=…`,
// `line_items[0][quantity]=1`), decoded by qs into nested objects; every leaf is a string.
import { invalidParam, missingParam, unknownParam } from './errors.js';

export type Params = Record<string, unknown>;

export function isObject(value: unknown): value is Params {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Path of a nested parameter as the provider names it in errors: `a[b][0]`. */
export function paramPath(prefix: string, key: string | number): string {
  return prefix ? `${prefix}[${key}]` : String(key);
}

/** Unknown parameters are an error, not silently ignored (the provider's API reference: errors). */
export function rejectUnknown(params: Params, allowed: readonly string[], prefix = ''): void {
  for (const key of Object.keys(params)) {
    if (!allowed.includes(key)) throw unknownParam(paramPath(prefix, key));
  }
}

export function requireObject(value: unknown, param: string): Params {
  if (value === undefined) return {};
  if (!isObject(value)) throw invalidParam(param, `Invalid object`, 'parameter_invalid_object');
  return value;
}

/**
 * An array parameter. qs turns `a[0]=…&a[1]=…` into an array, but an index past its array
 * limit, or sparse indices, into an object with numeric keys; both mean the same list.
 */
export function readArray(value: unknown, param: string): unknown[] | undefined {
  if (value === undefined || value === '') return undefined;
  if (Array.isArray(value)) return value;
  if (isObject(value) && Object.keys(value).every((k) => /^\d+$/.test(k))) {
    return Object.keys(value)
      .sort((a, b) => Number(a) - Number(b))
      .map((k) => value[k]);
  }
  throw invalidParam(param, `Invalid array`, 'parameter_invalid_array');
}

export function readString(
  params: Params,
  key: string,
  opts: { prefix?: string; required?: boolean; max?: number } = {},
): string | undefined {
  const param = paramPath(opts.prefix ?? '', key);
  const value = params[key];
  if (value === undefined || value === '') {
    if (opts.required) throw missingParam(param);
    return undefined;
  }
  if (typeof value !== 'string') throw invalidParam(param, `Invalid string: ${param} must be a string`);
  if (opts.max !== undefined && value.length > opts.max) {
    throw invalidParam(param, `Invalid string: ${param} must be at most ${opts.max} characters`, 'parameter_invalid_string');
  }
  return value;
}

export function readInt(
  params: Params,
  key: string,
  opts: { prefix?: string; required?: boolean; min?: number; max?: number } = {},
): number | undefined {
  const param = paramPath(opts.prefix ?? '', key);
  const value = params[key];
  if (value === undefined || value === '') {
    if (opts.required) throw missingParam(param);
    return undefined;
  }
  if (typeof value !== 'string' || !/^-?\d+$/.test(value) || !Number.isSafeInteger(Number(value))) {
    throw invalidParam(param, `Invalid integer: ${typeof value === 'string' ? value : param}`, 'parameter_invalid_integer');
  }
  const n = Number(value);
  if (opts.min !== undefined && n < opts.min) {
    throw invalidParam(param, `This value must be greater than or equal to ${opts.min}.`, 'parameter_invalid_integer');
  }
  if (opts.max !== undefined && n > opts.max) {
    throw invalidParam(param, `This value must be less than or equal to ${opts.max}.`, 'parameter_invalid_integer');
  }
  return n;
}

export function readEnum<T extends string>(
  params: Params,
  key: string,
  values: readonly T[],
  opts: { prefix?: string; required?: boolean } = {},
): T | undefined {
  const value = readString(params, key, opts);
  if (value === undefined) return undefined;
  if (!values.includes(value as T)) {
    const param = paramPath(opts.prefix ?? '', key);
    throw invalidParam(param, `Invalid ${param}: must be one of ${values.join(', ')}`, 'parameter_invalid_string');
  }
  return value as T;
}

/** An absolute http(s) URL (the provider answers "Not a valid URL" otherwise). */
export function readUrl(params: Params, key: string, opts: { required?: boolean } = {}): string | undefined {
  const value = readString(params, key, { ...opts, max: 5000 });
  if (value === undefined) return undefined;
  let ok = false;
  try {
    const url = new URL(value);
    ok = url.protocol === 'http:' || url.protocol === 'https:';
  } catch {
    ok = false;
  }
  if (!ok) throw invalidParam(key, 'Not a valid URL', 'url_invalid');
  return value;
}

/** Deliberately loose, like most address checks: something@something.tld. */
export function readEmail(params: Params, key: string): string | undefined {
  const value = readString(params, key, { max: 512 });
  if (value === undefined) return undefined;
  if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(value)) throw invalidParam(key, `Invalid email address: ${value}`, 'email_invalid');
  return value;
}

/**
 * Metadata: up to 50 keys, keys up to 40 characters, values up to 500 (the provider's API
 * reference: "Metadata"). An empty value removes the key when updating.
 */
export function readMetadata(
  params: Params,
  key: string,
  existing: Record<string, string> = {},
  prefix = '',
): Record<string, string> {
  const param = paramPath(prefix, key);
  const value = params[key];
  if (value === undefined) return { ...existing };
  if (value === '') return {};
  if (!isObject(value)) throw invalidParam(param, 'Invalid object', 'parameter_invalid_object');
  const out: Record<string, string> = { ...existing };
  for (const [k, v] of Object.entries(value)) {
    if (k.length > 40) throw invalidParam(paramPath(param, k), `Invalid metadata: keys can be at most 40 characters`);
    if (typeof v !== 'string') throw invalidParam(paramPath(param, k), `Invalid metadata: values must be strings`);
    if (v.length > 500) throw invalidParam(paramPath(param, k), `Invalid metadata: values can be at most 500 characters`);
    if (v === '') delete out[k];
    else out[k] = v;
  }
  if (Object.keys(out).length > 50) throw invalidParam(param, 'Invalid metadata: metadata can have at most 50 keys');
  return out;
}

/** `expand[]` may come as expand[0]=a&expand[1]=b or a single expand=a. */
export function readExpand(params: Params): string[] {
  const value = params.expand;
  if (value === undefined) return [];
  if (typeof value === 'string') return [value];
  const list = readArray(value, 'expand') ?? [];
  return list.map((v, i) => {
    if (typeof v !== 'string') throw invalidParam(`expand[${i}]`, 'Invalid string');
    return v;
  });
}

export interface ListParams {
  limit: number;
  startingAfter?: string;
  endingBefore?: string;
}

/** Cursor pagination: limit 1–100, default 10 (the provider's API reference: "Pagination"). */
export function readListParams(params: Params): ListParams {
  return {
    limit: readInt(params, 'limit', { min: 1, max: 100 }) ?? 10,
    startingAfter: readString(params, 'starting_after'),
    endingBefore: readString(params, 'ending_before'),
  };
}

/** Key order independent serialisation, to compare two requests' parameters. */
export function stableStringify(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(stableStringify).join(',')}]`;
  if (isObject(value)) {
    return `{${Object.keys(value)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${stableStringify(value[k])}`)
      .join(',')}}`;
  }
  return JSON.stringify(value ?? null);
}

/**
 * `created` list filter: an exact unix time or a range with gt/gte/lt/lte
 * (the provider's API reference: list endpoints' `created` parameter).
 */
export function readCreatedFilter(params: Params): (created: number) => boolean {
  const value = params.created;
  if (value === undefined || value === '') return () => true;
  if (typeof value === 'string') {
    const exact = readInt(params, 'created')!;
    return (c) => c === exact;
  }
  if (!isObject(value)) throw invalidParam('created', 'Invalid object', 'parameter_invalid_object');
  rejectUnknown(value, ['gt', 'gte', 'lt', 'lte'], 'created');
  const gt = readInt(value, 'gt', { prefix: 'created' });
  const gte = readInt(value, 'gte', { prefix: 'created' });
  const lt = readInt(value, 'lt', { prefix: 'created' });
  const lte = readInt(value, 'lte', { prefix: 'created' });
  return (c) =>
    (gt === undefined || c > gt) && (gte === undefined || c >= gte) && (lt === undefined || c < lt) && (lte === undefined || c <= lte);
}
