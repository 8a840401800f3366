import { closeDb, getDb } from '../src/server/db/client';
import { seedDemo } from '../src/server/seed';
import { seedDemoWorkflow } from '../src/server/seedWorkflow';
import { makeReleaseFiles } from '../src/server/release';

const production = process.env.NODE_ENV === 'production';
if (production && !process.env.SEED_DEMO) {
  console.log('[platewright] production mode: no demo data seeded');
  process.exit(0);
}
const password = process.env.DEMO_PASSWORD ?? 'platewright-demo';

async function main() {
  const r = await seedDemo(getDb(), password);
  const plates = await seedDemoWorkflow(getDb(), makeReleaseFiles);
  const created = [...r.created, ...plates];
  console.log(created.length ? `[platewright] demo seeded: ${created.join(', ')}` : '[platewright] demo data already present');
}

main()
  .then(async () => {
    await closeDb();
    process.exit(0); // the CAD kernel keeps a worker-free wasm instance alive; nothing else is pending
  })
  .catch(async (err) => {
    console.error(`[platewright] seeding failed: ${err instanceof Error ? err.message : String(err)}`);
    await closeDb();
    process.exit(1);
  });
