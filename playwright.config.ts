import { defineConfig, devices } from '@playwright/test';
import { loadConfig } from './server/config/env';

// Browser tests drive the built app in Debian's Chromium (never a downloaded browser).
const config = loadConfig();
const port = config.port + 10;
const baseURL = `http://127.0.0.1:${port}`;

export default defineConfig({
  testDir: 'tests/browser',
  // Stops the e2e database however the web server ended (see scripts/e2e-server.ts).
  globalTeardown: './tests/setup/e2e.global-teardown.ts',
  fullyParallel: false,
  workers: 1,
  retries: 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: [['list']],
  outputDir: '.data/playwright-results',
  use: {
    baseURL,
    trace: 'retain-on-failure',
    launchOptions: {
      executablePath: '/usr/bin/chromium',
      args: [
        '--no-sandbox',
        '--disable-gpu',
        '--disable-quic',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
      ],
    },
  },
  projects: [
    {
      name: 'desktop',
      use: { ...devices['Desktop Chrome'], channel: undefined, viewport: { width: 1280, height: 800 } },
    },
  ],
  webServer: {
    command: 'node_modules/.bin/tsx scripts/e2e-server.ts',
    url: `${baseURL}/api/health`,
    reuseExistingServer: false,
    timeout: 120_000,
    stdout: 'pipe',
    stderr: 'pipe',
    // The default is SIGKILL, which would leave the database the server started running.
    gracefulShutdown: { signal: 'SIGTERM', timeout: 15_000 },
  },
});
