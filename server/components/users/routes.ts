import { Router } from 'express';
import { createUserRequestSchema, listUsersQuerySchema, updateUserRequestSchema } from '../../../shared/api/users';
import { idParamsSchema } from '../../../shared/api/params';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { UsersService } from './service';

/** Users and roles: administrators only. */
export function userRoutes(users: UsersService): Router {
  const router = Router();
  router.use(requireRole('admin'));
  router.get('/', async (req, res) => {
    res.json(await users.list(parse(listUsersQuerySchema, req.query)));
  });
  router.post('/', async (req, res) => {
    res.status(201).json(await users.create(req.user!, parse(createUserRequestSchema, req.body)));
  });
  router.patch('/:id', async (req, res) => {
    const { id } = parse(idParamsSchema, req.params);
    res.json(await users.update(req.user!, id, parse(updateUserRequestSchema, req.body)));
  });
  return router;
}
