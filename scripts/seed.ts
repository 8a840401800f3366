import { closeDb, getDb } from '../src/server/db/client';
import { seedDemo } from '../src/server/seed';

const production = process.env.NODE_ENV === 'production';
if (production && !process.env.SEED_DEMO) {
  console.log('[platewright] production mode: no demo data seeded');
  process.exit(0);
}
const password = process.env.DEMO_PASSWORD ?? 'platewright-demo';
seedDemo(getDb(), password)
  .then(async (r) => {
    console.log(r.created.length ? `[platewright] demo seeded: ${r.created.join(', ')}` : '[platewright] demo data already present');
    await closeDb();
  })
  .catch(async (err) => {
    console.error(`[platewright] seeding failed: ${err instanceof Error ? err.message : String(err)}`);
    await closeDb();
    process.exit(1);
  });
