/**
 * Input checks for the engine. Invalid input throws an `EngineInputError` (a `RangeError`) that
 * names the offending field, so the API can answer 400 and no result ever carries NaN.
 */
import type { z } from 'zod';

/**
 * Why the engine refused an input, for callers to tell refusals apart without reading messages:
 * - `invalid_input`: a value outside its range or of the wrong shape (the field is named);
 * - `terrain_not_covered`: the terrain leaves stretches the engine will not fill;
 * - `route_too_large`: longer, or more points, than one analysis takes;
 * - `elevation_missing`: the positions carry no elevation and no elevation source was given.
 */
export type EngineRefusalCode = 'invalid_input' | 'terrain_not_covered' | 'route_too_large' | 'elevation_missing';

/** A `RangeError` that names the input field it is about, e.g. `vehicle.curbMassKg`. */
export class EngineInputError extends RangeError {
  /** Dotted path of the offending field. */
  readonly field: string;

  /** What kind of refusal this is (on the prototype, so a refusal revived across threads keeps it). */
  get code(): EngineRefusalCode {
    return 'invalid_input';
  }

  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.name = 'EngineInputError';
    this.field = field;
  }
}

/** Raised when the route's positions carry no elevation and no elevation source was given. */
export class MissingElevationError extends EngineInputError {
  override get code(): EngineRefusalCode {
    return 'elevation_missing';
  }

  constructor() {
    super('route.coordinates', 'positions carry no elevation and no elevation source was given');
    this.name = 'MissingElevationError';
  }
}

/** One stretch of the route without terrain, in metres along the route. */
export interface UncoveredStretch {
  fromM: number;
  toM: number;
}

/** Raised when the terrain leaves stretches uncovered that the engine will not fill. */
export class UncoveredTerrainError extends EngineInputError {
  override get code(): EngineRefusalCode {
    return 'terrain_not_covered';
  }

  /** Every uncovered stretch, filled or not. */
  readonly stretches: UncoveredStretch[];

  constructor(stretches: UncoveredStretch[], refused: UncoveredStretch[], maxGapFillM: number) {
    const list = refused.map((s) => `${s.fromM.toFixed(0)}–${s.toM.toFixed(0)} m`).join(', ');
    super(
      'route.coordinates',
      `no terrain covers ${list}; gaps up to ${maxGapFillM} m between covered points are ` +
        'interpolated, longer gaps and gaps at either end of the route are refused',
    );
    this.name = 'UncoveredTerrainError';
    this.stretches = stretches;
  }
}

/**
 * Raised before any work when a route is longer, or would be resampled into more points, than one
 * analysis accepts; the message names both limits so the caller can shorten the route or widen
 * the spacing.
 */
export class RouteTooLargeError extends EngineInputError {
  override get code(): EngineRefusalCode {
    return 'route_too_large';
  }

  constructor(
    readonly lengthM: number,
    readonly pointCount: number,
    readonly spacingM: number,
    readonly maxLengthM: number,
    readonly maxPoints: number,
  ) {
    super(
      'route.coordinates',
      `the route is ${(lengthM / 1_000).toFixed(1)} km long and would be resampled into ${pointCount} points at ` +
        `${spacingM} m spacing; one analysis takes at most ${maxLengthM / 1_000} km and ${maxPoints} points. ` +
        'Shorten the route or use a wider spacing.',
    );
    this.name = 'RouteTooLargeError';
  }
}

/** Throws unless `value` is a finite number. */
export function assertFinite(field: string, value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new EngineInputError(field, `must be a finite number, got ${String(value)}`);
  }
}

/** Throws unless `value` is finite and within [min, max]. */
export function assertInRange(field: string, value: number, min: number, max: number): void {
  assertFinite(field, value);
  if (value < min || value > max) {
    throw new EngineInputError(field, `must be within [${min}, ${max}], got ${value}`);
  }
}

/** Throws unless `value` is finite and ≥ 0. */
export function assertNonNegative(field: string, value: number): void {
  assertFinite(field, value);
  if (value < 0) throw new EngineInputError(field, `must be ≥ 0, got ${value}`);
}

/** Throws unless `value` is finite and > 0. */
export function assertPositive(field: string, value: number): void {
  assertFinite(field, value);
  if (value <= 0) throw new EngineInputError(field, `must be > 0, got ${value}`);
}

/**
 * Parses `input` with a zod schema; on failure throws an `EngineInputError` naming the first
 * offending field (prefixed with `root`, e.g. `vehicle.curbMassKg`).
 */
export function parseOrThrow<S extends z.ZodType>(schema: S, input: unknown, root = ''): z.output<S> {
  const result = schema.safeParse(input);
  if (result.success) return result.data;
  const issue = result.error.issues[0];
  const path = issue ? issue.path.map(String).join('.') : '';
  const field = [root, path].filter((part) => part.length > 0).join('.') || 'input';
  throw new EngineInputError(field, issue?.message ?? 'invalid input');
}
