import { runMigrations } from '../src/server/db/migrate';

const started = Date.now();
runMigrations()
  .then(() => console.log(`[platewright] database migrated (${Date.now() - started} ms)`))
  .catch((err) => {
    console.error(`[platewright] migration failed: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  });
