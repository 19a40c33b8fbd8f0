import type { ElevationSampler } from '@shared/engine/analyse-route';
import type { RouteAnalyser } from './analysis/analysis-pool';
import type { AppRuntime } from './app-runtime';
import type { Config } from './config';
import type { Database } from './db/client';

/** What the API needs from outside; tests pass their own. */
export interface AppDeps {
  db: Database;
  config: Config;
  /** Terrain elevation lookup for routes whose coordinates carry no elevation. */
  sampleElevations?: ElevationSampler;
  /** Runs one route analysis (on the worker threads unless a caller passes its own). */
  analyse?: RouteAnalyser;
  /**
   * The process's long-lived parts (terrain runtime, job queues), shared by reference by every
   * copy of these dependencies; made on first use when absent (api/app-runtime.ts).
   */
  runtime?: AppRuntime;
}
