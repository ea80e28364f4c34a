// A compute worker of the pool under Node, from source: registers the TypeScript loader, then runs
// workers/shareWorkerBody.ts (the installed command runs its bundle, dist-cli/shareWorker.mjs, instead).
import { register } from 'tsx/esm/api';

register();
await import('./shareWorkerBody.ts');
