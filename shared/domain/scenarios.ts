import * as z from 'zod';
import { descentSchema, profileSchema, profileSubsetSchema, summarySchema, uncoveredStretchSchema } from './analysis';
import { loadCaseSchema, seasonSchema } from './vehicle-profiles';
import { speedLimitKphSchema } from './limits';

/**
 * A scenario: one route version run with one vehicle profile, load, season, start SOC and
 * options. Results are stored with the engine version and the exact inputs, so an old result can
 * always be explained, and marked stale when the route, the profile or the engine changes.
 */

export const scenarioIdParamsSchema = z.object({ scenarioId: z.uuid() });

/**
 * GET /api/scenarios/:scenarioId/descent-cards.pdf: every descent of the result, or the one of
 * `direction` that covers `atM` (m along the route) when both are given.
 */
export const descentCardsQuerySchema = z
  .object({
    direction: z.enum(['outbound', 'inbound']).optional(),
    atM: z.coerce.number().min(0).optional(),
  })
  .refine((query) => (query.direction === undefined) === (query.atM === undefined), {
    message: 'Give both direction and atM to pick one descent, or neither for all of them',
    path: ['atM'],
  });

export const DIRECTIONS = ['outbound', 'inbound', 'round-trip'] as const;
export const directionSchema = z.enum(DIRECTIONS);
export type Direction = z.infer<typeof directionSchema>;

export const scenarioLoadSchema = z.union([
  z.object({ kind: z.literal('case'), case: loadCaseSchema }),
  z.object({ kind: z.literal('passengers'), passengers: z.number().int().min(0).max(400) }),
]);
export type ScenarioLoad = z.infer<typeof scenarioLoadSchema>;

export const scenarioSeasonSchema = z.union([
  z.object({ kind: z.literal('season'), season: seasonSchema }),
  z.object({ kind: z.literal('custom'), ambientC: z.number().min(-60).max(60), auxPowerW: z.number().min(0).max(500_000) }),
]);
export type ScenarioSeason = z.infer<typeof scenarioSeasonSchema>;

export const scenarioOptionsSchema = z.object({
  spacingM: z.number().min(1).max(200).default(10),
  smoothingWindowM: z.number().min(0).max(5_000).default(150),
  descentSpeedCapKph: speedLimitKphSchema.optional(),
  /** Whether the route's stops (with dwell) are served. */
  useStops: z.boolean().default(true),
  /** Layover at the far terminal on a round trip, s. */
  layoverS: z.number().min(0).max(7_200).default(300),
});
export type ScenarioOptions = z.infer<typeof scenarioOptionsSchema>;

export const scenarioDraftSchema = z.object({
  name: z.string().trim().min(1).max(160),
  routeId: z.uuid(),
  /** Route version to run; absent means the latest version at save time. */
  routeVersion: z.number().int().min(1).optional(),
  direction: directionSchema.default('outbound'),
  vehicleProfileId: z.uuid(),
  load: scenarioLoadSchema.default({ kind: 'case', case: 'seated' }),
  season: scenarioSeasonSchema.default({ kind: 'season', season: 'mild' }),
  startSoc: z.number().min(0).max(1).default(0.8),
  options: scenarioOptionsSchema.default(scenarioOptionsSchema.parse({})),
  /** Counted in the board's network figures (trips per day × service days). */
  inService: z.boolean().default(false),
});
export type ScenarioDraft = z.infer<typeof scenarioDraftSchema>;
export type ScenarioDraftInput = z.input<typeof scenarioDraftSchema>;

export const RUN_STATUSES = ['queued', 'running', 'done', 'failed'] as const;
export const runStatusSchema = z.enum(RUN_STATUSES);

export const riskCountsSchema = z.object({
  low: z.number().int(),
  elevated: z.number().int(),
  high: z.number().int(),
  critical: z.number().int(),
});

export const scenarioSchema = scenarioDraftSchema.extend({
  id: z.uuid(),
  routeVersion: z.number().int(),
  routeName: z.string(),
  vehicleProfileName: z.string(),
  status: runStatusSchema,
  /** Why the last run failed, in plain words (e.g. which stretches lack terrain). */
  failureReason: z.string().nullable(),
  /** Whether the inputs or the engine changed since the stored result was computed. */
  isStale: z.boolean(),
  /** What changed, in plain words (empty when not stale). */
  staleReasons: z.array(z.string()),
  /**
   * Whether the draft named its route version: a pinned scenario always runs that version; an
   * unpinned one moves to the route's latest version when it is saved or re-run.
   */
  routeVersionPinned: z.boolean(),
  /** The route's latest version now. */
  latestRouteVersion: z.number().int(),
  engineVersion: z.string().nullable(),
  computedAt: z.iso.datetime({ offset: true }).nullable(),
  /** Headline figures of the stored result (whole scenario: one direction or the round trip). */
  summary: summarySchema.nullable(),
  riskCounts: riskCountsSchema.nullable(),
  createdBy: z.string(),
  updatedAt: z.iso.datetime({ offset: true }),
});
export type Scenario = z.infer<typeof scenarioSchema>;
export const scenarioListSchema = z.object({ items: z.array(scenarioSchema) });

/** One direction's full result. */
export const directionResultSchema = z.object({
  direction: z.enum(['outbound', 'inbound']),
  summary: summarySchema,
  profile: profileSchema,
  descents: z.array(descentSchema),
  uncoveredStretches: z.array(uncoveredStretchSchema).optional(),
});
export type DirectionResult = z.infer<typeof directionResultSchema>;

export const scenarioResultSchema = z.object({
  scenarioId: z.uuid(),
  engineVersion: z.string(),
  computedAt: z.iso.datetime({ offset: true }),
  /** The exact engine inputs (vehicle, conditions, options) per direction, for explanation. */
  inputs: z.unknown(),
  /** Whole scenario totals (the round trip combines both directions). */
  summary: summarySchema,
  directions: z.array(directionResultSchema).min(1),
  caution: z.string(),
});
export type ScenarioResult = z.infer<typeof scenarioResultSchema>;

/** The result as answered with a ProfileView (each direction's profile possibly thinned). */
export const scenarioResultViewSchema = scenarioResultSchema.extend({
  directions: z.array(directionResultSchema.extend({ profile: profileSubsetSchema })).min(1),
});

/** GET /api/scenarios filters. */
export const scenarioListQuerySchema = z.object({
  routeId: z.uuid().optional(),
  vehicleProfileId: z.uuid().optional(),
  inService: z.stringbool().optional(),
});
export type ScenarioListQuery = z.infer<typeof scenarioListQuerySchema>;

/** GET /api/scenarios/compare?ids=a,b[,c,d]: two to four distinct scenarios. */
export const scenarioCompareQuerySchema = z.object({
  ids: z
    .string()
    .transform((text) =>
      text
        .split(',')
        .map((id) => id.trim())
        .filter((id) => id.length > 0),
    )
    .pipe(z.array(z.uuid()).min(2, 'give 2 to 4 scenario ids').max(4, 'give 2 to 4 scenario ids')),
});

export const scenarioComparisonSchema = z.object({
  items: z.array(z.object({ scenario: scenarioSchema, result: scenarioResultSchema.nullable() })),
  caution: z.string(),
});
export type ScenarioComparison = z.infer<typeof scenarioComparisonSchema>;
