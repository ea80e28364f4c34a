// A text worker of the parallel loader under Node, from source: registers the TypeScript loader, then runs
// workers/textWorkerBody.ts (the installed command runs its bundle, dist-cli/textWorker.mjs, instead).
import { register } from 'tsx/esm/api';

register();
await import('./textWorkerBody.ts');
