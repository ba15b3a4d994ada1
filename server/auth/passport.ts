import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { AppDataSource } from '../db/data-source';
import { User } from '../db/entities/user.entity';
import { verifyPassword } from './passwords';
import { loadedSessionUser } from './session';

export type SessionUser = User & { organization: NonNullable<User['organization']> };

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

export function createPassport(ds: AppDataSource) {
  const instance = new passport.Passport();
  const users = ds.getRepository(User);

  instance.use(
    new LocalStrategy(
      { usernameField: 'email', passwordField: 'password' },
      async (email, password, done) => {
        try {
          const user = await users.findOne({
            where: { email: email.trim().toLowerCase() },
            relations: { organization: true },
          });
          const ok = await verifyPassword(user?.passwordHash ?? null, password);
          if (!user || !ok || user.status !== 'active') return done(null, false);
          return done(null, user as SessionUser);
        } catch (err) {
          return done(err as Error);
        }
      },
    ),
  );

  instance.serializeUser((user, done) => done(null, (user as SessionUser).id));

  // Loaded on every request: a disabled or deleted user's sessions stop working at once. The session store reads
  // the user in the same query as the session (server/auth/session.ts); the query here is for any other store.
  instance.deserializeUser(
    async (req: object, id: string, done: (err: unknown, user?: false | SessionUser) => void) => {
      try {
        const loaded = loadedSessionUser(req, id);
        const user =
          loaded !== undefined
            ? loaded
            : await users
                .createQueryBuilder('u')
                .innerJoinAndSelect('u.organization', 'o')
                .where('u.id = :id', { id })
                .getOne();
        if (!user || user.status !== 'active') return done(null, false);
        return done(null, user as SessionUser);
      } catch (err) {
        return done(err as Error);
      }
    },
  );

  return instance;
}
