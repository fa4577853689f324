import { Op, type WhereOptions } from 'sequelize';
import { NotFoundError } from '../errors.js';
import type { Actor } from './actor.js';

/**
 * The one place tenancy is decided. Every query on tenant data goes through one of these,
 * so a utility's people never see another utility's rows and the lab sees its clients.
 */
export function orgScope(actor: Actor, column = 'organizationId'): WhereOptions {
  return { [column]: { [Op.in]: actor.visibleOrgIds } };
}

/** True when the actor may see records of organisation `orgId`. */
export function inScope(actor: Actor, orgId: number | null | undefined): boolean {
  return orgId !== null && orgId !== undefined && actor.visibleOrgIds.includes(orgId);
}

/**
 * Throws 404 (not 403) for a record outside the actor's scope, so ids of other tenants
 * cannot be probed.
 */
export function assertInScope(actor: Actor, orgId: number | null | undefined, what: string): void {
  if (!inScope(actor, orgId)) throw new NotFoundError(what);
}

/**
 * Records a laboratory keeps for the clients it serves (titrant lots): visible to their own
 * organisation, to its lab, and to the lab's clients, which titrate with the lab's lots.
 */
export function sharedScope(actor: Actor, column = 'organizationId'): WhereOptions {
  return { [column]: { [Op.in]: [...new Set([...actor.visibleOrgIds, actor.labId])] } };
}

/** 404 unless the actor may see a shared record of organisation `orgId` (see sharedScope). */
export function assertInSharedScope(actor: Actor, orgId: number | null | undefined, what: string): void {
  if (!(inScope(actor, orgId) || (orgId !== null && orgId !== undefined && orgId === actor.labId))) throw new NotFoundError(what);
}
