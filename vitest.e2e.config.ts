import { defineConfig } from 'vitest/config';

// End-to-end tests: the real server (fresh DATA_DIR, demo accounts) driven through headless Debian
// Chromium. One file at a time: they share one server and the machine has two cores.
export default defineConfig({
  test: {
    include: ['tests/e2e/**/*.e2e.ts'],
    environment: 'node',
    globalSetup: ['tests/e2e/global-setup.ts'],
    fileParallelism: false,
    pool: 'forks',
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});
