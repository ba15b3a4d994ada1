import { loadConfig } from '../../server/config/env';
import { endE2eServer, stopStaleProfiles } from '../../scripts/lib/db-processes';

// Playwright's global teardown, which it runs before it ends its web server: the server is ended first, so that
// it stops its own database, and then any server of the browser tests' profile still running is stopped too.
export default async function teardown() {
  const { dataDir } = loadConfig();
  await endE2eServer(dataDir);
  await stopStaleProfiles(dataDir, ['e2e']);
}
