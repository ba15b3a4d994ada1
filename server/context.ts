import type { AppConfig } from './config/env';
import type { AppDataSource } from './db/data-source';
import type { Logger } from './lib/logger';
import type { Storage } from './lib/storage';

export type AppContext = {
  config: AppConfig;
  ds: AppDataSource;
  logger: Logger;
  /** Where attachments live: the disk or S3-compatible object storage (config.storage). */
  storage: Storage;
  /** Absolute link into the client, for e-mails. */
  publicUrl: (path: string) => string;
};
