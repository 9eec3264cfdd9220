// The environment, parsed once. Everything the server reads from process.env is here.
import { z } from 'zod';

const defaultPort = process.env.CUTLINE_PG_PORT ?? '54329';

// Public defaults so development needs no setup; refused in production (below).
const developmentSecrets = {
  SESSION_SECRET: 'cutline-development-session-secret',
  SIGNING_KEY_PASSPHRASE: 'cutline-development-signing-key',
} as const;

const configSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default('127.0.0.1'),
  DATABASE_URL: z.string().url().default(`postgres://postgres@127.0.0.1:${defaultPort}/cutline`),
  SESSION_SECRET: z.string().min(16).default(developmentSecrets.SESSION_SECRET),
  // Secure cookies need HTTPS in front of the server: on by default under NODE_ENV=production
  // (a deployment sits behind a TLS proxy), off otherwise so loopback use works; either way an
  // explicit value wins (resolved below, once NODE_ENV is known).
  COOKIE_SECURE: z.enum(['true', 'false']).optional(),
  SIGN_IN_ATTEMPTS_PER_WINDOW: z.coerce.number().int().positive().default(10),
  SIGN_IN_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  // Failed sign-ins per address in that window, whatever the e-mail (password spraying).
  SIGN_IN_ATTEMPTS_PER_ADDRESS: z.coerce.number().int().positive().default(50),
  // Account back-off (server/services/sign-in-lockout.ts): after this many failed sign-ins in a
  // row (from any address) the account waits SIGN_IN_BACKOFF_SECONDS before the next attempt,
  // and each further failure doubles the wait, up to SIGN_IN_LOCKOUT_MINUTES.
  SIGN_IN_LOCKOUT_FAILURES: z.coerce.number().int().min(1).default(10),
  SIGN_IN_BACKOFF_SECONDS: z.coerce.number().positive().default(30),
  SIGN_IN_LOCKOUT_MINUTES: z.coerce.number().positive().default(15),
  // How long one process keeps a session and its user after reading them (0: read every request).
  // A sign-out, removed membership or role change made by another API process shows within it.
  AUTH_CACHE_MILLISECONDS: z.coerce.number().int().min(0).max(10_000).default(1000),
  // Memory one process gives to large answers kept ready (finished runs, the map at one data
  // version), plain and gzip-compressed; 0 builds every answer afresh.
  ANSWER_CACHE_MEGABYTES: z.coerce.number().int().min(0).max(4096).default(128),
  // Runs (single or in a sweep) one person may start per minute, and runs an organization may
  // have waiting or running at once: the queue must not become a way to starve other offices.
  RUN_STARTS_PER_MINUTE: z.coerce.number().int().min(1).default(30),
  RUNS_IN_FLIGHT_PER_ORGANIZATION: z.coerce.number().int().min(1).default(40),
  // The public signature check reads whole PDFs for anyone: so many a minute per address.
  VERIFY_PER_MINUTE: z.coerce.number().int().min(1).default(30),
  // Each check runs in a worker thread (server/services/briefings/signing/verify-in-worker.ts): the time
  // it may take once started, its heap, threads per process, and checks that may wait for one.
  VERIFY_TIME_BUDGET_MILLISECONDS: z.coerce.number().int().min(1).default(1500),
  VERIFY_MEMORY_BUDGET_MEGABYTES: z.coerce.number().int().min(16).default(256),
  VERIFY_THREADS: z.coerce.number().int().min(1).max(16).default(1),
  VERIFY_QUEUE: z.coerce.number().int().min(0).default(8),
  // The demo organization (invented town, published passwords): seeded by `npm start` and
  // `npm run db:seed` where NODE_ENV is not production ('auto'), always ('yes') or never ('no').
  SEED_DEMO: z.enum(['auto', 'yes', 'no']).default('auto'),
  PASSWORD_HASH_ROUNDS: z.coerce.number().int().min(4).max(15).default(11),
  TILE_URL: z.string().default(''),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  // Per-run budget: a larger problem is refused before it starts; a longer or hungrier solve is stopped.
  // What one run's time-expanded network may take, in arcs and in bytes (estimated at
  // shared/model/run-budget.ts's measured bytes per arc and node). The defaults are what one
  // worker (WORKER_CONCURRENCY 1) on a 2-core, 24 GB machine holds beside the API and PostgreSQL:
  // 6 GB and 600 million arcs (the implicit time-expanded network keeps about 10 bytes per arc,
  // so the bytes bind first; its residual ids stay below 2^31 up to about a billion arcs). The
  // generated county (180,000 segments) at a 1-minute step over 6 hours is 183.5 million arcs of
  // the formula, 2.3 GB measured (tests/bench/flow/README.md). A larger run is refused with the shortest coarser
  // step that fits. RUN_MEMORY_BUDGET_MEGABYTES below must stay above it. The time budget is
  // wall-clock time: the county at 1 minute needs about 4.5 minutes of CPU time, and a worker runs at
  // niceness 10, so on a machine busy with other work it takes several times that.
  RUN_MAX_EXPANDED_ARCS: z.coerce.number().int().positive().default(600_000_000),
  RUN_MAX_EXPANDED_MEGABYTES: z.coerce.number().int().min(16).default(6144),
  RUN_TIME_BUDGET_SECONDS: z.coerce.number().positive().default(1800),
  RUN_MEMORY_BUDGET_MEGABYTES: z.coerce.number().int().min(64).default(8192),
  // How often the queue looks for jobs of dead workers to retry.
  QUEUE_MAINTENANCE_SECONDS: z.coerce.number().int().min(1).default(30),
  // A job still active this long after its time budget belongs to a dead worker and is retried.
  RUN_EXPIRY_SLACK_SECONDS: z.coerce.number().int().min(1).default(30),
  WORKER_CONCURRENCY: z.coerce.number().int().min(1).max(16).default(1),
  // An uploaded road, zone or shelter file is read in a worker thread within these (server/import-execution/).
  IMPORT_TIME_BUDGET_SECONDS: z.coerce.number().positive().default(600),
  IMPORT_MEMORY_BUDGET_MEGABYTES: z.coerce.number().int().min(64).default(4096),
  // A briefing PDF is laid out in a worker thread within these (server/briefings/render-in-worker.ts).
  BRIEFING_RENDER_SECONDS: z.coerce.number().positive().default(120),
  BRIEFING_RENDER_MEGABYTES: z.coerce.number().int().min(32).default(1024),
  // How often each worker looks for runs with no live job (server/queue/run-reconciler.ts).
  RUN_RECONCILE_SECONDS: z.coerce.number().int().min(1).default(60),
  // A worker's CPU priority (Unix niceness, 0 to 19): where workers share a machine with the API,
  // people's requests come first and solves take the time left. 0 on a machine of their own.
  WORKER_NICENESS: z.coerce.number().int().min(0).max(19).default(10),
  // API processes on this machine sharing the port (node:cluster); one per core the API may use.
  API_PROCESSES: z.coerce.number().int().min(1).max(64).default(1),
  // On SIGTERM a worker takes no new runs and waits this long for the runs in hand; what is
  // still running then goes back to the queue for another worker. The API server waits this
  // long for requests in progress.
  WORKER_SHUTDOWN_GRACE_SECONDS: z.coerce.number().min(0).default(20),
  SHUTDOWN_GRACE_SECONDS: z.coerce.number().min(0).default(10),
  UPLOAD_MAX_MEGABYTES: z.coerce.number().positive().max(2048).default(256),
  // Uploads read and imported at once by one process: each is held in memory while it is read.
  UPLOADS_AT_ONCE: z.coerce.number().int().min(1).default(4),
  // Files the public signature check reads at once per process, apart from members' uploads.
  VERIFY_UPLOADS_AT_ONCE: z.coerce.number().int().min(1).default(2),
  // An upload's body must arrive within this time (408 beyond), so a slow sender cannot hold a slot.
  UPLOAD_READ_TIMEOUT_SECONDS: z.coerce.number().positive().default(120),
  // Briefing e-mail. Empty SMTP_URL with the development outbox on: the server starts its own
  // fake SMTP server on loopback and keeps every message (server/services/briefings/outbox.ts).
  SMTP_URL: z.string().default(''),
  MAIL_FROM: z.string().min(3).default('Cutline briefings <briefings@cutline.example>'),
  // The address people open the app at, for links in e-mail and on signed briefings; default http://HOST:PORT.
  PUBLIC_BASE_URL: z.string().url().optional(),
  // Encrypts the organisations' generated signing keys in the database. The default is for
  // development only: set your own before real use, and keep it (a changed one cannot open the stored keys).
  SIGNING_KEY_PASSPHRASE: z.string().min(8).default(developmentSecrets.SIGNING_KEY_PASSPHRASE),
  // A real certificate (PKCS#12) to sign briefings with instead of the generated self-signed one.
  SIGNING_P12_PATH: z.string().optional(),
  SIGNING_P12_PASSPHRASE: z.string().default(''),
  // The outbox page and the fake SMTP server: on unless NODE_ENV=production.
  DEV_OUTBOX: z.enum(['on', 'off']).optional(),
  // Dates on briefings (IANA name).
  BRIEFING_TIME_ZONE: z.string().default('UTC').refine((tz) => {
    try {
      new Intl.DateTimeFormat('en-US', { timeZone: tz });
      return true;
    } catch {
      return false;
    }
  }, 'Not an IANA time zone name.'),
});

const resolvedSchema = configSchema.transform((c) => ({ ...c, COOKIE_SECURE: c.COOKIE_SECURE === undefined ? c.NODE_ENV === 'production' : c.COOKIE_SECURE === 'true' }));

export type Config = z.output<typeof resolvedSchema>;

// In production the published development secrets would let anyone forge sessions or open the
// stored signing keys, so they are refused.
const productionSchema = resolvedSchema.superRefine((c, ctx) => {
  if (c.NODE_ENV !== 'production') return;
  // The passphrase guards every organisation's signing key in the database and its backups.
  if (c.SIGNING_KEY_PASSPHRASE.length < 20) {
    ctx.addIssue({ code: 'custom', path: ['SIGNING_KEY_PASSPHRASE'], message: 'use at least 20 characters in production' });
  }
  for (const [name, value] of Object.entries(developmentSecrets)) {
    if (c[name as keyof typeof developmentSecrets] === value) {
      ctx.addIssue({ code: 'custom', path: [name], message: 'set a secret of your own in production (the development default is public)' });
    }
  }
});

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = productionSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid environment:\n${lines.join('\n')}`);
  }
  return parsed.data;
}
