import type { Order } from 'sequelize';
import { listQuerySchema, type ListQuery } from '../../shared/schemas/common.js';
import { parseOrThrow } from '../../shared/schemas/parse.js';
import { ValidationError } from '../errors.js';

export interface ListParams {
  query: ListQuery;
  limit: number;
  offset: number;
  order: Order;
}

/**
 * Paging and sorting for every list: `page`, `pageSize`, `sort` (`name` or `-name`),
 * checked against the fields a list allows, so no client string reaches SQL.
 */
export function listParams(raw: unknown, sortable: Record<string, string | string[]>, defaultSort: string): ListParams {
  const query = parseOrThrow(listQuerySchema, raw);
  const sort = query.sort ?? defaultSort;
  const desc = sort.startsWith('-');
  const key = desc ? sort.slice(1) : sort;
  const column = sortable[key];
  if (!column) throw new ValidationError('The list cannot be sorted that way.', { sort: `one of ${Object.keys(sortable).join(', ')}` });
  const cols = Array.isArray(column) ? column : [column];
  const order = [...cols.map((c) => [...c.split('.'), desc ? 'DESC' : 'ASC']), ['id', 'ASC']] as Order;
  return { query, limit: query.pageSize, offset: (query.page - 1) * query.pageSize, order };
}

/** A boolean query flag: `true`/`false`/`1`/`0`; anything else is a 400 naming the field. */
export function boolParam(raw: unknown, field: string): boolean | undefined {
  if (raw === undefined || raw === '') return undefined;
  if (raw === 'true' || raw === '1') return true;
  if (raw === 'false' || raw === '0') return false;
  throw new ValidationError(`${field} must be true or false.`, { [field]: 'true or false' });
}

/** An integer id query parameter or undefined; anything else is a 400 naming the field. */
export function idParam(raw: unknown, field: string): number | undefined {
  if (raw === undefined || raw === '') return undefined;
  const n = Number(raw);
  if (!Number.isInteger(n) || n <= 0) throw new ValidationError(`${field} must be an id.`, { [field]: 'must be an id' });
  return n;
}
