// Passport with e-mail and password. The session stores only the user id; each request reloads
// the user so a removed membership or a disabled account takes effect at once.
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Database } from '../db/client';
import { findUserForSignIn, loadAuthUser } from '../services/users';
import { unknownUserHash, verifyPassword } from './password';

export function configurePassport(db: Database): passport.PassportStatic {
  const instance = new passport.Passport();
  instance.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      (async () => {
        const row = await findUserForSignIn(db, email);
        const ok = await verifyPassword(password, row?.passwordHash ?? unknownUserHash);
        if (!row || !ok || row.disabled) return done(null, false);
        return done(null, (await loadAuthUser(db, row.id)) ?? false);
      })().catch(done);
    }),
  );
  instance.serializeUser((user, done) => done(null, user.id));
  instance.deserializeUser((id: string, done) => {
    loadAuthUser(db, id).then((user) => done(null, user ?? false), done);
  });
  return instance as unknown as passport.PassportStatic;
}
