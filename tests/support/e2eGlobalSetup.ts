import './testDatabaseGuard';
import { startServer, testAppPort, type RunningServer } from './server';
import { closeDb, getDb } from '../../src/server/db/client';
import { seedDemo } from '../../src/server/seed';
import { seedDemoWorkflow } from '../../src/server/seedWorkflow';
import { makeReleaseFiles } from '../../src/server/release';

let server: RunningServer | undefined;

/** Seed the test database with the demo shop (plates and history included) and start the built app once for every e2e file. */
export async function setup(): Promise<void> {
  await seedDemo(getDb(), process.env.DEMO_PASSWORD ?? 'platewright-demo');
  await seedDemoWorkflow(getDb(), makeReleaseFiles);
  await closeDb();
  server = await startServer(testAppPort());
  process.env.E2E_BASE_URL = server.baseUrl;
}

export async function teardown(): Promise<void> {
  await server?.stop();
}
