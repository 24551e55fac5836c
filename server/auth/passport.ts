import { eq, sql } from 'drizzle-orm';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { AppContext } from '../context.js';
import { preparedFor } from '../db/prepared.js';
import { users } from '../db/schema.js';
import { dummyPasswordHash, verifyPassword } from './passwords.js';
import { toPublicUser } from '../services/users.js';

const userById = preparedFor((db) => db.select().from(users).where(eq(users.id, sql.placeholder('id'))).prepare());

/**
 * passport-local over the users table. The session holds only the user id; every request re-reads
 * the user so a role change or deactivation takes effect at once.
 */
export function configurePassport(ctx: AppContext): passport.PassportStatic {
  const pp = new passport.Passport();
  pp.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      const user = ctx.db.select().from(users).where(eq(users.email, email.trim().toLowerCase())).get();
      const check = user ? verifyPassword(user.passwordHash, password) : dummyPasswordHash().then((h) => verifyPassword(h, password));
      check
        .then((ok) => {
          if (!user || !ok) return done(null, false, { message: 'E-mail or password is not correct' });
          if (!user.active) return done(null, false, { message: 'This account is deactivated. Ask an administrator.' });
          return done(null, toPublicUser(user));
        })
        .catch(done);
    }),
  );
  pp.serializeUser((user, done) => done(null, user.id));
  pp.deserializeUser((id: number, done) => {
    const user = userById(ctx.db).get({ id });
    // A missing or deactivated user simply has no session any more (false = signed out).
    done(null, user && user.active ? toPublicUser(user) : false);
  });
  return pp as unknown as passport.PassportStatic;
}
