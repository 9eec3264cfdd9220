// Worker threads do not inherit the main thread's TypeScript loader: register tsx here, then
// load the TypeScript worker.
import { register } from 'tsx/esm/api';

register();
await import('./proposal-worker.ts');
