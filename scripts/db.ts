// npm run db -- start|stop|url [demo|test|replica|test-replica]
// `replica` is the demo's database with a read replica beside it (ports DB_PORT and DB_PORT + 6);
// `test-replica` the pair the replication tests use (DB_PORT + 7 and DB_PORT + 8).
import { loadConfig } from '../server/config/env';
import {
  startLocalDb,
  startLocalReplicaSet,
  stopLocalDb,
  stopLocalReplicaSet,
  replicaSets,
  type DbProfile,
} from './lib/mariadb';

const [command = 'status', profileArg = 'demo'] = process.argv.slice(2);
const config = loadConfig();

const sets = replicaSets(config.dbPort);
const set = profileArg === 'replica' || profileArg === 'test-replica' ? sets[profileArg] : null;
const profile = (profileArg === 'test' ? 'test' : 'demo') as DbProfile;
const port = profile === 'test' ? config.dbPort + 1 : config.dbPort;

async function main() {
  switch (command) {
    case 'start': {
      if (set) {
        const s = await startLocalReplicaSet({ dataDir: config.dataDir, ...set });
        console.log(
          `MariaDB ${set.profile} primary on 127.0.0.1:${s.primary.port}, replica on :${s.replica.port}`,
        );
        break;
      }
      const db = await startLocalDb({ dataDir: config.dataDir, profile, port });
      console.log(`MariaDB (${profile}) is up on 127.0.0.1:${db.port}`);
      break;
    }
    case 'stop':
      if (set) {
        await stopLocalReplicaSet(config.dataDir, set.profile);
        console.log(`MariaDB ${set.profile} primary and replica stopped`);
        break;
      }
      await stopLocalDb(config.dataDir, profile);
      console.log(`MariaDB (${profile}) stopped`);
      break;
    case 'url': {
      if (set) {
        // In the form `export $(npm run -s db -- url replica)` takes.
        const s = await startLocalReplicaSet({ dataDir: config.dataDir, ...set, log: () => {} });
        console.log(`DATABASE_URL=${s.primary.url}`);
        console.log(`DATABASE_REPLICA_URLS=${s.replica.url}`);
        break;
      }
      const db = await startLocalDb({ dataDir: config.dataDir, profile, port, log: () => {} });
      console.log(db.url);
      break;
    }
    default:
      console.error('usage: npm run db -- start|stop|url [demo|test|replica|test-replica]');
      process.exit(2);
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
