import type { AppDeps } from './app-deps';
import { elevationSamplerFor } from './terrain/elevation-sampler';

/**
 * Fills in the services every entry point needs unless a caller (a test) passes its own: routes
 * without their own elevations are sampled from the uploaded terrain. The HTTP app, the
 * background workers and the demo seed all go through here, so they compute alike.
 */
export function withDefaultServices(deps: AppDeps): AppDeps {
  return { ...deps, sampleElevations: deps.sampleElevations ?? elevationSamplerFor(deps) };
}
