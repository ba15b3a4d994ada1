import type { AppConfig } from './config/env';
import type { AppDataSource } from './db/data-source';
import type { Logger } from './lib/logger';

export type AppContext = {
  config: AppConfig;
  ds: AppDataSource;
  logger: Logger;
  /** Absolute link into the client, for e-mails. */
  publicUrl: (path: string) => string;
};
