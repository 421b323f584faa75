import { createUserSchema, updateUserSchema } from '../../shared/auth/user-schemas';
import type { RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { createUser, listUsers, updateUser } from './user-service';
import type { DataSource } from 'typeorm';
import { z } from 'zod';

const idParam = z.object({ id: z.string().uuid('User ids are UUIDs') });

/** Admin: list, create and change users (roles, site membership, disabled). */
export function registerUserRoutes(r: RouteRegistry, ds: DataSource): void {
  r.add('get', '/api/users', ['admin'], async () => {
    const items = await listUsers(ds);
    return { items, total: items.length };
  });

  r.add('post', '/api/users', ['admin'], async (req, res) => {
    const user = await createUser(ds, parse(createUserSchema, req.body));
    res.status(201);
    return { user };
  });

  r.add('patch', '/api/users/:id', ['admin'], async (req) => {
    const { id } = parse(idParam, req.params);
    return { user: await updateUser(ds, id, parse(updateUserSchema, req.body)) };
  });
}
