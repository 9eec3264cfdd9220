// Starts the API and serves the built client on one port: one process, or API_PROCESSES of them
// sharing the port under a small primary process (api-primary.ts).
import cluster from 'node:cluster';
import { loadConfig } from './config';

const config = loadConfig();
if (config.API_PROCESSES > 1 && cluster.isPrimary) {
  const { runApiPrimary } = await import('./api-primary');
  runApiPrimary(config.API_PROCESSES);
} else {
  const { startApiProcess } = await import('./api-process');
  await startApiProcess(config);
}
