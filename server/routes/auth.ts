import rateLimit from 'express-rate-limit';
import type { Request, RequestHandler } from 'express';
import { ErrorCode } from '../../shared/errors.js';
import { changePasswordSchema, loginSchema } from '../../shared/schemas/auth.js';
import { parseOrThrow } from '../../shared/schemas/parse.js';
import type { Config } from '../config.js';
import { actorOf } from '../services/actor.js';
import { changeOwnPassword, login, sessionUser } from '../services/auth.js';
import { signToken } from '../services/tokens.js';
import type { RouteBuilder } from './registry.js';

function limiter(config: Config, key: (req: Request) => string): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60_000,
    limit: config.LOGIN_RATE_LIMIT,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    keyGenerator: key,
    validate: { keyGeneratorIpFallback: false },
    handler: (_req, res) => {
      res.status(429).json({ error: { code: ErrorCode.tooMany, message: 'Too many sign-in attempts. Wait a few minutes and try again.' } });
    },
  });
}

export function authRoutes(r: RouteBuilder, config: Config) {
  const perIp = limiter(config, (req) => `ip:${req.ip}`);
  const perAccount = limiter(config, (req) => `acct:${String(req.body?.email ?? '').trim().toLowerCase()}`);

  r.post('/auth/login', 'public', perIp, perAccount, async (req, res) => {
    const { email, password } = parseOrThrow(loginSchema, req.body);
    res.json(await login(config, email, password, req.ip ?? null));
  });

  r.get('/auth/me', 'signed_in', (req, res) => {
    res.json(sessionUser(actorOf(req).user));
  });

  r.post('/auth/password', 'signed_in', async (req, res) => {
    const body = parseOrThrow(changePasswordSchema, req.body);
    const actor = actorOf(req);
    const version = await changeOwnPassword(actor, body.currentPassword, body.newPassword);
    res.json({ ...signToken(config, actor.id, version), user: sessionUser(actor.user) });
  });
}
