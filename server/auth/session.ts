import session from 'express-session';
import MySQLStoreFactory from 'express-mysql-session';
import type { AppConfig } from '../config/env';

export const SESSION_COOKIE = 'lp.sid';
export const IDLE_TIMEOUT_MS = 30 * 60 * 1000;
export const ABSOLUTE_TIMEOUT_MS = 8 * 60 * 60 * 1000;

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
    connectionLimit: 5,
    schema: { tableName: 'sessions', columnNames: { session_id: 'session_id', expires: 'expires', data: 'data' } },
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
    rolling: true, // every request pushes the idle deadline forward
    proxy: config.trustProxy,
    cookie: { httpOnly: true, sameSite: 'lax', secure, maxAge: IDLE_TIMEOUT_MS, path: '/' },
  });
}
