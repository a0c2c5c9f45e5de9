import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const here = (p: string) => fileURLToPath(new URL(p, import.meta.url));
const alias = {
  '@': here('./frontend/src'),
  '@common': here('./common/src'),
  '@backend': here('./backend/src'),
};

// Three layers: pure unit tests beside the code, API tests against a real MariaDB, browser journeys.
export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          include: ['common/src/**/*.test.ts', 'backend/src/**/*.test.ts', 'frontend/src/**/*.test.{ts,tsx}', 'scripts/**/*.test.ts'],
          environment: 'node',
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'api',
          include: ['tests/integration/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
          globalSetup: ['tests/integration/global-setup.ts'],
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'cluster',
          include: ['tests/cluster/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 150_000,
          hookTimeout: 150_000,
          globalSetup: ['tests/integration/global-setup.ts'],
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
          globalSetup: ['tests/e2e/global-setup.ts'],
        },
      },
    ],
  },
});
