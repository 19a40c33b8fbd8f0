import type { AppDeps } from './app-deps';
import { runtimeOf } from './app-runtime';
import type { RouteAnalyser } from './analysis/analysis-pool';
import { elevationSamplerFor } from './terrain/raster/elevation-sampler';

/**
 * Fills in the services every entry point needs unless a caller (a test) passes its own: the
 * process's runtime (terrain, job queues; api/app-runtime.ts), routes without their own
 * elevations sampled from the uploaded terrain, and analyses on the process's analysis threads. The HTTP app, the background workers and the demo seed all go
 * through here, so they compute alike.
 */
export function withDefaultServices(deps: AppDeps): AppDeps {
  // Made on the caller's object first, so the caller and every copy share one runtime.
  const runtime = runtimeOf(deps);
  const sampleElevations = deps.sampleElevations ?? elevationSamplerFor(deps);
  const analyse = deps.analyse ?? ((request) => runtime.analysisPool.analyse(request, sampleElevations));
  return { ...deps, runtime, sampleElevations, analyse };
}

/** The analyser of these dependencies, the default one when the caller passed none. */
export function analyserOf(deps: AppDeps): RouteAnalyser {
  return deps.analyse ?? withDefaultServices(deps).analyse!;
}
