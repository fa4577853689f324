import type { RequestHandler } from 'express';
import type { Config } from '../config.js';
import { QueryTypes } from 'sequelize';
import { fromRow, selectList } from '../db/rawRows.js';
import { sequelize } from '../db/current.js';
import { Organization, User } from '../db/models/index.js';
import { UnauthenticatedError } from '../errors.js';
import { actorFor } from '../services/actor.js';
import { verifyToken } from '../services/tokens.js';

export type AuthMiddleware = RequestHandler;

/**
 * Bearer token → `req.actor`. The user is re-read on every request so that a
 * deactivated user or a changed password ends old sessions at once.
 */
export function authenticate(config: Config): AuthMiddleware {
  return async (req, _res, next) => {
    const header = req.get('authorization') ?? '';
    const m = /^Bearer\s+(.+)$/i.exec(header);
    const claims = m ? verifyToken(config, m[1].trim()) : null;
    if (!claims) return next(new UnauthenticatedError(m ? 'Your session is not valid or has expired. Sign in again.' : 'Sign in to continue.'));
    const session = await sessionUser(claims.userId);
    const user = session?.user;
    if (!user || !user.active || user.tokenVersion !== claims.tokenVersion || !user.organization?.active) {
      return next(new UnauthenticatedError('Your session is not valid or has expired. Sign in again.'));
    }
    req.actor = await actorFor(user, req.ip ?? null, session.clientIds);
    next();
  };
}

let sessionSql: string | null = null;

/**
 * The user, their organisation and (for a lab) its client organisations in one statement, on
 * every request: the same rows `findByPk` with the organisation included and the clients'
 * query would read, without building the query and grouping the join each time.
 */
async function sessionUser(id: number): Promise<{ user: User; clientIds: number[] } | null> {
  sessionSql ??= `SELECT ${selectList(User, 'u')}, ${selectList(Organization, 'o', 'org.')},
      (SELECT GROUP_CONCAT(c.id ORDER BY c.id) FROM organizations c WHERE c.lab_id = o.id) AS clientIds
    FROM users u JOIN organizations o ON o.id = u.organization_id WHERE u.id = ?`;
  const [row] = await sequelize().query<Record<string, unknown>>(sessionSql, { replacements: [id], type: QueryTypes.SELECT });
  if (!row) return null;
  const user = fromRow(User, row);
  user.organization = fromRow(Organization, row, 'org.');
  const clientIds = typeof row.clientIds === 'string' && row.clientIds ? row.clientIds.split(',').map(Number) : [];
  return { user, clientIds };
}
