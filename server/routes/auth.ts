// /api/auth: the session, sign-in, sign-out and the organization a session works in.
import { Router, type Request } from 'express';
import type passport from 'passport';
import { ipKeyGenerator } from 'express-rate-limit';
import { rateLimited } from '../middleware/rate-limit';
import { signInRequestSchema, switchOrganizationRequestSchema, type SessionResponse } from '../../shared/api/auth';
import type { Config } from '../config';
import { HttpError, UnauthenticatedError, ForbiddenError } from '../errors';
import { currentMembership } from '../middleware/require-member';
import { recordAudit } from '../services/audit';
import type { SignInRefusal } from '../auth/passport';
import type { Database } from '../db/client';
import { setDeviceCookie } from '../auth/device-cookie';
import { ownPasswordChangeSchema } from '../../shared/api/users';
import { changeOwnPassword } from '../services/account-passwords';

export const sessionCookieName = 'cutline.sid';

export type AuthRouterDeps = {
  db: Database;
  config: Config;
  passport: passport.PassportStatic;
  csrfToken: (req: Request, overwrite?: boolean) => string;
};

function sessionBody(req: Request, csrfToken: string): SessionResponse {
  const membership = currentMembership(req);
  if (!req.user || !membership) return { user: null, csrfToken };
  return {
    user: {
      id: req.user.id,
      email: req.user.email,
      displayName: req.user.displayName,
      memberships: req.user.memberships,
      organizationId: membership.organizationId,
      role: membership.role,
    },
    csrfToken,
  };
}

function lockedError(until: Date): HttpError {
  const seconds = Math.max(1, Math.ceil((until.getTime() - Date.now()) / 1000));
  const wait = seconds < 60 ? `${seconds} second${seconds === 1 ? '' : 's'}` : `${Math.ceil(seconds / 60)} minute${Math.ceil(seconds / 60) === 1 ? '' : 's'}`;
  return new HttpError(
    423,
    'account_locked',
    `This account is locked after repeated failed sign-ins. Try again in ${wait}, or ask an administrator of your organization to unlock it.`,
  );
}

export function authRouter({ db, config, passport, csrfToken }: AuthRouterDeps): Router {
  const router = Router();

  // Failed attempts per address, whatever the e-mail: without it, rotating e-mails from one
  // address (password spraying) was never limited, and each attempt costs a bcrypt compare.
  const addressLimiter = rateLimited({
    name: 'sign-in-address',
    windowMs: config.SIGN_IN_WINDOW_MINUTES * 60_000,
    limit: config.SIGN_IN_ATTEMPTS_PER_ADDRESS,
    message: 'Too many failed sign-in attempts from this address. Wait a few minutes and try again.',
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    skipSuccessfulRequests: true,
  });
  // Counted per address and account, so one person's typos do not lock out a whole office.
  const signInLimiter = rateLimited({
    name: 'sign-in',
    windowMs: config.SIGN_IN_WINDOW_MINUTES * 60_000,
    limit: config.SIGN_IN_ATTEMPTS_PER_WINDOW,
    message: 'Too many sign-in attempts. Wait a few minutes and try again.',
    // The body is not validated yet: an e-mail that is not text (an object whose toString is not a
    // function) must not throw here, and counts against the address alone.
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${typeof req.body?.email === 'string' ? req.body.email.toLowerCase() : ''}`,
    skipSuccessfulRequests: true,
  });

  // Wrong current passwords, per account: a borrowed or stolen session must not become a way
  // to guess the password at the speed of the API.
  const passwordChangeLimiter = rateLimited({
    name: 'password-change',
    windowMs: config.SIGN_IN_WINDOW_MINUTES * 60_000,
    limit: config.SIGN_IN_ATTEMPTS_PER_WINDOW,
    message: 'Too many wrong current passwords. Wait a few minutes and try again.',
    keyGenerator: (req) => req.user?.id ?? ipKeyGenerator(req.ip ?? ''),
    skipSuccessfulRequests: true,
  });

  router.get('/session', (req, res) => {
    res.json(sessionBody(req, csrfToken(req)));
  });

  router.post('/sign-in', addressLimiter, signInLimiter, (req, res, next) => {
    const input = signInRequestSchema.parse(req.body);
    req.body = input;
    passport.authenticate('local', (err: unknown, user: Express.User | false, refusal?: SignInRefusal) => {
      if (err) return next(err);
      if (refusal?.lockedUntil) return next(lockedError(refusal.lockedUntil));
      if (!user) return next(new HttpError(401, 'unauthenticated', 'Wrong e-mail address or password.'));
      // req.login regenerates the session (passport ≥ 0.6), so a fresh CSRF token follows.
      req.login(user, (loginError) => {
        if (loginError) return next(loginError);
        req.session.organizationId = user.memberships[0]?.organizationId;
        setDeviceCookie(res, user.id, config.SESSION_SECRET, config.COOKIE_SECURE);
        const organizationId = req.session.organizationId;
        const audit = organizationId
          ? recordAudit(db, { userId: user.id, organizationId }, 'session.sign-in', 'user', user.id)
          : Promise.resolve();
        audit.then(() => res.json(sessionBody(req, csrfToken(req, true))), next);
      });
    })(req, res, next);
  });

  router.post('/sign-out', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      // Destroyed, not regenerated: a regenerated session is stored even when empty, and a
      // signed-out browser needs none (its next CSRF token is cookie-held).
      req.session.destroy((destroyError) => {
        if (destroyError) return next(destroyError);
        res.clearCookie(sessionCookieName, { path: '/' });
        res.json({ user: null, csrfToken: csrfToken(req, true) } satisfies SessionResponse);
      });
    });
  });

  // Anyone signed in changes their own password; this session stays, the account's others end.
  router.post(
    '/password',
    (req, _res, next) => next(req.isAuthenticated() ? undefined : new UnauthenticatedError()),
    passwordChangeLimiter,
    async (req, res) => {
      const input = ownPasswordChangeSchema.parse(req.body);
      await changeOwnPassword(db, req.user!.id, req.sessionID, input, config.PASSWORD_HASH_ROUNDS);
      res.status(204).end();
    },
  );

  router.post('/organization', (req, res) => {
    if (!req.isAuthenticated()) throw new UnauthenticatedError();
    const { organizationId } = switchOrganizationRequestSchema.parse(req.body);
    if (!req.user.memberships.some((m) => m.organizationId === organizationId)) {
      throw new ForbiddenError('You are not a member of that organization.');
    }
    req.session.organizationId = organizationId;
    res.json(sessionBody(req, csrfToken(req)));
  });

  return router;
}
