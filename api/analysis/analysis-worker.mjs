// Worker thread entry (piscina) for route analyses when the API runs from its TypeScript sources
// (tsx, vitest): loads analysis-task.ts through tsx. The bundled server has its own
// dist/api/analysis-worker.mjs, built from analysis-task.ts by `npm run build:api`.
import { tsImport } from 'tsx/esm/api';

const task = await tsImport('./analysis-task.ts', import.meta.url);

export default task.default;
