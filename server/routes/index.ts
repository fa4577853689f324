import type { Router } from 'express';
import type { AppDeps } from '../app.js';
import { authenticate } from '../middleware/authenticate.js';
import { auditRoutes } from './audit.js';
import { authRoutes } from './auth.js';
import { billingRoutes } from './billing.js';
import { calcRoutes } from './calc.js';
import { complianceRoutes } from './compliance.js';
import { healthRoutes } from './health.js';
import { openApiRoutes } from './openapi.js';
import { permitRoutes } from './permits.js';
import { labQcRoutes } from './labQc.js';
import { routes } from './registry.js';
import { reportRoutes } from './reports.js';
import { sampleRoutes } from './samples.js';
import { titrationRoutes } from './titrations.js';
import { toolRoutes } from './tools.js';
import { siteRoutes } from './sites.js';
import { userRoutes } from './users.js';

/** Every /api/v1 route, declared through the one builder that records its rule. */
export function apiRouter(deps: AppDeps): Router {
  const r = routes(authenticate(deps.config));
  healthRoutes(r, deps.sequelize);
  authRoutes(r, deps.config);
  userRoutes(r);
  siteRoutes(r);
  auditRoutes(r);
  calcRoutes(r);
  toolRoutes(r);
  permitRoutes(r);
  complianceRoutes(r);
  openApiRoutes(r);
  sampleRoutes(r);
  titrationRoutes(r, deps.config);
  labQcRoutes(r);
  reportRoutes(r);
  billingRoutes(r);
  return r.router;
}
