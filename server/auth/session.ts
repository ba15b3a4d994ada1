import type { Request } from 'express';
import session from 'express-session';
import MySQLStoreFactory from 'express-mysql-session';
import type { AppConfig } from '../config/env';
import type { AppDataSource } from '../db/data-source';
import { readRows } from '../db/read';
import { Organization } from '../db/entities/organization.entity';
import { User } from '../db/entities/user.entity';

export const SESSION_COOKIE = 'lp.sid';
export const IDLE_TIMEOUT_MS = 30 * 60 * 1000;
export const ABSOLUTE_TIMEOUT_MS = 8 * 60 * 60 * 1000;
/**
 * How stale the recorded last activity may get before a request writes it again. Writing the session row on every
 * request (express-session's rolling cookie and the store's touch) made every read a database write; now an active
 * session is written at most once a minute, so the idle timeout is kept to within this much.
 */
export const SESSION_TOUCH_INTERVAL_MS = 60 * 1000;

declare module 'express-session' {
  interface SessionData {
    createdAt: number;
    lastSeenAt: number;
    /** What the sessions page shows: the browser that signed in and the address it was last seen from. */
    userAgent: string;
    ip: string;
    /** A sign-in waiting for its second factor (server/modules/second-factor). */
    secondFactorChallengeId: string;
    /** A TOTP secret being enrolled, until a code confirms it. */
    enrollmentSecret: string;
  }
}

const MySQLStore = MySQLStoreFactory(session as never) as unknown as new (
  options: Record<string, unknown>,
  connection?: unknown,
) => session.Store & { close(): Promise<void>; onReady(): Promise<void> };

/** Where the store leaves the user it read with the session, for passport's deserializer (server/auth/passport.ts). */
const LOADED_USER = Symbol('lumenproof.sessionUser');
type Loaded = { id: string; user: User | null };

/**
 * The session's row and its signed-in user with the user's organisation, in one round trip: every authenticated
 * request needs all three, and reading them one after the other cost a query and TypeORM's hydration each time.
 * The user comes fresh from the database on every request, so a disabled user or a changed role counts at once.
 */
export const SESSION_SQL = `SELECT s.data, s.expires, u.id AS u_id, u.organization_id, u.email, u.name, u.roles, u.status,
       u.last_sign_in_at, u.created_at, u.updated_at, u.version, u.totp_confirmed_at, o.name AS o_name,
       o.kind AS o_kind, o.require_second_factor AS o_require_second_factor, o.time_zone AS o_time_zone,
       o.locale AS o_locale, o.created_at AS o_created_at
  FROM sessions s
  LEFT JOIN users u ON u.id = JSON_VALUE(s.data, '$.passport.user')
  LEFT JOIN organizations o ON o.id = u.organization_id
 WHERE s.session_id = ?`;

type SessionRow = {
  data: string;
  expires: number;
  u_id: string | null;
  organization_id: string;
  email: string;
  name: string;
  roles: string;
  status: User['status'];
  last_sign_in_at: Date | null;
  created_at: Date;
  updated_at: Date;
  version: number;
  totp_confirmed_at: Date | null;
  o_name: string;
  o_kind: Organization['kind'];
  o_require_second_factor: number;
  o_time_zone: string;
  o_locale: string;
  o_created_at: Date;
};

function userOf(r: SessionRow): User {
  const organization = Object.assign(new Organization(), {
    id: r.organization_id,
    name: r.o_name,
    kind: r.o_kind,
    requireSecondFactor: Boolean(r.o_require_second_factor),
    timeZone: r.o_time_zone,
    locale: r.o_locale,
    createdAt: r.o_created_at,
  });
  return Object.assign(new User(), {
    id: r.u_id!,
    organizationId: r.organization_id,
    organization,
    email: r.email,
    name: r.name,
    // Not read on every request: only signing in needs the hash, and it loads the user itself.
    passwordHash: null,
    roles: (r.roles ? r.roles.split(',') : []) as User['roles'],
    status: r.status,
    lastSignInAt: r.last_sign_in_at,
    // Whether a factor is confirmed is needed on every request (the enrolment requirement); the secret is not.
    totpSecret: null,
    totpConfirmedAt: r.totp_confirmed_at,
    totpLastStep: null,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
    version: r.version,
  });
}

