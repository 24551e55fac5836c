import { defineConfig } from 'vitest/config';

// Server unit tests (beside the code in server/ and shared/) and API integration tests (tests/api).
export default defineConfig({
  test: {
    include: ['server/**/*.spec.ts', 'shared/**/*.spec.ts', 'tests/api/**/*.spec.ts'],
    environment: 'node',
    pool: 'forks',
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
