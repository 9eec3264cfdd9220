// Worker threads do not inherit the main thread's TypeScript loader: register tsx here, then
// load the TypeScript writer.
import { register } from 'tsx/esm/api';

register();
await import('./write-export-worker.ts');
