// Worker thread entry (piscina) for scripts/bench-service-day.ts: loads the task through tsx.
import { tsImport } from 'tsx/esm/api';

const task = await tsImport('./bench-service-day-task.ts', import.meta.url);

export default task.default;
