import type { AppConfig } from './config/env';
import type { AppDataSource } from './db/data-source';
import type { Logger } from './lib/logger';
import type { Storage } from './lib/storage';

export type AppContext = {
  config: AppConfig;
  ds: AppDataSource;
  logger: Logger;
  /** Uploaded files and generated documents. */
  storage: Storage;
  /** Absolute link into the client, for e-mails. */
  publicUrl: (path: string) => string;
};
