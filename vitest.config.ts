import react from '@vitejs/plugin-react';
import { defineConfig } from 'vitest/config';

// Three projects: the pure shared code, the server (unit and API tests against the real test
// database, which scripts/test.ts starts), and the React client in jsdom.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'shared',
          include: ['tests/shared/**/*.test.ts'],
          environment: 'node',
        },
      },
      {
        test: {
          name: 'server',
          include: ['tests/server/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/server.global-setup.ts'],
          setupFiles: ['tests/setup/server.setup.ts'],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        plugins: [react()],
        test: {
          name: 'client',
          include: ['tests/client/**/*.test.tsx'],
          environment: 'jsdom',
          setupFiles: ['tests/setup/client.setup.ts'],
        },
      },
    ],
  },
});
