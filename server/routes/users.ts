import { id } from '../../shared/schemas/common.js';
import { parseOrThrow } from '../../shared/schemas/parse.js';
import { userCreateSchema, userUpdateSchema } from '../../shared/schemas/users.js';
import { ValidationError } from '../errors.js';
import { actorOf } from '../services/actor.js';
import { createUser, getUser, listUsers, resetPassword, updateUser } from '../services/users.js';
import type { RouteBuilder } from './registry.js';

/** A path id, or 400 naming `id`. */
const idOf = (v: unknown) => {
  const parsed = id.safeParse(v);
  if (!parsed.success) throw new ValidationError('The id in the path is not valid.', { id: 'must be a positive whole number' });
  return parsed.data;
};

export function userRoutes(r: RouteBuilder) {
  r.get('/users', 'users.manage', async (req, res) => {
    res.json(await listUsers(actorOf(req), req.query as Record<string, unknown>));
  });
  r.post('/users', 'users.manage', async (req, res) => {
    res.status(201).json(await createUser(actorOf(req), parseOrThrow(userCreateSchema, req.body)));
  });
  r.get('/users/:id', 'users.manage', async (req, res) => {
    res.json(await getUser(actorOf(req), idOf(req.params.id)));
  });
  r.patch('/users/:id', 'users.manage', async (req, res) => {
    res.json(await updateUser(actorOf(req), idOf(req.params.id), parseOrThrow(userUpdateSchema, req.body)));
  });
  r.post('/users/:id/reset-password', 'users.manage', async (req, res) => {
    res.json(await resetPassword(actorOf(req), idOf(req.params.id)));
  });
}

export { idOf };
