import { defineConfig } from 'drizzle-kit';
import { databaseUrl } from './src/server/db/config';

export default defineConfig({
  dialect: 'mysql',
  schema: './src/server/db/schema.ts',
  out: './drizzle',
  dbCredentials: { url: databaseUrl() },
  strict: true,
  verbose: true,
});
