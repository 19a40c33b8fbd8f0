import { afterAll, describe, expect, it } from 'vitest';
import type { PreviewRequestInput } from '@shared/domain/analysis';
import { MissingElevationError, RouteTooLargeError, UncoveredTerrainError } from '@shared/engine/validation';
import { AnalysisPool } from '../../../api/analysis/analysis-pool';
import { aStraightRoute, aWorkedExampleBus } from '../../shared/support/engine-builders';

/** A 2 km line without elevations: the engine needs a sampler for it. */
function aFlatLineRequest(overrides: Partial<PreviewRequestInput['options']> = {}): PreviewRequestInput {
  const coordinates = aStraightRoute(2_000, () => 0).map(([lon, lat]) => [lon, lat] as [number, number]);
  return {
    route: { type: 'LineString', coordinates },
    vehicle: aWorkedExampleBus(),
    conditions: { startSoc: 0.5 },
    options: { ...overrides },
  };
}

describe('AnalysisPool refusals across the worker boundary', () => {
  const pool = new AnalysisPool({ threads: 1, maxQueue: 4, workerHeapMb: 256 });
  afterAll(() => pool.close());

  it('raises the same class with the same code on the API thread as the engine raised in the worker', async () => {
    const missing = pool.analyse(aFlatLineRequest());
    await expect(missing).rejects.toBeInstanceOf(MissingElevationError);
    await expect(missing).rejects.toMatchObject({ code: 'elevation_missing', field: 'route.coordinates' });

    const uncovered = pool.analyse(aFlatLineRequest(), (points) => Promise.resolve(points.map(() => null)));
    await expect(uncovered).rejects.toBeInstanceOf(UncoveredTerrainError);
    await expect(uncovered).rejects.toMatchObject({ code: 'terrain_not_covered', stretches: [expect.objectContaining({ fromM: 0 })] });

    const tooLarge = pool.analyse({
      ...aFlatLineRequest({ spacingM: 1 }),
      route: { type: 'LineString', coordinates: aStraightRoute(450_000, () => 500) },
    });
    await expect(tooLarge).rejects.toBeInstanceOf(RouteTooLargeError);
    await expect(tooLarge).rejects.toMatchObject({ code: 'route_too_large' });
  }, 60_000);
});
