// One serving process of a cluster (server/cluster.ts): the same server as a single process, reporting its URL to
// the primary when it listens and stopping cleanly on SIGTERM or SIGINT.
import { loadConfig } from './config/env';
import { startServer } from './index';

const config = loadConfig();
startServer(config, config.databaseUrl!)
  .then((srv) => {
    process.send?.({ type: 'listening', url: srv.url });
    let stopping = false;
    const stop = () => {
      if (stopping) return;
      stopping = true;
      void srv.stop().then(() => process.exit(0));
    };
    process.on('SIGTERM', stop);
    process.on('SIGINT', stop);
  })
  .catch((err) => {
    console.error(err instanceof Error ? err.message : err);
    process.exit(1);
  });
