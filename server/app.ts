// createApp(deps): the middleware order, the routers, then not-found and the error handler.
// Tests build it on a test database; index.ts builds it and listens.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import express from 'express';
import session from 'express-session';
import helmet from 'helmet';
import { csrfSync } from 'csrf-sync';
import type pg from 'pg';
import type { DestinationStream } from 'pino';
import type { Config } from './config';
import type { Database } from './db/client';
import { configurePassport } from './auth/passport';
import { createSessionStore } from './auth/session-store';
import { csrfState } from './auth/csrf-state';
import { configureAuthUserCache } from './services/auth-user-cache';
import { errorHandler } from './middleware/error-handler';
import { refuseNulText } from './middleware/refuse-nul-text';
import { apiNotFound } from './middleware/not-found';
import { uploadLimits } from './middleware/upload-slots';
import { createAnswerCache } from './http/answer-cache';
import { planExportsRouter } from './routes/plan-exports';
import { mapTilesRouter } from './routes/map-tiles';
import { authRouter, sessionCookieName } from './routes/auth';
import { plansRouter } from './routes/plans';
import { membersRouter } from './routes/members';
import { auditRouter } from './routes/audit';
import { roadLayersRouter } from './routes/road-layers';
import { zonesSheltersRouter } from './routes/zones-shelters';
import { settingsRouter } from './routes/settings';
import { createSettings } from './services/settings';
import { runsRouter } from './routes/runs';
import type { RunEnqueuer } from './queue/run-enqueuer';
import type { ImportEnqueuer } from './queue/run-queue';
import { importsRouter } from './routes/imports';
import { mappingPresetsRouter } from './routes/mapping-presets';
import { healthRouter } from './routes/health';
import { randomUUID } from 'node:crypto';
import { pinoHttp } from 'pino-http';
import { createLogger } from './logger';
import { scenariosRouter } from './routes/scenarios';
import { sweepsRouter } from './routes/sweeps';
import { proposalsRouter } from './routes/proposals';
import type { ProposalEnqueuer } from './queue/proposal-queue';
import { briefingsRouter } from './routes/briefings';

export type AppDeps = {
  config: Config;
  db: Database;
  pool: pg.Pool;
  log?: (err: unknown) => void;
  // The built client; served with a fallback to index.html for client-side routes.
  clientDir?: string;
  // Where new runs are queued; worker processes take them from there (server/worker.ts).
  runQueue: RunEnqueuer;
  // Where uploaded files are queued for import (the same pg-boss; workers take them too).
  importQueue?: ImportEnqueuer;
  // Where searches for the best change are queued (server/queue/proposal-queue.ts); the run workers take them.
  proposalQueue?: ProposalEnqueuer;
  // True once the process is shutting down: /readyz then answers 503.
  isStopping?: () => boolean;
  // Where the JSON log lines go (standard output unless given).
  logDestination?: DestinationStream;
};

const noImportQueue: ImportEnqueuer = {
  enqueueImport: async () => {
    throw new Error('this app was built without an import queue');
  },
};

const noProposalQueue: ProposalEnqueuer = {
  enqueue: async () => {
    throw new Error('this process has no proposal queue');
  },
};

const defaultClientDir = fileURLToPath(new URL('../dist', import.meta.url));

export function createApp({ config, db, pool, log: givenLog, clientDir = defaultClientDir, runQueue, importQueue = noImportQueue, proposalQueue = noProposalQueue, isStopping, logDestination }: AppDeps) {
  const logger = createLogger(config, logDestination);
  const log = givenLog ?? ((err: unknown) => logger.error({ err }, 'unhandled error'));
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');

  const settings = createSettings(db, config.TILE_URL, log);
  // Warm the cache so the first page's policy already names a configured tile server.
  void settings.refreshOrigins().catch(log);
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          'img-src': ["'self'", 'data:', 'blob:', () => settings.tileOrigins().join(' ') || "'self'"],
        },
      },
    }),
  );
  // One JSON line per request with a request id (also sent back as x-request-id).
  app.use(
    pinoHttp({
      logger,
      genReqId: (req, res) => {
        const id = (req.headers['x-request-id'] as string | undefined)?.slice(0, 100) || randomUUID();
        res.setHeader('x-request-id', id);
        return id;
      },
      autoLogging: { ignore: (req) => req.url === '/healthz' },
    }),
  );
  // Health checks come before sessions: probes carry no cookie and must not create sessions.
  app.use(healthRouter(pool, log, isStopping));
  app.use(express.json({ limit: '1mb' }), refuseNulText);

  app.use(
    session({
      name: sessionCookieName,
      store: createSessionStore(pool, 60_000, config.AUTH_CACHE_MILLISECONDS),
      secret: config.SESSION_SECRET,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: { httpOnly: true, sameSite: 'lax', secure: config.COOKIE_SECURE, maxAge: 8 * 3600_000 },
    }),
  );
  configureAuthUserCache(config.AUTH_CACHE_MILLISECONDS);
  const passport = configurePassport(db, config);
  app.use(passport.initialize());
  app.use(passport.session());

  // CSRF protection: the token must come back in the x-csrf-token header of every
  // state-changing request. It lives in the session once signed in, in a signed cookie before
  // (server/auth/csrf-state.ts), so anonymous visits write no session rows.
  const { csrfSynchronisedProtection, generateToken } = csrfSync({
    size: 32,
    ...csrfState(config.SESSION_SECRET, config.COOKIE_SECURE),
    getTokenFromRequest: (req) => req.get('x-csrf-token'),
    errorConfig: { statusCode: 403, code: 'EBADCSRFTOKEN', message: 'Invalid CSRF token' },
  });
  app.use('/api', csrfSynchronisedProtection);
  // Upload slots and the body-read time limit, taken by the upload middleware after each route's own checks.
  app.locals.uploadLimits = uploadLimits(config.UPLOADS_AT_ONCE, config.VERIFY_UPLOADS_AT_ONCE, config.UPLOAD_READ_TIMEOUT_SECONDS);

  const answers = createAnswerCache(config.ANSWER_CACHE_MEGABYTES);
  app.use('/api/auth', authRouter({ db, config, passport, csrfToken: generateToken }));
  app.use('/api/plans', plansRouter(db));
  app.use('/api/plans/:planId', roadLayersRouter(db, config, answers));
  app.use('/api/plans/:planId', zonesSheltersRouter(db));
  app.use('/api/plans/:planId', scenariosRouter(db));
  app.use('/api/plans/:planId', runsRouter(db, config, runQueue, answers));
  app.use('/api/plans/:planId', importsRouter(db, config, importQueue, log));
  app.use('/api/plans/:planId', proposalsRouter(db, config, proposalQueue));
  app.use('/api/plans/:planId', sweepsRouter(db, config, runQueue));
  app.use('/api/plans/:planId', mapTilesRouter(db, answers));
  app.use('/api/plans/:planId', planExportsRouter(db, config));
  app.use('/api/members', membersRouter(db, config));
  app.use('/api/audit', auditRouter(db));
  app.use('/api/settings', settingsRouter(settings, db, config.BRIEFING_TIME_ZONE));
  app.use('/api/mapping-presets', mappingPresetsRouter(db));
  app.use('/api/briefings', briefingsRouter(db, config));
  app.use('/api', apiNotFound);

  if (fs.existsSync(path.join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(clientDir, 'index.html')));
  }

  app.use(errorHandler(log));
  return app;
}
