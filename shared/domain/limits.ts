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

/**
 * Round trips a route runs per service day, for the annual figures. 500 is a trip about every
 * three minutes around the clock, beyond any single mountain line; 0 leaves the route out of the
 * annual totals.
 */
export const TRIPS_PER_DAY = { min: 0, max: 500, default: 0 } as const;

/** Days a year a route runs (whole days); 360 leaves a few days for closures (common practice). */
export const SERVICE_DAYS_PER_YEAR = { min: 0, max: 366, default: 360 } as const;

/** State of charge as a share of usable battery energy, 0–1; forms show it in percent. */
export const SOC = { min: 0, max: 1 } as const;

/** Start SOC of a run when none is given: a bus leaving the depot after a part charge. */
export const DEFAULT_START_SOC = 0.8;

export const tripsPerDaySchema = z.number().min(TRIPS_PER_DAY.min).max(TRIPS_PER_DAY.max);
export const serviceDaysPerYearSchema = z.number().int().min(SERVICE_DAYS_PER_YEAR.min).max(SERVICE_DAYS_PER_YEAR.max);
/** A state of charge within `SOC`. */
export const socSchema = z.number().min(SOC.min).max(SOC.max);
