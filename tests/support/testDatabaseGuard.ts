// Integration and e2e tests write to the database they are pointed at: make sure it is a test one,
// never the demo instance `npm start` serves (run them through `npm test`).
const databaseName = process.env.DATABASE_URL ? new URL(process.env.DATABASE_URL).pathname.slice(1) : (process.env.DB_NAME ?? 'platewright');
if (!/test/.test(databaseName)) {
  throw new Error(`refusing to run against the database "${databaseName}": run the suites with npm test (it starts a separate test database)`);
}

export {};
