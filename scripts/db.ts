// npm run db -- start|stop|status|url [demo|test]
import { loadConfig } from '../server/config/env';
import { startLocalDb, stopLocalDb, type DbProfile } from './lib/mariadb';

const [command = 'status', profileArg = 'demo'] = process.argv.slice(2);
const profile = (profileArg === 'test' ? 'test' : 'demo') as DbProfile;
const config = loadConfig();
const port = profile === 'test' ? config.dbPort + 1 : config.dbPort;

async function main() {
  switch (command) {
    case 'start': {
      const db = await startLocalDb({ dataDir: config.dataDir, profile, port });
      console.log(`MariaDB (${profile}) is up on 127.0.0.1:${db.port}`);
      break;
    }
    case 'stop':
      await stopLocalDb(config.dataDir, profile);
      console.log(`MariaDB (${profile}) stopped`);
      break;
    case 'url': {
      const db = await startLocalDb({ dataDir: config.dataDir, profile, port, log: () => {} });
      console.log(db.url);
      break;
    }
    default:
      console.error('usage: npm run db -- start|stop|url [demo|test]');
      process.exit(2);
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
