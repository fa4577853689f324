import type { Transaction } from 'sequelize';
import { batchInsert } from '../db/batchInsert.js';
import { AuditEvent } from '../db/models/index.js';
import type { Actor } from './actor.js';

export interface AuditEntry {
  action: string;
  entity: string;
  entityId?: string | number | null;
  organizationId?: number | null;
  before?: object | null;
  after?: object | null;
  reason?: string | null;
}

const HIDDEN = new Set(['passwordHash', 'tokenVersion']);
const ASSOCIATIONS = new Set(['organization', 'facility', 'point', 'points', 'lab', 'clients', 'actor', 'sample', 'titrant']);

/** A plain copy of a record for the audit log, without secrets or loaded associations. */
export function snapshot(record: object | null | undefined, leaveOut?: (key: string) => boolean): object | null {
  if (!record) return null;
  const withGet = record as { get?: (o: { plain: true }) => object };
  const plain = (typeof withGet.get === 'function' ? withGet.get({ plain: true }) : record) as Record<string, unknown>;
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(plain)) if (!HIDDEN.has(k) && !ASSOCIATIONS.has(k) && !leaveOut?.(k)) out[k] = plain[k];
  return out;
}

/** Writes one audit event in the caller's transaction (who, what, before, after, why, from where). */
export async function audit(actor: Actor | null, entry: AuditEntry, transaction?: Transaction): Promise<void> {
  // In a transaction (nearly always) the batch insert of one row: the same row, without create's per-row machinery.
  if (transaction) await auditMany(actor, [entry], transaction);
  else await AuditEvent.create(eventFields(actor, entry));
}

/** Many audit events in one insert (an import), each exactly as `audit` would write it. */
export async function auditMany(actor: Actor | null, entries: AuditEntry[], transaction?: Transaction): Promise<void> {
  if (!transaction) throw new Error('auditMany runs in the caller’s transaction');
  await batchInsert(AuditEvent, entries.map((e) => eventFields(actor, e)), transaction);
}

function eventFields(actor: Actor | null, entry: AuditEntry) {
  return {
      actorUserId: actor?.id ?? null,
      organizationId: entry.organizationId ?? actor?.organizationId ?? null,
      action: entry.action,
      entity: entry.entity,
      entityId: entry.entityId === undefined || entry.entityId === null ? null : String(entry.entityId),
      before: entry.before ?? null,
      after: entry.after ?? null,
      reason: entry.reason ?? null,
      ip: actor?.ip ?? null,
  };
}
