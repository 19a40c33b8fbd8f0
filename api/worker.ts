/**
 * A worker-only process: no HTTP, just the background work of the shared PostgreSQL-backed queue
 * (terrain ingestion, network-wide batch runs) and the mail outbox. Start as many as the load
 * needs, on this machine or others, with the same DATABASE_URL (and DATA_DIR on shared storage
 * for terrain files):
 *
 *   DATABASE_URL=… SESSION_SECRET=… node --import tsx api/worker.ts
 *
 * Each job is handed to one process at a time; the mail outbox is shared with SKIP LOCKED.
 */
import { withDefaultServices } from './app-services';
import { startBatchRunWorkers } from './batch-runs/batch-runs-service';
import { startMaintenance } from './jobs/maintenance';
import { startCalibrationWorkers } from './calibrations/calibrations-service';
import { startServiceDayWorkers } from './service-days/service-days-service';
import { loadConfig } from './config';
import { createDatabase } from './db/client';
import { migrateDatabase } from './db/migrate';
import { createSmtpTransport, startMailWorker } from './mail/mail-worker';
import { startTerrain } from './terrain/terrain-startup';
import { startBasemap } from './basemap/basemap-startup';

// A worker process always works, whatever RUN_WORKERS says for the API processes.
const config = { ...loadConfig(), RUN_WORKERS: true };
await migrateDatabase(config.DATABASE_URL);
const { db, close } = createDatabase(config.DATABASE_URL, {
  connectTimeoutS: config.DB_CONNECT_TIMEOUT_S,
  statementTimeoutMs: config.DB_STATEMENT_TIMEOUT_MS,
});
const deps = withDefaultServices({ db, config });

const mail = startMailWorker(db, createSmtpTransport(config), { from: config.MAIL_FROM, secret: config.SESSION_SECRET });
const stopTerrain = await startTerrain(deps);
await startBasemap(deps);
await startBatchRunWorkers(deps);
await startCalibrationWorkers(deps);
await startServiceDayWorkers(deps);
const stopMaintenance = startMaintenance(deps);
console.log('[worker] Descentry worker running: terrain ingestion, base-map imports, batch runs, calibrations, mail outbox');

async function shutdown(signal: string) {
  console.log(`[worker] ${signal}: shutting down`);
  await stopMaintenance();
  await mail.stop();
  await stopTerrain();
  await deps.runtime!.close();
  await close();
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
