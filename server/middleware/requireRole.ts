import type { RequestHandler } from 'express';
import { can, type Capability } from '../../shared/roles.js';
import { ForbiddenError, UnauthenticatedError } from '../errors.js';

/** 403 unless the signed-in actor's role holds `capability` (shared/roles.ts). */
export function requireCapability(capability: Capability): RequestHandler {
  return (req, _res, next) => {
    if (!req.actor) return next(new UnauthenticatedError());
    if (!can(req.actor.role, capability)) return next(new ForbiddenError());
    next();
  };
}
