// A read worker of the parallel loader under Node, from source: registers the TypeScript loader, then runs
// workers/readWorkerBody.ts (the installed command runs its bundle, dist-cli/readWorker.mjs, instead).
import { register } from 'tsx/esm/api';

register();
await import('./readWorkerBody.ts');
