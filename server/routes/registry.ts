import { Router, type RequestHandler } from 'express';
import type { Capability } from '../../shared/roles.js';
import type { AuthMiddleware } from '../middleware/authenticate.js';
import { requireCapability } from '../middleware/requireRole.js';

/** Who may call a route: anyone, any signed-in user, or holders of a capability (shared/roles.ts). */
export type Rule = 'public' | 'signed_in' | Capability;

export interface RouteInfo {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string;
  rule: Rule;
}

/**
 * Every API route is declared through this builder, which records it with its rule. The
 * route × role test reads `routeTable` and also counts Express's own route layers, so a
 * route added some other way, or without a rule, fails that test.
 */
export const routeTable = new Map<string, RouteInfo>();

export interface RouteBuilder {
  router: Router;
  get(path: string, rule: Rule, ...handlers: RequestHandler[]): void;
  post(path: string, rule: Rule, ...handlers: RequestHandler[]): void;
  put(path: string, rule: Rule, ...handlers: RequestHandler[]): void;
  patch(path: string, rule: Rule, ...handlers: RequestHandler[]): void;
  delete(path: string, rule: Rule, ...handlers: RequestHandler[]): void;
}

export function routes(authenticate: AuthMiddleware): RouteBuilder {
  const router = Router();
  const add =
    (method: RouteInfo['method']) =>
    (path: string, rule: Rule, ...handlers: RequestHandler[]) => {
      routeTable.set(`${method.toUpperCase()} ${path}`, { method, path, rule });
      const guards: RequestHandler[] = rule === 'public' ? [] : rule === 'signed_in' ? [authenticate] : [authenticate, requireCapability(rule)];
      router[method](path, ...guards, ...handlers);
    };
  return { router, get: add('get'), post: add('post'), put: add('put'), patch: add('patch'), delete: add('delete') };
}
