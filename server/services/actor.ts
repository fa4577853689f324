import type { Request } from 'express';
import type { Role } from '../../shared/roles.js';
import { Organization, type User } from '../db/models/index.js';
import { UnauthenticatedError } from '../errors.js';

/** Who is calling: the user, their role and the organisations they may see. */
export interface Actor {
  user: User;
  id: number;
  role: Role;
  organizationId: number;
  orgKind: 'laboratory' | 'utility';
  /** The laboratory this actor works for or is served by. */
  labId: number;
  /** The lab sees itself and its clients; a utility sees itself. */
  visibleOrgIds: number[];
  ip: string | null;
}

declare module 'express-serve-static-core' {
  interface Request {
    actor?: Actor;
  }
}

/** The authenticated actor of a request (the authenticate middleware has run). */
export function actorOf(req: Request): Actor {
  if (!req.actor) throw new UnauthenticatedError();
  return req.actor;
}

/**
 * The actor for a user whose organisation is loaded: the lab sees itself and its clients, a
 * utility sees itself. Used by authenticate (which has read the clients' ids with the user) and
 * by the demo seed, which acts as demo users.
 */
export async function actorFor(user: User, ip: string | null = null, clientIds?: number[]): Promise<Actor> {
  const org = user.organization;
  if (!org) throw new UnauthenticatedError();
  const labId = org.kind === 'laboratory' ? org.id : (org.labId ?? org.id);
  let visibleOrgIds = [org.id];
  if (org.kind === 'laboratory') {
    const clients = clientIds ?? (await Organization.findAll({ where: { labId: org.id }, attributes: ['id'] })).map((c) => c.id);
    visibleOrgIds = [org.id, ...clients];
  }
  return { user, id: user.id, role: user.role, organizationId: org.id, orgKind: org.kind, labId, visibleOrgIds, ip };
}
