import { and, desc, eq, isNull } from 'drizzle-orm';
import type { CalibrationResult } from '@shared/domain/calibrations';
import type { Executor } from '../db/client';
import { calibrations, type CalibrationRow } from '../db/schema/index';

/** Calibrations as stored (Drizzle); the rules about them live in calibrations-service.ts. */

export async function insertCalibration(db: Executor, values: typeof calibrations.$inferInsert): Promise<CalibrationRow> {
  const [row] = await db.insert(calibrations).values(values).returning();
  return row!;
}

export async function findCalibration(db: Executor, id: string): Promise<CalibrationRow | undefined> {
  const [row] = await db.select().from(calibrations).where(eq(calibrations.id, id));
  return row;
}

/** The calibration, locked until the transaction ends. */
export async function lockCalibration(db: Executor, id: string): Promise<CalibrationRow | undefined> {
  const [row] = await db.select().from(calibrations).where(eq(calibrations.id, id)).for('update');
  return row;
}

/** A profile's calibrations, newest first. */
export function listCalibrationsOfProfile(db: Executor, vehicleProfileId: string): Promise<CalibrationRow[]> {
  return db.select().from(calibrations).where(eq(calibrations.vehicleProfileId, vehicleProfileId)).orderBy(desc(calibrations.createdAt));
}

/** Takes a queued calibration for one worker; undefined when another took or finished it. */
export async function claimQueuedCalibration(db: Executor, id: string): Promise<CalibrationRow | undefined> {
  const [row] = await db
    .update(calibrations)
    .set({ status: 'running', startedAt: new Date(), failureReason: null })
    .where(and(eq(calibrations.id, id), eq(calibrations.status, 'queued')))
    .returning();
  return row;
}

export async function finishCalibration(
  db: Executor,
  id: string,
  outcome: { result: CalibrationResult | null; failureReason: string | null },
): Promise<void> {
  await db
    .update(calibrations)
    .set({
      status: outcome.result ? 'done' : 'failed',
      result: outcome.result,
      failureReason: outcome.failureReason,
      finishedAt: new Date(),
    })
    .where(eq(calibrations.id, id));
}

export async function markCalibrationAccepted(
  db: Executor,
  id: string,
  decision: { decidedAt: Date; decidedByName: string; acceptedVersion: number },
): Promise<CalibrationRow> {
  const [row] = await db
    .update(calibrations)
    .set({ decision: 'accepted', ...decision })
    .where(eq(calibrations.id, id))
    .returning();
  return row!;
}

/** Records a rejection unless someone decided meanwhile (then undefined). */
export async function markCalibrationRejected(db: Executor, id: string, decidedByName: string): Promise<CalibrationRow | undefined> {
  const [row] = await db
    .update(calibrations)
    .set({ decision: 'rejected', decidedAt: new Date(), decidedByName })
    .where(and(eq(calibrations.id, id), isNull(calibrations.decision)))
    .returning();
  return row;
}

export async function setCalibrationRerun(db: Executor, id: string, rerunBatchId: string): Promise<CalibrationRow | undefined> {
  const [row] = await db.update(calibrations).set({ rerunBatchId }).where(eq(calibrations.id, id)).returning();
  return row;
}
