// Vitest: unit tests (pure lib code) and integration tests (route handlers and db/ on a real SQLite file).
// Edit when adding a test folder or a global setup step.
import { defineConfig } from 'vitest/config';
import path from 'node:path';

export default defineConfig({
  resolve: { alias: { '@': path.resolve(__dirname, '..'), 'server-only': path.resolve(__dirname, 'support/server-only-stub.ts') } },
  root: path.resolve(__dirname, '..'),
  test: {
    environment: 'node',
    include: ['tests/unit/**/*.test.ts', 'tests/integration/**/*.test.ts'],
    setupFiles: ['tests/support/vitest-setup.ts'],
    globalSetup: ['tests/support/global-setup.ts'],
    pool: 'forks',
    testTimeout: 20000,
    hookTimeout: 60000,
  },
});
