/// <reference types="vitest/config" />
import { getViteConfig } from 'astro/config';

// End-to-end: the built server (dist/) on the test database, driven by headless Chromium.
export default getViteConfig({
  test: {
    include: ['tests/e2e/**/*.test.ts'],
    fileParallelism: false,
    setupFiles: ['tests/support/testDatabaseGuard.ts'],
    testTimeout: 120_000,
    hookTimeout: 180_000,
    globalSetup: ['tests/support/e2eGlobalSetup.ts'],
  },
});
