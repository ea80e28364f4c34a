// A series worker under Node, from source: registers the TypeScript loader, then runs
// workers/seriesWorkerBody.ts (the installed command runs its bundle, dist-cli/seriesWorker.mjs, instead).
import { register } from 'tsx/esm/api';

register();
await import('./seriesWorkerBody.ts');
