/**
 * The engine's output as the database keeps it: a scenario's result (summary, risk counts, each
 * direction's profile and descents) and a review item's descents. Every stored result carries a
 * schema version (`result_version` on `scenarios` and `review_items`); reading one upgrades it to
 * the current shape and parses it with the contract's zod schemas, so a row that does not hold
 * what the code expects is found on read, naming the scenario or item and the field, instead of
 * breaking a chart or a PDF later.
 *
 * Versions:
 * 1. Rows written before results carried a version (the migration gives them 1). Their descents
 *    may predate the worst credible case: such a descent's `risk` is the nominal run's risk.
 * 2. The current shape: every descent carries `nominalRisk`, and a result its risk counts.
 *    Upgrading a version-1 descent sets `nominalRisk` to its `risk` when missing, which is what
 *    that risk was. Missing risk counts (of any version) are counted from the descents.
 *
 * Upgrade on read, not in a migration: a migration would have to rewrite large JSONB documents
 * of every stored result in one transaction, and reading stays correct for rows restored from an
 * older backup. A re-run writes the current version.
 */
import * as z from 'zod';
import { descentSchema, summarySchema, type Descent, type Summary } from '@shared/domain/analysis';
import { directionResultSchema, riskCountsSchema, type DirectionResult } from '@shared/domain/scenarios';

/** The schema version every newly stored result is written in. */
export const STORED_RESULT_VERSION = 2;

/** A scenario's stored result, in the current shape. */
export interface StoredScenarioResult {
  summary: Summary;
  riskCounts: z.infer<typeof riskCountsSchema>;
  directions: DirectionResult[];
}

/** Raised when a stored result cannot be read: its version is unknown or its content is not the contract's. */
export class StoredResultError extends Error {
  constructor(
    readonly what: string,
    message: string,
  ) {
    super(`${what}: the stored result cannot be read: ${message}`);
    this.name = 'StoredResultError';
  }
}

const storedScenarioResultSchema = z.object({
  summary: summarySchema,
  riskCounts: riskCountsSchema,
  directions: z.array(directionResultSchema),
});

type Json = Record<string, unknown>;

function isObject(value: unknown): value is Json {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Version 1 → 2 for one descent: the risk of a descent stored before the worst case is the nominal risk. */
function upgradeDescentFrom1(descent: unknown): unknown {
  if (!isObject(descent) || descent['nominalRisk'] !== undefined) return descent;
  return { ...descent, nominalRisk: descent['risk'] };
}

function assertKnownVersion(what: string, version: number): void {
  if (!Number.isInteger(version) || version < 1 || version > STORED_RESULT_VERSION) {
    throw new StoredResultError(what, `schema version ${version} is not one this server reads (1–${STORED_RESULT_VERSION})`);
  }
}

function parsed<T>(what: string, schema: z.ZodType<T>, value: unknown): T {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  const issue = result.error.issues[0]!;
  throw new StoredResultError(what, `${issue.path.join('.') || '(root)'}: ${issue.message}`);
}

/** Upgrades one stored descent of `version` to the current shape and parses it. */
export function readStoredDescent(what: string, version: number, descent: unknown): Descent {
  assertKnownVersion(what, version);
  const upgraded = version < 2 ? upgradeDescentFrom1(descent) : descent;
  return parsed(what, descentSchema, upgraded);
}

/** Upgrades a scenario's stored result of `version` to the current shape and parses it. */
export function readStoredScenarioResult(
  what: string,
  stored: { version: number; summary: unknown; riskCounts: unknown; directionResults: unknown },
): StoredScenarioResult {
  assertKnownVersion(what, stored.version);
  let directions = stored.directionResults;
  if (stored.version < 2 && Array.isArray(directions)) {
    directions = directions.map((direction: unknown) =>
      isObject(direction) && Array.isArray(direction['descents'])
        ? { ...direction, descents: direction['descents'].map(upgradeDescentFrom1) }
        : direction,
    );
  }
  let riskCounts = stored.riskCounts;
  if ((riskCounts === null || riskCounts === undefined) && Array.isArray(directions)) {
    riskCounts = countRisks(directions);
  }
  return parsed(what, storedScenarioResultSchema, { summary: stored.summary, riskCounts, directions });
}

/** Descents per risk level over every direction (what a run stores as `riskCounts`). */
function countRisks(directions: unknown[]): Json {
  const counts: Record<string, number> = { low: 0, elevated: 0, high: 0, critical: 0 };
  for (const direction of directions) {
    const descents = isObject(direction) && Array.isArray(direction['descents']) ? direction['descents'] : [];
    for (const descent of descents) {
      const risk = isObject(descent) ? descent['risk'] : undefined;
      if (typeof risk === 'string' && risk in counts) counts[risk]!++;
    }
  }
  return counts;
}

/** The stored part of a review item: its shown descent and each source's descent. */
interface StoredReviewDescents {
  id: string;
  resultVersion: number;
  descent: Descent;
  sources: Record<string, { descent: Descent }>;
}

/**
 * A review item row with its descents upgraded to the current shape and parsed; the row then
 * says the current version, so writing it back stores what it now holds.
 */
export function readStoredReviewItem<T extends StoredReviewDescents>(row: T): T {
  const what = `Review item ${row.id}`;
  const sources: Record<string, T['sources'][string]> = {};
  for (const [scenarioId, source] of Object.entries(row.sources)) {
    const descent = readStoredDescent(`${what}, source ${scenarioId}`, row.resultVersion, source.descent);
    sources[scenarioId] = { ...source, descent } as T['sources'][string];
  }
  return { ...row, resultVersion: STORED_RESULT_VERSION, descent: readStoredDescent(what, row.resultVersion, row.descent), sources };
}
