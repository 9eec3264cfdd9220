// Passport with e-mail and password. The session stores only the user id; each request reloads
// the user so a removed membership or a disabled account takes effect at once.
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Database } from '../db/client';
import type { Config } from '../config';
import { findUserForSignIn, loadAuthUser } from '../services/users';
import { recordFailedSignIn, clearFailedSignIns } from '../services/sign-in-lockout';
import { unknownUserHash, verifyPassword } from '../services/password';
import { cachedAuthUser } from '../services/auth-user-cache';
import { deviceKnownFor } from './device-cookie';

/** Why a sign-in was refused, for the route's message: locked accounts say until when. */
export type SignInRefusal = { message: 'locked' | 'refused'; lockedUntil?: Date };

export function configurePassport(
  db: Database,
  config: Pick<Config, 'SIGN_IN_LOCKOUT_FAILURES' | 'SIGN_IN_BACKOFF_SECONDS' | 'SIGN_IN_LOCKOUT_MINUTES' | 'PASSWORD_HASH_ROUNDS' | 'SESSION_SECRET'>,
): passport.PassportStatic {
  const instance = new passport.Passport();
  instance.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', passReqToCallback: true }, (req, email, password, done) => {
      const refuse = (refusal: SignInRefusal) => done(null, false, refusal);
      (async () => {
        const row = await findUserForSignIn(db, email);
        // The hash is checked even for a locked or unknown account, so timing tells nothing.
        const ok = await verifyPassword(password, row?.passwordHash ?? unknownUserHash(config.PASSWORD_HASH_ROUNDS));
        // A browser this account has signed in from before is not held by the lockout (a
        // stranger's failures cannot keep the person out of it), and its own typos do not count
        // towards one; the rate limits still apply to it.
        const knownDevice = row !== undefined && deviceKnownFor(req, row.id, config.SESSION_SECRET);
        if (!knownDevice && row?.lockedUntil && row.lockedUntil > new Date()) return refuse({ message: 'locked', lockedUntil: row.lockedUntil });
        if (!row || row.disabled) return refuse({ message: 'refused' });
        if (!ok) {
          if (knownDevice) return refuse({ message: 'refused' });
          const lockedUntil = await recordFailedSignIn(db, row.id, config);
          return refuse(lockedUntil ? { message: 'locked', lockedUntil } : { message: 'refused' });
        }
        await clearFailedSignIns(db, row.id);
        return done(null, (await loadAuthUser(db, row.id)) ?? false);
      })().catch(done);
    }),
  );
  instance.serializeUser((user, done) => done(null, user.id));
  instance.deserializeUser((id: string, done) => {
    cachedAuthUser(id, (userId) => loadAuthUser(db, userId)).then((user) => done(null, user ?? false), done);
  });
  return instance as unknown as passport.PassportStatic;
}
