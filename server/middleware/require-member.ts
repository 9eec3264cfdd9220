// Guards for routes: a signed-in member of the session's organization, optionally with a permission.
import type { Request, RequestHandler } from 'express';
import { can, type Permission } from '../../shared/api/roles';
import { ForbiddenError, UnauthenticatedError } from '../errors';

export function currentMembership(req: Request) {
  const user = req.user;
  if (!user) return undefined;
  return user.memberships.find((m) => m.organizationId === req.session.organizationId) ?? user.memberships[0];
}

export function requireMember(permission?: Permission): RequestHandler {
  return (req, _res, next) => {
    if (!req.isAuthenticated()) throw new UnauthenticatedError();
    const membership = currentMembership(req);
    if (!membership) throw new ForbiddenError('Your account belongs to no organization.');
    if (permission && !can(membership.role, permission)) throw new ForbiddenError();
    req.actor = { userId: req.user!.id, organizationId: membership.organizationId, role: membership.role };
    next();
  };
}

// Narrows req.actor after requireMember ran.
export function actorOf(req: Request) {
  if (!req.actor) throw new UnauthenticatedError();
  return req.actor;
}
