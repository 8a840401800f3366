/// <reference types="vitest/config" />
import { getViteConfig } from 'astro/config';

// Unit tests: pure code only (domain, cad, pure exports). No database, no browser.
export default getViteConfig({
  test: {
    include: ['tests/unit/**/*.test.ts'],
    testTimeout: 60_000,
  },
});
