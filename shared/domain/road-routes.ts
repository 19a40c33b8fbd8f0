import { z } from 'zod';
import { lineStringSchema } from './analysis';

/**
 * Road routes as planners edit them. A route is versioned: every save of its geometry, stops or
 * speed limits makes a new version, and a scenario records the exact version it ran on.
 */

export const routeIdParamsSchema = z.object({ routeId: z.uuid() });

/** A stop placed on the route. `atM` is its distance along the route, recomputed from lon/lat. */
export const routeStopSchema = z.object({
  name: z.string().trim().min(1).max(120),
  lon: z.number().min(-180).max(180),
  lat: z.number().min(-90).max(90),
  /** Distance along the route, m (computed by the server by projecting lon/lat on the line). */
  atM: z.number().min(0).optional(),
  /** Dwell time, s. */
  dwellS: z.number().min(0).max(3_600).default(20),
});
export type RouteStop = z.infer<typeof routeStopSchema>;

/** A speed-limit stretch along the route, metres from the start of the outbound direction. */
export const routeSpeedLimitSchema = z
  .object({
    fromM: z.number().min(0),
    toM: z.number().min(0),
    speedKph: z.number().min(5).max(130),
  })
  .refine((stretch) => stretch.toM > stretch.fromM, { message: 'toM must exceed fromM', path: ['toM'] });
export type RouteSpeedLimit = z.infer<typeof routeSpeedLimitSchema>;

export const ROUTE_MODES = ['bus', 'trolleybus', 'tram'] as const;

/** What a planner sends to create a route or save a new version of it. */
export const roadRouteDraftSchema = z.object({
  name: z.string().trim().min(1).max(120),
  description: z.string().trim().max(2_000).default(''),
  mode: z.enum(ROUTE_MODES).default('bus'),
  /** Outbound direction; inbound runs it backwards. Positions may carry elevation. */
  geometry: lineStringSchema,
  stops: z.array(routeStopSchema).max(500).default([]),
  speedLimits: z.array(routeSpeedLimitSchema).max(500).default([]),
  /** Default limit outside the stretches, km/h. */
  defaultSpeedLimitKph: z.number().min(5).max(130).default(50),
  /** Round trips per service day (for annual figures). */
  tripsPerDay: z.number().min(0).max(500).default(0),
  serviceDaysPerYear: z.number().int().min(0).max(366).default(360),
});
export type RoadRouteDraft = z.infer<typeof roadRouteDraftSchema>;
export type RoadRouteDraftInput = z.input<typeof roadRouteDraftSchema>;

export const roadRouteSchema = roadRouteDraftSchema.extend({
  id: z.uuid(),
  version: z.number().int().min(1),
  versionId: z.uuid(),
  lengthM: z.number(),
  stops: z.array(routeStopSchema.required({ atM: true })),
  createdBy: z.string(),
  updatedAt: z.iso.datetime({ offset: true }),
});
export type RoadRoute = z.infer<typeof roadRouteSchema>;

export const roadRouteSummarySchema = z.object({
  id: z.uuid(),
  name: z.string(),
  mode: z.enum(ROUTE_MODES),
  version: z.number().int(),
  lengthM: z.number(),
  stopCount: z.number().int(),
  tripsPerDay: z.number(),
  scenarioCount: z.number().int(),
  updatedAt: z.iso.datetime({ offset: true }),
});
export type RoadRouteSummary = z.infer<typeof roadRouteSummarySchema>;
export const roadRouteListSchema = z.object({ items: z.array(roadRouteSummarySchema) });
