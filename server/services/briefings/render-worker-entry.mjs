// Worker threads do not inherit the main thread's TypeScript loader: register tsx here, then
// hand piscina the TypeScript task.
import { register } from 'tsx/esm/api';

register();
const task = await import('./render-worker.ts');
export default task.default;
