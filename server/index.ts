// Starts the API and serves the built client on one port.
import { loadConfig } from './config';
import { createDatabase } from './db/client';
import { createApp } from './app';
import { demoAccounts } from './seed/demo-accounts';
import { startRunQueue } from './queue/run-queue';
import { startDevOutbox } from './services/briefings/outbox';

const config = loadConfig();
const { db, pool } = createDatabase(config.DATABASE_URL);
const runQueue = await startRunQueue(config);
// Development outbox: briefing e-mail goes to a loopback SMTP server that keeps it (admins read it on /outbox).
const outbox = await startDevOutbox(db, config);
const app = createApp({ config: outbox ? { ...config, SMTP_URL: outbox.url } : config, db, pool, runQueue });

const server = app.listen(config.PORT, config.HOST, () => {
  const url = `http://${config.HOST === '0.0.0.0' ? 'localhost' : config.HOST}:${config.PORT}/`;
  const lines = [
    '',
    `Cutline is running at ${url}`,
    '',
    'Demo sign-ins (an invented organization; change these before real use):',
    ...demoAccounts.map((a) => `  ${a.role.padEnd(9)} ${a.email.padEnd(32)} password: ${a.password}`),
    '',
    ...(outbox ? [`E-mail is kept in the development outbox (${outbox.url}, admins: ${url}outbox), never delivered.`, ''] : []),
    'Stop with Ctrl+C.',
  ];
  console.log(lines.join('\n'));
});

function shutdown() {
  server.close(() => {
    Promise.all([runQueue.stop(), outbox?.close()])
      .then(() => pool.end())
      .finally(() => process.exit(0));
  });
  setTimeout(() => process.exit(0), 5000).unref();
}
process.on('SIGINT', shutdown);
process.on('SIGTERM', shutdown);
