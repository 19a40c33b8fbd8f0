import * as z from 'zod';

/**
 * Field limits and defaults the contract, the forms and their messages share: the zod schemas
 * build on these, and the interface states the same range in the person's units
 * (shared/presentation/field-limits.ts), so a form never accepts what the API refuses.
 */

/**
 * Posted speed limits, descent speed caps and a route's default limit, km/h. 5 km/h is about
 * walking pace (the lowest speed the descent advice considers); 130 km/h is the highest general
 * motorway limit in Europe (common practice), far above any mountain transit line.
 */
export const SPEED_LIMIT_KPH = { min: 5, max: 130 } as const;

/** Default speed limit of a new route, km/h (common practice: the urban limit in most of Europe). */
export const DEFAULT_SPEED_LIMIT_KPH = 50;

/** A speed limit or cap in km/h within `SPEED_LIMIT_KPH`. */
export const speedLimitKphSchema = z.number().min(SPEED_LIMIT_KPH.min).max(SPEED_LIMIT_KPH.max);
