// Serves the built app: `npm run serve` (npm start ends here too). WEB_CONCURRENCY=N runs N
// processes on one port through node:cluster (the app keeps no state in its process that another
// needs: sessions, revisions and files live in MariaDB and the storage module); a process that
// dies is replaced. Default one process.
import cluster from 'node:cluster';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const dist = process.env.PLATEWRIGHT_DIST ?? 'dist';
const entry = pathToFileURL(resolve(dist, 'server/entry.mjs')).href;
const wanted = Number(process.env.WEB_CONCURRENCY ?? 1);
const processes = Number.isInteger(wanted) && wanted >= 1 && wanted <= 64 ? wanted : 1;
if (process.env.WEB_CONCURRENCY !== undefined && processes !== wanted) {
  console.error(`WEB_CONCURRENCY must be a whole number from 1 to 64 (got "${process.env.WEB_CONCURRENCY}"); serving with 1 process`);
}

if (processes > 1 && cluster.isPrimary) {
  let stopping = false;
  for (let i = 0; i < processes; i++) cluster.fork();
  cluster.on('exit', (worker, code, signal) => {
    if (stopping) {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
      return;
    }
    console.error(`app process ${worker.process.pid} ended (${signal ?? `exit ${code}`}); starting another`);
    cluster.fork();
  });
  const stop = (signal) => {
    stopping = true;
    for (const w of Object.values(cluster.workers ?? {})) w?.process.kill(signal);
    setTimeout(() => process.exit(0), 10_000).unref();
  };
  process.on('SIGTERM', () => stop('SIGTERM'));
  process.on('SIGINT', () => stop('SIGINT'));
} else {
  await import(entry);
}