/** The user the session store read with this request's session, if it did (and null when that user is gone). */
export function loadedSessionUser(req: object, id: string): User | null | undefined {
  const loaded = (req as unknown as { [LOADED_USER]?: Loaded })[LOADED_USER];
  return loaded && loaded.id === id ? loaded.user : undefined;
}

/**
 * What express-mysql-session sends its statements through: its writes (save, destroy, the expiry sweep) go through
 * TypeORM like every write; the one read on every request is SESSION_SQL, through readRows (SessionStore.get).
 */
function storeConnection(ds: AppDataSource) {
  return {
    query(sql: string, params: unknown[]) {
      return ds.query(sql, params).then((rows: unknown) => [rows, []]);
    },
  };
}

export class SessionStore extends MySQLStore {
  private readonly ds: AppDataSource;
  // Written by express-mysql-session (its prototype), declared for TypeScript.
  declare set: session.Store['set'];
  declare destroy: session.Store['destroy'];

  constructor(ds: AppDataSource) {
    super(
      {
        createDatabaseTable: false, // the table comes from a migration
        clearExpired: true,
        checkExpirationInterval: 15 * 60 * 1000,
        expiration: IDLE_TIMEOUT_MS,
        disableTouch: true, // the row is written when lastSeenAt moves (sessionPolicy), not on every request
        endConnectionOnClose: false, // the data source is the application's, closed with it
        schema: {
          tableName: 'sessions',
          columnNames: { session_id: 'session_id', expires: 'expires', data: 'data' },
        },
      },
      storeConnection(ds),
    );
    this.ds = ds;
    // No touch at all, rather than express-mysql-session's no-op: with a store that has one, express-session
    // holds back the last byte of every answer until the touch has answered, so each answer went out in two
    // writes (two packets for the client to read) and a turn of the event loop later.
    Object.defineProperty(this, 'touch', { value: undefined });
  }

  override get(sid: string, cb: (err: unknown, data?: session.SessionData | null) => void) {
    // From the primary: a session signed out or a role changed a moment ago must not be read from a lagging replica.
    readRows<SessionRow>(this.ds, SESSION_SQL, [sid], {
      from: 'primary',
      parser: 'interpreted',
      prepared: true,
    }).then((rows) => {
      const row = rows[0];
      if (!row || row.expires < Math.round(Date.now() / 1000)) return cb(null, null);
      let data: session.SessionData & { passport?: { user?: string } };
      try {
        data = JSON.parse(row.data);
      } catch (e) {
        return cb(e);
      }
      const id = data.passport?.user;
      // A symbol key: express-session copies and hashes only the session's own string keys, so it never saves this.
      if (id)
        (data as unknown as { [LOADED_USER]: Loaded })[LOADED_USER] = {
          id,
          user: row.u_id ? userOf(row) : null,
        };
      cb(null, data);
    }, cb);
  }

  override createSession(req: Request, data: session.SessionData) {
    const loaded = (data as unknown as { [LOADED_USER]?: Loaded })[LOADED_USER];
    if (loaded) (req as unknown as { [LOADED_USER]: Loaded })[LOADED_USER] = loaded;
    return super.createSession(req, data);
  }
}

/** Notes the browser and address of a session being signed in, for the sessions page. */
export function recordSessionDevice(req: Request) {
  req.session.userAgent = (req.get('user-agent') ?? '').slice(0, 400);
  req.session.ip = req.ip ?? '';
}

export function createSessionStore(ds: AppDataSource) {
  return new SessionStore(ds);
}

export function sessionMiddleware(config: AppConfig, store: session.Store) {
  const secure = config.publicUrl?.startsWith('https://') ?? false;
  return session({
    name: SESSION_COOKIE,
    secret: config.sessionSecret,
    store,
    resave: false,
    saveUninitialized: false,
    // The cookie and the row move forward when the session changes, which sessionPolicy makes happen at most once
    // a SESSION_TOUCH_INTERVAL_MS, not on every request.
    rolling: false,
    proxy: config.trustProxy,
    cookie: { httpOnly: true, sameSite: 'lax', secure, maxAge: IDLE_TIMEOUT_MS, path: '/' },
  });
}
