import { createServer } from 'node:http';
import { loadConfig } from './config';
import { createDatabase } from './db/client';
import { migrateDatabase } from './db/migrate';
import { createApp } from './app';
import { withDefaultServices } from './app-services';
import { startBatchRunWorkers } from './batch-runs/batch-runs-service';
import { startMaintenance } from './jobs/maintenance';
import { startCalibrationWorkers } from './calibrations/calibrations-service';
import { startServiceDayWorkers } from './service-days/service-days-service';
import { createSmtpTransport, startMailWorker } from './mail/mail-worker';
import { startSmtpFake } from './mail/smtp-fake';
import { startTerrain } from './terrain/terrain-startup';
import { startBasemap } from './basemap/basemap-startup';
import { ensureVehiclePresets } from './vehicle-profiles/vehicle-presets-seed';

const config = loadConfig();
await migrateDatabase(config.DATABASE_URL);
const { db, close } = createDatabase(config.DATABASE_URL, {
  connectTimeoutS: config.DB_CONNECT_TIMEOUT_S,
  statementTimeoutMs: config.DB_STATEMENT_TIMEOUT_MS,
});
const deps = withDefaultServices({ db, config });
// The generic vehicle classes are read-only profiles every environment needs (idempotent).
await ensureVehiclePresets(db);

const stoppers: Array<() => Promise<void> | void> = [];
if (config.MAIL_FAKE) {
  if (config.NODE_ENV === 'production') throw new Error('MAIL_FAKE must not be used in production');
  const fake = await startSmtpFake(db, config.SMTP_PORT, config.SMTP_HOST);
  stoppers.push(fake.close);
  console.log(`[mail] local mail catcher on ${config.SMTP_HOST}:${fake.port}`);
}
if (config.RUN_WORKERS) {
  const worker = startMailWorker(db, createSmtpTransport(config), { from: config.MAIL_FROM, secret: config.SESSION_SECRET });
  stoppers.push(worker.stop);
}
stoppers.push(await startTerrain(deps));
await startBasemap(deps);
await startBatchRunWorkers(deps);
await startCalibrationWorkers(deps);
await startServiceDayWorkers(deps);
// After the workers: what a crash left half-done is queued again now and every minute.
if (config.RUN_WORKERS) stoppers.unshift(startMaintenance(deps));

const server = createServer(createApp(deps));
server.listen(config.PORT, config.HOST, () => {
  console.log(`[api] Descentry listening on http://${config.HOST}:${config.PORT}`);
});

async function shutdown(signal: string) {
  console.log(`[api] ${signal}: shutting down`);
  server.close();
  for (const stop of stoppers) await stop();
  // The caches' listening lines, the analysis threads and the terrain runtime (api/app-runtime.ts).
  await deps.runtime!.close();
  await close();
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
