/// <reference types="vitest/config" />
import { getViteConfig } from 'astro/config';

// Integration tests: real MariaDB (the test instance started by scripts/test.sh), real fakes.
// One file at a time: some tests stop and restart the database.
export default getViteConfig({
  test: {
    include: ['tests/integration/**/*.test.ts'],
    fileParallelism: false,
    setupFiles: ['tests/support/testDatabaseGuard.ts'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});
