import type { Request } from 'express';
import type { Role } from '../../shared/roles.js';
import type { User } from '../db/models/index.js';
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
