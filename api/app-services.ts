import type { AppDeps } from './app-deps';
import { analysisPoolFor, type RouteAnalyser } from './analysis/analysis-pool';
import { elevationSamplerFor } from './terrain/raster/elevation-sampler';

/**
 * Fills in the services every entry point needs unless a caller (a test) passes its own: routes
 * without their own elevations are sampled from the uploaded terrain, and analyses run on the
 * process's analysis threads. The HTTP app, the background workers and the demo seed all go
 * through here, so they compute alike.
 */
export function withDefaultServices(deps: AppDeps): AppDeps {
  const sampleElevations = deps.sampleElevations ?? elevationSamplerFor(deps);
  const analyse = deps.analyse ?? ((request) => analysisPoolFor(deps).analyse(request, sampleElevations));
  return { ...deps, sampleElevations, analyse };
}

/** The analyser of these dependencies, the default one when the caller passed none. */
export function analyserOf(deps: AppDeps): RouteAnalyser {
  return deps.analyse ?? withDefaultServices(deps).analyse!;
}
