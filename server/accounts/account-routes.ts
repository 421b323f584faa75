import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { ALL_ROLES, type RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import type { Mailer } from '../mail/mailer';
import { hashPassword } from '../users/user-service';
import {
  acceptSchema,
  changePasswordSchema,
  invitationSchema,
  resetConfirmSchema,
  resetRequestSchema,
  tokenSchema,
} from './account-schemas';
import { acceptInvitation, invite, listInvitations, lookupInvitation, revokeInvitation } from './invitations';
import { changePassword, confirmReset, requestReset } from './passwords';
import { resetRateLimit } from './reset-rate-limit';

export const RESET_REQUESTED =
  'If this address belongs to an account, a link to set a new password is on its way. It works once, within 60 minutes.';

const idParam = z.object({ id: z.string().uuid('Invitation ids are UUIDs') });

/** Invitations (admins and leads), accepting one (public), password change (signed in) and reset (public). */
export function registerAccountRoutes(r: RouteRegistry, ds: DataSource, mailer: Mailer): void {
  r.add('post', '/api/invitations', ['admin', 'lead'], async (req, res) => {
    const input = parse(invitationSchema, req.body);
    const invitation = await invite(ds, mailer, req.user!, input, mailer.config.appOrigin);
    res.status(201);
    return { invitation };
  });

  r.add('get', '/api/invitations', ['admin', 'lead'], async (req) => {
    const items = await listInvitations(ds, req.user!);
    return { items, total: items.length };
  });

  r.add('delete', '/api/invitations/:id', ['admin', 'lead'], async (req, res) => {
    await revokeInvitation(ds, req.user!, parse(idParam, req.params).id);
    res.status(204).end();
  });

  r.add('post', '/api/invitations/lookup', 'public', async (req) => ({
    invitation: await lookupInvitation(ds, parse(tokenSchema, req.body).token),
  }));

  r.add('post', '/api/invitations/accept', 'public', async (req, res) => {
    const account = await acceptInvitation(ds, parse(acceptSchema, req.body), hashPassword);
    res.status(201);
    return { account };
  });

  r.add('post', '/api/auth/password', ALL_ROLES, async (req, res) => {
    const body = parse(changePasswordSchema, req.body);
    await changePassword(ds, req.user!.id, req.sessionID, body.currentPassword, body.newPassword);
    res.status(204).end();
  });

  r.add(
    'post',
    '/api/auth/password-reset',
    'public',
    (req, res) => {
      const { email } = parse(resetRequestSchema, req.body);
      // Answered before the lookup and the mail, so the time taken says nothing about the address.
      requestReset(ds, mailer, email, mailer.config.appOrigin).catch((err: Error) =>
        console.error('[mail] reset link not sent:', err.message),
      );
      res.status(202);
      return { message: RESET_REQUESTED };
    },
    resetRateLimit(ds),
  );

  r.add('post', '/api/auth/password-reset/confirm', 'public', async (req, res) => {
    const body = parse(resetConfirmSchema, req.body);
    await confirmReset(ds, body.token, body.password);
    res.status(204).end();
  });
}
