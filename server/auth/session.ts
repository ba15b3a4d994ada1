import session from 'express-session';
import MySQLStoreFactory from 'express-mysql-session';
import type { AppConfig } from '../config/env';

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
  }
}

const MySQLStore = MySQLStoreFactory(session as never) as unknown as new (
  options: Record<string, unknown>,
) => session.Store & { close(): Promise<void>; onReady(): Promise<void> };

function parseUrl(url: string) {
  const u = new URL(url);
  return {
    host: u.hostname,
    port: Number(u.port || 3306),
    user: decodeURIComponent(u.username),
    password: decodeURIComponent(u.password),
    database: u.pathname.replace(/^\//, ''),
  };
}

export function createSessionStore(databaseUrl: string) {
  return new MySQLStore({
    ...parseUrl(databaseUrl),
    createDatabaseTable: false, // the table comes from a migration
    clearExpired: true,
    checkExpirationInterval: 15 * 60 * 1000,
    expiration: IDLE_TIMEOUT_MS,
    disableTouch: true, // the row is written when lastSeenAt moves (sessionPolicy), not on every request
    connectionLimit: 10, // every authenticated request reads its session first: enough for 16 at once without queueing long
    schema: {
      tableName: 'sessions',
      columnNames: { session_id: 'session_id', expires: 'expires', data: 'data' },
    },
  });
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
