// npm run build:server: compiles the server ahead of time into dist-server/ (scripts/lib/build-server.ts), for
// `node dist-server/index.js` (npm run serve). npm start builds it when needed.
import { buildServerIfNeeded } from './lib/build-server';

buildServerIfNeeded(console.log, true).catch((err) => {
  console.error(err);
  process.exit(1);
});
