// Worker threads do not inherit the main thread's TypeScript loader: register tsx here, then
// load the TypeScript worker and hand its task function to the pool.
import { register } from 'tsx/esm/api';

register();
const worker = await import('./import-worker.ts');
export default worker.default;
