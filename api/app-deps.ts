import type { Config } from './config';
import type { Database } from './db/client';

/** What the API needs from outside; tests pass their own. */
export interface AppDeps {
  db: Database;
  config: Config;
}
